# Reference values for interval.CommonRiskDifference and
# interval.CommonRiskRatio with Method CommonStratifiedScore: the stratified
# score intervals of a common risk difference and risk ratio with
# Mantel-Haenszel weights n1 n2 / (n1 + n2) and with inverse-variance score
# weights 1 / V_i(theta) recomputed at each trial value, solved
# independently of kofn with mpmath at 50 digits.
#
# The statistic (Miettinen O, Nurminen M (1985), Statistics in Medicine
# 4:213-226; the weightings as recalled of Tang Y (2020), Statistics in
# Medicine 39:3427-3457; 50 digits):
#   Z(theta) = sum w_i (e_i - theta_i0) / sqrt(sum w_i^2 V_i(theta)),
# e_i - theta_i0 = p1^ - p2^ - delta (difference) or p1^ - rho p2^ (ratio),
# V_i the restricted variance with the factor N_i / (N_i - 1). Unlike
# kofn (which solves the Miettinen-Nurminen cubic and the ratio's quadratic
# by their roots), the restricted maximum-likelihood estimates here come
# from bisection on the derivative of the restricted log-likelihood, 140
# halvings (1e-42 of the range). The limits are defined as lower = inf{theta: Z <= z},
# upper = sup{theta: Z >= -z}, z the normal quantile at (1-level)/2 (or
# 1-level for one bound): found by a scan of 200 trial values (300 on the
# log scale of the ratio, rho in 1e-12..1e12; plus the value 0 or 1 where
# an all-failure or all-success stratum's variance vanishes) and 95
# bisections between neighbours (1e-28 of their distance). The estimate is the zero of Z nearest the
# Mantel-Haenszel estimate. Strata sets: the invented sets of
# testdata/strata_r.tsv and one more invented set, "uneven".
# The odds ratio (CommonOddsRatio with CommonStratifiedScore) has each
# stratum's score (p1^ - p1~)/(p1~ q1~) - (p2^ - p2~)/(p2~ q2~) with
# variance f (1/(n1 p1~ q1~) + 1/(n2 p2~ q2~)) (Miettinen and Nurminen 1985,
# recalled), p2~ by bisection on the margin equation n1 p1~ + n2 p2~ = x1 + x2.
# Run: /usr/bin/python3 testdata/gen/strata_score.py > testdata/strata_score.tsv (about twenty minutes)
#      /usr/bin/python3 testdata/gen/strata_score.py odds > testdata/strata_score_odds.tsv (about ten minutes)
import datetime
import sys
import mpmath as mp

mp.mp.dps = 50
sets = {}
for line in open("testdata/strata_r.tsv"):
    f = line.rstrip("\n").split("\t")
    if f[0] == "strata":
        v = [int(x) for x in f[2].split(",")]
        sets[f[1]] = [tuple(v[i:i + 4]) for i in range(0, len(v), 4)]
# invented: four clinics of very different sizes and rates
sets["uneven"] = [(9, 12, 4, 10), (40, 150, 22, 160), (3, 30, 1, 25), (70, 90, 55, 95)]


def bisect(f, lo, hi, steps=140):
    flo = f(lo)
    for _ in range(steps):
        mid = (lo + hi) / 2
        fm = f(mid)
        if (fm > 0) == (flo > 0):
            lo, flo = mid, fm
        else:
            hi = mid
    return (lo + hi) / 2


def mle_diff(x1, n1, x2, n2, d):
    lo, hi = max(mp.mpf(0), d), min(mp.mpf(1), 1 + d)
    def s(p):
        t = mp.mpf(0)
        if x1: t += x1 / p
        if n1 - x1: t -= (n1 - x1) / (1 - p)
        if x2: t += x2 / (p - d)
        if n2 - x2: t -= (n2 - x2) / (1 + d - p)
        return t
    eps = (hi - lo) * mp.mpf(10) ** -30
    if s(lo + eps) <= 0:
        p = lo
    elif s(hi - eps) >= 0:
        p = hi
    else:
        p = bisect(s, lo + eps, hi - eps)
    return p, p - d


def mle_ratio(x1, n1, x2, n2, r):
    hi = min(mp.mpf(1), 1 / r)
    def s(q):  # derivative in p2 = q
        t = mp.mpf(0)
        if x1: t += x1 / q
        if n1 - x1: t -= (n1 - x1) * r / (1 - r * q)
        if x2: t += x2 / q
        if n2 - x2: t -= (n2 - x2) / (1 - q)
        return t
    if x1 + x2 == 0:
        return mp.mpf(0), mp.mpf(0)
    eps = hi * mp.mpf(10) ** -30
    if s(hi - eps) >= 0:
        q = hi
    else:
        q = bisect(s, eps, hi - eps)
    return r * q, q


def mle_odds(x1, n1, x2, n2, psi):
    # p2 solves n1 p1(p2) + n2 p2 = x1 + x2 with p1 = psi p2 / (1 - p2 + psi p2),
    # the left side increasing in p2 on (0, 1)
    m = x1 + x2
    p1f = lambda q: psi * q / (1 - q + psi * q)
    q = bisect(lambda q: n1 * p1f(q) + n2 * q - m, mp.mpf(10) ** -45, 1 - mp.mpf(10) ** -45)
    return p1f(q), q


def zstat(ts, theta, effect, weights):
    num = vr = mp.mpf(0)
    for x1, n1, x2, n2 in ts:
        if n1 == 0 or n2 == 0:
            continue
        if effect == "ratio" and x1 + x2 == 0:
            continue
        if effect == "odds" and (x1 + x2 == 0 or x1 + x2 == n1 + n2):
            continue
        f = mp.mpf(n1 + n2) / (n1 + n2 - 1)
        if effect == "odds":
            # (p1^ - p1~)/(p1~ q1~) - (p2^ - p2~)/(p2~ q2~), variance f (1/(n1 p1~q1~) + 1/(n2 p2~q2~))
            p1, p2 = mle_odds(x1, n1, x2, n2, theta)
            e = (mp.mpf(x1) / n1 - p1) / (p1 * (1 - p1)) - (mp.mpf(x2) / n2 - p2) / (p2 * (1 - p2))
            v = f * (1 / (n1 * p1 * (1 - p1)) + 1 / (n2 * p2 * (1 - p2)))
        elif effect == "difference":
            p1, p2 = mle_diff(x1, n1, x2, n2, theta)
            e = mp.mpf(x1) / n1 - mp.mpf(x2) / n2 - theta
            v = f * (p1 * (1 - p1) / n1 + p2 * (1 - p2) / n2)
        else:
            p1, p2 = mle_ratio(x1, n1, x2, n2, theta)
            e = mp.mpf(x1) / n1 - theta * mp.mpf(x2) / n2
            v = f * (p1 * (1 - p1) / n1 + theta ** 2 * p2 * (1 - p2) / n2)
        if weights == "ivs":
            if v == 0:
                if e == 0:
                    return mp.mpf(0)  # the limit where the weight grows without bound
                return mp.inf if e > 0 else -mp.inf
            num += e / v
            vr += 1 / v
        else:
            w = mp.mpf(n1) * n2 / (n1 + n2)
            num += w * e
            vr += w * w * v
    if num == 0:
        return mp.mpf(0)
    return num / mp.sqrt(vr) if vr > 0 else (mp.inf if num > 0 else -mp.inf)


def mh(ts, effect):
    a = b = mp.mpf(0)
    for x1, n1, x2, n2 in ts:
        if n1 == 0 or n2 == 0:
            continue
        n = mp.mpf(n1 + n2)
        if effect == "odds":
            a += x1 * mp.mpf(n2 - x2) / n
            b += (n1 - x1) * mp.mpf(x2) / n
        elif effect == "difference":
            a += (x1 * mp.mpf(n2) - x2 * mp.mpf(n1)) / n
            b += n1 * mp.mpf(n2) / n
        else:
            a += x1 * mp.mpf(n2) / n
            b += x2 * mp.mpf(n1) / n
    return a / b


def limits(ts, effect, weights, level, side):
    tail = (1 - mp.mpf(level)) / (2 if side == "two-sided" else 1)
    z = -mp.sqrt(2) * mp.erfinv(2 * tail - 1)
    est0 = mh(ts, effect)
    if effect == "difference":
        a, b, m = mp.mpf(-1) + mp.mpf(10) ** -15, 1 - mp.mpf(10) ** -15, 200
        tr, inv = (lambda t: t), (lambda t: t)
        grid = [a + (b - a) * j / m for j in range(m + 1)] + [mp.mpf(0), est0]
    else:
        a, b, m = -mp.log(mp.mpf(10) ** 12), mp.log(mp.mpf(10) ** 12), 300
        tr, inv = mp.exp, mp.log
        grid = [a + (b - a) * j / m for j in range(m + 1)] + [mp.mpf(0), mp.log(est0)]
    grid.sort()
    Z = lambda t: zstat(ts, tr(t), effect, weights)
    zs = [Z(t) for t in grid]
    want_lo, want_hi = side in ("two-sided", "lower bound"), side in ("two-sided", "upper bound")
    acc = [(not want_lo or v <= z) and (not want_hi or v >= -z) for v in zs]
    first = acc.index(True)
    last = len(acc) - 1 - acc[::-1].index(True)
    lo, hi = a, b
    if want_lo and first > 0:
        lo = bisect(lambda t: Z(t) - z, grid[first - 1], grid[first], 95)
    if want_hi and last < len(grid) - 1:
        hi = bisect(lambda t: Z(t) + z, grid[last], grid[last + 1], 95)
    best, est = None, None
    for j in range(len(grid) - 1):
        if zs[j] == 0 and grid[j] == inv(est0):
            best, est = mp.mpf(0), grid[j]  # Z vanishes at the Mantel-Haenszel estimate itself
            break
        if zs[j] > 0 and zs[j + 1] < 0:
            r = bisect(Z, grid[j], grid[j + 1], 95)
            if best is None or abs(r - inv(est0)) < best:
                best, est = abs(r - inv(est0)), r
    lo_out = tr(lo) if lo > a else (mp.mpf(-1) if effect == "difference" else mp.mpf(0))
    hi_out = tr(hi) if hi < b else (mp.mpf(1) if effect == "difference" else mp.inf)
    return tr(est), lo_out, hi_out


print("# Stratified score intervals (mpmath %s, 50 digits), generated by testdata/gen/strata_score.py on %s" % (mp.__version__, datetime.date.today()))
print("# set\teffect\tweights\tlevel\tside\testimate\tlower\tupper")
effects = sys.argv[1:] or ["difference", "ratio"]
for name in ["moderate", "sparse", "large", "zeros", "uneven"]:
    for effect in effects:
        for weights in ["mh", "ivs"]:
            for level, side in [(0.95, "two-sided"), (0.9, "two-sided"), (0.95, "lower bound")]:
                e, lo, hi = limits(sets[name], effect, weights, level, side)
                print("%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s" % (name, effect, weights, level, side,
                      mp.nstr(e, 17), mp.nstr(lo, 17), mp.nstr(hi, 17)))
