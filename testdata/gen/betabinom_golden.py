#!/usr/bin/python3
"""Golden values of the beta-binomial distribution for binom.BetaBinom.

Writes testdata/betabinom_golden.tsv: for trials n, shapes a, b and a value
k, the natural logs of P(X = k), P(X <= k) and P(X > k) of
P(X = k) = C(n, k) B(k + a, n - k + b) / B(a, b).

Method (independent of the Go code, which uses a saddle-point product form
and summation with early stopping): in mpmath at 60 digits, P(X = 0) from
loggamma (60 digits leave over 45 after the cancellation at n = 2e6), then
every term by the exact ratio recurrence
P(X = j+1)/P(X = j) = (n-j)(j+a) / ((j+1)(n-j-1+b)), and both tails as
full sums over the whole support (no truncation), the upper tail summed on
its own from the top; the terms are normalised by their sum (which removes
the common error of P(X = 0)), and a log CDF near 0 is taken as
log1p(-upper sum), a log survival near 0 as log1p(-lower sum).

Run from the repository root (about a minute):
    /usr/bin/python3 testdata/gen/betabinom_golden.py
"""
import datetime

import mpmath

mpmath.mp.dps = 60

CASES = [
    # n, a, b
    (0, 1, 1),
    (1, 0.5, 0.5),
    (10, 2, 3),
    (10, 0.5, 0.5),
    (25, 0.1, 7.5),
    (40, 0.6, 0.4),
    (100, 1, 1),
    (100, 30, 70),
    (500, 0.2, 0.3),
    (1000, 38.5, 963.5),
    (1000, 1e-3, 5),
    (5000, 1e4, 2e4),
    (20000, 2.5, 1.5),
    (100000, 1e6, 1e6),
    (100000, 250.5, 9750.5),
    (2097152, 1, 1),
    (2097152, 3, 5),
]


def terms(n, a, b):
    a, b = mpmath.mpf(a), mpmath.mpf(b)
    lp0 = (mpmath.loggamma(n + b) + mpmath.loggamma(a + b)
           - mpmath.loggamma(n + a + b) - mpmath.loggamma(b))
    t = [mpmath.mpf(0)] * (n + 1)
    t[0] = mpmath.exp(lp0)
    for j in range(n):
        t[j + 1] = t[j] * (n - j) * (j + a) / ((j + 1) * (n - j - 1 + b))
    # The terms sum to 1 exactly; dividing by their sum removes the common
    # relative error of P(X = 0) from loggamma (about 1e-55).
    total = mpmath.fsum(t)
    return [x / total for x in t]


def pick(n, t):
    if n <= 12:
        return list(range(n + 1))
    mode = max(range(n + 1), key=lambda j: t[j]) if n <= 100000 else None
    ks = {0, 1, 2, n - 2, n - 1, n, n // 2, n // 3, (9 * n) // 10, n // 100}
    if mode is not None:
        ks |= {mode, max(0, mode - 1), min(n, mode + 1)}
    return sorted(k for k in ks if 0 <= k <= n)


def main():
    out = []
    for n, a, b in CASES:
        t = terms(n, a, b)
        # cumulative lower sums and separate upper sums
        low = [mpmath.mpf(0)] * (n + 1)
        s = mpmath.mpf(0)
        for j in range(n + 1):
            s += t[j]
            low[j] = s
        up = [mpmath.mpf(0)] * (n + 1)  # up[k] = P(X > k)
        s = mpmath.mpf(0)
        for j in range(n, -1, -1):
            up[j] = s
            s += t[j]
        for k in pick(n, t):
            lpmf = mpmath.log(t[k])
            # near 1 the lower tail is the complement of the small upper sum
            lcdf = mpmath.log1p(-up[k]) if up[k] < 0.5 else mpmath.log(low[k])
            if up[k] == 0:
                lsf = mpmath.ninf
            else:
                lsf = mpmath.log1p(-low[k]) if low[k] < 0.5 else mpmath.log(up[k])
            out.append((n, a, b, k, lpmf, lcdf, lsf))
    with open("testdata/betabinom_golden.tsv", "w") as f:
        f.write("# beta-binomial log PMF, log CDF and log survival: n a b k ln P(X=k) ln P(X<=k) ln P(X>k)\n")
        f.write("# generator: /usr/bin/python3 testdata/gen/betabinom_golden.py (full sums at 60 digits)\n")
        f.write("# tool: mpmath %s; date %s\n" % (mpmath.__version__, datetime.date.today()))
        for n, a, b, k, lpmf, lcdf, lsf in out:
            def fmt(v):
                if v == mpmath.ninf:
                    return "-Inf"
                return mpmath.nstr(v, 20, min_fixed=-1, max_fixed=1)
            f.write("%d\t%r\t%r\t%d\t%s\t%s\t%s\n" % (n, float(a), float(b), k, fmt(lpmf), fmt(lcdf), fmt(lsf)))


main()
