#!/usr/bin/python3
"""Reliability demonstration plans and acceptance sampling designs by direct search.

Writes ../power_reliability.tsv:
  demo  R C c n         smallest n with P(X <= c; n, 1 - R) <= 1 - C (SciPy binom.cdf, scanning n)
  bound n f C RL        exact lower bound on reliability: 1 - beta.ppf(C, f + 1, n - f)
  plan  aql rql alpha beta n c   smallest single sampling plan meeting both risks, by
                        scanning n = 1, 2, ... and every c < n (binomial OC)

Run: /usr/bin/python3 testdata/gen/power_reliability.py   (from the repo root)
"""
import datetime, os
import scipy
from scipy.stats import beta, binom

DEMO = [(r, c, f) for r in (0.9, 0.95, 0.99) for c in (0.9, 0.95) for f in (0, 1, 2)] + [(0.999, 0.9, 3)]
BOUND = [(30, 0, 0.9), (50, 1, 0.95), (100, 3, 0.9), (20, 2, 0.99), (1000, 10, 0.95)]
PLANS = [(0.01, 0.06, 0.05, 0.10), (0.02, 0.08, 0.05, 0.10), (0.005, 0.03, 0.05, 0.10), (0.05, 0.15, 0.05, 0.10)]


def demo(r, c, f):
    n = f + 1
    while binom.cdf(f, n, 1 - r) > 1 - c:
        n += 1
    return n


def plan(aql, rql, a, b):
    n = 1
    while True:
        for c in range(n):
            if binom.cdf(c, n, rql) <= b and binom.sf(c, n, aql) <= a:
                return n, c
        n += 1


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = []
    for r, c, f in DEMO:
        out.append(f"demo\t{r}\t{c}\t{f}\t{demo(r, c, f)}")
    for n, f, c in BOUND:
        out.append(f"bound\t{n}\t{f}\t{c}\t{1 - beta.ppf(c, f + 1, n - f):.15g}")
    for aql, rql, a, b in PLANS:
        n, c = plan(aql, rql, a, b)
        out.append(f"plan\t{aql}\t{rql}\t{a}\t{b}\t{n}\t{c}")
    with open(os.path.join(here, "..", "power_reliability.tsv"), "w") as fh:
        fh.write("# Reliability demonstration sizes, exact reliability bounds and smallest single\n")
        fh.write("# sampling plans, by direct search. Generator: /usr/bin/python3 testdata/gen/power_reliability.py\n")
        fh.write(f"# Tool: SciPy {scipy.__version__}; date {datetime.date.today()}\n")
        fh.write("\n".join(out) + "\n")


if __name__ == "__main__":
    main()
