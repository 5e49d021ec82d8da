#!/usr/bin/python3
"""Writes test/fixtures/lombscargle-astropy.json: periodogram powers and false-alarm
probabilities from astropy's LombScargle, the reference for test/orbit/periodogram.test.ts.

Run from the repository root with Debian's python (astropy 5.2.1, numpy 1.24.2):

    /usr/bin/python3 test/reference/make_lombscargle_refs.py

The series are seeded and invented (no observed data). method='cython' is the exact
O(N*Nf) evaluation; the default method='auto' would pick the approximate 'fast'
(extirpolation) algorithm for grids longer than 200 points, whose errors (~1e-4) are
larger than the 1e-6 the test asks for.
"""
import datetime
import json
import sys

import astropy
import numpy as np
from astropy.timeseries import LombScargle

OUT = "test/fixtures/lombscargle-astropy.json"


def series(name, rng, n, span, offset, make_y, dy_range):
    t = np.sort(offset + rng.uniform(0.0, span, n))
    # nights: move each time close to local midnight (fractional day 0.3 +- 0.15)
    t = np.floor(t) + 0.3 + rng.uniform(-0.15, 0.15, n)
    dy = rng.uniform(dy_range[0], dy_range[1], n)
    y = make_y(t) + dy * rng.standard_normal(n)
    return name, t, y, dy


def main():
    rng = np.random.default_rng(20240607)
    cases = [
        series("sine-heteroscedastic", rng, 30, 120.0, 2460000.0,
               lambda t: 3.0 + 10.0 * np.sin(2 * np.pi * t / 7.3 + 0.4), (0.5, 2.0)),
        series("noise-only", rng, 25, 200.0, 2460100.0, lambda t: -4.0 + 0.0 * t, (1.0, 3.0)),
        series("two-harmonics", rng, 40, 300.0, 0.0,
               lambda t: 20.0 * np.cos(2 * np.pi * t / 41.0) + 8.0 * np.cos(4 * np.pi * t / 41.0 + 1.0), (0.8, 1.2)),
        series("six-points", rng, 6, 30.0, 2459000.0, lambda t: 5.0 * np.sin(2 * np.pi * t / 3.1), (0.2, 0.4)),
    ]
    out_cases = []
    for name, t, y, dy in cases:
        span = t.max() - t.min()
        freq = np.concatenate([np.linspace(1.0 / span, 2.0, 240), rng.uniform(0.001, 3.0, 20)])
        fmax = 2.0
        ls = LombScargle(t, y, dy, fit_mean=True, center_data=True)
        powers = {}
        for norm in ("standard", "model", "log", "psd"):
            powers[norm] = ls.power(freq, normalization=norm, method="cython").tolist()
        zmax = float(np.max(powers["standard"][:240]))
        fap_b = float(ls.false_alarm_probability(zmax, method="baluev", maximum_frequency=fmax))
        fap_d = float(ls.false_alarm_probability(zmax, method="davies", maximum_frequency=fmax))
        # false_alarm_probability snaps fmax onto its own automatic grid (minimum df/2, step
        # df = 1/(5 T)); this is the f_max it actually used.
        fmax_used = float(ls.autofrequency(maximum_frequency=fmax, return_freq_limits=True)[1])
        out_cases.append({
            "name": name,
            "t": t.tolist(), "y": y.tolist(), "dy": dy.tolist(),
            "frequency": freq.tolist(),
            "power": powers,
            "maxStandardPower": zmax,
            "maximumFrequency": fmax,
            "effectiveMaximumFrequency": fmax_used,
            "falseAlarmBaluev": fap_b,
            "falseAlarmDavies": fap_d,
        })
    doc = {
        "generator": "test/reference/make_lombscargle_refs.py",
        "library": f"astropy {astropy.__version__}, numpy {np.__version__}, python {sys.version.split()[0]}",
        "date": datetime.date.today().isoformat(),
        "calls": [
            "ls = LombScargle(t, y, dy, fit_mean=True, center_data=True)",
            "ls.power(frequency, normalization=NORM, method='cython') for NORM in standard, model, log, psd",
            "ls.false_alarm_probability(max(standard power over the first 240 frequencies), method='baluev', maximum_frequency=2.0)",
            "ls.false_alarm_probability(same, method='davies', maximum_frequency=2.0)",
            "ls.autofrequency(maximum_frequency=2.0, return_freq_limits=True)[1] -> effectiveMaximumFrequency (the f_max those calls used)",
        ],
        "seed": 20240607,
        "cases": out_cases,
    }
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
