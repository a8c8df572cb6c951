#!/usr/bin/python3
"""Precision planning checks: P(|k/n - p| <= eps), its worst case over p, and
expected interval half-widths, by enumeration.

Writes ../power_precision.tsv with
  within  p eps target nmax first stable   (and the curve n, prob for n = 1..nmax)
  worst   eps n prob                       (infimum over p on a grid of 2e5 points
                                            plus one-sided limits 1e-11 from each
                                            candidate end point)
  ehw     method p n expected-half-width   (Wilson by its closed form, Clopper-Pearson
                                            by scipy.stats.beta quantiles, 95%)
Boundaries |k/n - p| <= eps are decided with exact fractions of the decimals.

Run: /usr/bin/python3 testdata/gen/power_precision.py   (from the repo root)
"""
import datetime, os
from fractions import Fraction
import numpy as np
import scipy
from scipy.stats import beta, binom, norm

WITHIN = [(0.3, 0.1, 0.95, 200), (0.5, 0.05, 0.90, 600), (0.1, 0.03, 0.95, 900)]
WORST = [(0.1, 60), (0.1, 97), (0.05, 200), (0.05, 385)]
EHW = [("wilson", 0.3, 50), ("wilson", 0.1, 200), ("clopper-pearson", 0.3, 50), ("clopper-pearson", 0.05, 300)]


def within(n, p, eps):
    pf, ef = Fraction(str(p)), Fraction(str(eps))
    k = np.arange(n + 1)
    ok = [abs(Fraction(int(i), n) - pf) <= ef for i in k]
    return float(binom.pmf(k, n, p)[np.array(ok)].sum())


def worst(n, eps):
    k = np.arange(n + 1)
    ps = list(np.linspace(1e-9, 0.5, 200001))
    for j in range(n + 2):
        for c in (j / n - eps, j / n + eps):
            ps += [c - 1e-11, c + 1e-11]
    best = 1.0
    for p in ps:
        if not (0 < p <= 0.5):
            continue
        m = np.abs(k / n - p) <= eps
        v = float(binom.pmf(k[m], n, p).sum())
        best = min(best, v)
    return best


def halfwidth(method, k, n):
    z = norm.ppf(0.975)
    if method == "wilson":
        ph = k / n
        c = (ph + z * z / (2 * n)) / (1 + z * z / n)
        h = z / (1 + z * z / n) * np.sqrt(ph * (1 - ph) / n + z * z / (4 * n * n))
        return h  # (U - L)/2, no clipping needed for Wilson
    lo = 0.0 if k == 0 else beta.ppf(0.025, k, n - k + 1)
    hi = 1.0 if k == n else beta.ppf(0.975, k + 1, n - k)
    return (hi - lo) / 2


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = []
    heads = []
    for p, eps, target, nmax in WITHIN:
        vals = [within(n, p, eps) for n in range(1, nmax + 1)]
        first = next(i + 1 for i, v in enumerate(vals) if v >= target)
        stable = max(i + 1 for i, v in enumerate(vals) if v < target) + 1
        name = f"w{p}_{eps}"
        heads.append(f"# case {name}\tp={p}\teps={eps}\ttarget={target}\tnmax={nmax}\tfirst={first}\tstable={stable}")
        out += [f"within\t{name}\t{n}\t{v:.15g}" for n, v in enumerate(vals, 1)]
    for eps, n in WORST:
        out.append(f"worst\t{eps}\t{n}\t{worst(n, eps):.15g}")
    for method, p, n in EHW:
        k = np.arange(n + 1)
        e = sum(binom.pmf(int(i), n, p) * halfwidth(method, int(i), n) for i in k)
        out.append(f"ehw\t{method}\t{p}\t{n}\t{e:.15g}")
    with open(os.path.join(here, "..", "power_precision.tsv"), "w") as fh:
        fh.write("# Precision planning: exact P(|k/n - p| <= eps) per n, worst case over p, expected\n")
        fh.write("# 95% interval half-widths. Generator: /usr/bin/python3 testdata/gen/power_precision.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}, NumPy {np.__version__}; date {datetime.date.today()}\n")
        for h in heads:
            fh.write(h + "\n")
        fh.write("\n".join(out) + "\n")


if __name__ == "__main__":
    main()
