#!/usr/bin/python3
"""Reference values for the sequential methods, computed independently of the library.

Writes ../sequential_golden.tsv with four kinds of row:

  cusum   p0 p1 shift unit ref threshold p arl sdrl
          Bernoulli CUSUM run lengths: the transition matrix of the integer
          chart (states 0..threshold-1) is built densely and (I - Q) L = 1,
          (I - Q) S = 1 + 2 Q L solved by LAPACK (numpy.linalg.solve).
  cusumh  p0 p1 shift unit ref arl0 threshold arl
          smallest threshold with in-control ARL >= arl0, by scanning every
          threshold upward with dense solves.
  cusummp shift unit ref threshold p arl
          the same chain solved by mpmath's LU at 60 digits, for in-control run
          lengths large enough that rounding in plain elimination shows.
  sprt    p0 p1 alpha beta maxn p accept reject asn
          truncated SPRT by a recursion over the full range k = 0..n (no
          band) with numpy, boundaries Z >= ln((1-beta)/alpha) reject,
          Z <= ln(beta/(1-alpha)) accept, at maxn reject iff Z > 0.
  cs      kind conc a b level k n lower upper
          beta-binomial mixture confidence sequence limits solved with
          mpmath at 40 digits (bisection on the log martingale); kind is
          "centred" (Beta(r p, r (1-p))) or "fixed" (Beta(a, b)).
  cserr   kind conc a b level p horizon error
          exact probability that the sequence ever excludes p by n <= horizon:
          recursion over the full k range with scipy.special.betaln.
  tau     alpha n tau2
          mixing variance of the two-sample normal mixture tuned for n per group
          at p1 = p2 = 1/2: x v with v = 1/(2n) and x minimizing
          (1 + 1/x)(2 ln(1/alpha) + ln(1 + x)) (scipy.optimize.minimize_scalar).
  diffnorm alpha tau2 p1 p2 horizon error
          exact probability that the two-sample normal-mixture sequence ever
          excludes p1 - p2 within horizon pairs: recursion over the full
          (k1, k2) grid with numpy.

Run: /usr/bin/python3 testdata/gen/sequential_golden.py   (from the repo root;
about 4 minutes, most of it the 60-digit solves)
"""
import datetime, math, os
import numpy as np
import scipy
from scipy.special import betaln
import mpmath

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "sequential_golden.tsv")
rows = []


def fmt(x):
    return repr(float(x))


# ---------------------------------------------------------------- CUSUM
def chain(unit, ref, shift, threshold, p):
    """Return Q (transient transitions) of the integer Bernoulli CUSUM."""
    if shift == "increase":
        up, down, pu = unit - ref, ref, p
    else:
        up, down, pu = ref, unit - ref, 1 - p
    n = threshold
    Q = np.zeros((n, n))
    for s in range(n):
        Q[s, max(0, s - down)] += 1 - pu
        if s + up < n:
            Q[s, s + up] += pu
    return Q


def arl(unit, ref, shift, threshold, p):
    Q = chain(unit, ref, shift, threshold, p)
    A = np.eye(threshold) - Q
    L = np.linalg.solve(A, np.ones(threshold))
    S = np.linalg.solve(A, 1 + 2 * Q @ L)
    return L[0], math.sqrt(max(S[0] - L[0] ** 2, 0))


CUSUMS = [
    # p0, p1, shift, unit, ref, thresholds, rates
    (0.01, 0.02, "increase", 69, 1, [69 * 3, 69 * 4 + 5], [0.01, 0.02, 0.015, 0.05]),
    (0.1, 0.2, "increase", 20, 3, [40, 61], [0.1, 0.2, 0.3]),
    (0.3, 0.4, "increase", 43, 15, [100, 173], [0.3, 0.4]),
    (0.2, 0.1, "decrease", 33, 5, [60, 99], [0.2, 0.1, 0.05]),
    (0.05, 0.01, "decrease", 40, 1, [80, 123], [0.05, 0.01, 0.02]),
]
for p0, p1, shift, unit, ref, ths, ps in CUSUMS:
    for th in ths:
        for p in ps:
            L, sd = arl(unit, ref, shift, th, p)
            rows.append(["cusum", p0, p1, shift, unit, ref, th, p, fmt(L), fmt(sd)])

CUSUMH = [
    (0.01, 0.02, "increase", 69, 1, 1000.0),
    (0.1, 0.2, "increase", 20, 3, 500.0),
    (0.2, 0.1, "decrease", 33, 5, 300.0),
]
for p0, p1, shift, unit, ref, target in CUSUMH:
    th = 1
    while True:
        L, _ = arl(unit, ref, shift, th, p0)
        if L >= target:
            break
        th += 1
    rows.append(["cusumh", p0, p1, shift, unit, ref, target, th, fmt(L)])



def arl_mp(unit, ref, shift, threshold, p):
    mpmath.mp.dps = 60
    p = mpmath.mpf(p)
    if shift == "increase":
        up, down, pu = unit - ref, ref, p
    else:
        up, down, pu = ref, unit - ref, 1 - p
    n = threshold
    A = mpmath.eye(n)
    for s in range(n):
        A[s, max(0, s - down)] -= 1 - pu
        if s + up < n:
            A[s, s + up] -= pu
    return mpmath.lu_solve(A, mpmath.matrix([1] * n))[0]


for shift, unit, ref, th, p in [("increase", 20, 3, 220, "0.1"), ("increase", 20, 3, 300, "0.1"), ("decrease", 40, 1, 240, "0.05")]:
    rows.append(["cusummp", shift, unit, ref, th, p, mpmath.nstr(arl_mp(unit, ref, shift, th, p), 25)])

# ---------------------------------------------------------------- SPRT
def sprt(p0, p1, alpha, beta, maxn, p):
    la = math.log1p(-beta) - math.log(alpha)
    lb = math.log(beta) - math.log1p(-alpha)
    a = math.log(p1 / p0)
    b = math.log((1 - p1) / (1 - p0))
    alive = np.zeros(maxn + 2)
    alive[0] = 1.0
    acc = rej = asn = 0.0
    for n in range(1, maxn + 1):
        asn += alive.sum()
        new = np.zeros(maxn + 2)
        new[: n + 1] += alive[: n + 1] * (1 - p)
        new[1 : n + 1] += alive[:n] * p
        k = np.arange(n + 1)
        z = k * a + (n - k) * b
        if n < maxn:
            r = z >= la
            c = z <= lb
        else:
            r = z > 0
            c = ~r
        rej += new[: n + 1][r].sum()
        acc += new[: n + 1][c].sum()
        new[: n + 1][r | c] = 0
        alive = new
    return acc, rej, asn


SPRTS = [
    (0.05, 0.15, 0.05, 0.1, 200, [0.05, 0.1, 0.15, 0.25]),
    (0.5, 0.6, 0.05, 0.05, 1000, [0.5, 0.55, 0.6]),
    (0.3, 0.1, 0.01, 0.1, 500, [0.3, 0.2, 0.1]),
    (0.001, 0.005, 0.05, 0.2, 3000, [0.001, 0.0025, 0.005]),
]
for p0, p1, alpha, beta, maxn, ps in SPRTS:
    for p in ps:
        acc, rej, asn = sprt(p0, p1, alpha, beta, maxn, p)
        rows.append(["sprt", p0, p1, alpha, beta, maxn, p, fmt(acc), fmt(rej), fmt(asn)])

# ---------------------------------------------------------------- confidence sequences
mpmath.mp.dps = 40


def shapes(kind, conc, a, b, p):
    if kind == "centred":
        return conc * p, conc * (1 - p)
    return mpmath.mpf(a), mpmath.mpf(b)


def logm(kind, conc, a, b, k, n, p):
    sa, sb = shapes(kind, conc, a, b, p)
    v = mpmath.log(mpmath.beta(sa + k, sb + n - k)) - mpmath.log(mpmath.beta(sa, sb))
    if k > 0:
        v -= k * mpmath.log(p)
    if n > k:
        v -= (n - k) * mpmath.log(1 - p)
    return v


def limit(kind, conc, a, b, level, k, n, lower):
    t = -mpmath.log(1 - mpmath.mpf(level))
    hat = mpmath.mpf(k) / n
    if lower and k == 0:
        return mpmath.mpf(0)
    if not lower and k == n:
        return mpmath.mpf(1)
    inside = lambda p: logm(kind, conc, a, b, k, n, p) < t
    # walk outward from the estimate to the first point outside
    tiny = mpmath.mpf(10) ** -300
    if lower:
        x_in, x = hat, hat
        while True:
            x = x_in / 2
            if x < tiny:
                return mpmath.mpf(0)  # inside down to 1e-300: the limit is 0
            if not inside(x):
                break
            x_in = x
    else:
        x_in, x = hat, hat
        while True:
            x = 1 - (1 - x_in) / 2
            if 1 - x < tiny:
                return mpmath.mpf(1)
            if not inside(x):
                break
            x_in = x
    lo, hi = (x, x_in) if lower else (x_in, x)
    for _ in range(200):
        mid = (lo + hi) / 2
        ins = inside(mid)
        if lower:
            lo, hi = (lo, mid) if ins else (mid, hi)
        else:
            lo, hi = (mid, hi) if ins else (lo, mid)
    return (lo + hi) / 2


CS = [
    # kind, conc, a, b, level, k, n
    ("centred", 122.6323654716538, 0, 0, 0.95, 500, 1000),
    ("centred", 122.6323654716538, 0, 0, 0.95, 3, 1000),
    ("centred", 122.6323654716538, 0, 0, 0.95, 0, 50),
    ("centred", 10.0, 0, 0, 0.99, 7, 20),
    ("centred", 1000.0, 0, 0, 0.9, 1234, 100000),
    ("centred", 5.0, 0, 0, 0.95, 1, 1),
    ("fixed", 0, 1, 1, 0.95, 30, 100),
    ("fixed", 0, 0.5, 0.5, 0.95, 0, 10),
    ("fixed", 0, 2, 30, 0.99, 17, 400),
    ("fixed", 0, 1, 1, 0.95, 99, 100),
]
for kind, conc, a, b, level, k, n in CS:
    lo = limit(kind, mpmath.mpf(conc), a, b, level, k, n, True)
    hi = limit(kind, mpmath.mpf(conc), a, b, level, k, n, False)
    rows.append(["cs", kind, conc, a, b, level, k, n, mpmath.nstr(lo, 20), mpmath.nstr(hi, 20)])


def cserr(kind, conc, a, b, level, p, horizon):
    t = -math.log1p(-level)
    sa, sb = (conc * p, conc * (1 - p)) if kind == "centred" else (a, b)
    alive = np.zeros(horizon + 2)
    alive[0] = 1.0
    miss = 0.0
    for n in range(1, horizon + 1):
        new = np.zeros(horizon + 2)
        new[: n + 1] += alive[: n + 1] * (1 - p)
        new[1 : n + 1] += alive[:n] * p
        k = np.arange(n + 1)
        lm = betaln(sa + k, sb + n - k) - betaln(sa, sb) - k * math.log(p) - (n - k) * math.log1p(-p)
        out = lm >= t
        miss += new[: n + 1][out].sum()
        new[: n + 1][out] = 0
        alive = new
    return miss


CSERR = [
    ("centred", 122.6323654716538, 0, 0, 0.95, 0.5, 2000),
    ("centred", 122.6323654716538, 0, 0, 0.95, 0.02, 2000),
    ("centred", 30.0, 0, 0, 0.9, 0.3, 1000),
    ("fixed", 0, 1, 1, 0.95, 0.5, 2000),
    ("fixed", 0, 1, 1, 0.99, 0.1, 1500),
    ("fixed", 0, 0.5, 5, 0.95, 0.05, 1000),
]
for kind, conc, a, b, level, p, horizon in CSERR:
    rows.append(["cserr", kind, conc, a, b, level, p, horizon, fmt(cserr(kind, conc, a, b, level, p, horizon))])

# ---------------------------------------------------------------- two-sample normal mixture
from scipy.optimize import minimize_scalar


def tuned_tau2(alpha, n):
    l2 = -2 * math.log(alpha)
    g = lambda lx: (1 + math.exp(-lx)) * (l2 + math.log1p(math.exp(lx)))
    r = minimize_scalar(g, bounds=(-10, 20), method="bounded", options={"xatol": 1e-12})
    return math.exp(r.x) / (2 * n)


def diffnorm(alpha, tau2, p1, p2, horizon):
    d = p1 - p2
    alive = np.zeros((1, 1))
    alive[0, 0] = 1.0
    miss = 0.0
    for n in range(1, horizon + 1):
        new = np.zeros((n + 1, n + 1))
        new[:n, :n] += alive * (1 - p1) * (1 - p2)
        new[1:, :n] += alive * p1 * (1 - p2)
        new[:n, 1:] += alive * (1 - p1) * p2
        new[1:, 1:] += alive * p1 * p2
        k = np.arange(n + 1) / n
        h1, h2 = np.meshgrid(k, k, indexing="ij")
        v = h1 * (1 - h1) / n + h2 * (1 - h2) / n
        est = h1 - h2
        with np.errstate(divide="ignore", invalid="ignore"):
            hw = np.sqrt(2 * v * (v + tau2) / tau2 * (-math.log(alpha) + 0.5 * np.log1p(tau2 / v)))
        lo = np.where(v > 0, np.maximum(est - hw, -1), -1)
        hi = np.where(v > 0, np.minimum(est + hw, 1), 1)
        out = (d < lo) | (d > hi)
        miss += new[out].sum()
        new[out] = 0
        alive = new
    return miss


for alpha, n in [(0.05, 20), (0.05, 1000), (0.1, 200)]:
    rows.append(["tau", alpha, n, fmt(tuned_tau2(alpha, n))])
for alpha, n, p1, p2, horizon in [(0.05, 20, 0.5, 0.5, 100), (0.05, 20, 0.01, 0.2, 100), (0.05, 1000, 0.02, 0.1, 100), (0.05, 100, 0.3, 0.25, 150)]:
    t2 = tuned_tau2(alpha, n)
    rows.append(["diffnorm", alpha, fmt(t2), p1, p2, horizon, fmt(diffnorm(alpha, t2, p1, p2, horizon))])

with open(OUT, "w") as f:
    f.write("# Reference values for Bernoulli CUSUM run lengths, truncated SPRTs and beta-binomial\n")
    f.write("# mixture confidence sequences (limits and exact time-uniform error), computed independently\n")
    f.write("# of the library: dense LAPACK solves, full-range recursions, mpmath bisection at 40 digits.\n")
    f.write("# Generator: /usr/bin/python3 testdata/gen/sequential_golden.py (row layouts in its docstring)\n")
    f.write("# Tool: NumPy %s, SciPy %s, mpmath %s; date %s\n" % (np.__version__, scipy.__version__, mpmath.__version__, datetime.date.today()))
    for r in rows:
        f.write("\t".join(str(x) for x in r) + "\n")
print("wrote", OUT, len(rows), "rows")
