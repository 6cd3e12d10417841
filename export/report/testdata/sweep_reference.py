#!/usr/bin/env python3
"""Reference weighted confusion counts and NPV for sweep_test.go, in exact rational
arithmetic (fractions.Fraction): the rule "score >= threshold" at +Inf and at every
distinct score, descending. Weights are decimal design weights whose float sums carry
rounding error; exact arithmetic has none, so every cell is >= 0 and NPV is undefined
(null) exactly where nothing is called negative. Run: python3 sweep_reference.py > sweep_reference.json
"""
import json
from fractions import Fraction as F

scores = [0.3, 0.8, 0.1, 0.7, 0.6, 0.5, 0.9, 0.8, 0.2, 0.4]
truth = [0, 1, 0, 1, 0, 1, 1, 0, 0, 0]
weights = ["3.7", "4.7", "4.4", "5.0", "3.7", "1.7", "4.4", "4.9", "4.6", "3.3"]
w = [F(x) for x in weights]
pos = sum(wi for wi, t in zip(w, truth) if t)
neg = sum(wi for wi, t in zip(w, truth) if not t)
rows = []
for th in [None] + sorted(set(scores), reverse=True):
    tp = sum((wi for s, t, wi in zip(scores, truth, w) if t and th is not None and s >= th), F(0))
    fp = sum((wi for s, t, wi in zip(scores, truth, w) if not t and th is not None and s >= th), F(0))
    fn, tn = pos - tp, neg - fp
    npv = None if tn + fn == 0 else float(tn / (tn + fn))
    rows.append({"threshold": "inf" if th is None else th, "wtp": float(tp), "wfp": float(fp),
                 "wtn": float(tn), "wfn": float(fn), "weighted_npv": npv})
print(json.dumps({"scores": scores, "truth": truth, "weights": [float(x) for x in weights], "rows": rows}, indent=1))
