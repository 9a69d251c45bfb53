#!/usr/bin/python3
"""Generate reference.csv: Sun positions from astropy for package spa's tests.

Run from solarcheck/spa:  /usr/bin/python3 testdata/gen_reference.py > testdata/reference.csv

Independent witness: astropy (IAU 2006/2000A precession-nutation, ERFA epv00
ephemeris, full topocentric reduction), not this project's code. The Go test
reads only the CSV, so CI needs no Python.

Time scales: each case is one UT1 instant and one Delta T. The SPA takes
TT = UT1 + Delta T; astropy is given exactly the same UT1 and TT (its UTC is
chosen so that TT matches, and delta_ut1_utc is set so that UT1 matches;
both are checked below), so no IERS or leap-second table decides the
comparison. Delta T comes from the Espenak & Meeus (2006) polynomials, copied
below; it is only an input here (both sides get the same number).

Columns (angles in degrees):
  ut1             the instant, RFC 3339, read as UT1
  delta_t_s       TT - UT1 given to both sides, seconds
  lat, lon, elevation_m, pressure_hpa, temperature_c   the observer
  alt_airless     astropy topocentric altitude, AltAz frame with pressure=0
  azimuth         astropy azimuth, clockwise from north
  alt_refracted   alt_airless plus SPA's refraction formula (Eq. 42, applied
                  here in Python at the case's pressure and temperature,
                  with SPA's rule of no refraction below -0.8334 deg);
                  ERFA's own refraction model differs from SPA's, so it is
                  not used
  declination     astropy apparent geocentric declination (TETE frame)
  eot_min         equation of time, minutes: Greenwich apparent solar time
                  (GAST - apparent RA of the Sun in TETE + 12 h) minus UT1
"""
import datetime
import math
import random
import sys
import warnings

import astropy
import erfa
import numpy as np
from astropy import units as u
from astropy.coordinates import AltAz, EarthLocation, TETE, get_sun
from astropy.time import Time
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None
warnings.simplefilter("ignore")  # "dubious year" (pre-1960 UTC) and IERS-range warnings


def delta_t(y):
    """Espenak & Meeus (2006) Delta T, seconds, for decimal year y (1900..2150 subset)."""
    if y < 1920:
        t = y - 1900
        return -2.79 + 1.494119*t - 0.0598939*t**2 + 0.0061966*t**3 - 0.000197*t**4
    if y < 1941:
        t = y - 1920
        return 21.20 + 0.84493*t - 0.076100*t**2 + 0.0020936*t**3
    if y < 1961:
        t = y - 1950
        return 29.07 + 0.407*t - t**2/233 + t**3/2547
    if y < 1986:
        t = y - 1975
        return 45.45 + 1.067*t - t**2/260 - t**3/718
    if y < 2005:
        t = y - 2000
        return (63.86 + 0.3345*t - 0.060374*t**2 + 0.0017275*t**3
                + 0.000651814*t**4 + 0.00002373599*t**5)
    if y < 2050:
        t = y - 2000
        return 62.92 + 0.32217*t + 0.005589*t**2
    uu = (y - 1820) / 100
    return -20 + 32*uu*uu - 0.5628*(2150 - y)


def spa_refraction(e0, p, t):
    """SPA Eq. 42, with SPA's rule (section 3.14) for when to apply it."""
    if e0 < -(0.26667 + 0.5667):
        return 0.0
    return p/1010 * 283/(273 + t) * 1.02/(60*math.tan(math.radians(e0 + 10.3/(e0 + 5.11))))


def cases():
    rnd = random.Random(20031017)
    out = []
    epoch = datetime.datetime(1970, 1, 1)
    t0 = (datetime.datetime(1900, 1, 1) - epoch).total_seconds()
    t1 = (datetime.datetime(2100, 12, 31, 23, 59, 59) - epoch).total_seconds()
    for _ in range(380):
        sec = int(rnd.uniform(t0, t1))
        lat = round(math.degrees(math.asin(rnd.uniform(-1, 1))), 4)  # uniform over the sphere
        lon = round(rnd.uniform(-180, 180), 4)
        elev = round(rnd.choice([0, 0, rnd.uniform(0, 4500)]), 1)
        p = round(rnd.uniform(600, 1050), 1)
        tc = round(rnd.uniform(-30, 40), 1)
        out.append((sec, lat, lon, elev, p, tc))
    # Fixed cases: poles, polar day and night, equator, tropics, date line.
    fixed = [
        ("1900-01-01T00:00:00", 0, 0), ("2100-12-31T23:59:59", 0, 0),
        ("2000-06-21T12:00:00", 89.9, 0), ("2000-12-21T12:00:00", -89.9, 120),
        ("2023-06-21T00:00:00", 78.22, 15.65), ("2023-12-21T12:00:00", 78.22, 15.65),
        ("1950-03-20T12:00:00", 0, 0), ("1999-08-11T11:00:00", 23.44, 30),
        ("2010-05-23T18:00:00", -23.44, -100), ("2066-09-23T06:00:00", 0.0, 179.99),
        ("1975-01-01T00:00:00", -33.86, 151.21), ("2042-11-03T03:00:00", 64.13, -21.9),
    ]
    for iso, lat, lon in fixed:
        sec = int((datetime.datetime.fromisoformat(iso) - datetime.datetime(1970, 1, 1)).total_seconds())
        out.append((sec, lat, lon, 0.0, 1013.25, 10.0))
    return out


def main():
    cs = cases()
    epoch = datetime.datetime(1970, 1, 1)
    ut1_iso = [(epoch + datetime.timedelta(seconds=c[0])).strftime("%Y-%m-%dT%H:%M:%SZ") for c in cs]
    # Julian Days of the intended UT1 (read the clock as UT1).
    jd_ut1 = np.array([c[0] for c in cs], dtype=float) / 86400 + 2440587.5
    years = np.array([float(s[:4]) + (float(s[5:7]) - 0.5)/12 for s in ut1_iso])
    dts = np.array([round(delta_t(y), 3) for y in years])
    tt = Time(jd_ut1, dts/86400, format="jd", scale="tt")
    utc = tt.utc
    # delta_ut1_utc = UT1 - UTC, with UTC as astropy derives it from our TT.
    # Around 1960-1972 (rubber seconds) and leap-second days astropy's UTC
    # day is not 86400 s long, so refine by fixed-point iteration.
    d = ((jd_ut1 - utc.jd1) - utc.jd2) * 86400
    for _ in range(6):
        tt.delta_ut1_utc = d
        d = d - ((tt.ut1.jd1 - jd_ut1) + tt.ut1.jd2) * 86400
    tt.delta_ut1_utc = d
    # Check both time scales hit the intended values (to 10 microseconds).
    err_ut1 = np.max(np.abs(((tt.ut1.jd1 - jd_ut1) + tt.ut1.jd2) * 86400))
    err_tt = np.max(np.abs(((tt.tt.jd1 - jd_ut1) + tt.tt.jd2) * 86400 - dts))
    if err_ut1 > 1e-5 or err_tt > 1e-5:
        sys.exit(f"time scales not matched: ut1 {err_ut1} s, tt {err_tt} s")

    lat = np.array([c[1] for c in cs]); lon = np.array([c[2] for c in cs])
    elev = np.array([c[3] for c in cs])
    loc = EarthLocation.from_geodetic(lon*u.deg, lat*u.deg, elev*u.m)
    sun = get_sun(tt)
    aa = sun.transform_to(AltAz(obstime=tt, location=loc, pressure=0*u.hPa))
    tete = sun.transform_to(TETE(obstime=tt))
    gast = tt.sidereal_time("apparent", "greenwich").deg
    ra = tete.ra.deg
    ut_h = ((jd_ut1 - 0.5) % 1.0) * 24
    eot = np.array([((((g - a + 180) / 15 - h) + 12) % 24 - 12) * 60 for g, a, h in zip(gast, ra, ut_h)])

    print("# Reference Sun positions for package spa, generated by testdata/gen_reference.py with")
    print(f"#   astropy {astropy.__version__} (pyerfa {erfa.__version__}, numpy {np.__version__}), "
          f"Python {sys.version.split()[0]}; IERS auto-download off, bundled IERS-B table.")
    print("# Same UT1 and same TT = UT1 + delta_t_s on both sides; alt_refracted = alt_airless plus SPA Eq. 42")
    print("#   (applied by the script, ERFA refraction not used). eot_min = GAST - RA(TETE) + 12 h - UT1.")
    print(f"# Rows: {len(cs)}. Angles in degrees.")
    print("ut1,delta_t_s,lat,lon,elevation_m,pressure_hpa,temperature_c,alt_airless,azimuth,alt_refracted,declination,eot_min")
    for i, c in enumerate(cs):
        alt = float(aa.alt.deg[i])
        ref = alt + spa_refraction(alt, c[4], c[5])
        print(f"{ut1_iso[i]},{dts[i]:.3f},{c[1]},{c[2]},{c[3]},{c[4]},{c[5]},"
              f"{alt:.7f},{float(aa.az.deg[i]):.7f},{ref:.7f},{float(tete.dec.deg[i]):.7f},{eot[i]:.5f}")


if __name__ == "__main__":
    main()
