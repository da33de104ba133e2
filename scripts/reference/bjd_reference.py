"""Reference barycentric times from astropy for tests/shared/time/.

Run from the repository root:
    /usr/bin/python3 scripts/reference/bjd_reference.py
Writes fixtures/time/bjd_astropy.json. For four sites (longitude east-positive, geodetic latitude,
height above the WGS84 ellipsoid) and five sky positions (ICRS right ascension and declination in
degrees; one with a large proper motion, mu_alpha* = mu_alpha cos(delta) and mu_delta in mas/yr at
the stated epoch), at 24 seeded random UTC times spread over 1995-2030 per case:
  - jdUtc: the input, full Julian date in UTC;
  - jdTt, jdTdb: Time(jd, scale='utc', location=site).tt.jd and .tdb.jd (the geocentre-to-site
    TDB term included by astropy);
  - bjdTdb: t.tdb + t.light_travel_time(coord, kind='barycentric') with astropy's builtin ephemeris
    (erfa epv00, stated by astropy as within 11.2 km of DE405, i.e. 4 microseconds of light time);
  - hjdUtc: t.utc + t.light_travel_time(coord, kind='heliocentric') (the heliocentric date in UTC,
    as older tables give it; used to check the HJD -> BJD_TDB path).
For the proper-motion star the coordinate is moved to each time by SkyCoord.apply_space_motion
(distance and radial velocity stated below; only the direction enters the light time).
Every JD is written as two numbers (integer day + fraction) as well, so no precision is lost in JSON.
No IERS download is attempted: the bundled tables are used; for dates past them astropy
extrapolates UT1 - UTC and the leap seconds (a warning, not an error; the site's position moves by
under 1 km, i.e. microseconds).
"""
import json
import os
import warnings

import astropy
import erfa
import numpy as np
from astropy import units as u
from astropy.coordinates import EarthLocation, SkyCoord
from astropy.time import Time
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None
try:
    iers.conf.iers_degraded_accuracy = 'warn'
except AttributeError:  # older astropy
    pass
warnings.simplefilter('ignore')

OUT = os.path.join('fixtures', 'time')
COMMAND = '/usr/bin/python3 scripts/reference/bjd_reference.py'

# Invented test sites (not the site table of shared/time): a southern mountain, a mid-Pacific
# summit, a European lowland and a high-latitude northern site.
SITES = [
    {'name': 'south-mountain', 'lonDeg': -70.73, 'latDeg': -29.26, 'heightM': 2400.0},
    {'name': 'pacific-summit', 'lonDeg': -155.47, 'latDeg': 19.82, 'heightM': 4200.0},
    {'name': 'lowland-east', 'lonDeg': 13.1, 'latDeg': 52.4, 'heightM': 40.0},
    {'name': 'north-coast', 'lonDeg': 18.9, 'latDeg': 69.6, 'heightM': 80.0},
]
# Sky positions: on the equator, near the north ecliptic pole, far south, near the ecliptic, and a
# nearby high-proper-motion star (values rounded from its published astrometry, from memory).
STARS = [
    {'name': 'equator', 'raDeg': 30.0, 'decDeg': 0.0},
    {'name': 'ecliptic-pole', 'raDeg': 270.0, 'decDeg': 66.56},
    {'name': 'far-south', 'raDeg': 95.0, 'decDeg': -72.5},
    {'name': 'ecliptic', 'raDeg': 180.0, 'decDeg': 0.5},
    {'name': 'fast-mover', 'raDeg': 269.4486, 'decDeg': 4.7392, 'pmRaMasYr': -801.55,
     'pmDecMasYr': 10362.5, 'epochJd': 2457389.0, 'distancePc': 1.83},
]
PER_CASE = 24
JD_START = 2449718.5  # 1995-01-01
JD_END = 2462502.5    # 2030-01-01


def split(jd):
    day = np.floor(jd)
    return [[int(d), float(f)] for d, f in zip(day, jd - day)]


def coord_at(star, t):
    if 'pmRaMasYr' not in star:
        return SkyCoord(star['raDeg'] * u.deg, star['decDeg'] * u.deg, frame='icrs')
    c = SkyCoord(star['raDeg'] * u.deg, star['decDeg'] * u.deg, frame='icrs',
                 pm_ra_cosdec=star['pmRaMasYr'] * u.mas / u.yr, pm_dec=star['pmDecMasYr'] * u.mas / u.yr,
                 distance=star['distancePc'] * u.pc, radial_velocity=0 * u.km / u.s,
                 obstime=Time(star['epochJd'], format='jd', scale='tdb'))
    return c.apply_space_motion(new_obstime=t.tdb)


def case(rng, site, star):
    loc = EarthLocation.from_geodetic(lon=site['lonDeg'] * u.deg, lat=site['latDeg'] * u.deg,
                                      height=site['heightM'] * u.m)
    jd = np.sort(rng.uniform(JD_START, JD_END, PER_CASE))
    day = np.floor(jd)
    t = Time(day, jd - day, format='jd', scale='utc', location=loc)
    coord = coord_at(star, t)
    bary = t.tdb + t.light_travel_time(coord, kind='barycentric')
    helio = t.utc + t.light_travel_time(coord, kind='heliocentric')
    return {
        'site': site, 'star': {k: v for k, v in star.items() if k != 'distancePc'},
        'jdUtc': split(jd),
        'jdTt': [[int(a), float(b)] for a, b in zip(t.tt.jd1, t.tt.jd2)],
        'jdTdb': [[int(a), float(b)] for a, b in zip(t.tdb.jd1, t.tdb.jd2)],
        'bjdTdb': [[int(a), float(b)] for a, b in zip(bary.jd1, bary.jd2)],
        'hjdUtc': [[int(a), float(b)] for a, b in zip(helio.jd1, helio.jd2)],
    }


def normalise(pairs):
    """jd1 + jd2 pairs as (integer day, fraction in [0, 1))."""
    out = []
    for a, b in pairs:
        whole = np.floor(a + b)
        out.append([int(whole), float((a - whole) + b)])
    return out


def main():
    rng = np.random.default_rng(20101935)
    cases = []
    for site in SITES:
        for star in STARS:
            c = case(rng, site, star)
            for key in ('jdTt', 'jdTdb', 'bjdTdb', 'hjdUtc'):
                c[key] = normalise(c[key])
            cases.append(c)
    doc = {
        'provenance': {
            'source': 'astropy Time.tt / Time.tdb and Time.light_travel_time (builtin ephemeris, erfa epv00)',
            'tool': f'astropy {astropy.__version__}, pyerfa {erfa.__version__}, numpy {np.__version__}',
            'command': COMMAND,
            'note': 'times as [integer JD, fraction]; UTC input; seed 20101935; 1995-2030',
        },
        'cases': cases,
    }
    os.makedirs(OUT, exist_ok=True)
    with open(os.path.join(OUT, 'bjd_astropy.json'), 'w') as f:
        f.write('{"provenance": ' + json.dumps(doc['provenance']) + ',\n "cases": [\n')
        f.write(',\n'.join('  ' + json.dumps(c) for c in cases))
        f.write('\n ]\n}\n')
    print(f'wrote {len(cases)} cases to {OUT}/bjd_astropy.json')


if __name__ == '__main__':
    main()
