#!/usr/bin/python3
"""Normal-theory boundaries of Lan-DeMets alpha-spending group-sequential tests.

Writes ../power_spending.tsv. For each case (spending function, one-sided
alpha, information fractions) the upper boundary z_k at look k solves

    P(Z_1 < z_1, ..., Z_{k-1} < z_{k-1}) - P(Z_1 < z_1, ..., Z_k < z_k) = a(t_k) - a(t_{k-1})

for the canonical joint distribution corr(Z_i, Z_j) = sqrt(t_i / t_j),
with scipy.stats.multivariate_normal.cdf (Genz's algorithm, abseps 1e-8)
and scipy.optimize.brentq; the first look uses scipy.stats.norm.isf. This
is independent of the grid recursion that power.SpendingBounds uses.

Run: /usr/bin/python3 testdata/gen/power_spending.py   (from the repo root; about five minutes)
"""
import datetime, math, os
import numpy as np
import scipy
from scipy.optimize import brentq
from scipy.stats import multivariate_normal, norm

CASES = [
    # name, family, rho, alpha (one-sided), fractions
    ("obf5", "O'Brien-Fleming", 0, 0.025, [0.2, 0.4, 0.6, 0.8, 1.0]),
    ("poc5", "Pocock", 0, 0.025, [0.2, 0.4, 0.6, 0.8, 1.0]),
    ("obf3", "O'Brien-Fleming", 0, 0.025, [1 / 3, 2 / 3, 1.0]),
    ("poc3", "Pocock", 0, 0.05, [1 / 3, 2 / 3, 1.0]),
    ("rho2", "power family", 2, 0.025, [0.25, 0.5, 0.75, 1.0]),
    ("rho3u", "power family", 3, 0.05, [0.3, 0.5, 1.0]),
    ("obf4u", "O'Brien-Fleming", 0, 0.01, [0.1, 0.45, 0.7, 1.0]),
]


def spent(family, rho, a, t):
    if t >= 1:
        return a
    if family == "Pocock":
        return a * math.log(1 + (math.e - 1) * t)
    if family == "power family":
        return a * t ** rho
    return 2 * norm.sf(norm.isf(a / 2) / math.sqrt(t))


def cdf(c, t):
    k = len(c)
    if k == 1:
        return norm.cdf(c[0])
    cov = np.array([[math.sqrt(min(t[i], t[j]) / max(t[i], t[j])) for j in range(k)] for i in range(k)])
    return multivariate_normal.cdf(np.array(c), mean=np.zeros(k), cov=cov, maxpts=1000000,
                                   abseps=1e-8, releps=1e-8)


def bounds(family, rho, a, t):
    z = []
    prev = 0.0
    stay = 1.0  # P(no crossing so far)
    for k in range(len(t)):
        inc = spent(family, rho, a, t[k]) - prev
        prev += inc
        if k == 0:
            c = norm.isf(inc)
        else:
            f = lambda c: stay - cdf(z + [c], t[: k + 1]) - inc
            c = brentq(f, 0.5, 8.0, xtol=1e-7)
        z.append(c)
        stay = cdf(z, t[: k + 1])
    return z


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = os.path.join(here, "..", "power_spending.tsv")
    with open(out, "w") as f:
        f.write("# Upper boundaries z_k of one-sided Lan-DeMets alpha-spending group-sequential tests (normal theory),\n")
        f.write("# solved with SciPy's multivariate normal CDF (Genz, abseps 1e-8; boundaries good to about 1e-4) and brentq.\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/power_spending.py\n")
        f.write("# Tool: SciPy %s, NumPy %s; date %s\n" % (scipy.__version__, np.__version__, datetime.date.today()))
        f.write("# columns: case\tfamily\trho\talpha\tfractions (comma-separated)\tboundaries (comma-separated)\n")
        for name, fam, rho, a, t in CASES:
            z = bounds(fam, rho, a, t)
            f.write("%s\t%s\t%g\t%g\t%s\t%s\n" % (name, fam, rho, a, ",".join("%.15g" % x for x in t),
                                                  ",".join("%.10f" % x for x in z)))


if __name__ == "__main__":
    main()
