#!/usr/bin/python3
"""Reference line fits by scipy.optimize.curve_fit, for test/fit/scipy-fits.test.ts.

Run with Debian's python3 (scipy 1.10.1, numpy 1.24.2):

    /usr/bin/python3 test/reference/make_scipy_fits.py

It writes test/fixtures/scipy-fits.json: seeded synthetic line spectra (data, truth),
scipy's fitted parameters and standard errors for each, the exact call, and reference
values of scipy.special.voigt_profile and of the Voigt FWHM (found by brentq on
voigt_profile), and a DER_SNR value computed with numpy from its published definition. The model and its parametrisation are those of lineshift's
src/fit/line-model.ts:

    continuum c0 + c1 (x - xref) + c2 (x - xref)^2,  xref = (x[0] + x[-1]) / 2
    + sum over components of amplitude * S(x - center)

with peak-normalised shapes S: Gaussian exp(-4 ln2 u^2 / F^2); Lorentzian
1 / (1 + (2u/F)^2); Voigt voigt_profile(u, sigma, gamma) / voigt_profile(0, sigma, gamma)
with sigma = F_G / (2 sqrt(2 ln 2)), gamma = F_L / 2. Widths are FWHM.
"""
import datetime
import json
import os
import sys

import numpy as np
import scipy
from scipy.optimize import brentq, curve_fit
from scipy.special import voigt_profile, wofz

FWHM_PER_SIGMA = 2.0 * np.sqrt(2.0 * np.log(2.0))
FOUR_LN2 = 4.0 * np.log(2.0)
TWO_OVER_SQRT_PI = 2.0 / np.sqrt(np.pi)
TOL = 1e-13  # ftol = xtol = gtol for MINPACK's lmder (method='lm')


def widths_of(profile):
    return ["fwhmGaussian", "fwhmLorentzian"] if profile == "voigt" else ["fwhm"]


def shape_and_grad(profile, u, w):
    """Peak-normalised shape and its derivatives with respect to center and widths."""
    if profile == "gaussian":
        f = w[0]
        s = np.exp(-FOUR_LN2 * u * u / f ** 2)
        return s, [s * 2 * FOUR_LN2 * u / f ** 2, s * 2 * FOUR_LN2 * u * u / f ** 3]
    if profile == "lorentzian":
        f = w[0]
        q = 2 * u / f
        s = 1 / (1 + q * q)
        return s, [4 * q * s * s / f, 2 * q * q * s * s / f]
    fg, fl = w
    sigma = fg / FWHM_PER_SIGMA
    gamma = fl / 2
    s2 = sigma * np.sqrt(2.0)
    z = (u + 1j * gamma) / s2
    y0 = gamma / s2
    wz = wofz(z)
    h = wofz(1j * y0).real
    s = wz.real / h
    dw = -2 * z * wz + 2j / np.sqrt(np.pi)  # w'(z) = -2 z w(z) + 2i/sqrt(pi)
    dh = 2 * y0 * h - TWO_OVER_SQRT_PI
    d_c = -dw.real / s2
    d_gamma = -dw.imag / s2
    d_sigma = -(dw * z).real / sigma
    dh_gamma = dh / s2
    dh_sigma = -dh * y0 / sigma
    return s, [
        d_c / h,
        (d_sigma - s * dh_sigma) / h / FWHM_PER_SIGMA,
        (d_gamma - s * dh_gamma) / h / 2,
    ]


def make_model(profile, ncomp, order, xref):
    nw = len(widths_of(profile))
    cs = nw + 2

    def model(x, *p):
        t = x - xref
        v = p[0] + (p[1] * t if order >= 1 else 0) + (p[2] * t * t if order >= 2 else 0)
        for k in range(ncomp):
            o = order + 1 + k * cs
            s, _ = shape_and_grad(profile, x - p[o], p[o + 1:o + 1 + nw])
            v = v + p[o + cs - 1] * s
        return v

    def jac(x, *p):
        t = x - xref
        cols = [np.ones_like(x)]
        if order >= 1:
            cols.append(t)
        if order >= 2:
            cols.append(t * t)
        for k in range(ncomp):
            o = order + 1 + k * cs
            amp = p[o + cs - 1]
            s, g = shape_and_grad(profile, x - p[o], p[o + 1:o + 1 + nw])
            cols.extend([amp * gi for gi in g])
            cols.append(s)
        return np.column_stack(cols)

    return model, jac


def names_of(profile, ncomp, order):
    names = ["continuumConstant", "continuumSlope", "continuumCurvature"][: order + 1]
    for k in range(1, ncomp + 1):
        names += [f"center{k}"] + [f"{w}{k}" for w in widths_of(profile)] + [f"amplitude{k}"]
    return names


CASES = [
    # name, profile, continuum order, components (center, widths, amplitude), continuum, x0, step, npix, noise, sigma mode
    ("gaussian-absorption-sigma-absolute", "gaussian", 1, [(6562.8, [3.2], -0.45)], [1.0, 0.002], 6540.0, 0.7, 64, 0.01, "absolute"),
    ("gaussian-absorption-no-sigma", "gaussian", 1, [(6562.8, [3.2], -0.45)], [1.0, -0.003], 6540.0, 0.7, 64, 0.02, "none"),
    ("gaussian-emission-sigma-relative", "gaussian", 1, [(5875.6, [2.4], 3.0)], [0.5, 0.01], 5860.0, 0.5, 64, 0.05, "relative"),
    ("gaussian-emission-order0-no-sigma", "gaussian", 0, [(7032.4, [1.8], 250.0)], [12.0], 7025.0, 0.25, 60, 2.0, "none"),
    ("lorentzian-absorption-sigma-absolute", "lorentzian", 1, [(4861.3, [4.0], -0.5)], [1.0, 0.001], 4840.0, 0.6, 72, 0.01, "absolute"),
    ("lorentzian-emission-no-sigma", "lorentzian", 2, [(6678.2, [2.0], 1.2)], [0.8, 0.004, -0.0002], 6665.0, 0.4, 66, 0.03, "none"),
    ("voigt-absorption-sigma-absolute", "voigt", 1, [(5889.95, [2.0, 1.5], -0.6)], [1.0, 0.0015], 5876.0, 0.4, 70, 0.008, "absolute"),
    ("voigt-emission-no-sigma", "voigt", 1, [(6562.8, [1.2, 2.5], 4.0)], [0.3, 0.002], 6548.0, 0.45, 66, 0.05, "none"),
    ("gaussian-blend-2-sigma-absolute", "gaussian", 2, [(5015.7, [2.2], -0.30), (5018.9, [2.6], -0.20)], [1.0, 0.002, -0.0004], 5002.0, 0.5, 64, 0.006, "absolute"),
    ("voigt-blend-2-sigma-relative", "voigt", 1, [(4340.5, [1.6, 1.0], -0.35), (4343.9, [1.4, 0.8], -0.25)], [0.9, 0.003], 4330.0, 0.4, 60, 0.01, "relative"),
]


def run_case(k, case):
    name, profile, order, comps, cont, x0, step, npix, noise, mode = case
    rng = np.random.default_rng(20240601 + k)
    x = x0 + step * np.arange(npix)
    xref = (x[0] + x[-1]) / 2
    ncomp = len(comps)
    truth = list(cont)
    for c, w, a in comps:
        truth += [c] + list(w) + [a]
    model, jac = make_model(profile, ncomp, order, xref)
    if mode == "none":
        sigma = None
        y = model(x, *truth) + noise * rng.standard_normal(npix)
    else:
        sigma = noise * (1.0 + 0.6 * rng.random(npix))
        y = model(x, *truth) + sigma * rng.standard_normal(npix)
    # Start from the truth moved by a few per cent (centres by 0.3 pixel).
    p0 = []
    for j, nm in enumerate(names_of(profile, ncomp, order)):
        p0.append(truth[j] + 0.3 * step if nm.startswith("center") else truth[j] * 1.05)
    # Guard: the analytic Jacobian must match central differences (relative 1e-6).
    pt = np.array(truth, dtype=float)
    jnum = np.empty((npix, len(pt)))
    for j in range(len(pt)):
        h = 1e-7 * max(abs(pt[j]), 1e-2)
        up, dn = pt.copy(), pt.copy()
        up[j] += h
        dn[j] -= h
        jnum[:, j] = (model(x, *up) - model(x, *dn)) / (2 * h)
    jan = jac(x, *pt)
    scale = np.max(np.abs(jan), axis=0)
    if np.max(np.abs(jan - jnum) / scale) > 1e-6:
        raise SystemExit(f"{name}: analytic Jacobian disagrees with finite differences")
    absolute = mode == "absolute"
    popt, pcov, info, mesg, ier = curve_fit(
        model, x, y, p0=p0, sigma=sigma, absolute_sigma=absolute, method="lm", jac=jac,
        ftol=TOL, xtol=TOL, gtol=TOL, full_output=True)
    call = (f"curve_fit(model, x, y, p0=p0, sigma={'sigma' if sigma is not None else 'None'}, "
            f"absolute_sigma={absolute}, method='lm', jac=jac, ftol={TOL}, xtol={TOL}, gtol={TOL}, full_output=True)")
    return {
        "name": name,
        "profile": profile,
        "continuumOrder": order,
        "components": ncomp,
        "continuumReference": xref,
        "parameterNames": names_of(profile, ncomp, order),
        "truth": truth,
        "x": x.tolist(),
        "y": y.tolist(),
        "sigma": None if sigma is None else sigma.tolist(),
        "absoluteSigma": absolute,
        "p0": p0,
        "call": call,
        "minpackInfo": int(ier),
        "minpackMessage": mesg,
        "parameters": popt.tolist(),
        "standardErrors": np.sqrt(np.diag(pcov)).tolist(),
        "chiSquare": float(np.sum(((model(x, *popt) - y) / (1.0 if sigma is None else sigma)) ** 2)),
    }


def voigt_values():
    out = []
    for fl_over_fg in [0.0, 0.01, 0.1, 1.0, 10.0, 100.0]:
        fg = 2.0
        fl = fl_over_fg * fg
        sigma = fg / FWHM_PER_SIGMA
        gamma = fl / 2
        for u in [0.0, 0.3, 1.0, 2.5, 6.0, 20.0, 80.0]:
            out.append({"offset": u, "fwhmGaussian": fg, "fwhmLorentzian": fl, "value": float(voigt_profile(u, sigma, gamma))})
    return out


def voigt_fwhm_values():
    out = []
    for fl in [0.0, 0.05, 0.5, 1.0, 2.0, 5.0, 20.0]:
        fg = 1.0
        sigma = fg / FWHM_PER_SIGMA
        gamma = fl / 2
        peak = voigt_profile(0.0, sigma, gamma)
        half = brentq(lambda u: voigt_profile(u, sigma, gamma) - peak / 2, 0.0, 10 * (fg + fl), xtol=1e-15, rtol=1e-15)
        out.append({"fwhmGaussian": fg, "fwhmLorentzian": fl, "fwhm": 2 * half})
    return out


def der_snr_values():
    """DER_SNR (Stoehr et al. 2008, ASP Conf. Ser. 394, 505) computed with numpy as the
    paper defines it: drop zero fluxes, signal = median(f), noise = 1.482602/sqrt(6) *
    median(|2 f_i - f_(i-2) - f_(i+2)|)."""
    rng = np.random.default_rng(20240701)
    x = np.arange(400)
    flux = 100.0 + 0.05 * x - 40.0 * np.exp(-0.5 * ((x - 150) / 3.0) ** 2) + 60.0 * np.exp(-0.5 * ((x - 300) / 1.5) ** 2)
    flux = flux + 2.0 * rng.standard_normal(400)
    flux[[10, 11, 200]] = 0.0  # zeros are dropped
    f = flux[flux != 0.0]
    n = len(f)
    signal = float(np.median(f))
    noise = float(1.482602 / np.sqrt(6.0) * np.median(np.abs(2.0 * f[2:n - 2] - f[0:n - 4] - f[4:n])))
    return {"flux": flux.tolist(), "signal": signal, "noise": noise, "snr": signal / noise,
            "call": "numpy.median as in Stoehr et al. (2008); zero fluxes dropped"}


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    target = os.path.join(here, "..", "fixtures", "scipy-fits.json")
    doc = {
        "generator": "test/reference/make_scipy_fits.py",
        "python": sys.version.split()[0],
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "date": datetime.date.today().isoformat(),
        "model": "continuum c0 + c1 (x - xref) + c2 (x - xref)^2 plus amplitude * S(x - center) per component; "
                 "S peak-normalised; widths FWHM; Voigt S = voigt_profile(u, F_G/(2 sqrt(2 ln 2)), F_L/2) / voigt_profile(0, ...)",
        "voigtProfileCall": "scipy.special.voigt_profile(offset, fwhmGaussian / (2*sqrt(2*ln 2)), fwhmLorentzian / 2)",
        "voigtFwhmCall": "2 * brentq(lambda u: voigt_profile(u, s, g) - voigt_profile(0, s, g) / 2, 0, 10 * (F_G + F_L), xtol=1e-15, rtol=1e-15)",
        "cases": [run_case(k, c) for k, c in enumerate(CASES)],
        "voigtProfile": voigt_values(),
        "voigtFwhm": voigt_fwhm_values(),
        "derSnr": der_snr_values(),
    }
    tmp = target + ".tmp"
    with open(tmp, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")
    os.replace(tmp, target)
    for c in doc["cases"]:
        print(c["name"], "ier", c["minpackInfo"], c["minpackMessage"][:60])


if __name__ == "__main__":
    main()
