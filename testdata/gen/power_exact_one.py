#!/usr/bin/python3
"""Exact power of one-sample exact binomial tests by full enumeration.

Writes ../power_exact_one.tsv: for each case (p0, p1, alpha, alternative,
two-sided method, mid-p) and every n = 1..nmax, the exact power and size of
the test that rejects k when its p-value is below alpha, with p-values
computed here from SciPy's binomial pmf (outcome by outcome, no region
reuse), and the first and stable n reaching the target power.

Run: /usr/bin/python3 testdata/gen/power_exact_one.py   (from the repo root)
"""
import datetime, os
import numpy as np
import scipy
from scipy.stats import binom

REL = 1e-7  # "as or more extreme" tolerance, common practice

CASES = [
    # name, p0, p1, alpha, alternative, method, mid, nmax, target
    ("pp2", 0.5, 0.7, 0.05, "two-sided", "point-probability", 0, 150, 0.80),
    ("gt", 0.2, 0.35, 0.05, "greater", "point-probability", 0, 200, 0.80),
    ("lt", 0.3, 0.15, 0.05, "less", "point-probability", 0, 200, 0.80),
    ("central", 0.1, 0.25, 0.05, "two-sided", "central", 0, 200, 0.80),
    ("blaker", 0.4, 0.6, 0.05, "two-sided", "blaker", 0, 150, 0.80),
    ("midp", 0.5, 0.65, 0.05, "two-sided", "point-probability", 1, 150, 0.80),
    ("gt01", 0.02, 0.08, 0.01, "greater", "point-probability", 0, 300, 0.90),
    ("saw", 0.5, 0.75, 0.05, "two-sided", "point-probability", 0, 150, 0.80),
]


def pvalues(n, p0, alt, method, mid):
    k = np.arange(n + 1)
    f = binom.pmf(k, n, p0)
    cdf = binom.cdf(k, n, p0)
    sf = binom.sf(k - 1, n, p0)  # P(X >= k)
    if alt == "less":
        return cdf - f / 2 if mid else cdf
    if alt == "greater":
        return sf - f / 2 if mid else sf
    if method == "central":
        lo = cdf - f / 2 if mid else cdf
        hi = sf - f / 2 if mid else sf
        return np.minimum(1.0, 2 * np.minimum(lo, hi))
    e = f if method == "point-probability" else np.minimum(cdf, sf)
    out = np.empty(n + 1)
    for i in range(n + 1):
        le = e <= e[i] * (1 + REL)
        if not mid:
            out[i] = f[le].sum()
        else:
            lt = e < e[i] * (1 - REL)
            eq = le & ~lt
            out[i] = f[lt].sum() + f[eq].sum() / 2
    return np.minimum(out, 1.0)


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(here, "..", "power_exact_one.tsv")
    rows, summary = [], []
    for name, p0, p1, alpha, alt, method, mid, nmax, target in CASES:
        pw = []
        for n in range(1, nmax + 1):
            pv = pvalues(n, p0, alt, method, mid)
            rej = pv < alpha
            k = np.arange(n + 1)
            power = binom.pmf(k, n, p1)[rej].sum()
            size = binom.pmf(k, n, p0)[rej].sum()
            pw.append(power)
            rows.append(f"{name}\t{n}\t{power:.15g}\t{size:.15g}")
        first = next(i + 1 for i, v in enumerate(pw) if v >= target)
        last_fail = max([i + 1 for i, v in enumerate(pw) if v < target])
        summary.append(f"# case {name}\tp0={p0}\tp1={p1}\talpha={alpha}\t{alt}\t{method}\tmid={mid}\tnmax={nmax}\ttarget={target}\tfirst={first}\tstable={last_fail + 1}")
    with open(path, "w") as fh:
        fh.write("# Exact power and size of one-sample exact binomial tests, n = 1..nmax, by\n")
        fh.write("# enumeration of every outcome with p-values recomputed per outcome (reject when p < alpha;\n")
        fh.write("# ties within relative 1e-7 count as equally extreme).\n")
        fh.write("# Generator: /usr/bin/python3 testdata/gen/power_exact_one.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}, NumPy {np.__version__}; date {datetime.date.today()}\n")
        fh.write("# 'stable' = 1 + the last n <= nmax below the target (valid when nmax is well beyond it).\n")
        for s in summary:
            fh.write(s + "\n")
        fh.write("# columns: case\tn\tpower\tsize\n")
        fh.write("\n".join(rows) + "\n")


if __name__ == "__main__":
    main()
