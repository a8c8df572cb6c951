#!/usr/bin/python3
"""Golden posterior probabilities that one arm beats the other, for
test.Compare.

Writes testdata/test_bayes.tsv with rows
  a1 b1 a2 b2 ln P(p1 > p2) ln P(p2 > p1) E[max(p2-p1,0)] E[max(p1-p2,0)]
for p1 ~ Beta(a1, b1), p2 ~ Beta(a2, b2) independent (posterior shapes).

Method (independent of the Go code, which uses beta-negative-binomial
sums from the mode with early stopping, a closed form for the losses and
Gauss-Legendre panels): mpmath at 40 digits, the double integral reduced
to one dimension, P(p1 > p2) = integral f2(x) (1 - I_x(a1, b1)) dx, by
tanh-sinh quadrature (mpmath.quad) split every standard deviation of p2 over
+-40 standard deviations, with I_x from mpmath.betainc(regularized=True);
P(p2 > p1) by the same integral with the arms exchanged (not as a
complement); the expected losses as integrals of f2(x) E[max(x - p1, 0)]
with E[max(x - p1, 0)] = x I_x(a1, b1) - m1 I_x(a1 + 1, b1).

Run from the repository root (about 15 minutes on a busy machine):
    /usr/bin/python3 testdata/gen/test_bayes.py
"""
import datetime

import mpmath

mpmath.mp.dps = 40

CASES = [
    (1001, 1, 1000, 2),        # 1000/1000 vs 999/1000, uniform priors
    (4, 8, 8, 6),              # 3/10 vs 7/12, uniform
    (3.5, 7.5, 7.5, 5.5),      # 3/10 vs 7/12, Jeffreys
    (51, 51, 41, 61),          # 50/100 vs 40/100, uniform
    (50.5, 50.5, 40.5, 60.5),  # Jeffreys
    (1, 1001, 6, 996),         # 0/1000 vs 5/1000, uniform
    (0.5, 1000.5, 5.5, 995.5), # Jeffreys
    (2.25, 9.75, 3.75, 11.25), # informative non-integer
    (901, 101, 881, 121),      # 900/1000 vs 880/1000, uniform
    (120.5, 880.5, 100.5, 900.5),
]


def ibeta(a, b, x):
    return mpmath.betainc(a, b, 0, x, regularized=True)


def logpdf(a, b, x):
    # (a-1) ln x and (b-1) ln(1-x), each omitted when its exponent is 0, so
    # that an end point of the range gives the density's limit, not 0 * inf
    v = mpmath.loggamma(a + b) - mpmath.loggamma(a) - mpmath.loggamma(b)
    if a != 1:
        v += (a - 1) * mpmath.log(x)
    if b != 1:
        v += (b - 1) * mpmath.log1p(-x)
    return v


def pts(a, b):
    m = a / (a + b)
    sd = mpmath.sqrt(a * b / ((a + b) ** 2 * (a + b + 1)))
    p = {mpmath.mpf(0), mpmath.mpf(1)}
    for j in range(-40, 41):
        x = m + j * sd
        if 0 < x < 1:
            p.add(x)
    return sorted(p)


def integ(a2, b2, g):
    return mpmath.quad(lambda x: mpmath.exp(logpdf(a2, b2, x)) * g(x), pts(a2, b2))


def main():
    rows = []
    for a1, b1, a2, b2 in CASES:
        A1, B1, A2, B2 = (mpmath.mpf(v) for v in (a1, b1, a2, b2))
        m1, m2 = A1 / (A1 + B1), A2 / (A2 + B2)
        p12 = integ(A2, B2, lambda x: 1 - ibeta(A1, B1, x))
        p21 = integ(A1, B1, lambda x: 1 - ibeta(A2, B2, x))
        loss1 = integ(A2, B2, lambda x: x * ibeta(A1, B1, x) - m1 * ibeta(A1 + 1, B1, x))
        loss2 = integ(A1, B1, lambda x: x * ibeta(A2, B2, x) - m2 * ibeta(A2 + 1, B2, x))
        rows.append("%r\t%r\t%r\t%r\t%s\t%s\t%s\t%s" % (a1, b1, a2, b2, mpmath.nstr(mpmath.log(p12), 25),
                    mpmath.nstr(mpmath.log(p21), 25), mpmath.nstr(loss1, 25), mpmath.nstr(loss2, 25)))
    with open("testdata/test_bayes.tsv", "w") as f:
        f.write("# P(p1 > p2) for independent Beta posteriors: a1 b1 a2 b2 ln P(p1>p2) ln P(p2>p1) loss_first loss_second\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/test_bayes.py (40-digit tanh-sinh quadrature of betainc)\n")
        f.write("# tool: mpmath %s; date %s\n" % (mpmath.__version__, datetime.date.today()))
        for r in rows:
            f.write(r + "\n")


main()
