#!/usr/bin/env python3
"""Reference values for the statistics of element identification (test/elements/statistics.test.ts).

Writes test/fixtures/elements-scipy.json with, for each x, scipy.special.erfc(x) and
scipy.stats.norm.sf(x) (the normal upper tail), and for each probability P,
scipy.stats.norm.isf(P) (the one-sided Gaussian-equivalent sigma). Deterministic: no random numbers.

Run with Debian's Python: /usr/bin/python3 test/reference/make_elements_refs.py
"""
import datetime
import json
import os

import scipy
import scipy.special
import scipy.stats

xs = [-3.0, -1.0, -0.25, 0.0, 0.1, 0.5, 1.0, 1.5, 1.9, 1.999, 2.0, 2.001, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0, 10.0, 15.0, 20.0, 26.0]
ps = [0.5, 0.3, 0.1, 0.05, 0.01, 1.3498980316301e-3, 1e-3, 1e-4, 2.866515718791939e-7, 1e-9, 1e-12, 1e-15, 1e-20, 1e-50, 0.9, 0.999]

out = {
    'generator': 'test/reference/make_elements_refs.py',
    'library': f'scipy {scipy.__version__}',
    'calls': ['scipy.special.erfc(x)', 'scipy.stats.norm.sf(x)', 'scipy.stats.norm.isf(p)'],
    'date': datetime.date.today().isoformat(),
    'erfc': [[x, float(scipy.special.erfc(x))] for x in xs],
    'normalUpperTail': [[x, float(scipy.stats.norm.sf(x))] for x in xs],
    'sigmaFromTail': [[p, float(scipy.stats.norm.isf(p))] for p in ps],
}
here = os.path.dirname(os.path.abspath(__file__))
path = os.path.join(here, '..', 'fixtures', 'elements-scipy.json')
tmp = path + '.tmp'
with open(tmp, 'w') as f:
    json.dump(out, f, indent=1)
    f.write('\n')
os.replace(tmp, path)
print(f'wrote {os.path.normpath(path)}')
