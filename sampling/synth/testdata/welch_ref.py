#!/usr/bin/python3
"""Reference Welch PSD for welch_test.go, from scipy.signal.welch.

Run with Debian's /usr/bin/python3 (python3-scipy, python3-numpy):
    /usr/bin/python3 testdata/welch_ref.py > testdata/welch_ref.json
The input must match welchInput in welch_test.go.
"""
import json
import numpy as np
import scipy
from scipy.signal import welch

fs = 256.0
n = np.arange(2048)
x = (np.sin(2 * np.pi * 10 * n / fs)
     + 0.5 * np.sin(2 * np.pi * 37.3 * n / fs)
     + 0.1 * (((n * 7919) % 101) - 50) / 50.0)
f, p = welch(x, fs=fs, window="hann", nperseg=256, noverlap=128,
             detrend="constant", return_onesided=True, scaling="density",
             average="mean")
json.dump({"scipy": scipy.__version__, "fs": fs, "nperseg": 256,
           "freq": f.tolist(), "psd": p.tolist()}, __import__("sys").stdout)
