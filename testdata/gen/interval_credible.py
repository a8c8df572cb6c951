#!/usr/bin/python3
"""Golden credible intervals for interval.Credible.

Writes testdata/interval_credible.tsv with rows
  k n prior_a prior_b level kind lower upper
(kind "et" equal-tailed, "hpd" highest posterior density). Posterior tail
probabilities are in interval_posterior_tail.py.

Method (independent of the Go code, which uses Newton steps on log tails):
mpmath at 40 digits; the Beta(a+k, b+n-k) distribution function by
tanh-sinh quadrature (mpmath.quad) of the density from loggamma, split
every two standard deviations; equal-tailed limits by bisection to 1e-24
relative on the distribution function; HPD limits by solving, in the lower limit L, the coverage
F(U(L)) - F(L) = level where U(L) is the root above the mode of the
equal-density equation (a-1) ln(U/L) + (b-1) ln((1-U)/(1-L)) = 0, both by
bisection to 1e-24.

Run from the repository root (about five minutes):
    /usr/bin/python3 testdata/gen/interval_credible.py
"""
import datetime

import mpmath

mpmath.mp.dps = 40

CASES = [
    # k, n, prior a, prior b, level
    (7, 30, 0.5, 0.5, 0.95),
    (7, 30, 1, 1, 0.95),
    (7, 30, 2, 8, 0.90),
    (0, 20, 0.5, 0.5, 0.95),
    (20, 20, 1, 1, 0.99),
    (1, 10, 0.5, 0.5, 0.95),
    (81, 263, 0.5, 0.5, 0.95),
    (37, 1000, 1, 1, 0.95),
    (3, 100000, 0.5, 0.5, 0.999),
    (499999, 1000000, 0.5, 0.5, 0.95),
    (5, 12, 0.3, 4.2, 0.5),
    (2, 3, 1, 1, 0.999999),
]

_norm = {}


def logpdf(a, b, x):
    if (a, b) not in _norm:
        _norm[(a, b)] = mpmath.loggamma(a + b) - mpmath.loggamma(a) - mpmath.loggamma(b)
    return (a - 1) * mpmath.log(x) + (b - 1) * mpmath.log1p(-x) + _norm[(a, b)]


def pieces(a, b, lo, hi):
    # split points every two standard deviations around the mean, so that
    # tanh-sinh quadrature sees a smooth integrand on each piece
    m = a / (a + b)
    sd = mpmath.sqrt(a * b / ((a + b) ** 2 * (a + b + 1)))
    pts = {lo, hi}
    for j in range(-40, 41, 2):
        p = m + j * sd
        if lo < p < hi:
            pts.add(p)
    return sorted(pts)


def integral(a, b, lo, hi):
    if hi <= lo:
        return mpmath.mpf(0)
    return mpmath.quad(lambda x: mpmath.exp(logpdf(a, b, x)), pieces(a, b, lo, hi))


def cdf(a, b, x):
    return integral(a, b, mpmath.mpf(0), x)


def sf(a, b, x):
    return integral(a, b, x, mpmath.mpf(1))


def bisect(f, lo, hi, tol=mpmath.mpf(10) ** -24):
    flo = f(lo)
    for _ in range(400):
        mid = (lo + hi) / 2
        fm = f(mid)
        if (fm > 0) == (flo > 0):
            lo, flo = mid, fm
        else:
            hi = mid
        if hi - lo < tol * max(abs(mid), mpmath.mpf(10) ** -300):
            break
    return (lo + hi) / 2


def bracket(a, b):
    m = a / (a + b)
    sd = mpmath.sqrt(a * b / ((a + b) ** 2 * (a + b + 1)))
    return max(mpmath.mpf(10) ** -38, m - 60 * sd), min(1 - mpmath.mpf(10) ** -38, m + 60 * sd)


def quantile(a, b, p, upper):
    lo, hi = bracket(a, b)
    if upper:
        return bisect(lambda x: p - sf(a, b, x), lo, hi)
    return bisect(lambda x: cdf(a, b, x) - p, lo, hi)


def hpd(a, b, level):
    m = (a - 1) / (a + b - 2)
    g = lambda x: (a - 1) * mpmath.log(x) + (b - 1) * mpmath.log(1 - x)

    def upper_of(L):
        c = g(L)
        return bisect(lambda u: c - g(u), m, mpmath.mpf(1) - mpmath.mpf(10) ** -38)

    def cover(L):
        return cdf(a, b, L) + sf(a, b, upper_of(L)) - (1 - level)
    L = bisect(cover, bracket(a, b)[0], m)
    return L, upper_of(L)


def main():
    rows = []
    for k, n, pa, pb, level in CASES:
        a, b = mpmath.mpf(pa) + k, mpmath.mpf(pb) + n - k
        lev = mpmath.mpf(level)
        t = (1 - lev) / 2
        rows.append("%d\t%d\t%r\t%r\t%r\tet\t%s\t%s" % (k, n, pa, pb, level, mpmath.nstr(quantile(a, b, t, False), 25), mpmath.nstr(quantile(a, b, t, True), 25)))
        if a > 1 and b > 1:
            L, U = hpd(a, b, lev)
            rows.append("%d\t%d\t%r\t%r\t%r\thpd\t%s\t%s" % (k, n, pa, pb, level, mpmath.nstr(L, 25), mpmath.nstr(U, 25)))
    with open("testdata/interval_credible.tsv", "w") as f:
        f.write("# credible intervals (k n prior_a prior_b level et|hpd lower upper) of the Beta(a+k, b+n-k) posterior\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/interval_credible.py (40-digit quadrature, bisection)\n")
        f.write("# tool: mpmath %s; date %s\n" % (mpmath.__version__, datetime.date.today()))
        for r in rows:
            f.write(r + "\n")


main()
