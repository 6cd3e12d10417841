#!/usr/bin/python3
# Ceiling of the automatic rule on the demo's generator: with the truth of every
# candidate known (the CSVs TestCeilingDump writes), the highest true sensitivity at
# true specificity >= 0.95 that a rule of each family can reach when its cutoffs are
# read off the truth itself (an oracle; no study can do as well):
#   kof6   "at least k of the six criteria", every feature's cutoff at one shared
#          sensitivity or specificity target of its own ROC against the truth (the
#          family criterion-verdict and criterion-majority choose from), best target
#          and k;
#   kof7   the same with the detector score as a seventh vote;
#   score  "score >= t" alone.
# Directions: each feature turned so that its AUC against the truth is >= 1/2
# (Mann-Whitney U/(m n), scipy.stats.mannwhitneyu); a missing feature counts as
# its median. Targets 0.30, 0.31, ..., 0.99.
# Run: QUORATE_CEILING_DIR=/tmp/cov QUORATE_CEILING_SEEDS=101-125 QUORATE_CEILING_OUT=/tmp/csv \
#        go test ./cmd/quorate -run TestCeilingDump
#      /usr/bin/python3 cmd/quorate/testdata/ceiling.py /tmp/csv
import glob
import sys

import numpy as np
from scipy.stats import mannwhitneyu

MINSPEC = 0.95


def auc(a, y):
    return mannwhitneyu(a[y == 1], a[y == 0]).statistic / ((y == 1).sum() * (y == 0).sum())


def best_kof(M, y):
    best = 0.0
    for t in np.linspace(0.30, 0.99, 70):
        for cut in (np.quantile(M[y == 1], 1 - t, axis=0), np.quantile(M[y == 0], t, axis=0)):
            cnt = (M >= cut).sum(1)
            for k in range(1, M.shape[1] + 1):
                h = cnt >= k
                if 1 - h[y == 0].mean() >= MINSPEC:
                    best = max(best, h[y == 1].mean())
    return best


def best_score(sc, y):
    for t in np.unique(sc):
        if np.mean(sc[y == 0] < t) >= MINSPEC:
            return np.mean(sc[y == 1] >= t)
    return 0.0


rows = []
for f in sorted(glob.glob(sys.argv[1] + '/seed*.csv'), key=lambda s: int(s.rsplit('seed', 1)[1][:-4])):
    d = np.genfromtxt(f, delimiter=',', skip_header=1, usecols=range(1, 9))
    X, sc, y = d[:, :6], d[:, 6], d[:, 7].astype(int)
    X = np.where(np.isnan(X), np.nanmedian(X, 0), X)
    for j in range(6):
        if auc(X[:, j], y) < 0.5:
            X[:, j] = -X[:, j]
    r = (best_kof(X, y), best_kof(np.column_stack([X, sc]), y), best_score(sc, y))
    rows.append(r)
    print('%s kof6 %.3f kof7 %.3f score %.3f' % ((f.rsplit('/', 1)[1],) + r))
print('mean over %d seeds: kof6 %.3f kof7 %.3f score %.3f' % ((len(rows),) + tuple(np.mean(rows, 0))))
