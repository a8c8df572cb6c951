#!/usr/bin/python3
"""Golden values of P(|X/n - p| <= eps) for binom.Dist.ProportionWithin.

Writes testdata/binom_extra_within.tsv: n, p, eps (as the shortest decimals
that print the doubles, Python repr), kmin, kmax and the probability.

The k range is decided in exact rational arithmetic on the decimals:
kmin = max(0, ceil(n (p - eps))), kmax = min(n, floor(n (p + eps))).
The probability is that of the binomial with the double p (its exact binary
value): an exact rational sum for n <= 100, else a 50-digit mpmath sum of
the PMF outward from the point of the range nearest the mode, stopped when
the geometric bound on the rest falls below 1e-45 of the partial sum.

Run from the repository root:  /usr/bin/python3 testdata/gen/binom_extra_within.py
"""
import datetime
import math
from fractions import Fraction

import mpmath

mpmath.mp.dps = 50


def krange(n, p, eps):
    pr, er = Fraction(repr(p)), Fraction(repr(eps))
    return max(0, math.ceil(n * (pr - er))), min(n, math.floor(n * (pr + er)))


def prob_exact(n, p, a, b):
    pf = Fraction(p)
    return sum(math.comb(n, k) * pf ** k * (1 - pf) ** (n - k) for k in range(a, b + 1))


def prob_mp(n, p, a, b):
    pm = mpmath.mpf(p)
    qm = 1 - pm
    m = min(max(int((n + 1) * p), a), b)
    l0 = (mpmath.loggamma(n + 1) - mpmath.loggamma(m + 1) - mpmath.loggamma(n - m + 1)
          + m * mpmath.log(pm) + (n - m) * mpmath.log(qm))
    tol = mpmath.mpf(10) ** -45
    s = mpmath.mpf(1)
    t, k = mpmath.mpf(1), m
    while k > a:
        r = k * qm / ((n - k + 1) * pm)
        t *= r
        k -= 1
        s += t
        if r < 1 and t * r / (1 - r) < tol * s:
            break
    t, k = mpmath.mpf(1), m
    while k < b:
        r = (n - k) * pm / ((k + 1) * qm)
        t *= r
        k += 1
        s += t
        if r < 1 and t * r / (1 - r) < tol * s:
            break
    return mpmath.exp(l0) * s


def main():
    ns = [1, 2, 3, 10, 20, 50, 99, 100, 400, 1000, 2000, 12345, 100000, 1000000]
    ps = [0.3, 0.5, 0.1, 0.7, 0.01, 0.999, 0.05, 1e-3, 0.25]
    epss = [0.1, 0.05, 0.01, 0.2, 0.03, 0.001, 0.25, 0.0, 0.5, 0.15]
    rows = []
    for n in ns:
        for p in ps:
            for eps in epss:
                a, b = krange(n, p, eps)
                if a > b:
                    v = mpmath.mpf(0)
                elif a == 0 and b == n:
                    v = mpmath.mpf(1)
                elif n <= 100:
                    f = prob_exact(n, p, a, b)
                    v = mpmath.mpf(f.numerator) / f.denominator
                else:
                    v = prob_mp(n, p, a, b)
                rows.append(f"{n}\t{p!r}\t{eps!r}\t{a}\t{b}\t{mpmath.nstr(v, 22, min_fixed=1, max_fixed=0)}")
    with open("testdata/binom_extra_within.tsv", "w") as f:
        f.write("# P(|X/n - p| <= eps) for X binomial(n, p): columns n p eps kmin kmax probability.\n")
        f.write("# k range exact on the decimals p and eps; probability with the double p (see generator).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/binom_extra_within.py\n")
        f.write(f"# Tool: Python fractions and mpmath {mpmath.__version__} at {mpmath.mp.dps} digits; date {datetime.date.today()}\n")
        for r in rows:
            f.write(r + "\n")
    print(len(rows), "rows")


if __name__ == "__main__":
    main()
