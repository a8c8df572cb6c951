#!/usr/bin/python3
"""Golden score statistics and p-values for the margin tests of package test.

Writes testdata/test_margin.tsv. Rows (tab-separated):

  diff  k1 n1 k2 n2 delta variance alternative z pvalue
  ratio k1 n1 k2 n2 rho   variance alternative z pvalue

variance is MN (Miettinen-Nurminen, factor N/(N-1)) or FM
(Farrington-Manning, factor 1). Independent of the Go code and of any
closed form: the restricted maximum-likelihood estimates are found by
maximizing the binomial log-likelihood along the null restriction
(p1 = p2 + delta, or p1 = rho p2) by golden-section search in mpmath at
40 digits (200 steps; the log-likelihood is concave along the restriction);
z and the normal tail p-value (scipy.special.ndtr) follow from the formulas in Farrington and Manning (1990) and Miettinen and Nurminen (1985).

Run from the repository root:  /usr/bin/python3 testdata/gen/test_margin.py
"""
import datetime

import mpmath
import scipy
from scipy.special import ndtr

mpmath.mp.dps = 40


def restricted(k1, n1, k2, n2, lo, hi, p1of):
    """MLE of p2 on [lo, hi] with p1 = p1of(p2), by golden section on the log-likelihood."""
    def ll(p2):
        p1 = p1of(p2)
        s = mpmath.mpf(0)
        for k, n, p in ((k1, n1, p1), (k2, n2, p2)):
            if k:
                s += k * mpmath.log(p)
            if n - k:
                s += (n - k) * mpmath.log(1 - p)
        return s
    # golden-section maximization in 40-digit arithmetic (the log-likelihood is concave)
    a, b = mpmath.mpf(lo), mpmath.mpf(hi)
    g = (mpmath.sqrt(5) - 1) / 2
    c, d = b - g * (b - a), a + g * (b - a)
    fc, fd = ll(c), ll(d)
    for _ in range(200):
        if fc >= fd:
            b, d, fd = d, c, fc
            c = b - g * (b - a)
            fc = ll(c)
        else:
            a, c, fc = c, d, fd
            d = a + g * (b - a)
            fd = ll(d)
    p2 = (a + b) / 2
    return p1of(p2), p2


def diff_row(k1, n1, k2, n2, delta, var, alt):
    eps = mpmath.mpf(10) ** -30
    lo, hi = max(0, -delta) + eps, min(1, 1 - delta) - eps
    p1t, p2t = restricted(k1, n1, k2, n2, lo, hi, lambda p2: p2 + delta)
    f = mpmath.mpf(n1 + n2) / (n1 + n2 - 1) if var == "MN" else 1
    v = f * (p1t * (1 - p1t) / n1 + p2t * (1 - p2t) / n2)
    z = float((mpmath.mpf(k1) / n1 - mpmath.mpf(k2) / n2 - delta) / mpmath.sqrt(v))
    return ["diff", k1, n1, k2, n2, repr(delta), var, alt, repr(z), repr(pval(z, alt))]


def ratio_row(k1, n1, k2, n2, rho, var, alt):
    eps = mpmath.mpf(10) ** -30
    lo, hi = eps, min(1, 1 / mpmath.mpf(rho)) - eps
    p1t, p2t = restricted(k1, n1, k2, n2, lo, hi, lambda p2: rho * p2)
    f = mpmath.mpf(n1 + n2) / (n1 + n2 - 1) if var == "MN" else 1
    v = f * (p1t * (1 - p1t) / n1 + rho * rho * p2t * (1 - p2t) / n2)
    z = float((mpmath.mpf(k1) / n1 - rho * mpmath.mpf(k2) / n2) / mpmath.sqrt(v))
    return ["ratio", k1, n1, k2, n2, repr(rho), var, alt, repr(z), repr(pval(z, alt))]


def pval(z, alt):
    if alt == "less":
        return float(ndtr(z))
    if alt == "greater":
        return float(ndtr(-z))
    return float(min(1.0, 2 * ndtr(-abs(z))))


def main():
    rows = []
    tables = [(56, 70, 48, 80), (7, 15, 12, 15), (30, 100, 40, 100), (95, 100, 90, 100),
              (1, 20, 3, 25), (140, 200, 150, 210), (12, 40, 3, 35)]
    for k1, n1, k2, n2 in tables:
        for var in ("MN", "FM"):
            for alt in ("two-sided", "less", "greater"):
                for delta in (-0.2, -0.1, 0.0, 0.05, 0.15):
                    rows.append(diff_row(k1, n1, k2, n2, delta, var, alt))
                for rho in (0.5, 0.8, 1.0, 1.25, 2.0):
                    rows.append(ratio_row(k1, n1, k2, n2, rho, var, alt))
    with open("testdata/test_margin.tsv", "w") as f:
        f.write("# Golden score statistics and p-values for the margin tests (row layout in the generator).\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/test_margin.py\n")
        f.write(f"# Tool: mpmath {mpmath.__version__}, SciPy {scipy.__version__} (Debian packages)\n")
        f.write(f"# Date: {datetime.date.today().isoformat()}\n")
        for r in rows:
            f.write("\t".join(str(x) for x in r) + "\n")


if __name__ == "__main__":
    main()
