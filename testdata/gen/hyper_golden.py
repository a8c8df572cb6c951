#!/usr/bin/python3
"""Golden values of the hypergeometric distributions for binom.Hyper and
binom.NoncentralHyper.

Writes testdata/hyper_golden.tsv (central) and
testdata/binom_extra_noncentral.tsv (Fisher's noncentral; method described
above main_noncentral). The central file holds, for population N, successes K, draws n
and a value x, the natural logs of P(X = x), P(X <= x) and P(X > x).

Method (independent of the Go code): for N <= 400 every probability is an
exact rational number (Python integers, math.comb) summed exactly and
converted to a logarithm with mpmath at 50 digits. For larger N the PMF is
exp(lgamma differences) in mpmath at 50 digits (50 digits leave about 32
after the cancellation of lgamma at N = 2^53), and a tail is the sum of the
terms outward from the point of the range nearest the mode, by the exact
ratio recurrence in 50-digit arithmetic, stopped when the geometric bound on
the remainder falls below 1e-45 of the partial sum.

Run from the repository root:  /usr/bin/python3 testdata/gen/hyper_golden.py [central|noncentral]
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
    # Beyond 1e6: huge populations with modest spreads.
    out.update({(10**9, 3 * 10**8, 10**4), (10**12, 3 * 10**11, 10**6), (10**12, 10**6, 5 * 10**11),
                (2**53, 2**52, 1000), (10**12, 7, 10**11)})
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


# ---------------------------------------------------------------------------
# Fisher's noncentral hypergeometric distribution, for binom.NoncentralHyper:
# testdata/binom_extra_noncentral.tsv. Every weight C(K,x) C(N-K,n-x) psi^x
# over the whole support is summed in 50-digit arithmetic (ratio recurrence
# from the bottom of the support; mpmath has no underflow), so the
# normalisation is complete rather than truncated.

NC_PARAMS = [
    (8, 4, 4, "0.1"), (8, 4, 4, "2.5"), (8, 4, 4, "10"),
    (30, 19, 15, "0.01"), (30, 19, 15, "0.5"), (30, 19, 15, "3"), (30, 19, 15, "100"),
    (50, 20, 20, "1e-300"), (50, 20, 20, "1e+300"), (50, 20, 20, "1.0000001"),
    (100, 40, 30, "1e-05"), (100, 40, 30, "0.3"), (100, 40, 30, "7"),
    (1000, 300, 200, "0.001"), (1000, 300, 200, "0.9"), (1000, 300, 200, "1.1"), (1000, 300, 200, "50"),
    (100000, 5000, 40000, "0.2"), (100000, 5000, 40000, "5"),
    (1000000, 500000, 500000, "0.999"), (1000000, 500000, 500000, "1.01"), (1000000, 500000, 500000, "1000"),
    (1000000, 3, 500000, "1000000"), (1000000, 999990, 17, "0.0001"),
]


def nc_terms(N, K, n, psi):
    lo, hi = support(N, K, n)
    t = mpmath.mpf(1)
    ts = [t]
    for j in range(lo, hi):
        t = t * psi * (K - j) * (n - j) / ((j + 1) * (N - K - n + j + 1))
        ts.append(t)
    return lo, hi, ts


def nc_rows(N, K, n, psis):
    psi = mpmath.mpf(float(psis))
    lo, hi, ts = nc_terms(N, K, n, psi)
    # log of the central weight at lo (the terms above are relative to it)
    Z = mpmath.fsum(ts)
    mean = mpmath.fsum(t * (lo + i) for i, t in enumerate(ts)) / Z
    var = mpmath.fsum(t * (lo + i - mean) ** 2 for i, t in enumerate(ts)) / Z
    cum = [mpmath.mpf(0)] * (len(ts) + 1)  # cum[i] = sum ts[:i]
    acc = mpmath.mpf(0)
    for i, t in enumerate(ts):
        acc += t
        cum[i + 1] = acc
    # upper sums computed from the top, so small upper tails are exact
    up = [mpmath.mpf(0)] * (len(ts) + 1)  # up[i] = sum ts[i:]
    acc = mpmath.mpf(0)
    for i in range(len(ts) - 1, -1, -1):
        acc += ts[i]
        up[i] = acc
    sd = mpmath.sqrt(var)
    if hi - lo <= 40:
        xs = list(range(lo - 1, hi + 2))
    else:
        pts = {lo - 1, lo, lo + 1, hi - 1, hi, hi + 1}
        for z in (0, 0.5, 1, 2, 3, 5, 8, 12, 20, 35):
            pts.add(int(mean + z * sd))
            pts.add(int(mean - z * sd))
        xs = sorted(x for x in pts if lo - 1 <= x <= hi + 1)
    rows = [f"mom\t{N}\t{K}\t{n}\t{psis}\t{fmt(mean)}\t{fmt(var)}"]
    ninf = mpmath.mpf("-inf")
    for x in xs:
        i = x - lo
        if x < lo:
            lp, lc, ls = ninf, ninf, mpmath.mpf(0)
        elif x > hi:
            lp, lc, ls = ninf, mpmath.mpf(0), ninf
        else:
            lp = mpmath.log(ts[i] / Z)
            lc = mpmath.log(cum[i + 1] / Z) if x < hi else mpmath.mpf(0)
            ls = mpmath.log(up[i + 1] / Z) if x < hi else ninf
        rows.append(f"pmf\t{N}\t{K}\t{n}\t{psis}\t{x}\t{fmt(lp)}\t{fmt(lc)}\t{fmt(ls)}")
    return rows


def main_noncentral():
    lines = []
    for N, K, n, psis in NC_PARAMS:
        lines.extend(nc_rows(N, K, n, psis))
    with open("testdata/binom_extra_noncentral.tsv", "w") as f:
        f.write("# Fisher's noncentral hypergeometric distribution (odds ratio psi).\n")
        f.write("# Rows 'mom': N K n psi mean variance. Rows 'pmf': N K n psi x logpmf logcdf logsf; -Inf where 0.\n")
        f.write("# psi is the float64 nearest the decimal shown; full-support 50-digit sums (see generator).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/hyper_golden.py\n")
        f.write(f"# Tool: mpmath {mpmath.__version__} at {mpmath.mp.dps} digits; date {datetime.date.today()}\n")
        for line in lines:
            f.write(line + "\n")
    print(len(lines), "noncentral rows")


if __name__ == "__main__":
    import sys
    # "central" or "noncentral" regenerates one file only; default both.
    if sys.argv[1:] != ["noncentral"]:
        main()
    if sys.argv[1:] != ["central"]:
        main_noncentral()
