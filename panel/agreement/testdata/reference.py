#!/usr/bin/python3
"""Reference values for panel/agreement tests, from statsmodels.

Run with Debian's interpreter (python3-statsmodels 0.13.5, python3-numpy):

    /usr/bin/python3 reference.py > reference.txt

It also writes binary7.csv, a seeded 7-rater present/absent table with no
missing cells (statsmodels' fleiss_kappa needs a constant number of raters).
"""
import numpy as np
from statsmodels.stats.inter_rater import fleiss_kappa, cohens_kappa, aggregate_raters

# Fleiss (1971), Table 1: 30 patients x 5 diagnoses, 6 raters each.
fleiss1971 = np.loadtxt("fleiss1971.csv", delimiter=",", dtype=int)
print("fleiss1971_kappa %.12f" % fleiss_kappa(fleiss1971, method="fleiss"))

# Two-rater contingency tables used by the Cohen tests.
tables = {
    "cohen1960": [[88, 14, 18], [10, 40, 10], [2, 6, 12]],
    "twobytwo": [[20, 5], [10, 15]],
}
for name, t in tables.items():
    print("%s_kappa %.12f" % (name, cohens_kappa(np.array(t, float)).kappa))

# Seeded panel: 7 raters, 300 items, binary, rater-specific accuracy.
rng = np.random.default_rng(20260101)
truth = rng.random(300) < 0.3
acc = np.array([0.95, 0.9, 0.85, 0.8, 0.75, 0.7, 0.65])
flip = rng.random((300, 7)) > acc
ratings = np.where(flip, ~truth[:, None], truth[:, None]).astype(int)
np.savetxt("binary7.csv", ratings, fmt="%d", delimiter=",")
counts, _ = aggregate_raters(ratings, n_cat=2)
print("binary7_fleiss %.12f" % fleiss_kappa(counts, method="fleiss"))
for a in range(7):
    for b in range(a + 1, 7):
        ct = np.zeros((2, 2))
        for x, y in zip(ratings[:, a], ratings[:, b]):
            ct[x, y] += 1
        print("binary7_cohen_%d_%d %.12f" % (a, b, cohens_kappa(ct).kappa))
