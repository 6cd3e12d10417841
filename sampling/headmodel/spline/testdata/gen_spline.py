#!/usr/bin/python3
"""Reference values for spherical-spline interpolation (Perrin, Pernier,
Bertrand & Echallier 1989), independent of the Go code: Legendre
polynomials from scipy.special.eval_legendre, the (n+1)x(n+1) system
[[G + lambda I, 1], [1', 0]] [c; c0] = [v; 0] solved with numpy.linalg.solve.

Also P_1 ... P_5 at a few x from scipy.special.eval_legendre and their
power-series coefficients from scipy.special.legendre(n).coeffs (the
closed forms of Abramowitz & Stegun 1964, Table 22.9).

Run: /usr/bin/python3 gen_spline.py > spline_ref.json
"""
import json
import numpy as np
from scipy.special import eval_legendre, legendre


def g(m, nterms, x):
    n = np.arange(1, nterms + 1)
    return float(np.sum((2 * n + 1) / (n * (n + 1)) ** m * eval_legendre(n, x)) / (4 * np.pi))


def main():
    xs = [-1.0, -0.5, 0.0, 0.3, 0.9, 1.0]
    gvals = []
    for m in (2, 3, 4):
        for nterms in (7, 50):
            gvals.append({"m": m, "nterms": nterms, "x": xs,
                          "g": [g(m, nterms, x) for x in xs]})
    # electrodes on the unit sphere (a rough upper-hemisphere layout)
    rng = np.random.default_rng(7)
    el = []
    while len(el) < 16:
        p = rng.normal(size=3)
        p /= np.linalg.norm(p)
        if p[2] > 0.0:
            el.append(p)
    el = np.array(el)
    vals = np.sin(2 * el[:, 0]) + el[:, 1] * el[:, 2] + 0.3 * el[:, 2]
    queries = np.array([[0, 0, 1], [0.6, 0.0, 0.8], [-0.48, 0.6, 0.64], [0.0, -0.8, 0.6]], float)
    interp = []
    for m, lam in ((4, 0.0), (4, 1e-4), (3, 0.0)):
        nterms = 50
        n = len(el)
        G = np.array([[g(m, nterms, float(np.clip(el[i] @ el[j], -1, 1))) for j in range(n)] for i in range(n)])
        A = np.zeros((n + 1, n + 1))
        A[:n, :n] = G + lam * np.eye(n)
        A[:n, n] = 1
        A[n, :n] = 1
        sol = np.linalg.solve(A, np.concatenate([vals, [0.0]]))
        c, c0 = sol[:n], sol[n]
        out = [float(c0 + sum(c[i] * g(m, nterms, float(q @ el[i])) for i in range(n))) for q in queries]
        interp.append({"m": m, "lambda": lam, "nterms": nterms, "c0": float(c0), "c": c.tolist(), "query_values": out})
    lx = [-1.0, -0.7, -0.2, 0.0, 0.35, 0.9, 1.0]
    leg = [{"n": n, "x": lx, "p": [float(eval_legendre(n, x)) for x in lx],
            "coeffs": [float(c) for c in legendre(n).coeffs]} for n in range(1, 6)]
    print(json.dumps({"g": gvals, "electrodes": el.tolist(), "values": vals.tolist(),
                      "queries": queries.tolist(), "interp": interp, "legendre": leg}, indent=1))


if __name__ == "__main__":
    main()
