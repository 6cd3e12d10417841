#!/usr/bin/python3
"""Reference scalp potentials of current dipoles in concentric spheres.

Independent of the Go code: for each Legendre degree n the boundary
conditions (continuous potential and normal current at each interface,
no current through the scalp) are solved as one dense linear system with
numpy.linalg.solve, Legendre polynomials come from
scipy.special.eval_legendre, and the dipole is the central difference of
two point sources (current +-I at r0 +- h p/2), not the analytic gradient.
The point-source potential inside shell 1 is I/(4 pi sigma1) sum b^n/r^(n+1) P_n
(e.g. Rush & Driscoll 1968; de Munck & Peters 1993).

Run: /usr/bin/python3 gen_sphere.py > sphere_ref.json
"""
import json
import numpy as np
from scipy.special import eval_legendre


def scalp_coeff(n, radii, sigma):
    """Scalp potential of degree n per unit source coefficient C in shell 1
    (shell-1 potential A1 r^n + C r^-(n+1)), radii scaled so the scalp is 1."""
    K = len(radii)
    # unknowns: A1, (A2,B2), ..., (AK,BK)
    m = 2 * K - 1
    M = np.zeros((m, m))
    rhs = np.zeros(m)
    def idx(i):  # columns of A_i, B_i (B_1 is the known source term)
        if i == 0:
            return 0, None
        return 2 * i - 1, 2 * i
    row = 0
    for i in range(K - 1):
        r = radii[i]
        ai, bi = idx(i)
        ao, bo = idx(i + 1)
        # continuity: A_i r^n + B_i r^-(n+1) - A_o r^n - B_o r^-(n+1) = 0
        M[row, ai] += r**n
        if bi is None:
            rhs[row] -= r**(-n - 1)
        else:
            M[row, bi] += r**(-n - 1)
        M[row, ao] -= r**n
        M[row, bo] -= r**(-n - 1)
        row += 1
        # current: sigma_i d/dr(...) = sigma_o d/dr(...)
        M[row, ai] += sigma[i] * n * r**(n - 1)
        if bi is None:
            rhs[row] -= sigma[i] * (-(n + 1)) * r**(-n - 2)
        else:
            M[row, bi] += sigma[i] * (-(n + 1)) * r**(-n - 2)
        M[row, ao] -= sigma[i + 1] * n * r**(n - 1)
        M[row, bo] -= sigma[i + 1] * (-(n + 1)) * r**(-n - 2)
        row += 1
    aK, bK = idx(K - 1)
    if K == 1:
        M[row, aK] = n
        rhs[row] = (n + 1)
    else:
        M[row, aK] = n
        M[row, bK] = -(n + 1)
    sol = np.linalg.solve(M, rhs)
    if K == 1:
        return sol[0] + 1.0
    return sol[aK] + sol[bK]


def monopole(e, r0, radii, sigma, nmax):
    R = radii[-1]
    rs = [r / R for r in radii]
    b = np.linalg.norm(r0) / R
    x = np.dot(e, r0) / (np.linalg.norm(e) * np.linalg.norm(r0))
    total = 0.0
    for n in range(1, nmax + 1):
        # C = b^n/(4 pi sigma1) in scaled units, potential scaled back by 1/R
        total += scalp_coeff(n, rs, sigma) * b**n * eval_legendre(n, x)
    return total / (4 * np.pi * sigma[0] * R)


def dipole(e, r0, p, radii, sigma, nmax=400, h=2e-6):
    p = np.asarray(p, float)
    q = np.linalg.norm(p)
    u = p / q
    R = radii[-1]
    plus = monopole(e, r0 + 0.5 * h * R * u, radii, sigma, nmax)
    minus = monopole(e, r0 - 0.5 * h * R * u, radii, sigma, nmax)
    return q * (plus - minus) / (h * R)


def main():
    R = 0.09
    heads = {
        "three": ([0.87 * R, 0.92 * R, R], [0.33, 0.33 / 80, 0.33]),
        "four": ([0.80 * R, 0.84 * R, 0.92 * R, R], [0.33, 1.79, 0.33 / 80, 0.33]),
    }
    electrodes = [
        [0.0, 0.0, 1.0],
        [-0.951, 0.0, 0.309],
        [0.459, 0.580, 0.673],
        [0.0, -0.951, 0.309],
        [0.309, -0.5, -0.2],
    ]
    dipoles = [
        ([0.0, 0.0, 0.05], [0.0, 0.0, 1e-8]),
        ([0.02, 0.03, 0.04], [1e-8, -2e-8, 0.5e-8]),
        ([-0.05, 0.0, 0.03], [0.0, 1e-8, 0.0]),
        ([0.01, -0.06, 0.02], [0.3e-8, 0.4e-8, -1e-8]),
    ]
    out = []
    for name, (radii, sigma) in heads.items():
        for pos, mom in dipoles:
            r0 = np.array(pos)
            v = [dipole(np.array(e), r0, mom, radii, sigma) for e in electrodes]
            out.append({"head": name, "radii": radii, "sigma": sigma,
                        "pos": pos, "moment": mom, "electrodes": electrodes,
                        "v": v})
    print(json.dumps(out, indent=1))


if __name__ == "__main__":
    main()
