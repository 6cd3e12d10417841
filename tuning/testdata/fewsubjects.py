# Reference values for TestFewSubjects: the widening factor of the headline
# interval, sqrt(a/(a-1)) * t(a-1, 1-alpha/2) / z(1-alpha/2), from scipy 1.10
# (Debian python3-scipy). Run: /usr/bin/python3 tuning/testdata/fewsubjects.py
import math
from scipy import stats
for a, level in ((2, 0.95), (5, 0.95), (8, 0.95), (30, 0.95), (8, 0.90)):
    p = 1 - (1 - level) / 2
    print(a, level, repr(math.sqrt(a / (a - 1)) * stats.t.ppf(p, a - 1) / stats.norm.ppf(p)))
