"""Timing reference for scripts/bench-time.ts: astropy's BJD_TDB of the same UTC times.

    /usr/bin/python3 scripts/reference/bjd_timing.py INPUT.json
INPUT: {jd: [...UTC JD], raDeg, decDeg, lonDeg, latDeg, heightM}. Prints one JSON line:
{ms (one wall-clock run), bjd: [first 50 results as [day, fraction]], versions}. No IERS download.
"""
import json
import sys
import time
import warnings

import astropy
import numpy as np
from astropy import units as u
from astropy.coordinates import EarthLocation, SkyCoord
from astropy.time import Time
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None
try:
    iers.conf.iers_degraded_accuracy = 'warn'
except AttributeError:
    pass
warnings.simplefilter('ignore')


def main():
    spec = json.load(open(sys.argv[1]))
    jd = np.asarray(spec['jd'])
    loc = EarthLocation.from_geodetic(lon=spec['lonDeg'] * u.deg, lat=spec['latDeg'] * u.deg, height=spec['heightM'] * u.m)
    coord = SkyCoord(spec['raDeg'] * u.deg, spec['decDeg'] * u.deg, frame='icrs')
    best, out = float('inf'), None
    for _ in range(1):  # one run: astropy takes tens of seconds for 100 000 times here
        t0 = time.perf_counter()
        day = np.floor(jd)
        t = Time(day, jd - day, format='jd', scale='utc', location=loc)
        out = t.tdb + t.light_travel_time(coord, kind='barycentric')
        best = min(best, (time.perf_counter() - t0) * 1000)
    whole = np.floor(out.jd1 + out.jd2)
    frac = (out.jd1 - whole) + out.jd2
    print(json.dumps({'ms': best, 'bjd': [[int(a), float(b)] for a, b in zip(whole[:50], frac[:50])],
                      'versions': {'astropy': astropy.__version__, 'numpy': np.__version__}}))


if __name__ == '__main__':
    main()
