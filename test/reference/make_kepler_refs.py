#!/usr/bin/python3
"""Writes test/fixtures/kepler-mpmath.json: eccentric and true anomalies solved to 40
significant digits with mpmath, the high-precision reference for test/orbit/kepler.test.ts.

Run from the repository root with Debian's python (mpmath 1.2.1):

    /usr/bin/python3 test/reference/make_kepler_refs.py

Each mean anomaly M and eccentricity e is a double; mpmath reads it exactly
(mpf(float) is exact) and solves M = E - e sin E by bisection to 1e-45 then polishes
with Newton's method at 60 digits. The true anomaly is
nu = 2 atan2(sqrt(1+e) sin(E/2), sqrt(1-e) cos(E/2)) at the same precision.
"""
import datetime
import json
import math

import mpmath
from mpmath import mp, mpf

OUT = "test/fixtures/kepler-mpmath.json"


def solve(M, e):
    mp.dps = 60
    M = mpf(M)
    e = mpf(e)
    k = mpmath.nint(M / (2 * mp.pi))
    m = M - 2 * mp.pi * k
    sign = 1
    if m < 0:
        sign, m = -1, -m
    lo, hi = m, min(mp.pi, m + e)
    f = lambda E: E - e * mpmath.sin(E) - m
    for _ in range(400):
        mid = (lo + hi) / 2
        if f(mid) < 0:
            lo = mid
        else:
            hi = mid
        if hi - lo < mpf(10) ** -45:
            break
    E = (lo + hi) / 2
    for _ in range(5):
        E = E - f(E) / (1 - e * mpmath.cos(E))
    E = sign * E + 2 * mp.pi * k
    nu = 2 * mpmath.atan2(mpmath.sqrt(1 + e) * mpmath.sin(E / 2), mpmath.sqrt(1 - e) * mpmath.cos(E / 2))
    return E, nu


def main():
    eccs = [0.0, 1e-6, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.95, 0.99, 0.995, 0.999, 0.9999]
    means = [0.0, 1e-8, 1e-4, 0.01, 0.1, 0.5, 1.0, 2.0, 3.0, math.pi - 1e-6, math.pi, 3.5, 5.0, 2 * math.pi - 0.001,
             -0.2, -3.0, 7.0, 20.0, -15.5]
    rows = []
    for e in eccs:
        for M in means:
            E, nu = solve(M, e)
            rows.append({"M": M, "e": e, "E": mpmath.nstr(E, 40), "nu": mpmath.nstr(nu, 40)})
    doc = {
        "generator": "test/reference/make_kepler_refs.py",
        "library": f"mpmath {mpmath.__version__}",
        "date": datetime.date.today().isoformat(),
        "precision": "60 decimal digits working precision; E and nu printed to 40 significant digits",
        "rows": rows,
    }
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=0)
        f.write("\n")


if __name__ == "__main__":
    main()
