#!/usr/bin/python3
"""Golden Clopper-Pearson and Wilson limits for package interval.

Writes testdata/interval_cp_wilson.tsv. Clopper-Pearson limits are the Beta
quantiles of Clopper and Pearson (1934), L = Beta(k, n-k+1).ppf(a) and
U = Beta(k+1, n-k).isf(a), from SciPy (Boost's incomplete-beta inverses).
Where min(k, n-k) <= 1000 the Clopper-Pearson limits are recomputed in
mpmath at 40 digits by bisection on the exact binomial sum (column cp_src =
mpmath; SciPy's values disagree there by up to about 1e-10 relative at
n = 1e7, and the mpmath ones are written); elsewhere SciPy's values are
written (cp_src = scipy).
Wilson limits are the closed form of Wilson (1927) evaluated in mpmath at
50 digits with z = sqrt(2) erfinv(1 - 2a); each is cross-checked against
scipy.stats.binomtest(...).proportion_ci(method="wilson") to 1e-8 relative
(SciPy's form is evaluated in double precision).

Usage: /usr/bin/python3 testdata/gen/interval_cp_wilson.py > testdata/interval_cp_wilson.tsv
"""
import datetime
import sys
import warnings

import mpmath
import scipy
from scipy import stats

mpmath.mp.dps = 50
# SciPy's binomtest warns about p = 0 densities at k = 0; the values are unaffected.
warnings.filterwarnings("ignore", category=RuntimeWarning)


def wilson(k, n, a):
    z = mpmath.sqrt(2) * mpmath.erfinv(1 - 2 * mpmath.mpf(a))
    k, n = mpmath.mpf(k), mpmath.mpf(n)
    p = k / n
    c = (p + z * z / (2 * n))
    h = z * mpmath.sqrt(p * (1 - p) / n + z * z / (4 * n * n))
    d = 1 + z * z / n
    return (c - h) / d, (c + h) / d


def binom_sum(k, n, p):
    """P(X <= k) for X ~ Binomial(n, p), mpmath, summed from the smaller end."""
    p = mpmath.mpf(p)
    q = 1 - p
    t = q ** n
    s = t
    for j in range(1, k + 1):
        t = t * (n - j + 1) / j * p / q
        s += t
    return s


def binom_ge(k, n, p):
    """P(X >= k), summed downward from j = n (n - k + 1 terms)."""
    p = mpmath.mpf(p)
    q = 1 - p
    t = p ** n
    s = t
    for j in range(n, k, -1):  # t_j -> t_{j-1}
        t = t * j / (n - j + 1) * q / p
        s += t
    return s


def cdf(k, n, p):
    """P(X <= k) from whichever end has fewer terms."""
    if k < 0:
        return mpmath.mpf(0)
    if k <= n // 2:
        return binom_sum(k, n, p)
    return 1 - binom_ge(k + 1, n, p)


def cp_mp(k, n, a, guess, lower):
    """Clopper-Pearson limit by bisection in log p near guess."""
    a = mpmath.mpf(a)
    if lower:  # P(X >= k; L) = a  <=>  P(X <= k-1; L) = 1 - a, decreasing in p
        f = lambda p: cdf(k - 1, n, p) - (1 - a)
    else:  # P(X <= k; U) = a, decreasing in p
        f = lambda p: cdf(k, n, p) - a
    lo, hi = mpmath.mpf(guess) * (1 - mpmath.mpf("1e-6")), mpmath.mpf(guess) * (1 + mpmath.mpf("1e-6"))
    hi = min(hi, 1 - mpmath.mpf(10) ** -30)
    if not (f(lo) > 0 > f(hi)):
        raise SystemExit("bracket failed at k=%d n=%d" % (k, n))
    for _ in range(80):
        mid = mpmath.sqrt(lo * hi)
        if f(mid) > 0:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


def main():
    out = sys.stdout
    out.write("# Clopper-Pearson and Wilson limits: k, n, level, side, CP lower, CP upper, cp_src, Wilson lower, Wilson upper\n")
    out.write("# side: two (tail (1-level)/2 each) or one (tail 1-level; both one-sided bounds listed)\n")
    out.write("# generator: /usr/bin/python3 testdata/gen/interval_cp_wilson.py > testdata/interval_cp_wilson.tsv\n")
    out.write("# tools: SciPy %s (stats.beta.ppf/isf), mpmath %s (Wilson at 50 digits, Clopper-Pearson where cp_src = mpmath)\n" % (scipy.__version__, mpmath.__version__))
    out.write("# date: %s\n" % datetime.date.today().isoformat())
    ns = [1, 2, 3, 5, 7, 10, 20, 30, 50, 100, 263, 1000, 12345, 100000, 1000000, 10000000]
    levels = [0.5, 0.8, 0.9, 0.95, 0.99, 0.999, 0.999999]
    for n in ns:
        ks = sorted({0, 1, 2, 3, n // 100, n // 10, n // 3, n // 2, n - 3, n - 1, n} & set(range(0, n + 1)))
        for k in ks:
            for lev in levels:
                for side in ("two", "one"):
                    a = (1 - lev) / 2 if side == "two" else 1 - lev
                    lo = 0.0 if k == 0 else stats.beta.ppf(a, k, n - k + 1)
                    hi = 1.0 if k == n else stats.beta.isf(a, k + 1, n - k)
                    src = "scipy"
                    if min(k, n - k) <= 1000:
                        src = "mpmath"
                        if k > 0:
                            lo = float(cp_mp(k, n, a, lo, True))
                        if k < n:
                            hi = float(cp_mp(k, n, a, hi, False))
                    wl, wu = wilson(k, n, a)
                    if side == "two":
                        ci = stats.binomtest(k, n).proportion_ci(confidence_level=lev, method="wilson")
                        for mine, theirs in ((wl, ci.low), (wu, ci.high)):
                            if abs(float(mine) - theirs) > 1e-8 * max(abs(theirs), 1e-300) and abs(float(mine) - theirs) > 1e-15:
                                raise SystemExit("wilson mismatch at k=%d n=%d level=%g: %r vs %r" % (k, n, lev, float(mine), theirs))
                    if k == 0:
                        wl = mpmath.mpf(0)
                    if k == n:
                        wu = mpmath.mpf(1)
                    out.write("%d\t%d\t%r\t%s\t%r\t%r\t%s\t%s\t%s\n" % (
                        k, n, lev, side, float(lo), float(hi), src,
                        mpmath.nstr(wl, 17, min_fixed=-400, max_fixed=400), mpmath.nstr(wu, 17, min_fixed=-400, max_fixed=400)))


if __name__ == "__main__":
    main()
