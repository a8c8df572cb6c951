#!/usr/bin/python3
"""Golden values of the hypergeometric distribution for binom.Hyper.

Writes testdata/hyper_golden.tsv: for population N, successes K, draws n
and a value x, the natural logs of P(X = x), P(X <= x) and P(X > x).

Method (independent of the Go code): for N <= 400 every probability is an
exact rational number (Python integers, math.comb) summed exactly and
converted to a logarithm with mpmath at 50 digits. For larger N the PMF is
exp(lgamma differences) in mpmath at 50 digits (50 digits leave about 35
after the cancellation of lgamma at N = 1e6), and a tail is the sum of the
terms outward from the point of the range nearest the mode, by the exact
ratio recurrence in 50-digit arithmetic, stopped when the geometric bound on
the remainder falls below 1e-45 of the partial sum.

Run from the repository root:  /usr/bin/python3 testdata/gen/hyper_golden.py
"""
import datetime
import math
from fractions import Fraction

import mpmath

mpmath.mp.dps = 50
EXACT_MAX = 400


def support(N, K, n):
    return max(0, n - (N - K)), min(n, K)


def mode(N, K, n):
    return (n + 1) * (K + 1) // (N + 2)


def log_exact_range(N, K, n, a, b):
    lo, hi = support(N, K, n)
    a, b = max(a, lo), min(b, hi)
    if a > b:
        return mpmath.mpf("-inf")
    s = sum(math.comb(K, x) * math.comb(N - K, n - x) for x in range(a, b + 1))
    f = Fraction(s, math.comb(N, n))
    return mpmath.log(mpmath.mpf(f.numerator)) - mpmath.log(mpmath.mpf(f.denominator))


def logpmf_mp(N, K, n, x):
    lg = mpmath.loggamma
    return (lg(K + 1) - lg(x + 1) - lg(K - x + 1) + lg(N - K + 1) - lg(n - x + 1)
            - lg(N - K - n + x + 1) - lg(N + 1) + lg(n + 1) + lg(N - n + 1))


def log_mp_range(N, K, n, a, b):
    lo, hi = support(N, K, n)
    a, b = max(a, lo), min(b, hi)
    if a > b:
        return mpmath.mpf("-inf")
    c = min(max(mode(N, K, n), a), b)
    l0 = logpmf_mp(N, K, n, c)
    tol = mpmath.mpf(10) ** -45
    s = mpmath.mpf(1)
    # downward from c
    t = mpmath.mpf(1)
    j = c
    while j > a:
        r = mpmath.mpf(j * (N - K - n + j)) / ((K - j + 1) * (n - j + 1))
        t *= r
        j -= 1
        s += t
        if r < 1 and t * r / (1 - r) < tol * s:
            break
    t = mpmath.mpf(1)
    j = c
    while j < b:
        r = mpmath.mpf((K - j) * (n - j)) / ((j + 1) * (N - K - n + j + 1))
        t *= r
        j += 1
        s += t
        if r < 1 and t * r / (1 - r) < tol * s:
            break
    return l0 + mpmath.log(s)


def values(N, K, n, x):
    lo, hi = support(N, K, n)
    rng = log_exact_range if N <= EXACT_MAX else log_mp_range
    return rng(N, K, n, x, x), rng(N, K, n, lo, x), rng(N, K, n, x + 1, hi)


def xs_for(N, K, n):
    lo, hi = support(N, K, n)
    if hi - lo <= 40:
        return list(range(lo - 1, hi + 2))
    m = mode(N, K, n)
    mean = n * K / N
    var = n * K * (N - K) * (N - n) / (N * N * (N - 1))
    sd = math.sqrt(var)
    pts = {lo - 1, lo, lo + 1, lo + 2, hi - 2, hi - 1, hi, hi + 1, m - 1, m, m + 1}
    for z in (0.5, 1, 2, 3, 5, 8, 12, 20, 30, 45, 70):
        pts.add(int(round(mean + z * sd)))
        pts.add(int(round(mean - z * sd)))
    for f in (0.01, 0.1, 0.25, 0.5, 0.75, 0.9, 0.99):
        pts.add(lo + int(f * (hi - lo)))
    return sorted(x for x in pts if lo - 1 <= x <= hi + 1)


def params():
    out = set()
    for N in (0, 1, 2, 3, 4, 5, 7, 10, 20, 37, 50, 100, 400, 1000, 10000, 100000, 1000000):
        fr = (0, 1, 2, N // 100, N // 10, N // 3, N // 2, N - N // 3, N - 1, N)
        for K in fr:
            for n in fr:
                if 0 <= K <= N and 0 <= n <= N:
                    out.add((N, K, n))
    # Asymmetric and tea-tasting style tables.
    out.update({(8, 4, 4), (30, 19, 15), (1000000, 3, 500000), (1000000, 999990, 17),
                (1000000, 250000, 10000), (123457, 61728, 40000)})
    return sorted(out)


def fmt(v):
    if v == mpmath.mpf("-inf"):
        return "-Inf"
    if v == 0:
        return "0"
    return mpmath.nstr(v, 22, min_fixed=1, max_fixed=0)


def main():
    lines = []
    ps = params()
    for N, K, n in ps:
        # keep the large-N set moderate in size
        xs = xs_for(N, K, n)
        for x in xs:
            lp, lc, ls = values(N, K, n, x)
            lines.append(f"{N}\t{K}\t{n}\t{x}\t{fmt(lp)}\t{fmt(lc)}\t{fmt(ls)}")
    with open("testdata/hyper_golden.tsv", "w") as f:
        f.write("# Hypergeometric log PMF, log CDF ln P(X <= x) and log survival ln P(X > x).\n")
        f.write("# Columns: N (total) K (successes) n (draws) x logpmf logcdf logsf; -Inf where 0.\n")
        f.write(f"# Exact rational sums for N <= {EXACT_MAX}; 50-digit mpmath sums beyond (see generator).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/hyper_golden.py\n")
        f.write(f"# Tool: mpmath {mpmath.__version__} at {mpmath.mp.dps} digits; date {datetime.date.today()}\n")
        for line in lines:
            f.write(line + "\n")
    print(len(lines), "rows")


if __name__ == "__main__":
    main()
