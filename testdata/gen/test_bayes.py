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

With the argument "bound" it writes testdata/test_bayes_bound.tsv instead:
the probability that each of k arms is best (k = 2 gives P(p1 > p2) and
P(p2 > p1)), for invented posteriors with no integer shape, from shapes of
0.1 to totals of 1e5, for test.Compare's and test.ProbBest's trapezoidal
rule and its error bound. Rows
  k a_1 b_1 ... a_k b_k ln P(arm 1 best) ... ln P(arm k best)
Method (independent of the Go code, which sums a trapezoidal rule with
internal/beta's continued fractions): mpmath at 40 digits, P(arm j best) =
integral g_j(t) prod_{i != j} F_i(t) dt over the log-odds t, g the density
of the log-odds, by tanh-sinh quadrature (mpmath.quad) split at every
standard deviation of each arm within 24 of its mode and at widening steps
into the tails, the window reaching e^-60 of every integrand's exponential
tails, each integrand scaled by its largest value at the split points so
that mpmath's absolute tolerance is relative; F_i(t) = I_x(a, b) from the
hypergeometric series I_x(a, b) = x^a (1-x)^b / (a B(a, b)) 2F1(a+b, 1;
a+1; x) (DLMF 8.17.8, recalled; checked here against mpmath.betainc at
small shapes before any row is written; see logcdf for which tail and how).
About an hour on a busy machine:
    /usr/bin/python3 testdata/gen/test_bayes.py bound
"""
import datetime
import sys

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


# Invented posteriors (shapes as after invented counts under Jeffreys or
# informative priors), none with an integer shape.
BOUND_CASES = [
    [(0.1, 0.1), (0.1, 0.1)],
    [(0.1, 0.9), (0.3, 0.7)],
    [(0.25, 0.75), (0.75, 0.25)],
    [(0.5, 0.5), (0.5, 10.5)],
    [(0.5, 20.5), (3.5, 17.5)],
    [(0.99, 3.01), (2.5, 1.5)],
    [(1.5, 0.5), (0.5, 1.5)],
    [(0.5, 1000.5), (5.5, 995.5)],
    [(0.9, 2000.1), (1500.3, 500.7)],
    [(300.5, 700.5), (700.5, 300.5)],
    [(4900.5, 5100.5), (5100.5, 4900.5)],
    [(0.5, 40000.5), (12.5, 39988.5)],
    [(50.5, 49950.5), (70.5, 49930.5)],
    [(24000.5, 26000.5), (25000.5, 25000.5)],
    [(0.5, 49999.5), (0.7, 49999.3)],
    [(0.5, 10.5), (2.5, 8.5), (5.5, 5.5)],
    [(12.5, 88.5), (30.5, 70.5), (25.5, 95.5), (20.5, 80.5)],
    [(0.1, 5.1), (0.3, 0.9), (1.7, 0.2)],
    [(500.5, 9500.5), (520.5, 9480.5), (480.5, 9520.5), (510.5, 9490.5), (300.5, 9700.5)],
    [(0.5, 3000.5), (2.5, 2998.5), (0.5, 3000.5), (6.5, 2994.5), (1.5, 2999.5), (0.5, 3000.5)],
]


def lbeta(a, b):
    return mpmath.loggamma(a) + mpmath.loggamma(b) - mpmath.loggamma(a + b)


def series(a, b, x):
    """sum_n (a+b)_n / (a+1)_n x^n, the positive series of 2F1(a+b, 1; a+1; x)."""
    total, t, n = mpmath.mpf(1), mpmath.mpf(1), 0
    while True:
        r = (a + b + n) * x / (a + 1 + n)
        t *= r
        total += t
        n += 1
        rmax = max(r, x)
        if rmax < 1 and t * rmax / (1 - rmax) < mpmath.mpf(10) ** -45 * total:
            return total


def logcdf(a, b, x, y):
    """ln I_x(a, b), y = 1 - x, by the series of DLMF 8.17.8: summed term
    by term for the lower tail where its ratios start below 0.9 and x <
    0.99, for the upper tail (I_y(b, a), then the complement) where those
    hold with x and y exchanged, the tail of the smaller argument first;
    elsewhere (near the mode) by mpmath.hyp2f1 at whichever of x, y is at
    most 1/2, then the complement if needed, which must leave at least
    1e-20 (20 of the 40 digits)."""
    pre = a * mpmath.log(x) + b * mpmath.log(y) - lbeta(a, b)
    lo_ok = (a + b) * x / (a + 1) < 0.9 and x < 0.99
    up_ok = (a + b) * y / (b + 1) < 0.9 and y < 0.99
    for which in ((0, 1) if x <= 0.5 else (1, 0)):
        if which == 0 and lo_ok:
            return pre - mpmath.log(a) + mpmath.log(series(a, b, x))
        if which == 1 and up_ok:
            return mpmath.log(-mpmath.expm1(pre - mpmath.log(b) + mpmath.log(series(b, a, y))))
    if x <= 0.5:
        return pre - mpmath.log(a) + mpmath.log(mpmath.hyp2f1(a + b, 1, a + 1, x))
    v = -mpmath.expm1(pre - mpmath.log(b) + mpmath.log(mpmath.hyp2f1(a + b, 1, b + 1, y)))
    assert v > mpmath.mpf(10) ** -20, (a, b, x, v)
    return mpmath.log(v)


def check_series():
    for a, b, x in [(0.1, 0.9, "0.01"), (0.1, 0.9, "0.6"), (3.5, 7.5, "0.3"), (3.5, 7.5, "0.8"), (0.5, 20.5, "0.001"), (12.5, 88.5, "0.2"),
                    (12.5, 88.5, "0.125"), (150.5, 80.5, "0.66"), (150.5, 80.5, "0.5"), (0.5, 1000.5, "0.0001"), (5.5, 0.3, "0.9"),
                    (0.1, 0.1, "0.999"), (0.1, 0.1, "0.001"), (25.5, 30.5, "0.45"), (25.5, 30.5, "0.55")]:
        a, b, x = mpmath.mpf(a), mpmath.mpf(b), mpmath.mpf(x)
        want = mpmath.log(mpmath.betainc(a, b, 0, x, regularized=True))
        got = logcdf(a, b, x, 1 - x)
        assert abs(got - want) < mpmath.mpf(10) ** -35 * max(1, abs(want)), (a, b, x, got, want)


def best(arms):
    arms = [(mpmath.mpf(a), mpmath.mpf(b)) for a, b in arms]
    k = len(arms)
    memo = {}

    def parts(t):
        v = memo.get(t)
        if v is None:
            x, y = 1 / (1 + mpmath.exp(-t)), 1 / (1 + mpmath.exp(t))
            lg = [a * mpmath.log(x) + b * mpmath.log(y) - lbeta(a, b) for a, b in arms]
            lF = [logcdf(a, b, x, y) for a, b in arms]
            v = (lg, lF, sum(lF))
            memo[t] = v
        return v

    def logf(j, t):
        lg, lF, s = parts(t)
        return lg[j] + s - lF[j]

    pts = set()
    A = sum(a for a, _ in arms)
    for a, b in arms:
        m, sd = mpmath.log(a / b), mpmath.sqrt(1 / a + 1 / b)
        for j in range(-24, 25):
            pts.add(m + j * sd)
        w = 24 * sd
        while w < 60 / A + 24 * sd or w < 60 / b + 24 * sd:
            w *= 1.5
            pts.add(m - w)
            pts.add(m + w)
    lo = min(pts) - 60 / A
    hi = max(pts) + 60 / min(b for _, b in arms)
    pts = sorted(p for p in pts if lo <= p <= hi) + []
    pts = [lo] + pts + [hi]
    out = []
    for j in range(k):
        c = max(logf(j, t) for t in pts)
        q = mpmath.quad(lambda t: mpmath.exp(logf(j, t) - c), pts)
        out.append(c + mpmath.log(q))
    return out


def bound():
    check_series()
    rows = []
    for arms in BOUND_CASES:
        lp = best(arms)
        f = [str(len(arms))] + ["%r\t%r" % ab for ab in arms] + [mpmath.nstr(v, 25) for v in lp]
        rows.append("\t".join(f))
        print(rows[-1], flush=True)
    with open("testdata/test_bayes_bound.tsv", "w") as f:
        f.write("# probability that each arm is best, independent Beta posteriors without integer shapes (invented): k a_1 b_1 ... a_k b_k ln P(arm 1 best) ... ln P(arm k best)\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/test_bayes.py bound (40-digit tanh-sinh quadrature in the log-odds, incomplete beta by its hypergeometric series)\n")
        f.write("# tool: mpmath %s; date %s\n" % (mpmath.__version__, datetime.date.today()))
        for r in rows:
            f.write(r + "\n")


if len(sys.argv) > 1 and sys.argv[1] == "bound":
    bound()
else:
    main()
