#!/usr/bin/env python3
"""Independent enumeration of rotational species and nuclear-spin counts.

Plain Python (fractions only), sharing nothing with zsum's character formula:

* The rotation group T of a regular tetrahedron is built as explicit 3x3
  integer matrices, by closing two generators (the three-fold rotation that
  cycles x -> y -> z, and the two-fold rotation about x) under
  multiplication; it must come out with 12 elements.
* Each element is put into its class by its rotation angle, from the matrix:
  cos(angle) = (trace - 1)/2, exactly.
* Each element acts on the homogeneous polynomials of degree J in x, y, z
  (monomial basis): (g p)(v) = p(g^-1 v), expanded exactly. The harmonic
  polynomials of degree J carry D^J, so its character is
  trace_J - trace_{J-2}.
* The species counts follow from the character table of T (A, the real E
  pair, F), projected with the class sizes found by the enumeration.
* Spin counts: the four nuclei at the tetrahedron's vertices (and three on
  a three-fold axis, group S3) are permuted; every product spin state of n
  states per nucleus is enumerated and the states each permutation fixes
  are counted, then projected.

Prints one line per result:
  T <J> <a> <e_pairs> <f>
  TSPIN <2I> <m_A> <m_E_pairs> <m_F>
  S3SPIN <2I> <m_A1> <m_A2> <m_E>
and exits non-zero if a projection is not a whole number.
"""

import itertools
import sys
from fractions import Fraction

MAX_J = 10
TWICE_SPINS = [0, 1, 2, 3]


def matmul(a, b):
    return tuple(
        tuple(sum(a[i][k] * b[k][j] for k in range(3)) for j in range(3)) for i in range(3)
    )


def transpose(a):
    return tuple(tuple(a[j][i] for j in range(3)) for i in range(3))


def group_t():
    identity = ((1, 0, 0), (0, 1, 0), (0, 0, 1))
    c3 = ((0, 0, 1), (1, 0, 0), (0, 1, 0))  # (x, y, z) -> (z, x, y)
    c2 = ((1, 0, 0), (0, -1, 0), (0, 0, -1))  # pi about x
    group = {identity}
    frontier = [identity]
    while frontier:
        new = []
        for g in frontier:
            for h in (c3, c2):
                p = matmul(g, h)
                if p not in group:
                    group.add(p)
                    new.append(p)
        frontier = new
    return sorted(group)


def angle_class(m):
    """The class from the rotation angle: cos = (tr - 1)/2."""
    det = (
        m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
        - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
        + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0])
    )
    assert det == 1, "not a proper rotation"
    cos = Fraction(m[0][0] + m[1][1] + m[2][2] - 1, 2)
    return {Fraction(1): "E", Fraction(-1): "C2", Fraction(-1, 2): "C3"}[cos]


def poly_mul(p, q):
    out = {}
    for mp, cp in p.items():
        for mq, cq in q.items():
            m = tuple(a + b for a, b in zip(mp, mq))
            out[m] = out.get(m, 0) + cp * cq
    return out


def monomials(degree):
    return [(a, b, degree - a - b) for a in range(degree + 1) for b in range(degree + 1 - a)]


def trace_on_degree(m, degree):
    """Trace of p -> p(g^-1 v) on homogeneous polynomials of `degree`."""
    if degree < 0:
        return 0
    inv = transpose(m)  # orthogonal
    # x_i(g^-1 v) = sum_j inv[i][j] x_j
    forms = [{tuple(1 if k == j else 0 for k in range(3)): inv[i][j] for j in range(3) if inv[i][j]}
             for i in range(3)]
    total = 0
    for mono in monomials(degree):
        p = {(0, 0, 0): 1}
        for i, power in enumerate(mono):
            for _ in range(power):
                p = poly_mul(p, forms[i])
        total += p.get(mono, 0)
    return total


CHARACTERS = {  # on (E, C2, C3); E is the real pair, divided by <E, E> = 2
    "A": ({"E": 1, "C2": 1, "C3": 1}, 1),
    "E": ({"E": 2, "C2": 2, "C3": -1}, 2),
    "F": ({"E": 3, "C2": -1, "C3": 0}, 1),
}


def project(chi_of, classes, table, order):
    out = []
    for name, (chars, norm) in table.items():
        s = Fraction(sum(chars[classes[i]] * chi_of[i] for i in range(len(classes))), order * norm)
        if s.denominator != 1:
            print(f"FAIL {name}: projection {s} is not whole", file=sys.stderr)
            sys.exit(1)
        out.append(int(s))
    return out


def vertex_permutation(m, vertices):
    perm = []
    for v in vertices:
        w = tuple(sum(m[i][j] * v[j] for j in range(3)) for i in range(3))
        perm.append(vertices.index(w))
    return perm


def fixed_spin_states(perm, n):
    count = 0
    for state in itertools.product(range(n), repeat=len(perm)):
        if all(state[perm[i]] == state[i] for i in range(len(perm))):
            count += 1
    return count


def main():
    group = group_t()
    assert len(group) == 12, len(group)
    classes = [angle_class(g) for g in group]
    sizes = {c: classes.count(c) for c in ("E", "C2", "C3")}
    assert sizes == {"E": 1, "C2": 3, "C3": 8}, sizes
    traces = {g: [trace_on_degree(g, d) for d in range(MAX_J + 1)] for g in group}
    for j in range(MAX_J + 1):
        chi = [traces[g][j] - (traces[g][j - 2] if j >= 2 else 0) for g in group]
        a, e, f = project(chi, classes, CHARACTERS, 12)
        assert a + 2 * e + 3 * f == 2 * j + 1
        print(f"T {j} {a} {e} {f}")
    vertices = [(1, 1, 1), (1, -1, -1), (-1, 1, -1), (-1, -1, 1)]
    perms = [vertex_permutation(g, vertices) for g in group]
    for twice in TWICE_SPINS:
        n = twice + 1
        chi = [fixed_spin_states(p, n) for p in perms]
        a, e, f = project(chi, classes, CHARACTERS, 12)
        print(f"TSPIN {twice} {a} {e} {f}")
    # S3 on three nuclei: classes by cycle type.
    s3 = list(itertools.permutations(range(3)))
    def s3_class(p):
        fixed = sum(1 for i in range(3) if p[i] == i)
        return {3: "E", 0: "C3", 1: "S"}[fixed]
    s3_classes = [s3_class(p) for p in s3]
    s3_table = {
        "A1": ({"E": 1, "C3": 1, "S": 1}, 1),
        "A2": ({"E": 1, "C3": 1, "S": -1}, 1),
        "E": ({"E": 2, "C3": -1, "S": 0}, 1),
    }
    for twice in TWICE_SPINS:
        n = twice + 1
        chi = [fixed_spin_states(list(p), n) for p in s3]
        a1, a2, e = project(chi, s3_classes, s3_table, 6)
        print(f"S3SPIN {twice} {a1} {a2} {e}")


if __name__ == "__main__":
    main()
