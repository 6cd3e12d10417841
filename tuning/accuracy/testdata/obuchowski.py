#!/usr/bin/python3
"""Writes obuchowski.json: clustered scores and Obuchowski's (1997,
Biometrics 53:567-578) clustered AUC variance computed with numpy by brute
force over all positive-negative pairs (psi = 1, 1/2, 0), independently of
the midrank algorithm used in package accuracy:

  V10_i = sum over positives x in cluster i of (1/N) sum_y psi(x, y)
  V01_i = sum over negatives y in cluster i of (1/M) sum_x psi(x, y)
  A = sum_i V10_i / M
  S10 = I/((I-1) M) sum_i (V10_i - m_i A)^2
  S01 = I/((I-1) N) sum_i (V01_i - n_i A)^2
  S11 = I/(I-1)     sum_i (V10_i - m_i A)(V01_i - n_i A)
  Var = S10/M + S01/N + 2 S11/(M N)

Also DeLong's unclustered variance for the same data (each event its own
cluster is not the same formula; DeLong 1988 is S10/M + S01/N with divisors
M-1, N-1). Run: /usr/bin/python3 obuchowski.py > obuchowski.json
"""
import json
import numpy as np

rng = np.random.default_rng(1997)
rows = []
for s in range(15):
    u = rng.normal(0, 0.8)  # subject effect shared by its events
    for e in range(int(rng.integers(1, 6))):
        t = bool(rng.random() < 0.35)
        score = round(float(u + (1.2 if t else 0) + rng.normal()), 1)  # rounded: ties
        rows.append(dict(cluster="s%02d" % s, truth=t, score=score))
x = np.array([r["score"] for r in rows])
t = np.array([r["truth"] for r in rows])
cl = [r["cluster"] for r in rows]
X, Y = x[t], x[~t]
M, N = len(X), len(Y)
psi = (X[:, None] > Y[None, :]) + 0.5 * (X[:, None] == Y[None, :])
v10 = psi.mean(axis=1)
v01 = psi.mean(axis=0)
A = psi.mean()
ids = sorted(set(cl))
I = len(ids)
V10 = np.zeros(I); V01 = np.zeros(I); m = np.zeros(I); n = np.zeros(I)
ip = iN = 0
for r in rows:
    k = ids.index(r["cluster"])
    if r["truth"]:
        V10[k] += v10[ip]; m[k] += 1; ip += 1
    else:
        V01[k] += v01[iN]; n[k] += 1; iN += 1
S10 = I / ((I - 1) * M) * ((V10 - m * A) ** 2).sum()
S01 = I / ((I - 1) * N) * ((V01 - n * A) ** 2).sum()
S11 = I / (I - 1) * ((V10 - m * A) * (V01 - n * A)).sum()
var = S10 / M + S01 / N + 2 * S11 / (M * N)
delong = v10.var(ddof=1) / M + v01.var(ddof=1) / N
print(json.dumps(dict(rows=rows, auc=A, var_clustered=var, var_delong=delong), indent=1))
