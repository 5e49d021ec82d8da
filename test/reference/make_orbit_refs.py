#!/usr/bin/python3
"""Writes test/fixtures/orbit-scipy.json: reference orbit fits by scipy.optimize.curve_fit
and F-distribution tail probabilities by scipy.stats.f.sf, for test/orbit/orbit-fit.test.ts.

Run from the repository root with Debian's python (scipy 1.10.1, numpy 1.24.2):

    /usr/bin/python3 test/reference/make_orbit_refs.py

The velocity series are seeded and invented (the demo's fictional LVAC-7 orbit and an
invented double-lined binary). The model is written here independently of lineshift:
v = gamma + K (cos(nu + omega) + e cos omega), M = 2 pi (t - T) / P, Kepler's equation by
Newton's method to 1e-15, nu = 2 atan2(sqrt(1+e) sin(E/2), sqrt(1-e) cos(E/2)); star 2 of
the double-lined case moves as gamma - K2 (cos(nu + omega) + e cos omega).
curve_fit(model, t, v, p0=truth, sigma=dy, absolute_sigma=True, method='lm',
xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000) in the parameters
(P, T - T0, e, omega_deg, K, gamma[, K2]) with T0 the starting T: MINPACK's forward
differences step each parameter by ~1.5e-8 of its value, which for a BJD near 2.46e6 would
be 0.04 d, far too coarse; fitting the offset from T0 keeps the step small, and the times
enter as t - T0 (so that a step of 1e-9 d in T is not lost in the rounding of a BJD). The covariance
is curve_fit's pcov (the same for T as for T - T0).
"""
import datetime
import json
import sys

import numpy as np
import scipy
from scipy.optimize import curve_fit
from scipy.stats import f as fdist

OUT = "test/fixtures/orbit-scipy.json"


def kepler(M, e):
    E = M + 0.85 * e * np.sign(np.sin(M))
    for _ in range(60):
        dE = (E - e * np.sin(E) - M) / (1 - e * np.cos(E))
        E = E - dE
        if np.max(np.abs(dE)) < 1e-15:
            break
    return E


def shape(tau, P, dT, e, wdeg):
    """tau = t - T0 (computed once, exactly enough), dT = T - T0."""
    M = 2 * np.pi * (tau - dT) / P
    M = np.mod(M, 2 * np.pi)
    E = kepler(M, e)
    nu = 2 * np.arctan2(np.sqrt(1 + e) * np.sin(E / 2), np.sqrt(1 - e) * np.cos(E / 2))
    w = np.radians(wdeg)
    return np.cos(nu + w) + e * np.cos(w)


def nights(rng, n, start, length):
    d = np.sort(rng.choice(length, n, replace=False))
    return start + d + 0.3 + 0.2 * (rng.random(n) - 0.5)


def main():
    rng = np.random.default_rng(20240611)
    cases = []

    # single-lined: the invented LVAC-7 orbit of data/demo/scenario.json
    truth = dict(P=12.37, T=2461140.63, e=0.28, w=112.0, K=41.3, g=-17.8)
    t = nights(rng, 26, 2461140.0, 160)
    dy = 1.0 + 0.8 * rng.random(t.size)
    v = truth["g"] + truth["K"] * shape(t - truth["T"], truth["P"], 0.0, truth["e"], truth["w"]) + dy * rng.standard_normal(t.size)
    # T moved to the passage nearest the weighted mean time, as lineshift reports it
    wts = dy ** -2
    tref = np.sum(wts * t) / np.sum(wts)
    T0 = truth["T"] + np.round((tref - truth["T"]) / truth["P"]) * truth["P"]
    model1 = lambda tt, P, dT, e, w, K, g: g + K * shape(tt - T0, P, dT, e, w)
    p0 = [truth["P"], 0.0, truth["e"], truth["w"], truth["K"], truth["g"]]
    popt, pcov = curve_fit(model1, t, v, p0=p0, sigma=dy, absolute_sigma=True, method="lm",
                           xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000)
    chi2 = float(np.sum(((v - model1(t, *popt)) / dy) ** 2))
    # circular orbit (e = 0, omega = 0: T is then the time of maximum velocity)
    modelc = lambda tt, P, dT, K, g: g + K * shape(tt - T0, P, dT, 0.0, 0.0)
    pc, _ = curve_fit(modelc, t, v, p0=[popt[0], popt[1] - popt[0] * 0.25, popt[4], popt[5]], sigma=dy, absolute_sigma=True,
                      method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000)
    chi2c = float(np.sum(((v - modelc(t, *pc)) / dy) ** 2))
    popt[1] += T0
    p0[1] = T0
    cases.append({
        "name": "lvac7-single-lined",
        "t": t.tolist(), "v": v.tolist(), "dy": dy.tolist(),
        "names": ["P", "T", "e", "omegaDeg", "K", "gamma"],
        "parameters": popt.tolist(), "covariance": pcov.tolist(), "chiSquare": chi2,
        "chiSquareCircular": chi2c,
        "truth": p0,
    })

    # double-lined (invented): star 2 missing on 4 blended nights
    tr = dict(P=5.813, T=2461000.2, e=0.12, w=251.0, K=58.0, g=12.5, K2=74.0)
    t = nights(rng, 22, 2461001.0, 90)
    dy1 = 1.5 + 0.5 * rng.random(t.size)
    dy2 = 2.5 + 0.5 * rng.random(t.size)
    s = shape(t - tr["T"], tr["P"], 0.0, tr["e"], tr["w"])
    v1 = tr["g"] + tr["K"] * s + dy1 * rng.standard_normal(t.size)
    v2 = tr["g"] - tr["K2"] * s + dy2 * rng.standard_normal(t.size)
    blended = np.zeros(t.size, bool)
    blended[[3, 8, 14, 19]] = True
    tt = np.concatenate([t, t[~blended]])
    which = np.concatenate([np.zeros(t.size), np.ones((~blended).sum())])
    vv = np.concatenate([v1, v2[~blended]])
    dd = np.concatenate([dy1, dy2[~blended]])
    w_all = dd ** -2
    tref = np.sum(w_all * tt) / np.sum(w_all)
    T0 = tr["T"] + np.round((tref - tr["T"]) / tr["P"]) * tr["P"]

    def model2(x, P, dT, e, w, K, g, K2):
        sh = shape(tt - T0, P, dT, e, w)
        return np.where(which == 0, g + K * sh, g - K2 * sh)

    p0 = [tr["P"], 0.0, tr["e"], tr["w"], tr["K"], tr["g"], tr["K2"]]
    popt, pcov = curve_fit(model2, tt, vv, p0=p0, sigma=dd, absolute_sigma=True, method="lm",
                           xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000)
    chi2 = float(np.sum(((vv - model2(tt, *popt)) / dd) ** 2))
    popt[1] += T0
    p0[1] = T0
    cases.append({
        "name": "invented-double-lined",
        "t": t.tolist(), "v": v1.tolist(), "dy": dy1.tolist(),
        "v2": [None if b else x for x, b in zip(v2.tolist(), blended)],
        "dy2": [None if b else x for x, b in zip(dy2.tolist(), blended)],
        "names": ["P", "T", "e", "omegaDeg", "K", "gamma", "K2"],
        "parameters": popt.tolist(), "covariance": pcov.tolist(), "chiSquare": chi2,
        "truth": p0,
    })

    ftail = []
    for F, d2 in [(0.5, 4), (1.7, 10), (3.2, 17), (6.0, 30), (12.0, 8), (0.05, 50)]:
        ftail.append({"F": F, "dfn": 2, "dfd": d2, "sf": float(fdist.sf(F, 2, d2))})

    doc = {
        "generator": "test/reference/make_orbit_refs.py",
        "library": f"scipy {scipy.__version__}, numpy {np.__version__}, python {sys.version.split()[0]}",
        "date": datetime.date.today().isoformat(),
        "calls": [
            "curve_fit(model, t, v, p0=truth, sigma=dy, absolute_sigma=True, method='lm', xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=100000) with parameters (P, T - T0, e, omega_deg, K, gamma[, K2]), T0 = starting T",
            "scipy.stats.f.sf(F, 2, dfd)",
        ],
        "seed": 20240611,
        "cases": cases,
        "fTail": ftail,
    }
    with open(OUT, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")


if __name__ == "__main__":
    main()
