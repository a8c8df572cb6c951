#!/usr/bin/python3
"""Golden values of the Stirling error of Gamma(x+1),

    se(x) = ln Gamma(x+1) - (x + 1/2) ln x + x - ln sqrt(2 pi),

at 40 significant digits with mpmath (Debian python3-mpmath), on a grid
dense between 0.01 and 40 (where internal/xmath switches methods) and
sparse above. Run: /usr/bin/python3 testdata/gen/stirling_error.py >
testdata/stirling_error.tsv
"""
import mpmath

mpmath.mp.dps = 60

xs = set()
for i in range(1, 100):
    xs.add(mpmath.mpf(i) / 100)
for i in range(100, 4001, 7):
    xs.add(mpmath.mpf(i) / 100)
for v in ["1", "2", "3", "9.999999999999998", "10", "10.000000000000002", "29.999", "30", "30.5", "1e2", "1234.5", "1e6", "1e12"]:
    xs.add(mpmath.mpf(v))

print("# x\tstirling_error(x)  (mpmath %s, 60 digits, printed to 20)" % mpmath.__version__)
for x in sorted(xs):
    xf = float(x)
    xm = mpmath.mpf(xf)  # the double nearest the grid point, exactly
    se = mpmath.loggamma(xm + 1) - (xm + mpmath.mpf(1) / 2) * mpmath.log(xm) + xm - mpmath.log(mpmath.sqrt(2 * mpmath.pi))
    print("%s\t%s" % (repr(xf), mpmath.nstr(se, 20)))
