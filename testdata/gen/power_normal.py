#!/usr/bin/python3
"""Normal-approximation sample sizes recomputed independently with SciPy.

Writes ../power_normal.tsv: columns kind, p1, p2, alpha, power, alternative,
ratio, variance, correction, margin, unrounded n1. Kinds: one (one-sample,
p1 = p0, p2 = true p), two (Fleiss pooled / unpooled, Casagrande-Pike-Smith
correction after Fleiss, Tytun, Ury 1980), ni (non-inferiority, unpooled),
eq (equivalence TOST, unpooled, solved with brentq), paired (Connor 1987,
p1 = p10, p2 = p01).

Run: /usr/bin/python3 testdata/gen/power_normal.py   (from the repo root)
"""
import datetime, math, os
import scipy
from scipy.optimize import brentq
from scipy.stats import norm


def za(alpha, alt):
    return norm.ppf(1 - alpha / 2) if alt == "two-sided" else norm.ppf(1 - alpha)


def one(p0, p1, alpha, pw, alt):
    s = za(alpha, alt) * math.sqrt(p0 * (1 - p0)) + norm.ppf(pw) * math.sqrt(p1 * (1 - p1))
    return s * s / (p1 - p0) ** 2


def two(p1, p2, alpha, pw, alt, r, var, cc):
    d = abs(p1 - p2)
    v = p1 * (1 - p1) + p2 * (1 - p2) / r
    if var == "pooled":
        pb = (p1 + r * p2) / (1 + r)
        s = za(alpha, alt) * math.sqrt((1 + 1 / r) * pb * (1 - pb)) + norm.ppf(pw) * math.sqrt(v)
    else:
        s = (za(alpha, alt) + norm.ppf(pw)) * math.sqrt(v)
    n = s * s / d ** 2
    if cc == "cps":
        n = n / 4 * (1 + math.sqrt(1 + 2 * (r + 1) / (r * n * d))) ** 2
    return n


def ni(p1, p2, alpha, pw, r, m):
    v = p1 * (1 - p1) + p2 * (1 - p2) / r
    return (norm.ppf(1 - alpha) + norm.ppf(pw)) ** 2 * v / (p1 - p2 + m) ** 2


def eq(p1, p2, alpha, pw, r, m):
    v = p1 * (1 - p1) + p2 * (1 - p2) / r
    d = p1 - p2
    z = norm.ppf(1 - alpha)

    def f(n):
        se = math.sqrt(v / n)
        return max(0.0, norm.cdf((m - d) / se - z) + norm.cdf((m + d) / se - z) - 1) - pw
    return brentq(f, 1e-6, 1e9, xtol=1e-12, rtol=1e-14)


def paired(p10, p01, alpha, pw, alt):
    psi, delta = p10 + p01, p10 - p01
    s = za(alpha, alt) * math.sqrt(psi) + norm.ppf(pw) * math.sqrt(psi - delta ** 2)
    return s * s / delta ** 2


ROWS = [
    ("one", 0.5, 0.7, 0.05, 0.8, "two-sided", 1, "-", "-", 0),
    ("one", 0.1, 0.05, 0.01, 0.9, "less", 1, "-", "-", 0),
    ("two", 0.05, 0.10, 0.05, 0.8, "two-sided", 1, "pooled", "cps", 0),
    ("two", 0.05, 0.10, 0.05, 0.8, "two-sided", 1, "pooled", "none", 0),
    ("two", 0.30, 0.45, 0.05, 0.9, "two-sided", 2, "pooled", "cps", 0),
    ("two", 0.30, 0.45, 0.025, 0.8, "less", 0.5, "unpooled", "none", 0),
    ("ni", 0.85, 0.85, 0.025, 0.8, "-", 1, "-", "-", 0.10),
    ("ni", 0.80, 0.85, 0.05, 0.9, "-", 2, "-", "-", 0.10),
    ("eq", 0.60, 0.60, 0.05, 0.8, "-", 1, "-", "-", 0.15),
    ("eq", 0.62, 0.60, 0.05, 0.9, "-", 1.5, "-", "-", 0.10),
    ("paired", 0.20, 0.08, 0.05, 0.8, "two-sided", 1, "-", "-", 0),
    ("paired", 0.05, 0.15, 0.01, 0.9, "less", 1, "-", "-", 0),
]


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = []
    for kind, p1, p2, a, pw, alt, r, var, cc, m in ROWS:
        if kind == "one":
            n = one(p1, p2, a, pw, alt)
        elif kind == "two":
            n = two(p1, p2, a, pw, alt, r, var, cc)
        elif kind == "ni":
            n = ni(p1, p2, a, pw, r, m)
        elif kind == "eq":
            n = eq(p1, p2, a, pw, r, m)
        else:
            n = paired(p1, p2, a, pw, alt)
        out.append(f"{kind}\t{p1}\t{p2}\t{a}\t{pw}\t{alt}\t{r}\t{var}\t{cc}\t{m}\t{n:.15g}")
    with open(os.path.join(here, "..", "power_normal.tsv"), "w") as fh:
        fh.write("# Normal-approximation sample sizes (unrounded n1), recomputed with SciPy.\n")
        fh.write("# Generator: /usr/bin/python3 testdata/gen/power_normal.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}; date {datetime.date.today()}\n")
        fh.write("# columns: kind\tp1\tp2\talpha\tpower\talternative\tratio\tvariance\tcorrection\tmargin\tn1\n")
        fh.write("\n".join(out) + "\n")


if __name__ == "__main__":
    main()
