#!/usr/bin/env python3
"""Independent oracle for zsum: partition functions by plain direct summation.

Written against mpmath 1.3.0 (https://mpmath.org, arbitrary-precision
floating point for Python); the version actually used is printed at run time.
Nothing here calls or copies zsum's code: every level ladder is written out
from the textbook formulas quoted in each case, and every sum is a plain loop.

Usage: python3 tests/crosscheck/oracle.py PATH_TO_ZSUM_BINARY

For each case the oracle computes, with x_i = E_i/kT and weights g_i,

    S0 = sum g e^{-x},  S1 = sum g x e^{-x},  S2 = sum g x^2 e^{-x}
    q = S0, ln q, U/kT = S1/S0, Cv/k = S2/S0 - (S1/S0)^2,
    S/k = ln q + U/kT, F/kT = -ln q

with energies exactly as given (no shift to the ground state), at mp.dps = 50
working digits. It then runs `zsum ... --digits 30 --format json` and checks
EVERY value zsum prints for q, ln_q, U_over_kT, Cv_over_k, S_over_k and
F_over_kT:

  * zsum's string must carry exactly 30 significant digits;
  * read as an exact decimal it must EQUAL the oracle value correctly rounded
    to 30 significant digits (round half to nearest; compared as integers
    mantissa * 10^exponent, so plain "104.03..." and scientific "6.96e23"
    forms compare alike);
  * parsed with mpmath.mpf, |zsum - oracle| <= 0.5 ulp of the 30th digit.

Accuracy of the oracle (claimed: 40 significant digits). Working precision is
50 digits; the sums have at most ~10^4 positive terms, so rounding costs at
most ~10^-45 relative; Cv/k = <x^2> - <x>^2 loses at most about one digit to
cancellation in these cases (<x^2>/Cv < 10). As a check on that argument the
whole computation is repeated at mp.dps = 70 with tails below 1e-75, and the
two runs must agree to 1e-42 relative for every quantity.

Truncation argument (each infinite ladder stops once its tail is provably
below 1e-60 relative to the partial sum, for each of S0, S1, S2). For moment
k in {0,1,2} we use a majorant m_k(n) of the n-th block of terms whose log is
a concave function of n on the range considered. Then the ratios
r_n = m_k(n+1)/m_k(n) are non-increasing in n, and once r_n < 1,

    sum_{j>n} m_k(j) <= m_k(n) (r_n + r_n^2 + ...) = m_k(n) r_n / (1 - r_n).

We stop after block n when m_k(n) r_n/(1 - r_n) <= 1e-60 * S_k for k = 0, 1, 2
(so every neglected tail is below 1e-60 relative). The majorant and the
reason its log is concave are given beside each model below.

Physical constants: SI 2019 (26th CGPM, 2018) exact defining values
h = 6.62607015e-34 J s, c = 299792458 m/s, k = 1.380649e-23 J/K, so the
second radiation constant c2 = h c / k is an exact rational (in m K), and an
energy of E cm^-1 at temperature T K has x = E * 100 * c2 / T exactly.
"""

import json
import os
import subprocess
import sys
import tempfile
from fractions import Fraction

try:
    import mpmath
    from mpmath import mp, mpf
except ImportError:  # pragma: no cover - reported by the Rust wrapper too
    sys.stderr.write("oracle.py needs mpmath: run `pip install mpmath`\n")
    sys.exit(3)

# --- exact constants (SI 2019 defining constants) ---------------------------
H_PLANCK = Fraction(662607015, 10**42)  # J s
C_LIGHT = Fraction(299792458)  # m / s
K_BOLTZMANN = Fraction(1380649, 10**29)  # J / K
C2 = H_PLANCK * C_LIGHT / K_BOLTZMANN  # m K, exact


def cm1_beta(t_kelvin):
    """Exact factor turning an energy in cm^-1 into x = E/kT at T kelvin."""
    return Fraction(100) * C2 / Fraction(t_kelvin)


def to_mpf(fr):
    """Fraction -> mpf, correctly rounded at the current precision."""
    return mpf(fr.numerator) / mpf(fr.denominator)


FIELDS = ["q", "ln_q", "U_over_kT", "Cv_over_k", "S_over_k", "F_over_kT"]
DIGITS = 30


class Moments:
    """Accumulates S0, S1, S2 of g x^k e^{-x}."""

    def __init__(self):
        self.s = [mpf(0), mpf(0), mpf(0)]

    def add(self, g, x, ex=None):
        """Adds weight g at reduced energy x (ex = e^{-x} if precomputed)."""
        if ex is None:
            ex = mpmath.exp(-x)
        t = g * ex
        self.s[0] += t
        self.s[1] += t * x
        self.s[2] += t * x * x

    def tail_small(self, majorant, n, eps):
        """True if sum_{j>n} m_k(j) <= eps * S_k for k = 0, 1, 2.

        majorant(k, n) must be log-concave in n from n on (see the caller).
        """
        for k in range(3):
            mn = majorant(k, n)
            if mn == 0:
                continue
            r = majorant(k, n + 1) / mn
            if r >= 1 or self.s[k] <= 0:
                return False
            if mn * r / (1 - r) > eps * self.s[k]:
                return False
        return True

    def results(self):
        s0, s1, s2 = self.s
        lnq = mpmath.log(s0)
        u = s1 / s0
        cv = s2 / s0 - u * u
        return {
            "q": s0,
            "ln_q": lnq,
            "U_over_kT": u,
            "Cv_over_k": cv,
            "S_over_k": lnq + u,
            "F_over_kT": -lnq,
        }


MAX_BLOCKS = 10**6


# --- models --------------------------------------------------------------------
def rotor(b_cm, t_kelvin, d_cm=Fraction(0), weights=(1, 1)):
    """Linear rotor: E_J = B x - D x^2, x = J(J+1) (cm^-1), 2J+1 states times
    the nuclear-spin weight (weights[0] for even J, weights[1] for odd J).

    D = 0: infinite ladder. Majorant = the term itself,
    m_k(J) = w_max (2J+1) y^k e^{-y}, y = b J(J+1); log m_k = log(2J+1)
    + k log J + k log(J+1) - b J(J+1) + const is concave for J >= 1.
    (The weights alternate, so we bound with the larger weight.)

    D > 0: the ladder is summed only while E increases with J, i.e. a finite
    ladder (E_J - E_{J-1} = 2J (B - 2 D J^2)); we sum ALL of it, so there is
    no truncation at all (its last terms are ~1e-150 for the cases here).
    """

    def oracle(eps):
        beta = cm1_beta(t_kelvin)
        m = Moments()
        wmax = max(weights)
        prev_e = None
        for j in range(MAX_BLOCKS):
            xj = Fraction(j * (j + 1))
            e = b_cm * xj - d_cm * xj * xj
            if prev_e is not None and not e > prev_e:
                assert d_cm > 0
                return m.results()
            prev_e = e
            g = (2 * j + 1) * weights[j % 2]
            m.add(g, to_mpf(e * beta))
            if d_cm == 0 and j >= 1:
                bb = to_mpf(b_cm * beta)

                def maj(k, n):
                    y = bb * n * (n + 1)
                    return wmax * (2 * n + 1) * y**k * mpmath.exp(-y)

                if m.tail_small(maj, j, eps):
                    return m.results()
        raise RuntimeError("rotor ladder did not converge")

    return oracle


def top(a_cm, b_cm, t_kelvin):
    """Prolate symmetric top: E = B J(J+1) + (A-B) K^2, K = -J..J, each (J,K)
    has 2J+1 states. Every K of a given J is summed (finite inner sum).

    Majorant of the J-block for moment k: with y = b J(J+1) and a = (A-B)/kT
    > 0, each x = y + a K^2 >= y, and x^k e^{-x} decreases for x >= k, so when
    y >= 2 every term is <= (2J+1) y^k e^{-y} and the block (2J+1 values of K)
    is <= m_k(J) = (2J+1)^2 y^k e^{-y}, whose log is concave in J >= 1. We
    only test the bound once y >= 2 (y grows with J, so it then holds for all
    later blocks too).
    """

    def oracle(eps):
        beta = cm1_beta(t_kelvin)
        bb = to_mpf(b_cm * beta)
        aa = to_mpf((a_cm - b_cm) * beta)
        assert aa > 0
        m = Moments()
        ek = []  # e^{-a K^2}, cached
        for j in range(MAX_BLOCKS):
            while len(ek) <= j:
                kk = len(ek)
                ek.append(mpmath.exp(-aa * kk * kk))
            y = bb * j * (j + 1)
            ey = mpmath.exp(-y)
            g = 2 * j + 1
            for kq in range(-j, j + 1):
                m.add(g, y + aa * kq * kq, ey * ek[abs(kq)])
            if j >= 1 and y >= 2:

                def maj(k, n):
                    yn = bb * n * (n + 1)
                    return (2 * n + 1) ** 2 * yn**k * mpmath.exp(-yn)

                if m.tail_small(maj, j, eps):
                    return m.results()
        raise RuntimeError("top ladder did not converge")

    return oracle


def box(dims, kt):
    """Particle in a cubic box, E = n1^2 + ... (n_i >= 1) in units of
    h^2/(8 m L^2), x = E/kT.

    dims = 1: term m_k(n) = (n^2/kT)^k e^{-n^2/kT} itself, log concave in n.

    dims = 3: terms grouped into shells N = n1^2+n2^2+n3^2 with the exact
    number g(N) of triples found by integer enumeration (no factorisation of
    q is used). For the tail, g(N) <= N: for each pair (n1, n2) with
    n1^2 + n2^2 < N there is at most one n3, and there are fewer than N such
    pairs. So m_k(N) = N (N/kT)^k e^{-N/kT}, log concave in N.
    """
    assert dims in (1, 3)
    kt = Fraction(kt)

    # Shell counts for dims = 3, up to a generous bound (the loop below
    # raises if the tail test has not passed before it).
    shells = None
    if dims == 3:
        nmax_e = int(kt * 200) + 200
        # Every ordered triple (a, b, c) with a^2 + b^2 + c^2 <= nmax_e.
        shells = {}
        lim = 1
        while lim * lim + 2 <= nmax_e:
            lim += 1
        sq = [i * i for i in range(lim + 1)]
        for a in range(1, lim + 1):
            for b in range(1, lim + 1):
                ab = sq[a] + sq[b]
                if ab + 1 > nmax_e:
                    break
                for c in range(1, lim + 1):
                    e = ab + sq[c]
                    if e > nmax_e:
                        break
                    shells[e] = shells.get(e, 0) + 1
        shell_limit = nmax_e

    def oracle(eps):
        ktm = to_mpf(kt)
        m = Moments()
        if dims == 1:
            for n in range(1, MAX_BLOCKS):
                m.add(1, to_mpf(Fraction(n * n) / kt))

                def maj(k, nn):
                    x = mpf(nn * nn) / ktm
                    return x**k * mpmath.exp(-x)

                if m.tail_small(maj, n, eps):
                    return m.results()
        else:
            for en in range(3, shell_limit + 1):
                g = shells.get(en, 0)
                if g:
                    m.add(g, to_mpf(Fraction(en) / kt))

                def maj(k, nn):
                    x = mpf(nn) / ktm
                    return nn * x**k * mpmath.exp(-x)

                if m.tail_small(maj, en, eps):
                    return m.results()
        raise RuntimeError("box ladder did not converge")

    return oracle


def oscillator(freq_cm, t_kelvin, zero_point):
    """Harmonic oscillator E = w v (or w (v + 1/2)), v >= 0, nondegenerate.

    Majorant = the term itself, (x (v+c))^k e^{-x (v+c)}, c = 0 or 1/2: its
    log k log(v+c) - x (v+c) + const is concave in v >= 1.
    """

    def oracle(eps):
        beta = cm1_beta(t_kelvin)
        c = Fraction(1, 2) if zero_point else Fraction(0)
        xw = to_mpf(freq_cm * beta)
        m = Moments()
        for v in range(MAX_BLOCKS):
            m.add(1, to_mpf(freq_cm * (v + c) * beta))
            if v >= 1:

                def maj(k, n):
                    x = xw * (n + mpf(c.numerator) / c.denominator)
                    return x**k * mpmath.exp(-x)

                if m.tail_small(maj, v, eps):
                    return m.results()
        raise RuntimeError("oscillator ladder did not converge")

    return oracle


def levels(level_list, t_kelvin):
    """A finite list of (energy in cm^-1, degeneracy): summed in full."""

    def oracle(eps):
        beta = cm1_beta(t_kelvin)
        m = Moments()
        for e_cm, g in level_list:
            m.add(g, to_mpf(e_cm * beta))
        return m.results()

    return oracle


# --- decimal comparison --------------------------------------------------------
def parse_decimal(s):
    """zsum's string -> (sign, mantissa digits as int, exponent, #sig digits)
    with value = sign * mantissa * 10^exponent, exactly."""
    t = s.strip()
    sign = 1
    if t[0] in "+-":
        sign = -1 if t[0] == "-" else 1
        t = t[1:]
    exp = 0
    if "e" in t or "E" in t:
        t, e = t.lower().split("e")
        exp = int(e)
    if "." in t:
        ip, fp = t.split(".")
    else:
        ip, fp = t, ""
    if not (ip + fp).isdigit():
        raise ValueError(f"not a decimal number: {s!r}")
    digits = (ip + fp).lstrip("0")
    exp -= len(fp)
    mant = int(ip + fp)
    return sign, mant, exp, len(digits)


def round_sig(x, n):
    """x (mpf) -> (sign, mantissa, exponent, near_tie): x correctly rounded to
    n significant digits is sign * mantissa * 10^exponent with
    10^(n-1) <= mantissa < 10^n. near_tie is set when x lies within 1e-9 ulp
    of a rounding boundary (beyond the oracle's own accuracy of ~1e-10 ulp),
    in which case the other neighbour is returned as alt."""
    sign = -1 if x < 0 else 1
    a = abs(x)
    with mp.workdps(mp.dps + 20):
        e = int(mpmath.floor(mpmath.log10(a)))
        while True:
            scaled = a * mpf(10) ** (n - 1 - e)
            if scaled >= mpf(10) ** n:
                e += 1
            elif scaled < mpf(10) ** (n - 1):
                e -= 1
            else:
                break
        fl = int(mpmath.floor(scaled))
        frac = scaled - fl
        near_tie = abs(frac - mpf(0.5)) < mpf("1e-9")
        mant = fl + 1 if frac >= mpf(0.5) else fl
        alt = fl if mant == fl + 1 else fl + 1
    ex = e - (n - 1)

    def norm(mm, ee):
        if mm == 10**n:
            return 10 ** (n - 1), ee + 1
        return mm, ee

    mant, ex1 = norm(mant, ex)
    alt, ex2 = norm(alt, ex)
    return sign, mant, ex1, near_tie, (alt, ex2)


def same_decimal(a, b):
    """(sign, mant, exp) pairs equal as exact decimals?"""
    sa, ma, ea = a
    sb, mb, eb = b
    if ma == 0 or mb == 0:
        return ma == mb
    if sa != sb:
        return False
    e = min(ea, eb)
    return ma * 10 ** (ea - e) == mb * 10 ** (eb - e)


def fmt_decimal(sign, mant, exp):
    return ("-" if sign < 0 else "") + f"{mant}e{exp}"


def check_field(name, zs, val):
    """Returns (ok, message). val: the oracle's value at 50 digits."""
    problems = []
    sign, zm, ze, nsig = parse_decimal(zs)
    if nsig != DIGITS:
        problems.append(f"prints {nsig} significant digits, expected {DIGITS}")
    osign, om, oe, near_tie, alt = round_sig(val, DIGITS)
    exact_ok = same_decimal((sign, zm, ze), (osign, om, oe))
    if not exact_ok and near_tie:
        exact_ok = same_decimal((sign, zm, ze), (osign, alt[0], alt[1]))
    if not exact_ok:
        problems.append("differs from the oracle rounded to 30 digits")
    with mp.workdps(mp.dps + 20):
        zv = mpmath.mpf(zs)
        ulp = mpf(10) ** oe
        diff_ulps = abs(zv - val) / ulp
        if diff_ulps > mpf(0.5) + mpf("1e-9"):
            problems.append(f"|zsum - oracle| = {mpmath.nstr(diff_ulps, 6)} ulp > 0.5 ulp")
    if problems:
        msg = (
            f"    {name}: " + "; ".join(problems) + "\n"
            f"      zsum                 : {zs}\n"
            f"      oracle (40 digits)   : {mpmath.nstr(val, 40)}\n"
            f"      oracle rounded to 30 : {mpmath.nstr(val, 30)}"
            f"  (= {fmt_decimal(osign, om, oe)})"
        )
        return False, msg
    note = " (near a rounding tie; either neighbour accepted)" if near_tie else ""
    return True, note


def run_zsum(binary, args):
    cmd = [binary] + args + ["--digits", str(DIGITS), "--format", "json"]
    proc = subprocess.run(cmd, capture_output=True, text=True)
    if proc.returncode != 0:
        raise RuntimeError(
            f"exit status {proc.returncode}; stderr: {proc.stderr.strip()}"
        )
    doc = json.loads(proc.stdout)
    rows = doc["rows"]
    if len(rows) != 1:
        raise RuntimeError(f"expected one row, got {len(rows)}")
    return cmd, rows[0]


def compute(oracle):
    """Runs the oracle at 50 digits (1e-60 tails) and again at 70 digits
    (1e-75 tails); asserts the two agree to 1e-42 relative."""
    with mp.workdps(50):
        lo = oracle(mpf("1e-60"))
    with mp.workdps(70):
        hi = oracle(mpf("1e-75"))
    with mp.workdps(70):
        for f in FIELDS:
            a, b = lo[f], hi[f]
            if abs(a - b) > mpf("1e-42") * abs(b):
                raise RuntimeError(
                    f"oracle self-check failed for {f}: {mpmath.nstr(a, 45)} at 50 "
                    f"digits vs {mpmath.nstr(b, 45)} at 70 digits"
                )
    return lo


def main():
    if len(sys.argv) != 2:
        sys.stderr.write("usage: oracle.py PATH_TO_ZSUM\n")
        return 2
    binary = sys.argv[1]
    print(f"zsum cross-check oracle: mpmath {mpmath.__version__}, "
          f"direct summation at mp.dps = 50 (self-checked at 70)")
    mp.dps = 50

    tmp = tempfile.TemporaryDirectory()
    level_file = os.path.join(tmp.name, "levels.txt")
    with open(level_file, "w") as fh:
        fh.write("# fine-structure doublet\n0 cm-1 4 2P3/2\n404.1 cm-1 2 2P1/2\n")

    d = Fraction
    cases = [
        ("rigid rotor B=1.99824 cm-1, T=298.15 K (sum)",
         ["sum", "rotor", "--B", "1.99824", "--unit", "cm-1", "--T", "298.15"],
         rotor(d("1.99824"), d("298.15"))),
        ("rigid rotor B=1.99824 cm-1, T=298.15 K (thermo)",
         ["thermo", "rotor", "--B", "1.99824", "--unit", "cm-1", "--T", "298.15"],
         rotor(d("1.99824"), d("298.15"))),
        # I = 1/2 fermions: even J take the I(2I+1) = 1 antisymmetric spin
        # states, odd J the (I+1)(2I+1) = 3 symmetric ones.
        ("rotor B=59.322 D=0.0471 cm-1, spin 1/2, T=77 K (sum)",
         ["sum", "rotor", "--B", "59.322", "--D", "0.0471", "--spin", "1/2",
          "--unit", "cm-1", "--T", "77"],
         rotor(d("59.322"), d(77), d("0.0471"), (1, 3))),
        ("rotor B=59.322 D=0.0471 cm-1, spin 1/2, T=77 K (thermo)",
         ["thermo", "rotor", "--B", "59.322", "--D", "0.0471", "--spin", "1/2",
          "--unit", "cm-1", "--T", "77"],
         rotor(d("59.322"), d(77), d("0.0471"), (1, 3))),
        ("symmetric top A=5.28 B=0.25 cm-1, T=50 K (thermo)",
         ["thermo", "top", "--A", "5.28", "--B", "0.25", "--unit", "cm-1",
          "--T", "50"],
         top(d("5.28"), d("0.25"), d(50))),
        ("symmetric top A=5.28 B=0.25 cm-1, T=50 K (sum)",
         ["sum", "top", "--A", "5.28", "--B", "0.25", "--unit", "cm-1",
          "--T", "50"],
         top(d("5.28"), d("0.25"), d(50))),
        ("3D cubic box, kT=50 (thermo)",
         ["thermo", "box", "--dims", "3", "--kT", "50"], box(3, 50)),
        ("1D box, kT=3 (thermo)",
         ["thermo", "box", "--dims", "1", "--kT", "3"], box(1, 3)),
        ("harmonic oscillator 1000 cm-1, T=1500 K (thermo)",
         ["thermo", "oscillator", "--freq", "1000", "--unit", "cm-1", "--T", "1500"],
         oscillator(d(1000), d(1500), False)),
        ("harmonic oscillator 1000 cm-1 with zero point, T=1500 K (thermo)",
         ["thermo", "oscillator", "--freq", "1000", "--unit", "cm-1", "--T", "1500",
          "--zero-point"],
         oscillator(d(1000), d(1500), True)),
        ("level file 0 cm-1 x4, 404.1 cm-1 x2, T=300 K (thermo)",
         ["thermo", "file", level_file, "--T", "300"],
         levels([(d(0), 4), (d("404.1"), 2)], d(300))),
    ]

    cache = {}
    failures = 0
    for label, args, oracle in cases:
        try:
            key = id(oracle)
            if key not in cache:
                cache[key] = compute(oracle)
            vals = cache[key]
        except Exception as exc:  # an oracle failure is a failure too
            failures += 1
            print(f"FAIL  {label}: oracle error: {exc}")
            continue
        try:
            cmd, row = run_zsum(binary, args)
        except Exception as exc:
            failures += 1
            print(f"FAIL  {label}: zsum did not answer: {exc}")
            continue
        msgs = []
        notes = []
        ok = True
        if row.get("certified") is not True:
            ok = False
            msgs.append(f"    certified = {row.get('certified')!r}, expected true")
        for f in FIELDS:
            if f not in row:
                ok = False
                msgs.append(f"    {f}: missing from zsum's JSON row")
                continue
            good, msg = check_field(f, row[f], vals[f])
            if good:
                if msg:
                    notes.append(f + msg)
            else:
                ok = False
                msgs.append(msg)
        shown = " ".join(cmd[1:])
        if ok:
            extra = ("; " + "; ".join(notes)) if notes else ""
            print(f"PASS  {label}: all {len(FIELDS)} values agree to all "
                  f"{DIGITS} digits (q = {row['q']}, Cv/k = {row['Cv_over_k']}){extra}")
        else:
            failures += 1
            print(f"FAIL  {label}\n    command: zsum {shown}")
            for m in msgs:
                print(m)
    tmp.cleanup()
    if failures:
        print(f"{failures} of {len(cases)} cases FAILED")
        return 1
    print(f"all {len(cases)} cases agree with the mpmath oracle")
    return 0


if __name__ == "__main__":
    sys.exit(main())
