#!/usr/bin/python3
"""Reads a report's CSV, ECSV and JSON exports the way a notebook would, and prints what it got as JSON.

Usage: /usr/bin/python3 scripts/reference/read_exports.py DATA.csv DATA.ecsv REPORT.json
Needs Debian's python3-pandas and python3-astropy (not the pyenv python). Used by
tests/shared/report/exports-python.spec.ts; exits non-zero when any reader refuses a file.
"""
import json
import sys

import astropy
import astropy.units as u
import pandas as pd
from astropy.io import ascii
from astropy.table import Table

csv_path, ecsv_path, json_path = sys.argv[1:4]
out = {'astropy': astropy.__version__, 'pandas': pd.__version__}

df = pd.read_csv(csv_path)
out['pandas_csv'] = {'columns': list(df.columns), 'rows': len(df), 'dtypes': {c: str(t) for c, t in df.dtypes.items()}}

t = ascii.read(csv_path, format='csv')
out['astropy_csv'] = {'columns': t.colnames, 'rows': len(t)}

e = Table.read(ecsv_path, format='ascii.ecsv')
out['astropy_ecsv'] = {
    'columns': e.colnames, 'rows': len(e),
    'units': {c: (str(e[c].unit) if e[c].unit is not None else None) for c in e.colnames},
    'dtypes': {c: str(e[c].dtype) for c in e.colnames},
    'meta': {k: str(v) for k, v in e.meta.items()},
    'first_rv_in_km_s': float((e['rv_m_s'][0] * e['rv_m_s'].unit).to(u.km / u.s).value),
}

with open(json_path) as f:
    j = json.load(f)
units = dict(j['units'])
for p in (j.get('sampling') or {}).get('parameters', []):
    units['sampling:' + p['name']] = p['unit']
parsed = {}
for k, s in units.items():
    parsed[k] = str(u.Unit(s)) if s else ''
out['json_units'] = parsed
print(json.dumps(out))
