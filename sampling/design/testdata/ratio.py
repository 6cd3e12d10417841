#!/usr/bin/python3
"""Writes ratio.json: a stratified sample and reference estimates computed
with numpy from Cochran (1977) Sampling Techniques 3rd ed., §6.11, combined
ratio estimate (written here in its textbook form with s2_y, s2_x, s_yx,
not the residual form used by package design):

  R = ybar_st / xbar_st,
  v(R) = sum_h N_h^2 (1-f_h)/n_h (s2_yh + R^2 s2_xh - 2 R s_yxh) / X^2.

Also the stratified mean of y (Cochran §5.3) and sensitivity/specificity/PPV
as combined ratios of 0/1 indicators.
Run: /usr/bin/python3 ratio.py > ratio.json
"""
import json
import numpy as np

rng = np.random.default_rng(20240601)
Nh = {"s1": 500, "s2": 1200, "s3": 80}
nh = {"s1": 25, "s2": 40, "s3": 12}
units = []
for h in sorted(Nh):
    for i in range(nh[h]):
        truth = bool(rng.random() < {"s1": 0.2, "s2": 0.5, "s3": 0.8}[h])
        pred = bool(rng.random() < (0.85 if truth else 0.15))
        x = float(np.round(rng.gamma(2.0, 3.0), 3))
        y = float(np.round(0.7 * x + rng.normal(0, 1), 3))
        units.append(dict(stratum=h, y=y, x=x, truth=truth, pred=pred))

def ratio(yf, xf):
    X = Y = 0.0
    for h in Nh:
        u = [d for d in units if d["stratum"] == h]
        Y += Nh[h] * np.mean([yf(d) for d in u])
        X += Nh[h] * np.mean([xf(d) for d in u])
    R = Y / X
    v = 0.0
    for h in Nh:
        u = [d for d in units if d["stratum"] == h]
        yy = np.array([yf(d) for d in u], float)
        xx = np.array([xf(d) for d in u], float)
        n = len(u)
        c = np.cov(yy, xx, ddof=1)
        v += Nh[h] ** 2 * (1 - n / Nh[h]) / n * (c[0, 0] + R * R * c[1, 1] - 2 * R * c[0, 1])
    return R, v / X ** 2

out = {"N": Nh, "units": units}
out["ratio"] = ratio(lambda d: d["y"], lambda d: d["x"])
out["sensitivity"] = ratio(lambda d: d["pred"] and d["truth"], lambda d: d["truth"])
out["specificity"] = ratio(lambda d: (not d["pred"]) and (not d["truth"]), lambda d: not d["truth"])
out["ppv"] = ratio(lambda d: d["pred"] and d["truth"], lambda d: d["pred"])
N = sum(Nh.values())
m = sum(Nh[h] / N * np.mean([d["y"] for d in units if d["stratum"] == h]) for h in Nh)
vm = sum((Nh[h] / N) ** 2 * (1 - nh[h] / Nh[h]) * np.var([d["y"] for d in units if d["stratum"] == h], ddof=1) / nh[h] for h in Nh)
out["stratmean"] = (m, vm)
print(json.dumps(out, indent=1))
