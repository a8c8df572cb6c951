#!/usr/bin/python3
"""Golden posterior tail probabilities for interval.Posterior.ProbAbove and
ProbBelow.

Writes testdata/interval_posterior_tail.tsv with rows
  k n prior_a prior_b c ln P(p > c) ln P(p <= c)
for the Beta(prior_a + k, prior_b + n - k) posterior.

Method (independent of the Go code, which uses continued fractions and
series): mpmath at 40 digits, each tail integrated on its own (never as a
complement) by tanh-sinh quadrature (mpmath.quad) of the density from
loggamma, split every standard deviation around the mean and, from the
cut point c outward, every 1/|d ln f/dx| (the scale on which a far-tail
density falls by e), so that a tail of e^-120 is integrated as accurately
as one near 1/2; a tail above 1/2 is written as log1p of minus the other.

Run from the repository root (under a minute):
    /usr/bin/python3 testdata/gen/interval_posterior_tail.py
"""
import datetime

import mpmath

mpmath.mp.dps = 40

TAILS = [(7, 30, 0.5, 0.5, 0.1), (7, 30, 1, 1, 0.5), (0, 1000, 0.5, 0.5, 0.01),
         (990, 1000, 1, 1, 0.999), (37, 1000, 1, 1, 0.2), (5, 12, 0.3, 4.2, 1e-6),
         (37, 1000, 0.5, 0.5, 0.037), (500, 1000, 1, 1, 0.45), (2, 100000, 0.5, 0.5, 1e-4)]


def logpdf(a, b, x, norm):
    return (a - 1) * mpmath.log(x) + (b - 1) * mpmath.log1p(-x) + norm


def points(a, b, lo, hi, c):
    m = a / (a + b)
    sd = mpmath.sqrt(a * b / ((a + b) ** 2 * (a + b + 1)))
    pts = {lo, hi}
    for j in range(-60, 61):
        x = m + j * sd
        if lo < x < hi:
            pts.add(x)
    slope = abs((a - 1) / c - (b - 1) / (1 - c))
    if slope > 0:
        h = 1 / slope
        for j in range(1, 200):
            for x in (c + j * h, c - j * h):
                if lo < x < hi:
                    pts.add(x)
    return sorted(pts)


def main():
    rows = []
    for k, n, pa, pb, c in TAILS:
        a, b = mpmath.mpf(pa) + k, mpmath.mpf(pb) + n - k
        c = mpmath.mpf(c)
        norm = mpmath.loggamma(a + b) - mpmath.loggamma(a) - mpmath.loggamma(b)
        f = lambda x: mpmath.exp(logpdf(a, b, x, norm))
        up = mpmath.quad(f, points(a, b, c, mpmath.mpf(1), c))
        low = mpmath.quad(f, points(a, b, mpmath.mpf(0), c, c))
        # a tail near 1 is the complement of the small one (whose relative
        # accuracy carries over); the small one is integrated directly
        lup = mpmath.log1p(-low) if low < 0.5 else mpmath.log(up)
        llow = mpmath.log1p(-up) if up < 0.5 else mpmath.log(low)
        rows.append("%d\t%d\t%r\t%r\t%s\t%s\t%s" % (k, n, pa, pb, mpmath.nstr(c, 17), mpmath.nstr(lup, 25), mpmath.nstr(llow, 25)))
    with open("testdata/interval_posterior_tail.tsv", "w") as f:
        f.write("# posterior tails of Beta(prior_a+k, prior_b+n-k): k n prior_a prior_b c ln P(p > c) ln P(p <= c)\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/interval_posterior_tail.py (40-digit tanh-sinh quadrature)\n")
        f.write("# tool: mpmath %s; date %s\n" % (mpmath.__version__, datetime.date.today()))
        for r in rows:
            f.write(r + "\n")


main()
