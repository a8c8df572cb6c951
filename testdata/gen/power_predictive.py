#!/usr/bin/python3
"""Golden operating characteristics of predictive-probability monitored
single-arm designs (Lee JJ, Liu DD (2008), Clinical Trials 5:93-106) for
power.PredictiveDesign.OC, and predictive tails for power.PredictiveAtLeast.

Writes testdata/power_predictive.tsv with rows
  design <name> final p0 thetaT thetaL thetaU prior_a prior_b looks final_need p reject early_stop expected_n
  atleast x n final need prior_a prior_b prob

Method (independent of the Go code): SciPy 1.10 (scipy.stats.beta.sf for
the final posterior, scipy.stats.betabinom.sf for the predictive
probability, scipy.stats.binom.pmf for the increments); the boundaries by
scanning every count at every look (the Go code bisects); the operating
characteristics by the same forward recursion written out with NumPy
convolutions. Double precision; the tests compare to 1e-10.

Run from the repository root (seconds):
    /usr/bin/python3 testdata/gen/power_predictive.py
"""
import datetime

import numpy as np
import scipy
from scipy import stats

DESIGNS = [
    # name, final, p0, thetaT, thetaL, thetaU, prior a, b, looks, rates
    ("continuous", 40, 0.2, 0.9, 0.05, 1.0, 0.6, 0.4, list(range(10, 40)), [0.2, 0.4]),
    ("three-looks", 30, 0.3, 0.95, 0.1, 0.99, 1.0, 1.0, [10, 20, 25], [0.3, 0.5]),
    ("jeffreys", 60, 0.15, 0.9, 0.02, 1.0, 0.5, 0.5, list(range(5, 60, 5)), [0.15, 0.3, 0.05]),
]
ATLEAST = [(7, 20, 40, 14, 0.6, 0.4), (0, 10, 100, 3, 0.5, 0.5), (30, 50, 200, 150, 1, 1), (3, 3, 10, 10, 2, 8)]


def final_need(final, p0, thetaT, a, b):
    for x in range(final + 1):
        if stats.beta.sf(p0, a + x, b + final - x) > thetaT:
            return x
    return final + 1


def pp(x, n, final, need, a, b):
    j = need - x
    m = final - n
    if j <= 0:
        return 1.0
    if j > m:
        return 0.0
    return stats.betabinom.sf(j - 1, m, a + x, b + n - x)


def oc(final, p0, thetaT, thetaL, thetaU, a, b, looks, p):
    need = final_need(final, p0, thetaT, a, b)
    cur = np.array([1.0])
    prev = 0
    reject = early = expn = 0.0
    for n in looks:
        cur = np.convolve(cur, stats.binom.pmf(np.arange(n - prev + 1), n - prev, p))
        prev = n
        for x in range(n + 1):
            v = pp(x, n, final, need, a, b)
            if v < thetaL or (thetaU < 1 and v > thetaU):
                early += cur[x]
                expn += cur[x] * n
                if v > thetaU:
                    reject += cur[x]
                cur[x] = 0.0
    cur = np.convolve(cur, stats.binom.pmf(np.arange(final - prev + 1), final - prev, p))
    expn += cur.sum() * final
    reject += cur[need:].sum()
    return need, reject, early, expn


def main():
    rows = []
    for name, final, p0, tT, tL, tU, a, b, looks, rates in DESIGNS:
        for p in rates:
            need, rej, early, expn = oc(final, p0, tT, tL, tU, a, b, looks, p)
            rows.append("design\t%s\t%d\t%r\t%r\t%r\t%r\t%r\t%r\t%s\t%d\t%r\t%.17g\t%.17g\t%.17g" % (
                name, final, p0, tT, tL, tU, a, b, ",".join(map(str, looks)), need, p, rej, early, expn))
    for x, n, final, need, a, b in ATLEAST:
        rows.append("atleast\t%d\t%d\t%d\t%d\t%r\t%r\t%.17g" % (x, n, final, need, a, b, pp(x, n, final, need, a, b)))
    with open("testdata/power_predictive.tsv", "w") as f:
        f.write("# predictive-probability designs (Lee and Liu 2008): exact operating characteristics and predictive tails\n")
        f.write("# design name final p0 thetaT thetaL thetaU prior_a prior_b looks final_need p reject early_stop expected_n\n")
        f.write("# atleast x n final need prior_a prior_b prob\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/power_predictive.py\n")
        f.write("# tool: SciPy %s, NumPy %s; date %s\n" % (scipy.__version__, np.__version__, datetime.date.today()))
        for r in rows:
            f.write(r + "\n")


main()
