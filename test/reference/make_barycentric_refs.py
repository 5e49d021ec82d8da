#!/usr/bin/python3
"""Reference values for lineshift's time scales, barycentric/heliocentric corrections and
light-travel times, computed with Debian's astropy (python3-astropy 5.2.1, pyerfa 2.0.0.1).

Run from the repository root with Debian's python (not another python on PATH):

    /usr/bin/python3 test/reference/make_barycentric_refs.py

It writes test/fixtures/barycentric-astropy.json. It works offline:
`astropy.utils.iers.conf.auto_download = False`, so astropy uses the IERS-B table bundled
with it (UT1-UTC and polar motion) and its bundled leap-second table. For times past the end
of the bundled IERS-B table astropy assumes UT1-UTC = 0 and mean polar motion
(`iers_degraded_accuracy = 'warn'`); the effect on a velocity correction is below 0.1 m/s
(UT1-UTC < 0.9 s, Earth rotation speed <= 0.47 km/s) and on a light-travel time below 2 us.

Each case records the exact calls. Seeded: re-running gives the same file (except the date).
"""
import datetime
import json
import os
import sys
import warnings

import numpy as np

import astropy
import erfa
import astropy.units as u
from astropy.constants import G, GM_earth, GM_jup, GM_sun, c
from astropy.coordinates import EarthLocation, SkyCoord
from astropy.time import Time
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.iers_degraded_accuracy = 'warn'
warnings.simplefilter('ignore')  # expired-table and dubious-year warnings are expected offline

SEED = 20240605
N_RANDOM = 60
OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', 'fixtures', 'barycentric-astropy.json')
TZDATA_LEAP_LIST = '/usr/share/zoneinfo/leap-seconds.list'

rng = np.random.default_rng(SEED)


def iso_from_unix(seconds):
    d = datetime.datetime(1970, 1, 1) + datetime.timedelta(seconds=float(seconds))
    return d.strftime('%Y-%m-%dT%H:%M:%S.') + f'{d.microsecond // 1000:03d}'


# Times: uniform 1990-2035 (UTC, millisecond resolution), plus hand-picked ones around leap
# seconds (including one inside the leap second 2016-12-31T23:59:60) and in the future.
t0 = datetime.datetime(1990, 1, 1).timestamp() - datetime.datetime(1970, 1, 1).timestamp()
t1 = datetime.datetime(2035, 12, 31).timestamp() - datetime.datetime(1970, 1, 1).timestamp()
times = [iso_from_unix(s) for s in rng.uniform(t0, t1, N_RANDOM)]
times += [
    '1998-12-31T23:59:59.900',  # just before the leap second at the end of 1998
    '1999-01-01T00:00:00.100',  # just after it
    '2016-12-31T23:59:59.500',
    '2016-12-31T23:59:60.500',  # inside the leap second itself
    '2017-01-01T00:00:00.500',
    '2012-06-30T23:59:60.250',
    '2026-03-15T02:30:00.000',
    '2031-07-04T21:10:05.000',
    '2035-06-30T12:00:00.000',
]
n = len(times)
# Sites: latitude uniform in sin(lat) with some high-latitude ones, longitude uniform, height -50..5000 m.
lat = np.degrees(np.arcsin(rng.uniform(-1, 1, n)))
lat[:4] = [89.5, -89.9, 78.2, -77.85]
lon = rng.uniform(-180, 180, n)
height = rng.uniform(-50, 5000, n)
# Targets: uniform on the sphere, some near the poles.
ra = rng.uniform(0, 360, n)
dec = np.degrees(np.arcsin(rng.uniform(-1, 1, n)))
dec[4:8] = [89.95, -89.9, 88.0, -87.5]

cases = []
for i in range(n):
    t = Time(times[i], format='isot', scale='utc')
    loc = EarthLocation.from_geodetic(lon[i] * u.deg, lat[i] * u.deg, height[i] * u.m)  # WGS84
    sc = SkyCoord(ra[i] * u.deg, dec[i] * u.deg, frame='icrs')
    bary = sc.radial_velocity_correction(kind='barycentric', obstime=t, location=loc)
    helio = sc.radial_velocity_correction(kind='heliocentric', obstime=t, location=loc)
    ltt_b = t.light_travel_time(sc, kind='barycentric', location=loc)
    ltt_h = t.light_travel_time(sc, kind='heliocentric', location=loc)
    tt_minus_utc = (t.tt.jd1 - t.utc.jd1) * 86400 + (t.tt.jd2 - t.utc.jd2) * 86400
    tdb_minus_tt = (t.tdb.jd1 - t.tt.jd1) * 86400 + (t.tdb.jd2 - t.tt.jd2) * 86400
    bjd = t.tdb + ltt_b
    hjd = t.utc + ltt_h
    cases.append({
        'time_utc': times[i],
        'ra_deg': float(ra[i]), 'dec_deg': float(dec[i]),
        'lat_deg': float(lat[i]), 'lon_deg': float(lon[i]), 'height_m': float(height[i]),
        'itrs_xyz_m': [float(loc.x.to_value(u.m)), float(loc.y.to_value(u.m)), float(loc.z.to_value(u.m))],
        'jd_utc': float(t.utc.jd1 + t.utc.jd2),
        'mjd_tdb': float((t.tdb.jd1 - 2400000.5) + t.tdb.jd2),
        'tt_minus_utc_s': float(tt_minus_utc),
        'tdb_minus_tt_s': float(tdb_minus_tt),
        'barycentric_correction_m_s': float(bary.to_value(u.m / u.s)),
        'heliocentric_correction_m_s': float(helio.to_value(u.m / u.s)),
        'light_travel_time_barycentric_s': float(ltt_b.to_value(u.s)),
        'light_travel_time_heliocentric_s': float(ltt_h.to_value(u.s)),
        'bjd_tdb_minus_2400000': float((bjd.jd1 - 2400000) + bjd.jd2),
        'hjd_utc_minus_2400000': float((hjd.jd1 - 2400000) + hjd.jd2),
    })

# Leap seconds: erfa's built-in table, astropy's bundled IERS file, and the IETF/IERS
# leap-seconds.list that Debian's tzdata package ships (with its expiry date).
erfa_table = [{'year': int(r['year']), 'month': int(r['month']), 'tai_utc_s': float(r['tai_utc'])} for r in erfa.leap_seconds.get()]
pre1972 = []
for (y, m, d, fd) in [(1961, 3, 1, 0.5), (1962, 6, 1, 0.0), (1964, 2, 1, 0.25), (1965, 8, 1, 0.5),
                      (1966, 6, 1, 0.5), (1968, 6, 1, 0.75), (1970, 1, 1, 0.0), (1971, 12, 31, 0.99)]:
    pre1972.append({'date': f'{y:04d}-{m:02d}-{d:02d}', 'day_fraction': fd, 'tai_utc_s': float(erfa.dat(y, m, d, fd))})
tzdata = None
if os.path.exists(TZDATA_LEAP_LIST):
    entries = []
    expires_ntp = None
    with open(TZDATA_LEAP_LIST) as f:
        for line in f:
            if line.startswith('#@'):
                expires_ntp = int(line.split()[1])
            elif line.strip() and not line.startswith('#'):
                ntp, dat = line.split()[:2]
                mjd = int(ntp) / 86400 + 15020  # NTP epoch 1900-01-01 = MJD 15020
                entries.append({'mjd': mjd, 'tai_utc_s': float(dat)})
    tzdata = {
        'source': 'leap-seconds.list from Debian package tzdata (IERS/IETF list)',
        'expires_mjd': expires_ntp / 86400 + 15020 if expires_ntp else None,
        'entries': entries,
    }

out = {
    'generator': 'test/reference/make_barycentric_refs.py',
    'library': f'astropy {astropy.__version__}, pyerfa {erfa.__version__}, numpy {np.__version__}, python {sys.version.split()[0]}',
    'date': datetime.date.today().isoformat(),
    'seed': SEED,
    'offline': 'astropy.utils.iers.conf.auto_download = False (bundled IERS-B and leap-second tables); '
               "iers_degraded_accuracy = 'warn' (UT1-UTC = 0 past the IERS-B table)",
    'calls': {
        'time': "t = Time(time_utc, format='isot', scale='utc')",
        'location': 'loc = EarthLocation.from_geodetic(lon_deg*u.deg, lat_deg*u.deg, height_m*u.m)  # WGS84',
        'itrs_xyz_m': '[loc.x, loc.y, loc.z] in metres',
        'target': "sc = SkyCoord(ra_deg*u.deg, dec_deg*u.deg, frame='icrs')",
        'barycentric_correction_m_s': "sc.radial_velocity_correction(kind='barycentric', obstime=t, location=loc).to_value(u.m/u.s)",
        'heliocentric_correction_m_s': "sc.radial_velocity_correction(kind='heliocentric', obstime=t, location=loc).to_value(u.m/u.s)",
        'light_travel_time_barycentric_s': "t.light_travel_time(sc, kind='barycentric', location=loc).to_value(u.s)",
        'light_travel_time_heliocentric_s': "t.light_travel_time(sc, kind='heliocentric', location=loc).to_value(u.s)",
        'mjd_tdb': '(t.tdb.jd1 - 2400000.5) + t.tdb.jd2  # geocentric TDB (no location on t)',
        'tt_minus_utc_s': '((t.tt.jd1 - t.utc.jd1) + (t.tt.jd2 - t.utc.jd2)) * 86400',
        'tdb_minus_tt_s': '((t.tdb.jd1 - t.tt.jd1) + (t.tdb.jd2 - t.tt.jd2)) * 86400',
        'bjd_tdb_minus_2400000': 'b = t.tdb + ltt_barycentric; (b.jd1 - 2400000) + b.jd2',
        'hjd_utc_minus_2400000': 'h = t.utc + ltt_heliocentric; (h.jd1 - 2400000) + h.jd2',
        'leap_seconds_erfa': 'erfa.leap_seconds.get()',
        'leap_seconds_pre1972': 'erfa.dat(year, month, day, day_fraction)',
    },
    'constants_used_by_astropy_gravitational_redshift': {
        'GM_sun_m3_s2': GM_sun.value, 'GM_jup_m3_s2': GM_jup.value, 'GM_earth_m3_s2': GM_earth.value,
        'G_times_moon_mass_m3_s2': (G * 7.34767309e22 * u.kg).to_value(u.m**3 / u.s**2),
        'c_m_s': c.value,
    },
    'leap_seconds_erfa': erfa_table,
    'leap_seconds_erfa_expires': str(erfa.leap_seconds.expires),
    'leap_seconds_pre1972': pre1972,
    'leap_seconds_tzdata': tzdata,
    'cases': cases,
}
with open(OUT, 'w') as f:
    json.dump(out, f, indent=1)
    f.write('\n')
print(f'wrote {len(cases)} cases to {os.path.relpath(OUT)}')
