#!/usr/bin/python3
"""Reference values for design tests (run with /usr/bin/python3; numpy).

Stratified estimate of the caribou total, Siniff & Skoog (1964) survey as
tabulated in Lohr (2010) Sampling: Design and Analysis 2nd ed., ch. 3
(from memory: N_h, n_h, ybar_h, s2_h below; the book reports a total of
54,497 with SE 5,840, which these inputs reproduce).
"""
import numpy as np

N = np.array([400, 30, 61, 18, 70, 120], float)
n = np.array([98, 10, 37, 6, 39, 21], float)
ybar = np.array([24.1, 25.6, 267.6, 179.0, 293.7, 33.2])
s2 = np.array([5575, 4064, 347556, 22798, 123578, 9795], float)

t = np.sum(N * ybar)
v = np.sum(N**2 * (1 - n / N) * s2 / n)
print("total %.6f" % t)
print("var   %.6f" % v)
print("se    %.6f" % np.sqrt(v))
# Neyman allocation (Cochran 1977 eq. 5.26 form n N_h S_h / sum)
S = np.sqrt(s2)
print("neyman100", " ".join("%.9f" % x for x in 100 * N * S / np.sum(N * S)))
a = 200 * N * S / np.sum(N * S)
print("neyman200", " ".join("%.9f" % x for x in a))
# stratum C (index 2) exceeds N_C = 61: take it whole, re-share 139
rest = np.delete(np.arange(6), 2)
b = 139 * N[rest] * S[rest] / np.sum(N[rest] * S[rest])
print("neyman200 C whole, others", " ".join("%.9f" % x for x in b))
