#!/usr/bin/python3
"""Exact power of McNemar's exact conditional (and mid-p) test by enumeration.

Writes ../power_paired.tsv: for each case (p10, p01, alpha, alternative, mid)
and n = 1..nmax pairs, the power, summing the multinomial probabilities of
all (n10, n01) whose conditional p-value (Binomial(n10 + n01, 1/2), two-sided
as twice the smaller tail, capped at 1) is below alpha, and the first and
stable n reaching the target.

Run: /usr/bin/python3 testdata/gen/power_paired.py   (from the repo root)
"""
import datetime, math, os
import numpy as np
import scipy
from scipy.special import gammaln
from scipy.stats import binom, norm

CASES = [
    # name, p10, p01, alpha, alternative, mid, nmax, target
    ("ex2", 0.25, 0.10, 0.05, "two-sided", 0, 200, 0.80),
    ("mid2", 0.20, 0.05, 0.05, "two-sided", 1, 160, 0.80),
    ("gt", 0.15, 0.05, 0.05, "greater", 0, 220, 0.80),
    # mid = 2: the asymptotic chi-square test, z = (n10 - n01)/sqrt(n10 + n01)
    ("asy", 0.22, 0.10, 0.05, "two-sided", 2, 200, 0.80),
]


def pval(x, d, alt, mid):
    if d == 0:
        return 1.0
    if mid == 2:
        z = (2 * x - d) / math.sqrt(d)
        if alt == "greater":
            return norm.sf(z)
        if alt == "less":
            return norm.cdf(z)
        return 2 * norm.sf(abs(z))
    f = binom.pmf(x, d, 0.5)
    lo = binom.cdf(x, d, 0.5) - (f / 2 if mid else 0)
    hi = binom.sf(x - 1, d, 0.5) - (f / 2 if mid else 0)
    if alt == "greater":
        return hi
    if alt == "less":
        return lo
    return min(1.0, 2 * min(lo, hi))


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    rows, summary = [], []
    for name, p10, p01, alpha, alt, mid, nmax, target in CASES:
        # rej[a, b]: the table with n10 = a, n01 = b is rejected
        rej = np.zeros((nmax + 1, nmax + 1), dtype=bool)
        for a in range(nmax + 1):
            for b in range(nmax + 1 - a):
                rej[a, b] = pval(a, a + b, alt, mid) < alpha
        pw = []
        A, B = np.meshgrid(np.arange(nmax + 1), np.arange(nmax + 1), indexing="ij")
        for n in range(1, nmax + 1):
            m = (A + B <= n) & rej
            a, b = A[m], B[m]
            c = n - a - b
            lp = (gammaln(n + 1) - gammaln(a + 1) - gammaln(b + 1) - gammaln(c + 1)
                  + a * np.log(p10) + b * np.log(p01) + c * np.log1p(-(p10 + p01)))
            tot = float(np.exp(lp).sum())
            pw.append(tot)
            rows.append(f"{name}\t{n}\t{tot:.15g}")
        first = next(i + 1 for i, v in enumerate(pw) if v >= target)
        last_fail = max(i + 1 for i, v in enumerate(pw) if v < target)
        summary.append(f"# case {name}\tp10={p10}\tp01={p01}\talpha={alpha}\t{alt}\tmid={mid}\tnmax={nmax}\ttarget={target}\tfirst={first}\tstable={last_fail + 1}")
    with open(os.path.join(here, "..", "power_paired.tsv"), "w") as fh:
        fh.write("# Exact power of McNemar's exact conditional test (two-sided: twice the smaller\n")
        fh.write("# Binomial(d, 1/2) tail; mid=1: mid-p; mid=2: asymptotic chi-square, z = (n10-n01)/sqrt(n10+n01)),\n# reject when p < alpha, n = 1..nmax pairs,\n")
        fh.write("# by enumeration of every (n10, n01) with multinomial probabilities.\n")
        fh.write("# Generator: /usr/bin/python3 testdata/gen/power_paired.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}, NumPy {np.__version__}; date {datetime.date.today()}\n")
        for s in summary:
            fh.write(s + "\n")
        fh.write("# columns: case\tn\tpower\n")
        fh.write("\n".join(rows) + "\n")


if __name__ == "__main__":
    main()
