#!/usr/bin/python3
"""Reference values for the confusion-table, Wilson-interval and AUC tests
of package accuracy, from general-purpose libraries (Debian's interpreter:
python3-sklearn 1.2, python3-scipy 1.10, python3-statsmodels 0.13).

Run from this directory: /usr/bin/python3 reference.py > reference.json

- Altman & Bland (1994) liver-scan table (TP 231, FP 32, FN 27, TN 54):
  sklearn.metrics.recall_score / precision_score with pos_label 1
  (sensitivity, PPV) and pos_label 0 (specificity, NPV), the four cells
  given as four rows with sample_weight = the cell count.
- Newcombe (1998) Table II cases: scipy.stats.binomtest(x, n)
  .proportion_ci(0.95, method="wilson" / "wilsoncc") and
  statsmodels.stats.proportion.proportion_confint(method="wilson").
- Hanley & McNeil (1982) rating table: sklearn.metrics.roc_auc_score and
  scipy.stats.mannwhitneyu U / (m n) (the Wilcoxon area). No general library
  has the Hanley & McNeil (1982) standard error, so it is written out here
  with numpy from the paper's formula, Q1 = A/(2-A), Q2 = 2A^2/(1+A),
  SE^2 = (A(1-A) + (nA-1)(Q1-A^2) + (nN-1)(Q2-A^2)) / (nA nN), at the
  printed A = 0.893 with 51 abnormal and 58 normal images.
"""
import json

import numpy as np
from scipy import stats
from sklearn import metrics
from statsmodels.stats.proportion import proportion_confint

out = {}

# truth, prediction, count
cells = [(1, 1, 231), (0, 1, 32), (1, 0, 27), (0, 0, 54)]
y = [c[0] for c in cells]
p = [c[1] for c in cells]
w = [c[2] for c in cells]
out["altman_bland"] = {
    "sensitivity": metrics.recall_score(y, p, pos_label=1, sample_weight=w),
    "specificity": metrics.recall_score(y, p, pos_label=0, sample_weight=w),
    "ppv": metrics.precision_score(y, p, pos_label=1, sample_weight=w),
    "npv": metrics.precision_score(y, p, pos_label=0, sample_weight=w),
}

wil = []
for x, n in [(81, 263), (15, 148), (0, 20), (1, 29), (29, 29)]:
    r = stats.binomtest(x, n)
    lo, hi = r.proportion_ci(0.95, method="wilson")
    clo, chi = r.proportion_ci(0.95, method="wilsoncc")
    slo, shi = proportion_confint(x, n, alpha=0.05, method="wilson")
    wil.append({"x": x, "n": n, "lo": lo, "hi": hi, "cc_lo": clo, "cc_hi": chi,
                "sm_lo": slo, "sm_hi": shi})
out["wilson"] = wil

normal = [33, 6, 6, 11, 2]
abnormal = [3, 2, 2, 11, 33]
ratings = np.arange(1, 6)
s0 = np.repeat(ratings, normal)
s1 = np.repeat(ratings, abnormal)
scores = np.r_[s0, s1]
truth = np.r_[np.zeros(len(s0)), np.ones(len(s1))]
u = stats.mannwhitneyu(s1, s0, alternative="two-sided").statistic
out["hanley_mcneil"] = {
    "roc_auc_score": metrics.roc_auc_score(truth, scores),
    "mannwhitney_auc": u / (len(s0) * len(s1)),
}
A, nA, nN = 0.893, 51, 58
q1, q2 = A / (2 - A), 2 * A * A / (1 + A)
out["hanley_mcneil"]["se_numpy"] = float(np.sqrt(
    (A * (1 - A) + (nA - 1) * (q1 - A * A) + (nN - 1) * (q2 - A * A)) / (nA * nN)))
print(json.dumps(out, indent=1))
