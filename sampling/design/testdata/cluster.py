#!/usr/bin/python3
"""Writes cluster.json: a clustered, stratified sample and reference
variances of design-weighted ratios with subjects as primary sampling units.

1. statsmodels (0.13, Debian python3-statsmodels): the weighted mean of y
   (prevalence: every unit is in the denominator) is WLS of y on a constant
   with weights w; its cluster-robust (sandwich) variance with
   use_correction=True is G/(G-1) * (N-1)/(N-K) * sum_c (sum_{i in c} w_i e_i)^2
   / (sum w)^2 with K = 1, i.e. the unstratified with-replacement
   ultimate-cluster linearised variance of the ratio (Wolter 2007 §1.4;
   Binder 1983 Int Stat Rev 51:279). Used for the sample whose subjects span
   all strata (one variance stratum after collapsing).
2. numpy closed form of the stratified ultimate-cluster variance for a
   sample whose subjects are nested in strata, for a general ratio
   sum w y / sum w x (sensitivity: y = pred & truth, x = truth):
   v = sum_h n_h/(n_h-1) sum_c (t_c - tbar_h)^2 / X^2,
   t_c = sum_{i in c} w_i (y_i - R x_i); df = #PSU - #strata.
3. Student t quantiles t_{0.975, df} for df 9 and 199 from
   scipy.stats.t.ppf (scipy 1.10), for the design-df interval and the
   Korn & Graubard (1998) effective size.
Run: /usr/bin/python3 cluster.py > cluster.json
"""
import json
import numpy as np
import statsmodels.api as sm

rng = np.random.default_rng(20261205)

def make(nested):
    units = []
    strata = ["q1", "q2", "q3"]
    for s in range(12):
        subj = "sub-%02d" % s
        frailty = rng.normal(0, 1.2)  # subject effect: events cluster
        home = strata[s % 3]
        for e in range(int(rng.integers(2, 7))):
            h = home if nested else strata[int(rng.integers(0, 3))]
            w = {"q1": 4.0, "q2": 2.5, "q3": 1.25}[h]
            truth = bool(rng.random() < 1 / (1 + np.exp(-(frailty - 0.3))))
            pred = bool(rng.random() < (0.8 if truth else 0.2))
            units.append(dict(stratum=h, cluster=subj, weight=w, truth=truth, pred=pred))
    return units

def ultimate_cluster(units, y, x, by_stratum):
    w = np.array([u["weight"] for u in units])
    R = (w * y).sum() / (w * x).sum()
    z = w * (y - R * x)
    groups = {}
    for i, u in enumerate(units):
        g = u["stratum"] if by_stratum else "all"
        groups.setdefault(g, {}).setdefault(u["cluster"], 0.0)
        groups[g][u["cluster"]] += z[i]
    v = 0.0
    npsu = 0
    for g, tc in groups.items():
        t = np.array(list(tc.values()))
        n = len(t)
        npsu += n
        if n > 1:
            v += n / (n - 1) * ((t - t.mean()) ** 2).sum()
    X = (w * x).sum()
    return float(R), float(v / X ** 2), npsu - len(groups)

out = {}
# 1. subjects spread over strata: statsmodels cluster-robust weighted mean
spread = make(nested=False)
y = np.array([float(u["truth"]) for u in spread])
w = np.array([u["weight"] for u in spread])
groups = np.unique([u["cluster"] for u in spread], return_inverse=True)[1]
fit = sm.WLS(y, np.ones((len(y), 1)), weights=w).fit(
    cov_type="cluster", cov_kwds={"groups": groups, "use_correction": True})
R, v, df = ultimate_cluster(spread, y, np.ones(len(y)), by_stratum=False)
assert abs(fit.params[0] - R) < 1e-12 and abs(fit.cov_params()[0, 0] - v) < 1e-12
out["spread"] = dict(units=spread, prevalence=float(fit.params[0]),
                     prevalence_var=float(fit.cov_params()[0, 0]), df=df)
# 2. subjects nested in strata: stratified ultimate cluster, numpy
nested = make(nested=True)
t = np.array([float(u["truth"]) for u in nested])
p = np.array([float(u["pred"]) for u in nested])
R, v, df = ultimate_cluster(nested, p * t, t, by_stratum=True)
out["nested"] = dict(units=nested, sensitivity=R, sensitivity_var=v, df=df)
# 3. t quantiles
from scipy import stats
out["t975"] = {str(d): float(stats.t.ppf(0.975, d)) for d in (9, 199)}
print(json.dumps(out, indent=1))
