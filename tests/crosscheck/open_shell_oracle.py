#!/usr/bin/env python3
"""Independent oracle for the open-shell diatomic rotors (tests/open_shell.rs).

Diagonalises each J's Hamiltonian matrix numerically with mpmath's symmetric
eigensolver mp.eigsy at 60 significant digits, with none of zsum's closed
forms, and sums partition functions directly over the eigenvalues.

2Pi (Lambda = 1, S = 1/2) in the Hund's case (a) basis |Omega = 1/2>,
|Omega = 3/2>, x = J + 1/2, both parities alike (Lambda doubling unsplit):

    <1/2|H|1/2> = -A/2 + B x^2
    <3/2|H|3/2> =  A/2 + B (x^2 - 2)
    <1/2|H|3/2> = -B sqrt(x^2 - 1)

(from H = A L_z S_z + B (J - L - S)^2 with the L_x, L_y terms dropped);
J = 1/2 has only the Omega = 1/2 row. The centrifugal term is
-D (x^2 - 1)^2 times the identity (zsum's stated choice). Eigenvalues in
ascending order are F1 then F2; each level holds 2(2J+1) states.

3Sigma (S = 1, Lambda = 0) in the full case (a) basis |Omega = +1>,
|Omega = 0>, |Omega = -1> (no parity combinations), n = J(J+1), from
H = B (J - S)^2 + (2/3) lambda (3 S_z^2 - S^2) + gamma (J - S).S:

    <+-1|H|+-1> = B n + 2 lambda/3 - gamma
    < 0 |H| 0 > = B (n + 2) - 4 lambda/3 - 2 gamma
    <+-1|H| 0 > = (gamma/2 - B) sqrt(2 n)

shifted by -(2 lambda/3 - gamma) so that the N = J level lies at B n.
J = 0 has only the Omega = 0 row. With every N allowed, each eigenvalue
holds 2J+1 states. (Only odd N is checked through the levels, not here.)

Input, a JSON document on standard input:

    {"pi":    [{"name": .., "A": .., "B": .., "D": .., "twice_j": [1, 3, ..]}],
     "sigma": [{"name": .., "B": .., "lambda": .., "gamma": .., "j": [0, 1, ..]}],
     "q":     [{"name": .., "kind": "pi" | "sigma", constants as above,
                "kelvin": ["10", "298.15", ..]}]}

constants as exact decimal strings in cm^-1. Output lines:

    PI <name> <2J> <eigenvalue> ...        ascending, 50 significant digits
    SIGMA <name> <J> <eigenvalue> ...
    Q <name> <T> <ln q> <U/kT> <Cv/k>      energies from the lowest level
    DONE <lines>

kT in cm^-1 is T k/(h c) with the exact SI values of k, h and c.
"""

import json
import sys

from mpmath import mp

mp.dps = 60

K_OVER_HC = mp.mpf("1.380649e-23") / (mp.mpf("6.62607015e-34") * 299792458 * 100)


def pi_levels(A, B, D, twice_j):
    x = mp.mpf(twice_j + 1) / 2
    shift = -D * (x * x - 1) ** 2
    if twice_j == 1:
        return [-A / 2 + B * x * x + shift]
    H = mp.matrix(2, 2)
    H[0, 0] = -A / 2 + B * x * x
    H[1, 1] = A / 2 + B * (x * x - 2)
    H[0, 1] = H[1, 0] = -B * mp.sqrt(x * x - 1)
    E = mp.eigsy(H, eigvals_only=True)
    return sorted(E[i] + shift for i in range(2))


def sigma_levels(B, lam, gam, j):
    n = mp.mpf(j * (j + 1))
    zero = 2 * lam / 3 - gam
    if j == 0:
        return [B * (n + 2) - 4 * lam / 3 - 2 * gam - zero]
    H = mp.matrix(3, 3)
    H[0, 0] = H[2, 2] = B * n + 2 * lam / 3 - gam
    H[1, 1] = B * (n + 2) - 4 * lam / 3 - 2 * gam
    off = (gam / 2 - B) * mp.sqrt(2 * n)
    H[0, 1] = H[1, 0] = H[2, 1] = H[1, 2] = off
    E = mp.eigsy(H, eigvals_only=True)
    return sorted(E[i] - zero for i in range(3))


def levels_of(case, j):
    """(energy, states) of one J (2J for pi)."""
    if case["kind"] == "pi":
        A, B, D = (mp.mpf(case[k]) for k in ("A", "B", "D"))
        return [(e, 2 * (j + 1)) for e in pi_levels(A, B, D, j)]
    B, lam, gam = (mp.mpf(case[k]) for k in ("B", "lambda", "gamma"))
    return [(e, 2 * j + 1) for e in sigma_levels(B, lam, gam, j)]


def thermo(case, T):
    kt = mp.mpf(T) * K_OVER_HC
    B = mp.mpf(case["B"])
    js = range(1, 20001, 2) if case["kind"] == "pi" else range(0, 10001)
    levels = []
    lowest = None
    for j in js:
        ls = levels_of(case, j)
        levels.extend(ls)
        low = min(e for e, _ in ls)
        lowest = low if lowest is None else min(lowest, low)
        # Past the first few J, stop when every level of this J lies 130 kT
        # above the lowest (the rest of the sum is then below e^-120 of it).
        if j > 6 and low - lowest > 130 * kt + 100 * B:
            break
    else:
        raise SystemExit(f"{case['name']} at {T} K: the levels never pass 130 kT")
    e0 = min(e for e, _ in levels)
    z = s1 = s2 = mp.mpf(0)
    for e, g in levels:
        x = (e - e0) / kt
        w = g * mp.exp(-x)
        z += w
        s1 += w * x
        s2 += w * x * x
    u = s1 / z
    return mp.log(z), u, s2 / z - u * u


def main():
    doc = json.load(sys.stdin)
    out = 0
    for kind, key, names, levels in (
        ("PI", "twice_j", ("A", "B", "D"), pi_levels),
        ("SIGMA", "j", ("B", "lambda", "gamma"), sigma_levels),
    ):
        for s in doc.get(kind.lower(), []):
            constants = [mp.mpf(s[k]) for k in names]
            for j in s[key]:
                vals = " ".join(mp.nstr(e, 50) for e in levels(*constants, j))
                print(f"{kind} {s['name']} {j} {vals}")
                out += 1
    for case in doc.get("q", []):
        for T in case["kelvin"]:
            lnq, u, cv = thermo(case, T)
            vals = " ".join(mp.nstr(v, 45) for v in (lnq, u, cv))
            print(f"Q {case['name']} {T} {vals}")
            out += 1
    print(f"DONE {out}")


if __name__ == "__main__":
    main()
