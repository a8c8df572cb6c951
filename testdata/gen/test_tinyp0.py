#!/usr/bin/python3
"""Golden log p-values of the asymptotic one-sample tests at tiny p0.

Writes testdata/test_tinyp0.tsv. Rows (tab-separated):

  method k n p0 alternative logp

for method score, score-cc (continuity correction min(1/2, |k - n p0|)) and
likelihood-ratio (signed root of G2 = 2 [k ln(k/(n p0)) + (n-k) ln((n-k)/(n
(1-p0)))], 0 ln 0 = 0), with the standard normal tails: less ln Phi(z),
greater ln Phi(-z), two-sided ln min(1, 2 Phi(-|z|)). p0 runs down to the
smallest subnormal double (written as its shortest repr, which parses back
to the same double); each p0 is taken as that exact binary value. mpmath
evaluates everything at 60 digits, with no overflow or underflow; a log
p-value below -1.7976931348623157e308 (the most negative double) is
written as -inf.

Run from the repository root:  /usr/bin/python3 testdata/gen/test_tinyp0.py
"""
import datetime

import mpmath as mp

mp.mp.dps = 60
MAXF = mp.mpf("1.7976931348623157e308")


def stat(method, k, n, p0):
    k, n, p = mp.mpf(k), mp.mpf(n), mp.mpf(p0)
    if method == "likelihood-ratio":
        g = 0
        if k > 0:
            g += k * mp.log(k / (n * p))
        if n - k > 0:
            g += (n - k) * (mp.log((n - k) / n) - mp.log1p(-p))  # 1 - p rounds to 1
        z = mp.sqrt(2 * g)
        return -z if k < n * p else z
    d = k - n * p
    if method == "score-cc":
        c = min(mp.mpf("0.5"), abs(d))
        d = mp.sign(d) * (abs(d) - c)
    return d / mp.sqrt(n * p * (1 - p))


def lphi(x):
    """ln Phi(x). mpmath's erfc overflows a float internally for |x| beyond
    about 1e150, so below -1e6 the asymptotic series (Abramowitz and Stegun
    1964, 26.2.12) is used, ln Phi(x) = -x^2/2 - ln(-x) - ln sqrt(2 pi) +
    ln(1 - 1/x^2 + 3/x^4 - ...), whose 12 terms are exact far beyond 60
    digits there; above 0, ln Phi(x) = log1p(-Phi(-x)),
    as Phi(x) may round to 1 at 60 digits."""
    if x < -10**6:
        s, t = mp.mpf(1), mp.mpf(1)
        for j in range(1, 13):
            t *= -(2 * j - 1) / x**2
            s += t
        return -x**2 / 2 - mp.log(-x) - mp.log(mp.sqrt(2 * mp.pi)) + mp.log(s)
    if x > 0:  # ln(1 - Phi(-x)): ncdf(x) itself would round to 1
        return mp.log1p(-mp.exp(lphi(-x)))
    return mp.log(mp.ncdf(x))


def logp(z, alt):
    if alt == "less":
        return lphi(z)
    if alt == "greater":
        return lphi(-z)
    # 2 Phi(-|z|) = erfc(|z|/sqrt 2); log1p(-erf) keeps a tiny |z| visible
    return min(mp.mpf(0), mp.log1p(-mp.erf(abs(z) / mp.sqrt(2))) if abs(z) < 1 else mp.log(2) + lphi(-abs(z)))


def fmt(v):
    if v < -MAXF:
        return "-inf"
    return repr(float(v))


def main():
    rows = []
    for p0 in (5e-324, 4e-310, 1e-300, 1e-20):
        for k in (0, 1, 10):
            for method in ("score", "score-cc", "likelihood-ratio"):
                for alt in ("two-sided", "less", "greater"):
                    z = stat(method, k, 10, p0)
                    rows.append((method, k, 10, repr(p0), alt, fmt(logp(z, alt))))
    with open("testdata/test_tinyp0.tsv", "w") as f:
        f.write("# Golden log p-values of the score, score-cc and likelihood-ratio one-sample tests at tiny p0 (subnormal to 1e-20).\n")
        f.write("# Columns: method k n p0 alternative logp; -inf marks a log p-value below the most negative double.\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/test_tinyp0.py\n")
        f.write("# Tool: mpmath %s at 60 digits (Debian python3-mpmath)\n" % mp.__version__)
        f.write("# Date: %s\n" % datetime.date.today().isoformat())
        for r in rows:
            f.write("\t".join(str(x) for x in r) + "\n")


main()
