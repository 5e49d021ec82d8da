#!/usr/bin/python3
"""Reference values for the synthetic spectra and the velocity combination, from Debian's
astropy and scipy (offline).

Run with Debian's python3 (astropy 5.2.1, scipy 1.10.1):

    /usr/bin/python3 test/reference/make_velocity_refs.py

It writes test/fixtures/velocity-references.json with
- the Planck law per unit wavelength, B_lambda(T), from
  astropy.modeling.models.BlackBody(temperature=T * u.K,
  scale=1 * u.erg / (u.cm**2 * u.s * u.AA * u.sr))(wavelength * u.AA), at vacuum
  wavelengths, for test/lines/synthetic.test.ts (only ratios are compared);
- Wien's displacement constant astropy.constants.b_wien (CODATA 2018) in m K;
- the 99th percentile of chi-square divided by its degrees of freedom,
  scipy.stats.chi2.ppf(0.99, nu) / nu, for test/velocity/combine.test.ts.
Nothing is random; rerunning changes only the date.
"""
import datetime
import json
import os

import astropy
import astropy.constants as const
import astropy.units as u
import scipy
from astropy.modeling.models import BlackBody
from scipy.stats import chi2

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "fixtures", "velocity-references.json")

TEMPERATURES_K = [5800.0, 9000.0, 15000.0]
WAVELENGTHS_VACUUM_ANGSTROM = [3500.0, 4000.0, 5000.0, 6564.6, 8000.0, 10000.0]
DEGREES_OF_FREEDOM = [1, 2, 3, 4, 5, 7, 10, 15, 20, 30, 50]


def main():
    planck = []
    for t in TEMPERATURES_K:
        bb = BlackBody(temperature=t * u.K, scale=1 * u.erg / (u.cm**2 * u.s * u.AA * u.sr))
        values = bb(WAVELENGTHS_VACUUM_ANGSTROM * u.AA).to_value(u.erg / (u.cm**2 * u.s * u.AA * u.sr))
        planck.append({"temperature_k": t, "b_lambda_erg_per_s_cm2_angstrom_sr": [float(v) for v in values]})
    out = {
        "generated": datetime.date.today().isoformat(),
        "astropy_version": astropy.__version__,
        "scipy_version": scipy.__version__,
        "planck": {
            "call": "BlackBody(temperature=T*u.K, scale=1*u.erg/(u.cm**2*u.s*u.AA*u.sr))(wavelength*u.AA)",
            "wavelengths_vacuum_angstrom": WAVELENGTHS_VACUUM_ANGSTROM,
            "curves": planck,
        },
        "wien_b_m_k": {"call": "astropy.constants.b_wien.to_value(u.m * u.K)", "value": float(const.b_wien.to_value(u.m * u.K))},
        "chi2_reduced_q99": {
            "call": "scipy.stats.chi2.ppf(0.99, nu) / nu",
            "degrees_of_freedom": DEGREES_OF_FREEDOM,
            "values": [float(chi2.ppf(0.99, nu) / nu) for nu in DEGREES_OF_FREEDOM],
        },
    }
    with open(OUT, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")
    print("wrote", os.path.relpath(OUT))


if __name__ == "__main__":
    main()
