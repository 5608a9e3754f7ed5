#!/usr/bin/env python3
"""Independent oracle for the asymmetric top (tests/asymmetric_math.rs).

Builds the FULL (2J+1) x (2J+1) Hamiltonian of the rigid or Watson
A-reduced quartic asymmetric top in the symmetric-top basis |J,K>,
K = -J..J (no Wang blocks, no splitting), and diagonalises it with mpmath's
symmetric eigensolver mp.eigsy at 50 significant digits.

    <K|H|K>   = ((B+C)/2) n + (A - (B+C)/2) K^2 - DJ n^2 - DJK n K^2 - DK K^4
    <K+2|H|K> = <K|H|K+2>
              = sqrt[(n - K(K+1)) (n - (K+1)(K+2))]
                * [ (B-C)/4 - dJ n - (dK/2) ((K+2)^2 + K^2) ]

with n = J(J+1). The constants arrive as exact decimal strings in a JSON
document on standard input:

    {"sets": [{"name": "water", "A": "27.8806", "B": "14.5218",
               "C": "9.2777", "quartic": null | {"DJ": ..., "DJK": ...,
               "DK": ..., "dJ": ..., "dK": ...}, "j": [0, 1, ...]}]}

For every set and J it prints one line per eigenvalue, ascending:

    EIG <name> <J> <value to 50 significant digits>

then `DONE <number of matrices>`.
"""

import json
import sys

from mpmath import mp

mp.dps = 50


def hamiltonian(A, B, C, q, J):
    n = mp.mpf(J * (J + 1))
    size = 2 * J + 1
    H = mp.matrix(size, size)
    DJ, DJK, DK, dJ, dK = q
    for i in range(size):
        K = mp.mpf(i - J)
        H[i, i] = ((B + C) / 2) * n + (A - (B + C) / 2) * K**2 \
            - DJ * n**2 - DJK * n * K**2 - DK * K**4
    for i in range(size - 2):
        K = mp.mpf(i - J)
        g = mp.sqrt((n - K * (K + 1)) * (n - (K + 1) * (K + 2)))
        v = g * ((B - C) / 4 - dJ * n - (dK / 2) * ((K + 2)**2 + K**2))
        H[i + 2, i] = v
        H[i, i + 2] = v
    return H


def main():
    doc = json.load(sys.stdin)
    count = 0
    for s in doc["sets"]:
        A, B, C = (mp.mpf(s[k]) for k in ("A", "B", "C"))
        qd = s.get("quartic")
        if qd is None:
            q = [mp.mpf(0)] * 5
        else:
            q = [mp.mpf(qd[k]) for k in ("DJ", "DJK", "DK", "dJ", "dK")]
        for J in s["j"]:
            H = hamiltonian(A, B, C, q, J)
            if J == 0:
                values = [H[0, 0]]
            else:
                values = sorted(mp.eigsy(H, eigvals_only=True))
            for v in values:
                print("EIG", s["name"], J, mp.nstr(v, 50, min_fixed=-mp.inf, max_fixed=mp.inf))
            count += 1
    print("DONE", count)


if __name__ == "__main__":
    main()
