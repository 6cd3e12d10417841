#!/usr/bin/python3
"""Reference values for package signal, made with scipy.signal.

Run with Debian's interpreter from this directory:
    /usr/bin/python3 gen_scipy.py > scipy_ref.json
"""
import json

import numpy as np
import scipy
from scipy import signal


def test_input(n):
    """A deterministic test signal: slow drift, alpha, mains, a spike-like
    bump, a step and a pseudo-random term built from integer arithmetic.
    The Go test reads x from the JSON rather than rebuilding it."""
    t = np.arange(n) / 256.0
    noise = ((np.arange(n) * 7919) % 101 - 50) / 50.0
    x = (40 * np.sin(2 * np.pi * 0.2 * t) + 20 * np.sin(2 * np.pi * 10 * t)
         + 15 * np.sin(2 * np.pi * 50 * t) + 5 * noise
         + 100 * np.exp(-0.5 * ((t - 2.0) / 0.02) ** 2)
         + 30 * (t > 3.0) + 25.0)
    return x


designs = [
    # name, kind, order, fs, edges
    ("lp1", "lowpass", 1, 256.0, [30.0]),
    ("lp2", "lowpass", 2, 256.0, [30.0]),
    ("lp3", "lowpass", 3, 256.0, [30.0]),
    ("lp5", "lowpass", 5, 200.0, [70.0]),
    ("hp1", "highpass", 1, 256.0, [0.5]),
    ("hp2", "highpass", 2, 256.0, [0.5]),
    ("hp4", "highpass", 4, 500.0, [1.0]),
    ("bp2", "bandpass", 2, 256.0, [0.5, 70.0]),
    ("bp3", "bandpass", 3, 256.0, [1.0, 35.0]),
    ("bp4", "bandpass", 4, 256.0, [0.5, 70.0]),
    ("bs2", "bandstop", 2, 256.0, [48.0, 52.0]),
    ("bs3", "bandstop", 3, 512.0, [58.0, 62.0]),
]
notches = [("n50", 50.0, 30.0, 256.0), ("n60", 60.0, 35.0, 500.0)]

out = {"scipy": scipy.__version__, "numpy": np.__version__, "designs": [],
       "notches": [], "filtfilt": [], "buttap": [], "x": []}
for n in range(1, 11):
    z, p, k = signal.buttap(n)
    a = np.real(np.poly(p))
    out["buttap"].append({"n": n, "den": a.tolist()})
for name, kind, order, fs, edges in designs:
    wn = edges[0] if len(edges) == 1 else edges
    sos = signal.butter(order, wn, btype=kind, fs=fs, output="sos")
    out["designs"].append({"name": name, "kind": kind, "order": order,
                           "fs": fs, "edges": edges, "sos": sos.tolist()})
for name, f0, q, fs in notches:
    b, a = signal.iirnotch(f0, q, fs=fs)
    # |H| at DC, f0 and Nyquist from scipy.signal.freqz
    _, h = signal.freqz(b, a, worN=[0.0, f0, fs / 2], fs=fs)
    out["notches"].append({"name": name, "f0": f0, "q": q, "fs": fs,
                           "sos": [list(b) + list(a)], "gain_dc_f0_nyquist": np.abs(h).tolist()})

x = test_input(1024)
out["x"] = x.tolist()
bp = signal.butter(4, [0.5, 70.0], btype="bandpass", fs=256.0, output="sos")
b, a = signal.iirnotch(50.0, 30.0, fs=256.0)
chain = np.vstack([bp, np.concatenate([b, a])[None, :]])
cases = [("bp4+n50", chain), ("hp2",
         signal.butter(2, 0.5, btype="highpass", fs=256.0, output="sos")),
         ("lp3", signal.butter(3, 30.0, btype="lowpass", fs=256.0,
                               output="sos"))]
for name, sos in cases:
    y = signal.sosfiltfilt(sos, x)
    out["filtfilt"].append({"name": name, "sos": sos.tolist(),
                            "y": y.tolist()})

print(json.dumps(out, indent=None))
