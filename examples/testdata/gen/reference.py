#!/usr/bin/python3
"""Reference values for the example programs' tests, from SciPy and mpmath.

Writes examples/testdata/reference.tsv. Run from the repository root:

    /usr/bin/python3 examples/testdata/gen/reference.py > examples/testdata/reference.tsv

Each line is "key<TAB>value". The score intervals are computed here from their
definitions (restricted maximum likelihood by bisection on the derivative of
the concave log-likelihood, then bisection on the score statistic) in mpmath
at 50 digits, independently of the Go code; the exact tests come from SciPy.
"""

import datetime
import sys

import mpmath as mp
import numpy as np
import scipy
from scipy.stats import barnard_exact, boschloo_exact, fisher_exact, hypergeom, binom

mp.mp.dps = 50
Z975 = mp.sqrt(2) * mp.erfinv(mp.mpf("0.95"))  # 0.975 normal quantile


def bisect(f, lo, hi, iters=200):
    """Root of f on [lo, hi], f(lo) and f(hi) of opposite signs."""
    flo = f(lo)
    for _ in range(iters):
        mid = (lo + hi) / 2
        fm = f(mid)
        if (fm < 0) == (flo < 0):
            lo, flo = mid, fm
        else:
            hi = mid
    return (lo + hi) / 2


def argmax_concave(dl, lo, hi):
    """Maximizer of a concave function on (lo, hi) given its derivative."""
    eps = mp.mpf(10) ** -40
    return bisect(lambda x: -dl(x), lo + eps, hi - eps)


def mn_score(x1, n1, x2, n2, delta):
    """Miettinen-Nurminen score statistic for H0: p1 - p2 = delta."""
    x1, n1, x2, n2, delta = map(mp.mpf, (x1, n1, x2, n2, delta))

    def dl(p2):  # derivative of the log-likelihood in p2, p1 = p2 + delta
        p1 = p2 + delta
        return x1 / p1 - (n1 - x1) / (1 - p1) + x2 / p2 - (n2 - x2) / (1 - p2)

    p2 = argmax_concave(dl, max(mp.mpf(0), -delta), min(mp.mpf(1), 1 - delta))
    p1 = p2 + delta
    n = n1 + n2
    var = (p1 * (1 - p1) / n1 + p2 * (1 - p2) / n2) * n / (n - 1)
    return (x1 / n1 - x2 / n2 - delta) / mp.sqrt(var)


def tango_score(n11, n12, n21, n22, delta):
    """Tango's (1998) score statistic for H0: q12 - q21 = delta."""
    n = mp.mpf(n11 + n12 + n21 + n22)
    n12, n21, conc = mp.mpf(n12), mp.mpf(n21), mp.mpf(n11 + n22)

    def dl(q21):  # q12 = q21 + delta, concordant mass 1 - q12 - q21
        return n12 / (q21 + delta) + n21 / q21 - 2 * conc / (1 - 2 * q21 - delta)

    q21 = argmax_concave(dl, max(mp.mpf(0), -delta), (1 - delta) / 2)
    return (n12 - n21 - n * delta) / mp.sqrt(n * (2 * q21 + delta - delta * delta))


def score_interval(stat, est):
    """Limits where the decreasing score statistic crosses +z and -z."""
    tiny = mp.mpf(10) ** -30
    lower = bisect(lambda d: stat(d) - Z975, -1 + tiny, est)
    upper = bisect(lambda d: stat(d) + Z975, est, 1 - tiny)
    return lower, upper


def fisher_power(n1, n2, p1, p2, alpha=0.05):
    """Exact power of the two-sided point-probability Fisher test (tables
    no more probable than the observed one, relative tolerance 1e-7), by
    enumerating the conditional distribution of x1 for every margin."""
    total = 0.0
    b1 = binom.pmf(np.arange(n1 + 1), n1, p1)
    b2 = binom.pmf(np.arange(n2 + 1), n2, p2)
    for s in range(n1 + n2 + 1):
        lo, hi = max(0, s - n2), min(s, n1)
        xs = np.arange(lo, hi + 1)
        f = hypergeom.pmf(xs, n1 + n2, n1, s)
        for x, fx in zip(xs, f):
            p = f[f <= fx * (1 + 1e-7)].sum()
            if p < alpha:
                total += b1[x] * b2[s - x]
    return total


def main():
    out = sys.stdout
    out.write("# Reference values for the tests of the example programs (examples/*/main_test.go).\n")
    out.write("# Generator: /usr/bin/python3 examples/testdata/gen/reference.py > examples/testdata/reference.tsv\n")
    out.write("# Tools: Python %s, SciPy %s, mpmath %s (Debian packages)\n"
              % (sys.version.split()[0], scipy.__version__, mp.__version__))
    out.write("# Date: %s\n" % datetime.date.today().isoformat())
    out.write("# SciPy's two-sided Boschloo test doubles the one-sided p-value, a different\n")
    out.write("# definition from the test package's two-sided ordering; the one-sided value is given.\n")
    rows = []

    # signup: B 33/149 against A 18/152.
    table = [[33, 18], [149 - 33, 152 - 18]]
    rows.append(("signup.barnard.two-sided", barnard_exact(table, alternative="two-sided", n=128).pvalue))
    rows.append(("signup.boschloo.greater", boschloo_exact(table, alternative="greater", n=128).pvalue))
    rows.append(("signup.fisher.two-sided", fisher_exact(table).pvalue))
    est = mp.mpf(33) / 149 - mp.mpf(18) / 152
    lo, hi = score_interval(lambda d: mn_score(33, 149, 18, 152, d), est)
    rows.append(("signup.mn.lower", lo))
    rows.append(("signup.mn.upper", hi))
    for n in (220, 240, 260):
        rows.append(("signup.fisher.power.%d" % n, fisher_power(n, n, 0.12, 0.22)))

    # classifiers: n11 = 412, n12 = 31, n21 = 14, n22 = 43.
    est = mp.mpf(31 - 14) / 500
    lo, hi = score_interval(lambda d: tango_score(412, 31, 14, 43, d), est)
    rows.append(("classifiers.tango.lower", lo))
    rows.append(("classifiers.tango.upper", hi))

    for key, value in rows:
        out.write("%s\t%s\n" % (key, mp.nstr(mp.mpf(value), 15)))


if __name__ == "__main__":
    main()
