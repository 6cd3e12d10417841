#!/usr/bin/python3
"""Reference onsets for clock_test.go, computed with Python's datetime.

A time of day is taken at its first occurrence at or after the recording start
(the next calendar day when it is earlier in the day than the start); a
date-time is read as the wall clock written, its zone offset dropped.
Run: /usr/bin/python3 testdata/clock_ref.py
"""
from datetime import datetime, time, timedelta

CASES = [
    ("2024-03-01T22:30:00", "22:45:10.250"),
    ("2024-03-01T22:30:00", "01:15:00"),
    ("2024-03-01T22:30:00.500", "23:59:59.999"),
    ("2024-03-01T22:30:00", "2024-03-02T00:00:01Z"),
    ("2024-03-01T22:30:00", "2024-03-02T00:00:01+01:00"),
    ("2024-12-31T23:00:00", "00:30:00"),
    ("2024-02-28T23:59:00", "2024-02-29 00:01:00"),
    ("2024-03-01T22:30:00", "22:29:59"),
    ("2024-03-01T00:00:00", "7:05:03.000001"),
]


def offset(start, value):
    s = datetime.fromisoformat(start)
    if len(value) >= 10 and value[4] == "-":
        v = value.replace("Z", "+00:00")
        t = datetime.fromisoformat(v).replace(tzinfo=None)
        return (t - s).total_seconds()
    hms, _, frac = value.partition(".")
    h, m, sec = (int(x) for x in hms.split(":"))
    us = int((frac + "000000")[:6]) if frac else 0
    cand = datetime.combine(s.date(), time(h, m, sec, us))
    if cand < s:
        cand += timedelta(days=1)
    return (cand - s).total_seconds()


for start, value in CASES:
    print('{"%s", "%s", %r},' % (start, value, offset(start, value)))
