#!/usr/bin/python3
"""Generate sun_ephem.csv: the Sun at each demo photo's true instant, from PyEphem.

Run from internal/democase:  /usr/bin/python3 testdata/gen_sun_ephem.py > testdata/sun_ephem.csv

Independent witness for the demo's drawn shadows: PyEphem (python3-ephem,
Debian), not this project's SPA. The instants below are the demo photos' true
UTC times truncated to the second, copied from democase.Build with the default
seed; they are the whole-second wall times of the script in scenario.go
converted to UTC (the seed only adds the sub-second part), and the test looks
each photo up by that second (the Sun moves at most 0.004 deg in the dropped
fraction). Add a line here when the script gains a photo. Place: the demo's coordinates and
elevation, or, for the photos the surveyor's camera took on its trip, Halifax's (SITES).
Refraction is switched off (pressure 0), so the altitude is the
airless topocentric one; azimuth is from true north, clockwise.

Columns: utc (RFC 3339), azimuth_deg, altitude_airless_deg, zone (the site's IANA zone).
"""
import math

import ephem

SITES = {
    "America/New_York": ("44.2306", "-69.1080", 40.0),  # the boatyard
    "America/Halifax": ("44.6488", "-63.5752", 20.0),  # the surveyor's trip
}

TRIP = [
    "2027-10-02T14:05:51Z",
    "2027-10-03T18:41:17Z",
    "2027-10-04T12:58:33Z",
]

INSTANTS = [
    "2027-09-08T16:21:40Z",
    "2027-09-12T15:05:14Z",
    "2027-09-15T15:58:05Z",
    "2027-09-17T17:20:05Z",
    "2027-09-22T16:40:31Z",
    "2027-09-25T18:40:02Z",
    "2027-09-26T17:05:30Z",
    "2027-09-29T16:12:18Z",
    "2027-10-06T16:47:55Z",
    "2027-10-09T18:22:51Z",
    "2027-10-10T12:52:30Z",
    "2027-10-10T15:20:12Z",
    "2027-10-10T16:31:40Z",
    "2027-10-10T17:15:47Z",
    "2027-10-10T19:02:11Z",
    "2027-10-10T20:10:04Z",
    "2027-10-11T13:41:18Z",
    "2027-10-11T14:15:36Z",
    "2027-10-12T18:05:22Z",
    "2027-10-13T15:52:09Z",
    "2027-10-14T19:20:09Z",
    "2027-10-18T15:40:20Z",
    "2027-10-19T16:58:10Z",
    "2027-10-20T16:30:44Z",
    "2027-10-21T16:02:33Z",
    "2027-10-27T16:05:26Z",
    "2027-11-02T14:48:51Z",
    "2027-11-03T16:36:12Z",
    "2027-11-12T16:48:05Z",
    "2027-11-12T18:25:44Z",
    "2027-09-28T14:12:40Z",
    "2027-09-29T18:30:05Z",
    "2027-10-07T17:20:09Z",
    "2027-10-08T20:02:44Z",
]


def main():
    sun = ephem.Sun()
    print("# Sun positions from PyEphem %s (python3-ephem) via testdata/gen_sun_ephem.py" % ephem.__version__)
    print("# places: %s; pressure 0 (airless); azimuth clockwise from true north" %
          "; ".join("%s %s, %s, %.0f m" % (z, *SITES[z]) for z in sorted(SITES)))
    print("utc,azimuth_deg,altitude_airless_deg,zone")
    rows = [(t, "America/New_York") for t in INSTANTS] + [(t, "America/Halifax") for t in TRIP]
    for t, zone in rows:
        lat, lon, elev = SITES[zone]
        obs = ephem.Observer()
        obs.lat, obs.lon, obs.elevation = lat, lon, elev
        obs.pressure = 0  # no refraction: airless altitude
        obs.date = ephem.Date(t.replace("T", " ").rstrip("Z"))
        sun.compute(obs)
        print("%s,%.5f,%.5f,%s" % (t, math.degrees(sun.az), math.degrees(sun.alt), zone))


if __name__ == "__main__":
    main()
