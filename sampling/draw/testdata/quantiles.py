#!/usr/bin/python3
"""Writes quantiles.json: data with ties and the inner edges of k quantile
bins computed by numpy.quantile(method="inverted_cdf"), Hyndman & Fan (1996)
definition 1, at probabilities j/k.
Run: /usr/bin/python3 quantiles.py > quantiles.json
"""
import json
import numpy as np

rng = np.random.default_rng(11)
cases = []
for n, k in [(1000, 5), (37, 4), (10, 3), (250, 10)]:
    x = np.round(rng.gamma(1.5, 2.0, n), 1)  # rounding makes ties
    edges = [float(np.quantile(x, j / k, method="inverted_cdf")) for j in range(1, k)]
    cases.append(dict(x=[float(v) for v in x], k=k, edges=edges))
print(json.dumps(cases))
