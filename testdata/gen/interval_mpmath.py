#!/usr/bin/python3
"""Golden limits for package interval from independent mpmath code.

Writes testdata/interval_mpmath.tsv with columns
    case  method  level  lower  upper  estimate
for the methods SciPy and R base lack (or compute only in double precision):
one proportion (Jeffreys, mid-p, likelihood ratio, Wilson with continuity
correction, Agresti-Coull, arcsine, logit, Blaker), two independent
proportions (Mee and Miettinen-Nurminen difference, Koopman and
Miettinen-Nurminen ratio, Miettinen-Nurminen odds ratio, Cornfield exact
and mid-p odds ratio with the conditional MLE), paired proportions (Tango
score, Newcombe hybrid score) and the exact conditional discordant ratio.
Every limit is found by bisection (200 halvings, on the log scale for
ratios and small proportions) of the method's defining equation evaluated
at 50 significant digits; restricted MLEs are roots of the likelihood
equations found by mpmath.polyroots or bisection. Two-sided levels; each
limit has tail (1 - level)/2, Blaker's acceptability alpha = 1 - level.

Usage: /usr/bin/python3 testdata/gen/interval_mpmath.py > testdata/interval_mpmath.tsv
"""
import datetime
import sys

import mpmath as mp

mp.mp.dps = 50
F = mp.mpf


def bisect(f, lo, hi, log=False, iters=200, smooth=True):
    """Root of an increasing f on [lo, hi] (f(lo) <= 0 <= f(hi)).

    Smooth functions: 40 halvings, then mpmath's Illinois solver on the
    bracket to 1e-40; step functions (smooth=False): plain halvings."""
    lo, hi = F(lo), F(hi)
    mid = lambda: mp.sqrt(lo * hi) if log else (lo + hi) / 2
    for _ in range(40 if smooth else iters):
        m = mid()
        if f(m) < 0:
            lo = m
        else:
            hi = m
    if smooth:
        try:
            r = mp.findroot(f, (lo, hi), solver="illinois", tol=F(10) ** -40, maxsteps=200)
            if lo <= r <= hi:
                return r
        except (ValueError, ZeroDivisionError):
            pass
        for _ in range(iters):
            m = mid()
            if f(m) < 0:
                lo = m
            else:
                hi = m
    return (lo + hi) / 2


def zq(a):
    return -mp.sqrt(2) * mp.erfinv(2 * F(a) - 1)  # upper-tail quantile: P(Z > z) = a


# ---------------------------------------------------------------- binomial

def pmf(j, n, p):
    return mp.binomial(n, j) * p ** j * (1 - p) ** (n - j)


def cdf(k, n, p):
    """P(X <= k), summed from the nearer end."""
    if k < 0:
        return F(0)
    if k >= n:
        return F(1)
    if k <= n // 2:
        return mp.fsum(pmf(j, n, p) for j in range(0, k + 1))
    return 1 - mp.fsum(pmf(j, n, p) for j in range(k + 1, n + 1))


def sf(k, n, p):
    """P(X > k)."""
    if k < 0:
        return F(1)
    if k >= n:
        return F(0)
    if k >= n // 2:
        return mp.fsum(pmf(j, n, p) for j in range(k + 1, n + 1))
    return 1 - mp.fsum(pmf(j, n, p) for j in range(0, k + 1))


def beta_cdf(x, a, b):
    """I_x(a, b) by the positive series x^a y^b/(a B) sum (a+b)_j/(a+1)_j x^j."""
    x = F(x)
    if x <= 0:
        return F(0)
    if x >= 1:
        return F(1)
    # The positive series needs about (a+b)x terms past its peak; use the
    # side that needs fewer (50 digits make the complement harmless).
    if (a + b) * x > 1e5 and (a + b) * (1 - x) < (a + b) * x:
        return 1 - beta_cdf(1 - x, b, a)
    lpre = a * mp.log(x) + b * mp.log1p(-x) - mp.log(a) - (mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b))
    s, t, j = F(1), F(1), 0
    while True:
        t *= (a + b + j) * x / (a + 1 + j)
        s += t
        j += 1
        if t < s * F(10) ** -45:
            break
    return mp.exp(lpre) * s


def jeffreys(k, n, a):
    A, B = k + F(1) / 2, n - k + F(1) / 2
    lo = F(0) if k == 0 else bisect(lambda x: beta_cdf(x, A, B) - a, F(10) ** -40, F(k) / n + F(1) / (2 * n), log=True)
    # upper: I_U(A, B) = 1 - a (the series runs fast below the mean, and
    # beta_cdf switches to the complement above it)
    hi = F(1) if k == n else bisect(lambda x: beta_cdf(x, A, B) - (1 - a), F(k) / n + F(1) / (4 * n), min(1 - F(10) ** -40, (k + 41 + 20 * mp.sqrt(k + 1)) / F(n)), log=True)
    return lo, hi


def midp(k, n, a):
    lo = F(0) if k == 0 else bisect(lambda p: sf(k, n, p) + pmf(k, n, p) / 2 - a, F(10) ** -40, F(k) / n, log=True)
    hi = F(1) if k == n else 1 - bisect(lambda q: sf(n - k, n, q) + pmf(n - k, n, q) / 2 - a, F(10) ** -40, F(n - k) / n, log=True)
    return lo, hi


def lr(k, n, a):
    z2 = zq(a) ** 2
    k, n = F(k), F(n)

    def dev(p):
        d = F(0)
        if k > 0:
            d += k * mp.log(k / (n * p))
        if k < n:
            d += (n - k) * mp.log((n - k) / (n * (1 - p)))
        return 2 * d
    lo = F(0) if k == 0 else bisect(lambda p: z2 - dev(p), F(10) ** -40, k / n, log=True)
    hi = F(1) if k == n else 1 - bisect(lambda q: z2 - dev(1 - q), F(10) ** -40, (n - k) / n, log=True)
    return lo, hi


def wilson_cc(k, n, a):
    z = zq(a)
    p = F(k) / n
    q = 1 - p
    lo = F(0) if k == 0 else (2 * n * p + z * z - 1 - z * mp.sqrt(z * z - 2 - F(1) / n + 4 * p * (n * q + 1))) / (2 * (n + z * z))
    hi = F(1) if k == n else (2 * n * p + z * z + 1 + z * mp.sqrt(z * z + 2 - F(1) / n + 4 * p * (n * q - 1))) / (2 * (n + z * z))
    return lo, min(hi, F(1))


def adjusted_wald_ac(k, n, a):
    z = zq(a)
    nt = n + z * z
    pt = (k + z * z / 2) / nt
    h = z * mp.sqrt(pt * (1 - pt) / nt)
    return max(F(0), pt - h), min(F(1), pt + h)


def arcsine(k, n, a):
    z = zq(a)
    c = mp.asin(mp.sqrt((k + F(3) / 8) / (n + F(3) / 4)))
    h = z / (2 * mp.sqrt(n))
    lo = F(0) if k == 0 or c - h <= 0 else mp.sin(c - h) ** 2
    hi = F(1) if k == n or c + h >= mp.pi / 2 else mp.sin(c + h) ** 2
    return lo, hi


def logit(k, n, a):
    if k == 0:
        return F(0), 1 - a ** (F(1) / n)
    if k == n:
        return a ** (F(1) / n), F(1)
    z = zq(a)
    c = mp.log(F(k) / (n - k))
    h = z * mp.sqrt(F(1) / k + F(1) / (n - k))
    ex = lambda x: 1 / (1 + mp.exp(-x))
    return ex(c - h), ex(c + h)


def blaker(k, n, level):
    alpha = 1 - F(level)

    def acc(p):
        lower = [cdf(j, n, p) for j in range(n + 1)]
        upper = [1 - lower[j - 1] if j > 0 else F(1) for j in range(n + 1)]
        t = [min(lower[j], upper[j]) for j in range(n + 1)]
        tk = t[k] * (1 + F("1e-7"))
        return mp.fsum(pmf(j, n, p) for j in range(n + 1) if t[j] <= tk)
    # The limits lie between the Clopper-Pearson limits at tails alpha/2 and alpha.
    def cp_lower(kk, tail):
        return bisect(lambda p: sf(kk - 1, n, p) - tail, F(10) ** -40, F(kk) / n, log=True)
    lo = F(0)
    if k > 0:
        a, b = cp_lower(k, alpha / 2), min(cp_lower(k, alpha), F(k) / n)
        lo = bisect(lambda p: acc(p) - alpha, a, b, iters=120, smooth=False)
    hi = F(1)
    if k < n:
        kk = n - k
        a, b = cp_lower(kk, alpha / 2), min(cp_lower(kk, alpha), F(kk) / n)

        def acc_mirror(q):  # acceptability of n-k at q equals that of k at 1-q
            return acc(1 - q)
        hi = 1 - bisect(lambda q: acc_mirror(q) - alpha, a, b, iters=120, smooth=False)
    return lo, hi


# ------------------------------------------------------- two proportions

def diff_mle(x1, n1, x2, n2, d):
    if d <= -1:
        return F(0), F(1)
    if d >= 1:
        return F(1), F(0)
    lo, hi = max(F(0), d), min(F(1), 1 + d)

    def s(p):  # score of the restricted likelihood in p1 (decreasing)
        v = F(0)
        for c, den in ((x1, p), (-(n1 - x1), 1 - p), (x2, p - d), (-(n2 - x2), 1 - p + d)):
            if c != 0:
                v += c / den
        return v
    eps = (hi - lo) * F(10) ** -45
    if s(lo + eps) <= 0:
        return lo, lo - d
    if s(hi - eps) >= 0:
        return hi, hi - d
    p = bisect(lambda p: -s(p), lo + eps, hi - eps)
    return p, p - d


def diff_z(x1, n1, x2, n2, d, mn):
    p1, p2 = diff_mle(x1, n1, x2, n2, d)
    v = p1 * (1 - p1) / n1 + p2 * (1 - p2) / n2
    if mn:
        v *= F(n1 + n2) / (n1 + n2 - 1)
    num = F(x1) / n1 - F(x2) / n2 - d
    if num == 0:
        return F(0)
    if v <= 0:
        return mp.inf if num > 0 else -mp.inf
    return num / mp.sqrt(v)


def ratio_mle(x1, n1, x2, n2, r):
    A = r * (n1 + n2)
    B = -(r * n1 + x1 + n2 + r * x2)
    C = F(x1 + x2)
    if C == 0:
        return F(0), F(0)
    p2 = (-B - mp.sqrt(B * B - 4 * A * C)) / (2 * A)
    return r * p2, p2


def ratio_z(x1, n1, x2, n2, r, mn):
    p1, p2 = ratio_mle(x1, n1, x2, n2, r)
    v = p1 * (1 - p1) / n1 + r * r * p2 * (1 - p2) / n2
    if mn:
        v *= F(n1 + n2) / (n1 + n2 - 1)
    num = F(x1) / n1 - r * F(x2) / n2
    if num == 0:
        return F(0)
    if v <= 0:
        return mp.inf if num > 0 else -mp.inf
    return num / mp.sqrt(v)


def odds_z(x1, n1, x2, n2, psi):
    m = F(x1 + x2)
    A = n2 * (psi - 1)
    B = n1 * psi + n2 - m * (psi - 1)
    if A == 0:
        p2 = m / (n1 + n2)
    else:
        p2 = (-B + mp.sqrt(B * B + 4 * A * m)) / (2 * A)
    p1 = psi * p2 / (1 + p2 * (psi - 1))
    num = x1 - n1 * p1
    w1, w2 = n1 * p1 * (1 - p1), n2 * p2 * (1 - p2)
    if num == 0:
        return F(0)
    if w1 == 0 or w2 == 0:
        return mp.inf if num > 0 else -mp.inf
    return num / mp.sqrt(F(n1 + n2) / (n1 + n2 - 1) * w1 * w2 / (w1 + w2))


def score_limits(zf, z, lo, hi, est, log=False):
    """Limits where the decreasing statistic zf equals +z and -z."""
    L = lo if zf(lo) <= z else bisect(lambda x: z - zf(x), lo, est, log=log)
    U = hi if zf(hi) >= -z else bisect(lambda x: -z - zf(x), est, hi, log=log)
    return L, U


def nchg(x1, n1, x2, n2, psi):
    """Weights of Fisher's noncentral hypergeometric distribution of x1."""
    m = x1 + x2
    lo, hi = max(0, m - n2), min(n1, m)
    w = {j: mp.binomial(n1, j) * mp.binomial(n2, m - j) * psi ** j for j in range(lo, hi + 1)}
    s = mp.fsum(w.values())
    return {j: v / s for j, v in w.items()}, lo, hi


def cornfield(x1, n1, x2, n2, a, mid):
    _, lo, hi = nchg(x1, n1, x2, n2, F(1))

    def ge(psi):
        w, _, _ = nchg(x1, n1, x2, n2, psi)
        return mp.fsum(v for j, v in w.items() if j > x1) + (w[x1] / 2 if mid else w[x1])

    def le(psi):
        w, _, _ = nchg(x1, n1, x2, n2, psi)
        return mp.fsum(v for j, v in w.items() if j < x1) + (w[x1] / 2 if mid else w[x1])
    L = F(0) if x1 == lo else bisect(lambda psi: ge(psi) - a, F(10) ** -30, F(10) ** 30, log=True)
    U = mp.inf if x1 == hi else bisect(lambda psi: a - le(psi), F(10) ** -30, F(10) ** 30, log=True)
    if x1 == lo:
        est = F(0)
    elif x1 == hi:
        est = mp.inf
    else:
        def mean_minus(psi):
            w, _, _ = nchg(x1, n1, x2, n2, psi)
            return mp.fsum(j * v for j, v in w.items()) - x1
        est = bisect(mean_minus, F(10) ** -30, F(10) ** 30, log=True)
    return L, U, est


# ---------------------------------------------------------------- paired

def tango_z(b, c, n, d):
    b, c, n = F(b), F(c), F(n)
    w = -b - c + (2 * n - b + c) * d
    q = (mp.sqrt(max(F(0), w * w + 8 * n * c * d * (1 - d))) - w) / (4 * n)
    q = max(q, max(F(0), -d))
    num = b - c - n * d
    v = n * (2 * q + d * (1 - d))
    if num == 0:
        return F(0)
    if v <= 0:
        return mp.inf if num > 0 else -mp.inf
    return num / mp.sqrt(v)


def wilson(k, n, z):
    p = F(k) / n
    c = p + z * z / (2 * n)
    h = z * mp.sqrt(p * (1 - p) / n + z * z / (4 * n * n))
    return (c - h) / (1 + z * z / n), (c + h) / (1 + z * z / n)


def newcombe_paired(n11, n12, n21, n22, z):
    n = n11 + n12 + n21 + n22
    a, b = n11 + n12, n11 + n21
    p1, p2 = F(a) / n, F(b) / n
    l1, u1 = wilson(a, n, z)
    l2, u2 = wilson(b, n, z)
    den = F(n11 + n12) * (n21 + n22) * (n11 + n21) * (n12 + n22)
    phi = (F(n11) * n22 - F(n12) * n21) / mp.sqrt(den) if den > 0 else F(0)
    d = F(n12 - n21) / n
    dl1, du1, dl2, du2 = p1 - l1, u1 - p1, p2 - l2, u2 - p2
    return d - mp.sqrt(dl1 ** 2 - 2 * phi * dl1 * du2 + du2 ** 2), d + mp.sqrt(du1 ** 2 - 2 * phi * du1 * dl2 + dl2 ** 2), d


def cp(k, n, a):
    lo = F(0) if k == 0 else bisect(lambda p: sf(k - 1, n, p) - a, F(10) ** -40, F(k) / n, log=True)
    hi = F(1) if k == n else 1 - bisect(lambda q: sf(n - k - 1, n, q) - a, F(10) ** -40, F(n - k) / n, log=True)
    return lo, hi


def fmt(x):
    if x == mp.inf:
        return "+Inf"
    return mp.nstr(x, 20, min_fixed=-400, max_fixed=400)


def main():
    out = sys.stdout
    out.write("# Golden limits from mpmath (50 digits): case, method, level, lower, upper, estimate\n")
    out.write("# case: k/n for one proportion; k1/n1-k2/n2 for two; n11,n12,n21,n22 for paired; n12:n21 for the discordant ratio\n")
    out.write("# generator: /usr/bin/python3 testdata/gen/interval_mpmath.py > testdata/interval_mpmath.tsv\n")
    out.write("# tools: mpmath %s\n" % mp.__version__)
    out.write("# date: %s\n" % datetime.date.today().isoformat())
    rows = []
    singles = [(0, 20), (1, 20), (81, 263), (4, 20), (19, 20), (20, 20), (1, 1), (37, 1000), (5, 10 ** 6), (2, 10 ** 9), (5, 10 ** 12)]
    for lev in ("0.95", "0.9", "0.99"):
        a = (1 - F(lev)) / 2
        for k, n in singles:
            case = "%d/%d" % (k, n)
            est = F(k) / n
            if n <= 10 ** 6 or k <= 5:
                rows.append((case, "Jeffreys", lev) + jeffreys(k, n, a) + (est,))
                rows.append((case, "likelihood ratio", lev) + lr(k, n, a) + (est,))
            if n <= 1000 or k <= 5:
                if n <= 1000:
                    rows.append((case, "mid-p", lev) + midp(k, n, a) + (est,))
            rows.append((case, "Wilson with continuity correction", lev) + wilson_cc(k, n, a) + (est,))
            rows.append((case, "Agresti-Coull", lev) + adjusted_wald_ac(k, n, a) + (est,))
            rows.append((case, "arcsine", lev) + arcsine(k, n, a) + (est,))
            rows.append((case, "logit", lev) + logit(k, n, a) + (est,))
            if n <= 30:
                rows.append((case, "Blaker", lev) + blaker(k, n, lev) + (est,))
        z = zq(a)
        twos = [(56, 70, 48, 80), (7, 15, 12, 15), (0, 10, 0, 20), (10, 10, 0, 10), (3, 1000, 1, 50), (1, 2, 1, 3), (5, 10 ** 9, 9, 10 ** 9)]
        for x1, n1, x2, n2 in twos:
            case = "%d/%d-%d/%d" % (x1, n1, x2, n2)
            dh = F(x1) / n1 - F(x2) / n2
            for name, mn in (("Mee", False), ("Miettinen-Nurminen", True)):
                L, U = score_limits(lambda d: diff_z(x1, n1, x2, n2, d, mn), z, F(-1), F(1), dh)
                rows.append((case, "difference " + name, lev, L, U, dh))
            rh = (F(x1) / n1) / (F(x2) / n2) if x2 > 0 else mp.inf
            if x1 + x2 > 0:
                for name, mn in (("Koopman", False), ("Miettinen-Nurminen", True)):
                    guess = ((x1 + F(1) / 2) / n1) / ((x2 + F(1) / 2) / n2)
                    L, U = score_limits(lambda r: ratio_z(x1, n1, x2, n2, r, mn), z, F(10) ** -30, F(10) ** 30, guess, log=True)
                    rows.append((case, "ratio " + name, lev, L if L > F(10) ** -29 else F(0), U if U < F(10) ** 29 else mp.inf, rh))
            if 0 < x1 + x2 < n1 + n2 and n1 + n2 <= 10 ** 4:
                guess = ((x1 + F(1) / 2) * (n2 - x2 + F(1) / 2)) / ((n1 - x1 + F(1) / 2) * (x2 + F(1) / 2))
                L, U = score_limits(lambda s: odds_z(x1, n1, x2, n2, s), z, F(10) ** -30, F(10) ** 30, guess, log=True)
                orh = mp.inf if (n1 - x1) * x2 == 0 else F(x1 * (n2 - x2)) / ((n1 - x1) * x2)
                rows.append((case, "odds Miettinen-Nurminen", lev, L if L > F(10) ** -29 else F(0), U if U < F(10) ** 29 else mp.inf, orh))
                for name, mid in (("Cornfield exact conditional", False), ("Cornfield mid-p", True)):
                    rows.append((case, "odds " + name, lev) + cornfield(x1, n1, x2, n2, a, mid))
        paired = [(1, 1, 7, 12), (43, 8, 1, 48), (10, 4, 12, 30), (0, 3, 0, 17)]
        for t in paired:
            case = "%d,%d,%d,%d" % t
            n = sum(t)
            d = F(t[1] - t[2]) / n
            L, U = score_limits(lambda dd: tango_z(t[1], t[2], n, dd), z, F(-1), F(1), d)
            rows.append((case, "paired Tango score", lev, L, U, d))
            rows.append((case, "paired Newcombe paired hybrid score", lev) + newcombe_paired(*t, z))
            b, c = t[1], t[2]
            lo1, hi1 = cp(b, b + c, a)
            lo2, hi2 = cp(c, b + c, a)
            rows.append(("%d:%d" % (b, c), "discordant Clopper-Pearson", lev, lo1 / hi2, hi1 / lo2 if lo2 > 0 else mp.inf, F(b) / c if c > 0 else mp.inf))
    for r in rows:
        out.write("%s\t%s\t%s\t%s\t%s\t%s\n" % (r[0], r[1], r[2], fmt(r[3]), fmt(r[4]), fmt(r[5])))


if __name__ == "__main__":
    main()
