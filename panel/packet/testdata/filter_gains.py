#!/usr/bin/python3
"""Reference gains for the review page's filter check in browser_test.go
(Debian python3-scipy 1.10).

Run from this directory: /usr/bin/python3 filter_gains.py

Each case is a unit sine of f Hz, 4096 samples at 256 samples/s, run
forward and backward (scipy.signal.sosfiltfilt) through second-order
Butterworth high- and low-pass sections (scipy.signal.butter(2, ...)) and
a notch of Q 30 (scipy.signal.iirnotch); the gain is the largest |y| over
samples 1024-3071, as the test measures it on the page. Output:

    10 Hz, LFF 0.5, HFF 70, notch 50: 0.9999
    70 Hz, LFF 0, HFF 70, notch 0: 0.5000
    0.5 Hz, LFF 0.5, HFF 0, notch 0: 0.5000
    50 Hz, LFF 0, HFF 0, notch 50: 0.0000
    60 Hz, LFF 0, HFF 0, notch 60: 0.0000
"""
import numpy as np
from scipy import signal

FS = 256.0
for f, lff, hff, notch in [(10, 0.5, 70, 50), (70, 0, 70, 0), (0.5, 0.5, 0, 0),
                           (50, 0, 0, 50), (60, 0, 0, 60)]:
    x = np.sin(2 * np.pi * f * np.arange(4096) / FS)
    sos = []
    if lff:
        sos.append(signal.butter(2, lff, "highpass", fs=FS, output="sos"))
    if hff:
        sos.append(signal.butter(2, hff, "lowpass", fs=FS, output="sos"))
    if notch:
        b, a = signal.iirnotch(notch, 30, fs=FS)
        sos.append(signal.tf2sos(b, a))
    y = signal.sosfiltfilt(np.vstack(sos), x)
    print("%g Hz, LFF %g, HFF %g, notch %g: %.4f" % (f, lff, hff, notch, np.abs(y[1024:3072]).max()))
