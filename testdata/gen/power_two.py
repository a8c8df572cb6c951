#!/usr/bin/python3
"""Exact power of two-sample tests (Fisher, Barnard, pooled z) by enumeration.

Writes ../power_two.tsv. For each case (n1, n2, p1, p2, alpha, alternative,
test) every table (x1, x2) is decided by SciPy's own test (p < alpha
rejects): scipy.stats.fisher_exact, scipy.stats.barnard_exact (pooled),
or the pooled z statistic against scipy.stats.norm; the power is the sum of
binomial probabilities of the rejected tables. Also a Fisher sample-size
scan n1 = n2 = nlo..nhi with the first and stable n reaching the target.

Run: /usr/bin/python3 testdata/gen/power_two.py   (from the repo root)
"""
import datetime, math, os
import numpy as np
import scipy
from scipy.stats import barnard_exact, binom, fisher_exact, norm

CASES = [
    # name, test, n1, n2, p1, p2, alpha, alternative
    ("f2", "fisher", 30, 30, 0.2, 0.5, 0.05, "two-sided"),
    ("fg", "fisher", 25, 40, 0.6, 0.3, 0.05, "greater"),
    ("z2", "z", 40, 40, 0.3, 0.55, 0.05, "two-sided"),
    ("zl", "z", 30, 20, 0.2, 0.5, 0.05, "less"),
    ("b2", "barnard", 15, 15, 0.2, 0.7, 0.05, "two-sided"),
    ("bg", "barnard", 12, 18, 0.6, 0.2, 0.05, "greater"),
]
SCAN = ("scan", 0.2, 0.6, 0.05, 10, 40, 0.80)  # Fisher two-sided, n1 = n2


def pvalue(test, x1, n1, x2, n2, alt):
    table = [[x1, n1 - x1], [x2, n2 - x2]]
    if test == "fisher":
        return fisher_exact(table, alternative=alt)[1]
    if test == "barnard":
        # barnard_exact takes the two samples as the columns of the table
        cols = [[x1, x2], [n1 - x1, n2 - x2]]
        return barnard_exact(cols, alternative=alt, pooled=True, n=64).pvalue
    s, N = x1 + x2, n1 + n2
    if s == 0 or s == N:
        z = 0.0
    else:
        p = s / N
        z = (x1 / n1 - x2 / n2) / math.sqrt(p * (1 - p) * (1 / n1 + 1 / n2))
    if alt == "greater":
        return norm.sf(z)
    if alt == "less":
        return norm.cdf(z)
    return 2 * norm.sf(abs(z))


def power(test, n1, n2, p1, p2, alpha, alt):
    b1, b2 = binom.pmf(np.arange(n1 + 1), n1, p1), binom.pmf(np.arange(n2 + 1), n2, p2)
    tot = 0.0
    for x1 in range(n1 + 1):
        for x2 in range(n2 + 1):
            if pvalue(test, x1, n1, x2, n2, alt) < alpha:
                tot += b1[x1] * b2[x2]
    return tot


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    lines = []
    for name, test, n1, n2, p1, p2, alpha, alt in CASES:
        pw = power(test, n1, n2, p1, p2, alpha, alt)
        lines.append(f"{name}\t{test}\t{n1}\t{n2}\t{p1}\t{p2}\t{alpha}\t{alt}\t{pw:.15g}")
    name, p1, p2, alpha, nlo, nhi, target = SCAN
    pws = []
    for n in range(nlo, nhi + 1):
        pw = power("fisher", n, n, p1, p2, alpha, "two-sided")
        pws.append(pw)
        lines.append(f"{name}\tfisher\t{n}\t{n}\t{p1}\t{p2}\t{alpha}\ttwo-sided\t{pw:.15g}")
    first = next(nlo + i for i, v in enumerate(pws) if v >= target)
    stable = max(nlo + i for i, v in enumerate(pws) if v < target) + 1
    with open(os.path.join(here, "..", "power_two.tsv"), "w") as fh:
        fh.write("# Exact power of two-sample tests by enumeration of all tables, each decided by SciPy's\n")
        fh.write("# fisher_exact, barnard_exact (pooled, n = 64) or the pooled z (reject when p < alpha).\n")
        fh.write("# Generator: /usr/bin/python3 testdata/gen/power_two.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}, NumPy {np.__version__}; date {datetime.date.today()}\n")
        fh.write(f"# case scan\tp1={p1}\tp2={p2}\talpha={alpha}\tnlo={nlo}\tnhi={nhi}\ttarget={target}\tfirst={first}\tstable={stable}\n")
        fh.write("# columns: case\ttest\tn1\tn2\tp1\tp2\talpha\talternative\tpower\n")
        fh.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
