#!/usr/bin/env python3
"""Build data/linelists/Ti_II.csv: Ritz air wavelengths of strong optical Ti II lines.

Run from anywhere with Debian's Python 3 (standard library only):

    /usr/bin/python3 data/linelists/build_ti_ii.py

It rewrites Ti_II.csv and build_ti_ii_log.txt beside this script and prints a summary.

Inputs (in sources/, see sources/README.md):
  * nistspectrum=Ti+II.webdump.dat  NIST ASD energy levels of Ti II, verbatim from the public
    mirror github.com/afloers/NIST_ASD_Data (source id NIST_ASD_LEV).
  * srd108_titanium_air_subset.csv  the titanium rows (>= 3500 A) of the NIST Handbook of Basic
    Atomic Spectroscopic Data (SRD 108) strong-line table, as scraped in
    github.com/AntoineBellemare/biotuner data/air_elements.csv (source id NIST_SRD108). The scrape
    lost the spectrum column (Ti I or Ti II).

Method (the same as the shared reference build, derive_ritz.py / build_linelists.py):
  sigma = E_upper - E_lower (cm-1); lambda_vac = 1e8 / sigma (A);
  lambda_air = lambda_vac / n, with n from Peck & Reeder (1972):
  n - 1 = 8.06051e-5 + 2.480990e-2/(132.274 - s^2) + 1.74557e-4/(39.32957 - s^2), s = 1/lambda_vac in um^-1.
  Transitions are E1: parity change, |dJ| <= 1, not J=0 -> 0.

Selection (which lines are listed):
  1. Only transitions between low-lying levels are considered: lower level below 26 000 cm-1 (the
     even 3d2 4s, 3d3 and 3d 4s2 terms, which hold the population in stellar atmospheres and
     lamps), upper level an odd 3d2 4p term below 48 000 cm-1.
  2. Among those, the lines named in TARGETS (approximate air positions of the well-known strong
     optical Ti II lines of stellar spectra, recalled from memory) are matched to a Ritz line
     within 0.06 A; the lowest-lying lower level wins when several match (logged).
  3. Handbook lines (NIST SRD 108) that match one of the low-lying Ti II transitions within
     0.02 A are classified as Ti II: their intensity is attached to the Ritz row (added as a new
     row when the line was not in TARGETS). The tabulated wavelength is always the Ritz value;
     the Handbook value is quoted in the note and compared in the log (second source).
  Memory only chose *which* lines to list; every value comes from the NIST levels.
"""
import csv
import os
from fractions import Fraction

HERE = os.path.dirname(os.path.abspath(__file__))
LEVELS = os.path.join(HERE, 'sources', 'nistspectrum=Ti+II.webdump.dat')
HANDBOOK = os.path.join(HERE, 'sources', 'srd108_titanium_air_subset.csv')
OUT = os.path.join(HERE, 'Ti_II.csv')
LOGFILE = os.path.join(HERE, 'build_ti_ii_log.txt')
LO, HI = 3500.0, 9500.0
LOWER_MAX_CM = 26000.0
UPPER_MAX_CM = 48000.0
TARGET_TOL_A = 0.06
HANDBOOK_TOL_A = 0.02
HEADER = ['wavelength_air_angstrom', 'relative_intensity', 'source_id', 'note']

# Approximate air wavelengths (A) of strong optical Ti II lines, from memory (selection only).
TARGETS = [
    3685.19, 3759.29, 3761.32, 3900.54, 3913.46, 4012.38, 4028.34, 4053.83, 4161.53, 4163.64,
    4171.90, 4287.87, 4290.22, 4294.10, 4300.05, 4301.91, 4307.86, 4312.86, 4314.97, 4320.96,
    4330.72, 4337.91, 4344.29, 4367.65, 4386.84, 4391.03, 4394.06, 4395.03, 4395.84, 4399.77,
    4407.68, 4411.07, 4417.72, 4418.33, 4421.94, 4441.73, 4443.80, 4444.55, 4450.48, 4464.45,
    4468.49, 4470.85, 4488.33, 4501.27, 4529.47, 4533.97, 4549.62, 4563.76, 4571.97, 4589.96,
    4657.20, 4708.66, 4779.98, 4798.53, 4805.09, 4911.19, 5005.17, 5010.21, 5013.69, 5069.09,
    5129.16, 5154.07, 5185.90, 5188.69, 5226.54, 5268.61, 5336.79, 5381.02, 5396.25, 5418.77,
    6491.57, 6559.59, 6606.95, 6680.13,
]


def n_air(lvac):
    s2 = (1e4 / lvac) ** 2
    return 1 + 8.06051e-5 + 2.480990e-2 / (132.274 - s2) + 1.74557e-4 / (39.32957 - s2)


def vac2air(lvac):
    return lvac / n_air(lvac)


def read_levels(path):
    levels = []
    with open(path) as f:
        lines = f.read().splitlines()
    for line in lines[1:]:
        cols = [c.strip().strip('"') for c in line.split('\t')]
        if len(cols) < 5:
            continue
        conf, term, j, lev = cols[0], cols[1], cols[2], cols[4]
        lev = lev.replace('[', '').replace(']', '').replace('?', '').replace('+x', '').strip()
        try:
            e = float(lev)
            jj = Fraction(j)
        except ValueError:
            continue
        dec = len(lev.split('.')[1]) if '.' in lev else 0
        levels.append(dict(conf=conf, term=term, J=jj, E=e, odd='*' in term, dec=dec))
    return levels


def transitions(levels):
    out = []
    for u in levels:
        for lo in levels:
            if u['E'] <= lo['E'] or u['odd'] == lo['odd']:
                continue
            dj = abs(u['J'] - lo['J'])
            if dj > 1 or (u['J'] == 0 and lo['J'] == 0):
                continue
            lv = 1e8 / (u['E'] - lo['E'])
            la = vac2air(lv)
            if LO - 1 <= la <= HI + 1:
                out.append((la, lv, lo, u))
    out.sort(key=lambda t: t[0])
    return out


def low_lying(t):
    return t[2]['E'] < LOWER_MAX_CM and t[3]['E'] < UPPER_MAX_CM


def desig(level):
    term = level['term'].replace('*', 'o')
    return f"{level['conf']} {term} J={level['J']}"


def level_rounding_a(t):
    la, lv, lo, u = t
    return lv * lv * (10.0 ** (-lo['dec']) + 10.0 ** (-u['dec'])) * 1e-8


def main():
    log = []
    levels = read_levels(LEVELS)
    trs = [t for t in transitions(levels) if low_lying(t)]
    log.append(f'levels read: {len(levels)}; low-lying E1 transitions {LO:.0f}-{HI:.0f} A: {len(trs)}')

    rows = {}  # key: Ritz air value rounded to 1e-4 -> row dict

    def add(t, origin):
        key = round(t[0], 4)
        if key not in rows:
            rows[key] = dict(t=t, origin=origin, hb=None)
        return rows[key]

    for tgt in TARGETS:
        cands = [t for t in trs if abs(t[0] - tgt) < TARGET_TOL_A]
        if not cands:
            log.append(f'target {tgt}: no low-lying Ti II Ritz line within {TARGET_TOL_A} A; left out')
            continue
        cands.sort(key=lambda t: (round(t[2]['E'], 0), abs(t[0] - tgt)))
        if len(cands) > 1:
            log.append(f'target {tgt}: ambiguous, took {cands[0][0]:.4f} ({desig(cands[0][2])} - {desig(cands[0][3])}); '
                       + '; '.join(f'{t[0]:.4f} {desig(t[2])} - {desig(t[3])}' for t in cands[1:3]))
        if LO <= cands[0][0] <= HI:
            add(cands[0], 'selected strong line')

    # Handbook merge (second source)
    diffs = []
    with open(HANDBOOK) as f:
        hb = list(csv.DictReader(f))
    for r in hb:
        w = float(r['wavelength'])
        cands = [t for t in trs if abs(t[0] - w) <= HANDBOOK_TOL_A]
        if not cands:
            continue
        t = min(cands, key=lambda t: abs(t[0] - w))
        row = add(t, 'added from Handbook list')
        row['hb'] = (r['wavelength'], r['intensity'], r['persistence'] == '1')
        diffs.append((w, t[0], w - t[0]))

    # chance coincidences: the same Handbook list shifted by offsets far larger than the tolerance
    offsets = [s * (0.5 + 0.25 * k) for k in range(19) for s in (-1, 1)]  # +-0.5 ... +-5.0 A
    counts = []
    for off in offsets:
        n = 0
        for r in hb:
            w = float(r['wavelength']) + off
            if any(abs(t[0] - w) <= HANDBOOK_TOL_A for t in trs):
                n += 1
        counts.append(n)
    chance = sum(counts) / len(counts)

    out = []
    for key in sorted(rows):
        row = rows[key]
        t = row['t']
        la, lv, lo, u = t
        note = f"Ti II; {row['origin']}; {desig(lo)} - {desig(u)}; Ritz; vac {lv:.4f}"
        ua = level_rounding_a(t)
        if ua >= 0.002:
            note += f'; level rounding ~{ua:.3f} A'
        inten = ''
        src = 'NIST_ASD_LEV'
        if row['hb']:
            wl, it, pers = row['hb']
            inten = str(int(float(it))) if float(it) == int(float(it)) else it
            src = 'NIST_ASD_LEV+NIST_SRD108'
            note += f"; NIST Handbook line {wl} (int {inten}{', persistent' if pers else ''}); Handbook - Ritz {float(wl) - la:+.4f} A"
        out.append([f'{la:.4f}', inten, src, note])

    with open(OUT, 'w', newline='') as f:
        w = csv.writer(f, lineterminator='\n')
        w.writerow(HEADER)
        w.writerows(out)

    log.append(f'Handbook titanium lines read (>= {LO:.0f} A): {len(hb)}; classified as Ti II (within {HANDBOOK_TOL_A} A '
               f'of a low-lying Ti II Ritz line): {len(diffs)}')
    for w, r, d in diffs:
        log.append(f'  Handbook {w:.3f} vs Ritz {r:.4f}: d = {d:+.4f} A')
    if diffs:
        ds = [d for _, _, d in diffs]
        mean = sum(ds) / len(ds)
        rms = (sum(d * d for d in ds) / len(ds)) ** 0.5
        log.append(f'  Handbook - Ritz: mean {mean:+.4f} A, rms {rms:.4f} A, max |d| {max(abs(d) for d in ds):.4f} A')
    log.append(f'chance coincidences: the Handbook list shifted by {len(offsets)} offsets of 0.5-5.0 A matches '
               f'{chance:.2f} lines on average (max {max(counts)}) at the same tolerance')
    log.append(f'rows written: {len(out)} ({sum(1 for r in out if r[1])} with Handbook intensity)')
    with open(LOGFILE, 'w') as f:
        f.write('\n'.join(log) + '\n')
    print('\n'.join(log))


if __name__ == '__main__':
    main()
