#!/usr/bin/python3
"""Entropy of the binomial and hypergeometric distributions, for binom.Dist.Entropy
and binom.Hyper.Entropy: derivation of the large-variance expansion and golden values.

1. Derivation. For X binomial(n, p) with variance V = n p q and u = p q, the
   local Edgeworth expansion gives P(X = k) = f(x_k)/sqrt(V), x_k = (k - np)/sqrt(V),
   f(x)/phi(x) = 1 + eps(x) = [exp(sum_{j>=3} lambda_j t^j / j!)]_{t^m -> He_m(x)},
   lambda_j = (k_j / k_2) V^(1 - j/2), k_j the Bernoulli cumulants
   (k_1 = p, k_{j+1} = p q dk_j/dp). The lattice sum of -P ln P equals the
   integral up to O(exp(-2 pi^2 V)), and since eps has no He_0, He_2 part,
   H = (1/2) ln(2 pi e V) - E_phi[(1+eps) ln(1+eps)].
   Expanding (1+e) ln(1+e) = e + sum_{m>=2} (-1)^m e^m / (m(m-1)) and taking
   Gaussian moments in exact rational arithmetic gives
   E_phi[...] = sum_k b_k(u) / V^k with b_k polynomials in u, found here by
   exact interpolation at rational p and checked at further points.
2. Golden: testdata/binom_extra_entropy.tsv, entropies by 50-digit mpmath
   summation of -P ln P over all terms above 1e-60 of the largest (PMF from
   loggamma at 50 digits, ratio recurrence), for binomials with V <= 2e5 and
   hypergeometric cases; for larger V the expansion above (checked against
   the sums up to V = 2e5, where its omitted term is below 1e-25).

Run from the repository root:  /usr/bin/python3 testdata/gen/binom_extra_entropy.py
"""
import datetime
import math
from fractions import Fraction as F

import mpmath

mpmath.mp.dps = 50

R = 4  # terms up to V^-R
S = 2 * R  # max power of s

def bern_cumulants(J):
    # k_j as polynomials in p (list of coeffs), k_1 = p, k_{j+1} = (p - p^2) k_j'
    ks = {1: [F(0), F(1)]}
    for j in range(1, J):
        c = ks[j]
        d = [c[i] * i for i in range(1, len(c))]  # derivative
        # multiply by p - p^2
        out = [F(0)] * (len(d) + 2)
        for i, a in enumerate(d):
            out[i + 1] += a
            out[i + 2] -= a
        ks[j + 1] = out
    return ks

def peval(c, p):
    return sum(a * p ** i for i, a in enumerate(c))

def hermite(M):
    He = [[F(1)], [F(0), F(1)]]
    for m in range(1, M):
        a = [F(0)] + He[m]
        b = He[m - 1]
        nxt = [F(0)] * max(len(a), len(b))
        for i, v in enumerate(a): nxt[i] += v
        for i, v in enumerate(b): nxt[i] -= m * v
        He.append(nxt)
    return He

def coeffs_at(p):
    ks = bern_cumulants(S + 3)
    k2 = peval(ks[2], p)
    rho = {j: peval(ks[j], p) / k2 for j in range(3, S + 3)}
    # series A(s,t) = sum_j rho_j s^(j-2) t^j / j!   ; exp(A) truncated at s^S
    A = {}
    for j in range(3, S + 3):
        A[(j - 2, j)] = rho[j] / math.factorial(j)
    def mul(P, Q):
        out = {}
        for (s1, t1), a in P.items():
            for (s2, t2), b in Q.items():
                if s1 + s2 <= S:
                    key = (s1 + s2, t1 + t2)
                    out[key] = out.get(key, 0) + a * b
        return out
    E = {(0, 0): F(1)}
    term = {(0, 0): F(1)}
    for m in range(1, S + 1):
        term = mul(term, A)
        term = {k: v / m for k, v in term.items()}
        for k, v in term.items():
            E[k] = E.get(k, 0) + v
    maxt = max(t for (_, t) in E)
    He = hermite(maxt + 1)
    # eps as dict s -> poly in x (list)
    eps = {}
    for (sp, tp), a in E.items():
        if sp == 0:
            continue
        poly = eps.setdefault(sp, [F(0)] * (maxt + 2))
        for i, c in enumerate(He[tp]):
            poly[i] += a * c
    # polynomial in (s, x): dict s -> list
    def pmul(P, Q):
        out = {}
        for s1, a in P.items():
            for s2, b in Q.items():
                if s1 + s2 <= S:
                    o = out.setdefault(s1 + s2, [F(0)] * (len(a) + len(b)))
                    if len(o) < len(a) + len(b):
                        o.extend([F(0)] * (len(a) + len(b) - len(o)))
                    for i, x in enumerate(a):
                        if x == 0: continue
                        for j, y in enumerate(b):
                            o[i + j] += x * y
        return out
    # (1+e)ln(1+e) = e + sum_{m>=2} (-1)^m e^m / (m(m-1))
    total = {k: list(v) for k, v in eps.items()}
    powm = eps
    for m in range(2, S + 1):
        powm = pmul(powm, eps)
        c = F((-1) ** m, m * (m - 1))
        for sp, poly in powm.items():
            o = total.setdefault(sp, [F(0)] * len(poly))
            if len(o) < len(poly): o.extend([F(0)] * (len(poly) - len(o)))
            for i, v in enumerate(poly):
                o[i] += c * v
    def gauss(poly):
        tot = F(0)
        for k, v in enumerate(poly):
            if k % 2 == 0 and v != 0:
                df = 1
                for i in range(k - 1, 0, -2): df *= i
                tot += v * df
        return tot
    return {sp: gauss(poly) for sp, poly in sorted(total.items())}


def derive():
    """Returns [b_1, ..., b_R] as coefficient lists in u (exact rationals)."""
    ps = [F(1, d) for d in (2, 3, 5, 7, 11, 13, 17, 19, 23)]
    data = {p: coeffs_at(p) for p in ps}
    for sp in range(1, S + 1, 2):
        assert all(data[p].get(sp, 0) == 0 for p in ps), sp
    out = []
    for k in range(1, R + 1):
        n = k + 2
        M = [[(p * (1 - p)) ** i for i in range(n)] + [data[p][2 * k]] for p in ps[:n]]
        for c in range(n):
            piv = next(r for r in range(c, n) if M[r][c] != 0)
            M[c], M[piv] = M[piv], M[c]
            for r in range(n):
                if r != c:
                    f = M[r][c] / M[c][c]
                    M[r] = [a - f * b for a, b in zip(M[r], M[c])]
        coef = [M[i][n] / M[i][i] for i in range(n)]
        for p in ps[n:]:
            u = p * (1 - p)
            assert sum(c * u ** i for i, c in enumerate(coef)) == data[p][2 * k], (k, p)
        while coef and coef[-1] == 0:
            coef.pop()
        out.append(coef)
    return out


# The coefficients written in binom/entropy.go.
GO_COEFFS = [
    [F(1, 12), F(-1, 3)],
    [F(1, 24), F(-1, 6), F(1, 12)],
    [F(19, 360), F(-17, 60), F(1, 3), F(-1, 90)],
    [F(9, 80), F(-23, 30), F(22, 15), F(-2, 3), F(-1, 120)],
]


def asym(n, p, coeffs):
    p = mpmath.mpf(p)
    u = p * (1 - p)
    V = n * u
    s = mpmath.mpf(0)
    for k, c in enumerate(coeffs, start=1):
        s += sum(mpmath.mpf(a.numerator) / a.denominator * u ** i for i, a in enumerate(c)) / V ** k
    return mpmath.log(2 * mpmath.pi * mpmath.e * V) / 2 - s


def entropy_walk(m, lo, hi, logpmf_m, ratio_down, ratio_up):
    """-sum P ln P outward from the mode m over terms above 1e-60 of P(m)."""
    H = mpmath.mpf(0)
    lm = logpmf_m
    H -= mpmath.exp(lm) * lm
    for d in (-1, 1):
        lk, k = lm, m
        while True:
            if d < 0:
                if k == lo:
                    break
                lk += mpmath.log(ratio_down(k))
                k -= 1
            else:
                if k == hi:
                    break
                lk += mpmath.log(ratio_up(k))
                k += 1
            H -= mpmath.exp(lk) * lk
            if lk < lm - 140:
                break
    return H


def binom_entropy(n, p):
    pm = mpmath.mpf(p)
    qm = 1 - pm
    m = int((n + 1) * p)
    m = min(max(m, 0), n)
    lm = (mpmath.loggamma(n + 1) - mpmath.loggamma(m + 1) - mpmath.loggamma(n - m + 1)
          + m * mpmath.log(pm) + (n - m) * mpmath.log(qm))
    return entropy_walk(m, 0, n, lm,
                        lambda k: k * qm / ((n - k + 1) * pm),
                        lambda k: (n - k) * pm / ((k + 1) * qm))


def hyper_entropy(N, K, n):
    lo, hi = max(0, n - (N - K)), min(n, K)
    m = (n + 1) * (K + 1) // (N + 2)
    lg = mpmath.loggamma
    lm = (lg(K + 1) - lg(m + 1) - lg(K - m + 1) + lg(N - K + 1) - lg(n - m + 1)
          - lg(N - K - n + m + 1) - lg(N + 1) + lg(n + 1) + lg(N - n + 1))
    return entropy_walk(m, lo, hi, lm,
                        lambda j: mpmath.mpf(j * (N - K - n + j)) / ((K - j + 1) * (n - j + 1)),
                        lambda j: mpmath.mpf((K - j) * (n - j)) / ((j + 1) * (N - K - n + j + 1)))


def fmt(v):
    return mpmath.nstr(v, 22, min_fixed=1, max_fixed=0) if v != 0 else "0"


def main():
    coeffs = derive()
    assert coeffs == GO_COEFFS, coeffs
    rows = []
    ps = [0.5, 0.3, 0.1, 0.9, 0.01, 1e-3, 1e-6, 0.999999, 1e-12]
    ns = [1, 2, 3, 5, 10, 30, 100, 1000, 3000, 10000, 100000, 1000000, 10**8, 10**10, 10**12, 10**15]
    maxdiff = 0
    for n in ns:
        for p in ps:
            V = n * p * (1 - p)
            if V <= 2e5:
                h = binom_entropy(n, p)
                if V >= 1000:
                    maxdiff = max(maxdiff, abs(asym(n, p, coeffs) - h) / h)
            else:
                h = asym(n, p, coeffs)
            rows.append(f"binom\t{n}\t{p!r}\t\t{fmt(h)}")
    assert maxdiff < 1e-16, maxdiff
    for N, K, n in [(2, 1, 1), (8, 4, 4), (30, 19, 15), (100, 3, 50), (1000, 300, 200),
                    (100000, 5000, 40000), (1000000, 500000, 500000), (1000000, 10, 999000),
                    (10**9, 3 * 10**8, 10**6), (4 * 10**6, 2 * 10**6, 2 * 10**6),
                    (10**10, 3 * 10**9, 10**8), (10**12, 10**11, 10**9),
                    (2**34 - 7, 2**33 + 3, 2**33 - 5)]:
        rows.append(f"hyper\t{N}\t{K}\t{n}\t{fmt(hyper_entropy(N, K, n))}")
    with open("testdata/binom_extra_entropy.tsv", "w") as f:
        f.write("# Shannon entropy in nats. Rows: binom n p - H | hyper N K n H.\n")
        f.write("# Binomial p is the double printed (Python repr); see the generator for the method.\n")
        f.write(f"# Expansion coefficients b_k(u), lowest power first: {[[str(c) for c in b] for b in coeffs]}\n")
        f.write(f"# Largest relative gap expansion vs 50-digit sums for 1000 <= V <= 2e5: {mpmath.nstr(maxdiff, 3)}\n")
        f.write("# Generator: /usr/bin/python3 testdata/gen/binom_extra_entropy.py\n")
        f.write(f"# Tool: Python fractions, mpmath {mpmath.__version__} at {mpmath.mp.dps} digits; date {datetime.date.today()}\n")
        for r in rows:
            f.write(r + "\n")
    print(len(rows), "rows; max expansion gap", mpmath.nstr(maxdiff, 3))


if __name__ == "__main__":
    main()
