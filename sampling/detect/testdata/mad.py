#!/usr/bin/python3
"""Reference values for TestBlockMAD (Debian python3-scipy 1.10).

Run from this directory: /usr/bin/python3 mad.py

Prints the median and scipy.stats.median_abs_deviation of the worked
example {1, 1, 2, 2, 4, 6, 9}, and the normal-consistency factor
1/Phi^-1(3/4) that median_abs_deviation(scale="normal") applies
(Hampel 1974), from scipy.stats.norm.ppf. Output:

    median 2.0
    mad 1.0
    normal_scale 1.482602218505602
"""
import numpy as np
from scipy import stats

x = np.array([1, 1, 2, 2, 4, 6, 9], float)
print("median", np.median(x))
print("mad", stats.median_abs_deviation(x))
print("normal_scale", repr(1 / stats.norm.ppf(0.75)))
