#!/usr/bin/python3
# Reference for TestCriterionAUCAgainstScipy: one criterion's feature and
# panel majority, and the AUC as U/(m·n) from scipy.stats.mannwhitneyu
# (U counts ties as ½, Mann & Whitney 1947).
# Run: /usr/bin/python3 testdata/mannwhitney.py > testdata/mannwhitney.json
import json
import numpy as np
from scipy.stats import mannwhitneyu

rng = np.random.default_rng(20260101)
n = 120
present = rng.random(n) < 0.4
x = np.round(rng.normal(0, 1, n) + 0.9 * present, 1)  # rounded: ties occur
u = mannwhitneyu(x[present], x[~present], alternative="two-sided").statistic
auc = u / (present.sum() * (~present).sum())
print(json.dumps({"feature": x.tolist(), "present": present.tolist(), "auc": float(auc)}))
