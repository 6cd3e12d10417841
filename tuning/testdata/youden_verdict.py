#!/usr/bin/python3
# Reference for TestFitFeatureByVerdict: one criterion's feature, the
# reference standard (IED verdict), that criterion's panel majority (which
# disagrees with the verdict on some events) and design weights; the
# design-weighted Youden threshold (Youden 1950) of the feature against each
# label from scikit-learn's roc_curve with sample_weight, argmax of TPR − FPR
# (the first, i.e. highest, threshold on ties).
# Run: /usr/bin/python3 testdata/youden_verdict.py > testdata/youden_verdict.json
import json
import numpy as np
from sklearn.metrics import roc_curve

rng = np.random.default_rng(20261205)
n = 150
verdict = rng.random(n) < 0.3
flip = rng.random(n) < 0.25
majority = verdict ^ flip
x = np.round(rng.normal(0, 1, n) + 1.2 * verdict + 0.6 * majority, 1)  # rounded: ties occur
w = rng.choice([1.0, 2.5, 4.0], n)


def youden(label):
    fpr, tpr, th = roc_curve(label, x, sample_weight=w, drop_intermediate=False)
    j = tpr - fpr
    return float(th[int(np.argmax(j))]), float(j.max())


tv, jv = youden(verdict)
tm, jm = youden(majority)
print(json.dumps({"feature": x.tolist(), "verdict": verdict.tolist(), "majority": majority.tolist(),
                  "weight": w.tolist(), "youden_verdict": tv, "j_verdict": jv,
                  "youden_majority": tm, "j_majority": jm}))
