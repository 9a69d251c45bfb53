#!/usr/bin/python3
"""Reference Theil-Sen fits for package clock's tests.

Run from this directory with Debian's Python:
    /usr/bin/python3 gen_theilsen.py > theilsen_scipy.csv
Each row: case name, x values, y values (space separated, full precision),
and scipy.stats.theilslopes' slope, intercept (method="joint": median of
y - slope*x) and 95 % slope bounds (Sen 1968 eq. 2.6, with tie corrections).
The data are pseudo-random (numpy, fixed seeds); they are inputs only.
"""
import numpy as np
import scipy
from scipy.stats import theilslopes

rng = np.random.default_rng(20260503)
cases = []

x = np.sort(rng.uniform(0, 60, 20))
cases.append(("line20_noise", x, 3.0 + 1.7 * x + rng.normal(0, 2, x.size)))

x = np.repeat(np.arange(0.0, 10.0), 2)[:15]
cases.append(("ties_in_x", x, -0.4 * x + np.round(rng.normal(0, 1, x.size), 1)))

x = np.sort(rng.uniform(0, 60, 30))
y = -2.5 * x + rng.normal(0, 1.5, x.size)
y[rng.choice(x.size, 8, replace=False)] += rng.uniform(300, 900, 8)
cases.append(("outliers_8_of_30", x, y))

x = np.arange(8.0)
cases.append(("n8_ties_in_y", x, np.array([1, 2, 2, 3, 5, 5, 6, 8], dtype=float)))

print("# scipy %s, numpy %s: scipy.stats.theilslopes(y, x, 0.95, method='joint')" % (scipy.__version__, np.__version__))
print("case,x,y,slope,intercept,low,high")
for name, x, y in cases:
    r = theilslopes(y, x, 0.95, method="joint")
    print("%s,%s,%s,%r,%r,%r,%r" % (name, " ".join(repr(float(v)) for v in x),
          " ".join(repr(float(v)) for v in y), float(r[0]), float(r[1]), float(r[2]), float(r[3])))
