#!/usr/bin/python3
"""Golden values of the binomial distribution for package binom.

Writes testdata/binom_golden.tsv: for each case (n, p, k) the natural logs
of P(X = k), P(X <= k) and P(X > k), X ~ Binomial(n, p), to 22 significant
digits, computed with mpmath (Debian python3-mpmath):

  * n <= 3000: exact tail sums of all n+1 terms at 60 digits, with p taken as
    the exact binary value of the double and q = 1 - p exact at that
    precision;
  * n > 3000: the regularized incomplete beta P(X <= k) = I_q(n-k, k+1) and
    P(X > k) = I_p(k+1, n-k) as integrals of t^a (1-t)^b over the logit
    u = ln(t/(1-t)), by mpmath.quad at 40 digits on pieces laid out from the
    integrand's maximum (width 1/sqrt(ab/(a+b)), growing geometrically) until
    the integrand has dropped by e^-120, normalised by ln B(a, b) from
    mpmath.loggamma. Both tails are integrated directly; the script checks
    that they add up to 1 (to 1e-24) and that the quadrature agrees with the
    exact sums at n = 3000, then writes the larger tail as the complement of
    the smaller at full precision.

Run: /usr/bin/python3 testdata/gen/binom_golden.py  (about four minutes of
CPU in two processes; longer in wall time on a loaded machine).
The PMF is ln C(n, k) + k ln p + (n-k) ln q from mpmath.loggamma at 50
digits.
"""
import datetime
import math
import multiprocessing
import os
import sys

import mpmath as mp

NINF = float("-inf")


def fmt(v):
    if v == mp.ninf:
        return "-inf"
    return mp.nstr(v, 22, min_fixed=-1, max_fixed=-1, strip_zeros=False)


def log_pmf(n, p, k):
    with mp.workdps(50):
        if k < 0 or k > n:
            return mp.ninf
        P = mp.mpf(p)
        Q = 1 - P
        if P == 0:
            return mp.mpf(0) if k == 0 else mp.ninf
        if Q == 0:
            return mp.mpf(0) if k == n else mp.ninf
        lc = mp.loggamma(n + 1) - mp.loggamma(k + 1) - mp.loggamma(n - k + 1)
        return lc + k * mp.log(P) + (n - k) * mp.log(Q)


def trivial_tails(n, p, k):
    """Tails that need no summation, or None."""
    if k < 0:
        return mp.ninf, mp.mpf(0)
    if k >= n:
        return mp.mpf(0), mp.ninf
    if p == 0:
        return mp.mpf(0), mp.ninf
    if p == 1:
        return mp.ninf, mp.mpf(0)
    return None


def exact_tails(n, p, ks):
    """ln P(X <= k), ln P(X > k) for each k by summing all n+1 terms."""
    out = {}
    if p == 0 or p == 1:
        return {k: trivial_tails(n, p, k) for k in ks}
    with mp.workdps(60):
        P = mp.mpf(p)
        Q = 1 - P
        terms = []
        t = Q**n
        for j in range(n + 1):
            terms.append(t)
            t = t * (n - j) / (j + 1) * P / Q
        for k in ks:
            tr = trivial_tails(n, p, k)
            if tr is not None:
                out[k] = tr
                continue
            lo = mp.fsum(terms[: k + 1])
            hi = mp.fsum(terms[k + 1 :])
            # The larger tail as the complement of the smaller, which the
            # sum holds to full relative precision (as in quad_tails).
            if lo < hi:
                out[k] = (mp.log(lo), mp.log1p(-lo))
            else:
                out[k] = (mp.log1p(-hi), mp.log(hi))
    return out


def quad_tails(n, p, k):
    """ln I_q(n-k, k+1) and ln I_p(k+1, n-k) by quadrature in the logit."""
    tr = trivial_tails(n, p, k)
    if tr is not None:
        return tr
    with mp.workdps(40):
        a = mp.mpf(n - k)
        b = mp.mpf(k + 1)
        mu = a + b
        P = mp.mpf(p)
        Q = 1 - P
        ux = mp.log(Q / P)

        def g(u):  # ln(t^a (1-t)^b), t = 1/(1+e^-u)
            if u < 0:
                return a * u - mu * mp.log1p(mp.exp(u))
            return (a - mu) * u - mu * mp.log1p(mp.exp(-u))

        def gp(u):
            return a - mu / (1 + mp.exp(-u))

        us = mp.log(a / b)
        w = mp.sqrt(mu / (a * b))
        lnB = mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(mu)

        def side(lo, hi):
            if lo < us < hi:
                start = us
            elif us <= lo:
                start = lo
            else:
                start = hi
            gref = g(start)
            res = mp.mpf(0)
            for direction, end in ((-1, lo), (1, hi)):
                if (direction == -1 and start <= lo) or (direction == 1 and start >= hi):
                    continue
                slope = abs(gp(start))
                h = w if slope * w < 1 else 1 / slope
                x0 = start
                pts = [x0]
                while True:
                    x1 = x0 + direction * h
                    if direction == -1 and x1 < end:
                        x1 = end
                    if direction == 1 and x1 > end:
                        x1 = end
                    pts.append(x1)
                    if x1 == end or g(x1) - gref < -120:
                        break
                    x0 = x1
                    h *= 1.6
                pts.sort()
                res += mp.quad(lambda u: mp.exp(g(u) - gref), pts)
            return gref + mp.log(res) - lnB

        lo, hi = side(-mp.inf, ux), side(ux, mp.inf)
        # Self-check: the tails are integrated separately and must add to 1.
        s = mp.exp(lo) + mp.exp(hi)
        assert abs(s - 1) < mp.mpf(10) ** -24, (n, p, k, s)
        # The larger tail (at least about 1/2) is written as the complement
        # of the smaller, which the quadrature resolves to full relative
        # precision; integrated directly it carries an absolute error near
        # 1e-28 that would show as noise in a log close to 0.
        if lo < hi:
            hi = mp.log1p(-mp.exp(lo))
        else:
            lo = mp.log1p(-mp.exp(hi))
        return lo, hi


def kl_points(n, p, levels):
    """k with n KL(k/n || p) near each level, on both sides of the mean."""
    out = []
    if p <= 0 or p >= 1:
        return out

    def kl(x):
        r = 0.0
        if x > 0:
            r += x * math.log(x / p)
        if x < 1:
            r += (1 - x) * (math.log1p(-x) - math.log1p(-p))
        return n * r

    for L in levels:
        for lo, hi in ((0.0, p), (p, 1.0)):
            if kl(lo if lo < p else hi) < L:
                continue
            a, b = lo, hi
            for _ in range(200):
                m = 0.5 * (a + b)
                if (kl(m) > L) == (lo < p):
                    a = m
                else:
                    b = m
            out.append(int(round(n * 0.5 * (a + b))))
    return out


SMALL_N = [0, 1, 2, 3, 5, 10, 17, 30, 50, 100, 250, 1000, 3000]
LARGE_N = [5000, 10**5, 10**6, 10**8, 10**9, 10**10, 10**12, 999999999989]
PS = [0.0, 1e-15, 3e-13, 1e-10, 1e-7, 1e-4, 0.003, 0.05, 0.1, 0.25, 1 / 3, 0.5, 0.6, 0.9,
      0.999, 1 - 1e-7, 1 - 1e-12, 1 - 1e-15, 1.0]
ZS = [-40, -9, -4, -1.5, -0.3, 0.3, 1.5, 4, 9, 40]
LEVELS = [30, 745, 1e4, 1e5]


def ks_for(n, p, large):
    ks = {-1, 0, 1, 2, n - 2, n - 1, n, n + 1}
    if n <= 30 and not large:
        ks.update(range(n + 1))
    mean = n * p
    sd = math.sqrt(n * p * (1 - p))
    mode = math.floor((n + 1) * p)
    ks.update({mode - 1, mode, mode + 1})
    for z in (ZS if not large else ZS[1:-1]):
        ks.add(int(round(mean + z * sd)))
    ks.update(kl_points(n, p, LEVELS))
    return sorted(k for k in ks if -1 <= k <= n + 1)


def small_cases(args):
    n, p = args
    ks = ks_for(n, p, False)
    tails = exact_tails(n, p, ks)
    return [(n, p, k, log_pmf(n, p, k)) + tails[k] for k in ks]


def large_case(args):
    n, p, k = args
    return (n, p, k, log_pmf(n, p, k)) + quad_tails(n, p, k)


def main():
    mp.mp.dps = 32
    # Cross-check of the two methods at n = 3000 before anything is written.
    for p, k in ((0.3, 900), (0.3, 700), (0.001, 2), (0.999, 2990)):
        ex = exact_tails(3000, p, [k])[k]
        qu = quad_tails(3000, p, k)
        for e, q in zip(ex, qu):
            assert abs(e - q) <= mp.mpf(10) ** -24 * max(1, abs(e)), (p, k, e, q)
    small = [(n, p) for n in SMALL_N for p in PS]
    large = [(n, p, k) for n in LARGE_N for p in PS for k in ks_for(n, p, True)]
    with multiprocessing.Pool(2) as pool:
        rows = [r for rs in pool.map(small_cases, small) for r in rs]
        rows += pool.map(large_case, large, chunksize=8)
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "..", "binom_golden.tsv")
    with open(path, "w") as f:
        f.write("# Binomial golden values: ln P(X = k), ln P(X <= k), ln P(X > k) for X ~ Binomial(n, p).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/binom_golden.py (exact sums for n <= 3000,\n")
        f.write("# incomplete-beta quadrature for larger n; see the script's docstring).\n")
        f.write("# Tool: mpmath %s, Python %s; date %s.\n" % (
            mp.__version__, sys.version.split()[0], datetime.date.today().isoformat()))
        f.write("# p is the shortest decimal of the double used; -inf marks a zero probability.\n")
        f.write("# n\tp\tk\tlnpmf\tlncdf\tlnsf\n")
        for n, p, k, lp, lc, ls in rows:
            f.write("%d\t%r\t%d\t%s\t%s\t%s\n" % (n, p, k, fmt(lp), fmt(lc), fmt(ls)))
    print("wrote %d cases to %s" % (len(rows), os.path.normpath(path)))


if __name__ == "__main__":
    main()
