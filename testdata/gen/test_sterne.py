#!/usr/bin/python3
"""Golden Sterne intervals (inversions of the point-probability binomial test).

Writes testdata/test_sterne.tsv. Rows (tab-separated):

  sterne k n lower upper gaps

the hull [lower, upper] of {p0 : scipy.stats.binomtest(k, n, p0).pvalue >=
0.05} (two-sided, point probability with relative tolerance 1e-7), and
gaps = 1 when some p0 inside the hull is rejected. Method, independent of
the Go code: the p-value is evaluated on a grid of 20001 values of p0;
each end is the outermost accept/reject transition, refined by 60 steps of
bisection with binomtest; gaps are transitions seen on the grid between.

Run from the repository root:  /usr/bin/python3 testdata/gen/test_sterne.py
"""
import datetime

import numpy as np
import scipy
import scipy.stats as st


def acc(k, n, p):
    return st.binomtest(k, n, p).pvalue >= 0.05


def bisect(k, n, a, b):
    """a rejected, b accepted: the boundary, returned on the accepted side."""
    for _ in range(60):
        m = 0.5 * (a + b)
        if acc(k, n, m):
            b = m
        else:
            a = m
    return b


def main():
    rows = []
    g = np.linspace(0, 1, 20001)[1:-1]
    for n in [3, 5, 8, 10, 15, 20, 30, 50]:
        for k in sorted({0, 1, 2, n // 4, n // 3, n // 2, n - 1, n}):
            a = np.array([acc(k, n, p) for p in g])
            idx = np.nonzero(a)[0]
            i0, i1 = idx[0], idx[-1]
            lo = 0.0 if k == 0 else bisect(k, n, g[i0 - 1], g[i0])
            hi = 1.0 if k == n else bisect(k, n, g[i1 + 1], g[i1])
            gaps = int(not a[i0:i1 + 1].all())
            rows.append(["sterne", k, n, repr(float(lo)), repr(float(hi)), gaps])
    with open("testdata/test_sterne.tsv", "w") as f:
        f.write("# Sterne intervals: hulls of the p0 accepted by the point-probability test (layout in the generator).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/test_sterne.py\n")
        f.write(f"# Tool: SciPy {scipy.__version__} (Debian python3-scipy)\n")
        f.write(f"# Date: {datetime.date.today().isoformat()}\n")
        for r in rows:
            f.write("\t".join(str(x) for x in r) + "\n")


if __name__ == "__main__":
    main()
