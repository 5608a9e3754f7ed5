#!/usr/bin/env python3
"""Independent oracle for zsum at the cold end: ground-dominated sums.

What is checked. At low temperature a partition function is its ground term
times 1 + (something astronomically small), so ln q, U/kT and Cv/k are of
order e^{-x} with x = (first excitation)/kT in the hundreds. A summation
engine that works with energies shifted to the ground and ratio formulas can
get these wrong (print 0, or lose every digit), so this oracle recomputes
them the slowest, plainest way and requires zsum's printed digits to be the
correctly rounded values:

    S0 = sum g e^{-x},  S1 = sum g x e^{-x},  S2 = sum g x^2 e^{-x},
    x = E/kT from the energies exactly as the model defines them (no shift
    to the ground state),
    q = S0, ln q = log(S0), U/kT = S1/S0, Cv/k = S2/S0 - (S1/S0)^2,
    S/k = ln q + U/kT, F/kT = -ln q        (standard textbook formulas).

No log1p, no expm1, no closed forms: plain sums of positive terms in mpmath
(https://mpmath.org, arbitrary-precision floating point; version printed at
run time), at mp.dps = 300 working digits to start with.

Why the oracle is independent. Nothing here calls, imports or copies zsum's
code. Every level ladder is written out below from its textbook formula (the
harmonic oscillator, the rigid linear rotor with nuclear-spin statistics of
two identical nuclei, and the standard Dunham-type rotation-vibration term
formula of a diatomic molecule). zsum is only run as a program, with
`--format json`; its description line is read only to confirm that it
describes the same model (the nuclear-spin weights it states must be the
ones derived here, else the case fails).

Physical constants: SI 2019 exact defining constants (26th CGPM),
h = 6.62607015e-34 J s, c = 299792458 m/s, k = 1.380649e-23 J/K, so a
wavenumber nu in cm^-1 is E/k = 100 h c nu / k kelvin, an exact rational,
and x = 100 (h c / k) nu / T is formed exactly (Fraction) before rounding.

Accuracy of the oracle (a rigorous a posteriori bound, not a guess).
With u = 10^-(dps-1) (mpmath's unit roundoff at dps digits is below
10^-dps), every term t = g e^{-x} x^k carries a relative error of at most
(|x| + 8) u (x rounded once, exp, two products), and summing n positive
terms adds at most n u relative. Those bounds are accumulated term by term
(running error analysis) together with the truncation bound below, giving
rho_k = (bound on |S_k - computed S_k|) / S_k. They are propagated to every
printed quantity (log: abs error rho_0 (1 + 2 rho_0) + 4 u |ln q|; quotients:
relative errors add; Cv: absolute error m2 rel(m2) + U^2 (2 rel(U) +
rel(U)^2) + 4 u (m2 + U^2), which charges the cancellation in S2/S0 - U^2 in
full). A value counts as known to N digits only when BOTH ends of
[value - 2 err, value + 2 err], as exact rationals, round to the same N-digit
decimal. If any value is not settled, the whole computation is repeated at
twice the digits (300 -> 600 -> ...): ln q ~ 5.6e-492 at 3 K needs more than
300 digits, since 1 + 5.6e-492 must be formed by a plain sum; the dps that
was used is printed in the verdict. As a check on the analysis itself the
settled digits are recomputed at twice that precision and must be identical.

Truncation (every ladder is infinite in J or v, except the diatomic's
vibrational ladder, which is finite and summed in full). For moment k the
n-th term is majorised by m_k(n) = w_max d(n) y(n)^k e^{-y(n)}, with d(n) the
degeneracy, w_max the larger nuclear-spin weight, and y(n) = E(n)/kT. When
y is affine (oscillator) or convex increasing (rotor ladders, y >= 2 so that
k log y - y is non-increasing) in n, log m_k is concave in n, so the ratios
r_n = m_k(n+1)/m_k(n) never increase. Once r_n <= 1/2,

    sum_{j>n} m_k(j) <= m_k(n) (r_n + r_n^2 + ...) = m_k(n) r_n/(1 - r_n),

and we stop when that is below 10^-(dps+10) times the sum of the terms other
than the first (the ground) one, for k = 0, 1, 2: the neglected tail is
then below working precision even relative to the tiny excitation part that
ln q measures. The tail bound is also added into rho_k above.

Decimal comparison. zsum's string must carry exactly N significant digits
(N = 15 and 30), must not end in `*`, its row must say "certified": true,
and read as an exact decimal (mantissa and decimal exponent as integers, so
"1.2e-70" and "0.00012" forms compare alike) it must equal the oracle's
value correctly rounded to N digits (round half to even).

Usage: python3 tests/crosscheck/cold_oracle.py ZSUM_BINARY [CASE ...]
       python3 tests/crosscheck/cold_oracle.py --list
Prints one verdict line per case, `PASS  name: ...` or `FAIL  name` followed
by the command, zsum's value and the oracle's value for every disagreement.
Exit status 0 if every case passed, 1 if any failed, 2 on bad usage, 3 if
mpmath is missing.
"""

import json
import re
import subprocess
import sys
from fractions import Fraction

try:
    import mpmath
    from mpmath import mp, mpf
except ImportError:  # pragma: no cover - the Rust wrapper reports it too
    sys.stderr.write("cold_oracle.py needs mpmath: run `pip install mpmath`\n")
    sys.exit(3)

# --- exact constants (SI 2019 exact defining constants) -----------------------
H_PLANCK = Fraction(662607015, 10**42)  # J s
C_LIGHT = Fraction(299792458)  # m / s
K_BOLTZMANN = Fraction(1380649, 10**29)  # J / K
C2 = H_PLANCK * C_LIGHT / K_BOLTZMANN  # h c / k in m K, exact


def cm1_beta(t_kelvin):
    """Exact factor turning an energy in cm^-1 into x = E/kT at T kelvin."""
    return Fraction(100) * C2 / Fraction(t_kelvin)


def to_mpf(fr):
    """Fraction -> mpf at the current precision."""
    return mpf(fr.numerator) / mpf(fr.denominator)


def mpf_to_fraction(x):
    """The exact rational value of a finite mpf."""
    man, exp = x.man_exp  # |x| = man 2^exp (man_exp drops the sign)
    man = int(man) * (-1 if x < 0 else 1)
    if exp >= 0:
        return Fraction(man * 2**exp)
    return Fraction(man, 2 ** (-exp))


FIELDS = ["q", "ln_q", "U_over_kT", "Cv_over_k", "S_over_k", "F_over_kT"]
DIGIT_SETTINGS = [15, 30]
START_DPS = 300
MAX_DPS = 4800
MAX_TERMS = 10**6


# --- sums with running error bounds ------------------------------------------
class Sums:
    """S0, S1, S2 of g x^k e^{-x}, with a running bound on their rounding
    errors and on the truncated tails."""

    def __init__(self, dps):
        self.u = mpf(10) ** (1 - dps)
        self.tail_eps = mpf(10) ** (-(dps + 10))
        self.s = [mpf(0)] * 3
        self.err = [mpf(0)] * 3
        self.tail = [mpf(0)] * 3
        self.first = None
        # The sums without their first (ground) term, kept apart so that the
        # tail test sees e.g. 5.6e-492 rather than (1 + 5.6e-492) - 1 = 0.
        self.excited = [mpf(0)] * 3
        self.n = 0

    def add(self, g, x_fraction):
        """Adds g states at reduced energy x (an exact Fraction)."""
        x = to_mpf(x_fraction)
        t = g * mpmath.exp(-x)
        terms = [t, t * x, t * x * x]
        rel = (abs(x) + 8) * self.u
        for k in range(3):
            self.s[k] += terms[k]
            self.err[k] += terms[k] * rel
        if self.first is None:
            self.first = terms
        else:
            for k in range(3):
                self.excited[k] += terms[k]
        self.n += 1

    def tail_small(self, majorant, n):
        """Tests the tail after term n (see the module docstring); on success
        adds the tail bound to the error budget and returns True.

        majorant(k, n) must be log-concave in n from n on (the caller says
        why)."""
        found = []
        for k in range(3):
            excited = self.excited[k]
            if excited <= 0:
                return False
            mn = majorant(k, n)
            r = majorant(k, n + 1) / mn
            if r > mpf(1) / 2:
                return False
            bound = mn * r / (1 - r)
            if bound > self.tail_eps * excited:
                return False
            found.append(bound)
        for k in range(3):
            self.tail[k] += found[k]
        return True

    def add_tail(self, k, bound):
        self.tail[k] += bound

    def results(self):
        """Every printed quantity as (value, absolute error bound)."""
        u = self.u
        s0, s1, s2 = self.s
        rho = [
            (self.err[k] + (self.n + 2) * u * self.s[k] + self.tail[k]) / self.s[k]
            for k in range(3)
        ]
        lnq = mpmath.log(s0)
        e_lnq = rho[0] * (1 + 2 * rho[0]) + 4 * u * abs(lnq)
        uu = s1 / s0
        rel_u = rho[1] + rho[0] + 2 * rho[0] ** 2 + 2 * u
        m2 = s2 / s0
        rel_m2 = rho[2] + rho[0] + 2 * rho[0] ** 2 + 2 * u
        cv = m2 - uu * uu
        e_cv = m2 * rel_m2 + uu * uu * (2 * rel_u + rel_u**2) + 4 * u * (m2 + uu * uu)
        e_u = abs(uu) * rel_u
        s = lnq + uu
        return {
            "q": (s0, s0 * rho[0]),
            "ln_q": (lnq, e_lnq),
            "U_over_kT": (uu, e_u),
            "Cv_over_k": (cv, e_cv),
            "S_over_k": (s, e_lnq + e_u + 2 * u * (abs(lnq) + abs(uu))),
            "F_over_kT": (-lnq, e_lnq),
        }


# --- models (each: a function of dps returning Sums.results()) ---------------
def oscillator(freq_cm, t_kelvin):
    """1D harmonic oscillator, energies from the ground: E_v = v h c nu,
    v = 0, 1, ..., one state each (standard textbook formula).

    Majorant = the term itself, (v a)^k e^{-v a}, a = h c nu / kT: its log
    k log v - v a is concave in v >= 1 (x affine in v)."""
    beta = cm1_beta(t_kelvin)
    a_exact = freq_cm * beta

    def run(dps):
        m = Sums(dps)
        a = to_mpf(a_exact)
        for v in range(MAX_TERMS):
            m.add(1, a_exact * v)
            if v >= 1:

                def maj(k, n):
                    x = a * n
                    return x**k * mpmath.exp(-x)

                if m.tail_small(maj, v):
                    return m.results()
        raise RuntimeError("oscillator ladder did not converge")

    return run


def rotor(b_cm, t_kelvin, weights):
    """Rigid linear rotor: E_J = B J(J+1) h c, (2J+1) states times the
    nuclear-spin weight of J's parity, weights = (even J, odd J); levels of
    weight 0 are absent (standard textbook formula).

    Majorant m_k(J) = w_max (2J+1) y^k e^{-y}, y = b J(J+1), b = hcB/kT:
    y is convex and increasing in J, and k log y - y is concave and
    non-increasing for y >= k, so log m_k is concave for J >= 1 once
    y >= 2 (tested before the bound is used)."""
    beta = cm1_beta(t_kelvin)
    wmax = max(weights)

    def run(dps):
        m = Sums(dps)
        b = to_mpf(b_cm * beta)
        for j in range(MAX_TERMS):
            w = weights[j % 2]
            if w:
                m.add((2 * j + 1) * w, b_cm * beta * (j * (j + 1)))
            if j >= 1 and b * j * (j + 1) >= 2 and m.first is not None:

                def maj(k, n):
                    y = b * n * (n + 1)
                    return wmax * (2 * n + 1) * y**k * mpmath.exp(-y)

                if m.tail_small(maj, j):
                    return m.results()
        raise RuntimeError("rotor ladder did not converge")

    return run


def dunham_v_max(we, wexe):
    """Last bound level of G(v) = we(v+1/2) - wexe(v+1/2)^2: the levels on
    the rising branch, v + 1/2 <= we/(2 wexe) (textbook count
    floor(we/(2 wexe) - 1/2))."""
    q = we / (2 * wexe) - Fraction(1, 2)
    return q.numerator // q.denominator


def diatomic(we, wexe, be, alpha, t_kelvin, weights):
    """Rotating, vibrating diatomic, standard Dunham-type term formula with
    D_e = 0 (the case here):

        E(v, J) = G(v) + B_v J(J+1),
        G(v) = we (v + 1/2) - wexe (v + 1/2)^2      (from the potential
                                                     minimum, zero point kept)
        B_v = B_e - alpha_e (v + 1/2),

    (2J+1) states times the nuclear-spin weight of J's parity, v = 0..v_max
    (all bound levels, a finite ladder summed in full). For each v the J
    ladder is infinite; with y(J) = E(v, J)/kT >= G(0)/kT >= 2 convex and
    increasing in J (B_v > 0), m_k(J) = w_max (2J+1) y^k e^{-y} is
    log-concave in J as for the rotor."""
    beta = cm1_beta(t_kelvin)
    wmax = max(weights)
    vmax = dunham_v_max(we, wexe)
    half = Fraction(1, 2)

    def run(dps):
        m = Sums(dps)
        for v in range(vmax + 1):
            g_v = we * (v + half) - wexe * (v + half) ** 2
            b_v = be - alpha * (v + half)
            assert b_v > 0 and g_v * beta >= 2
            gm, bm = to_mpf(g_v * beta), to_mpf(b_v * beta)
            for j in range(MAX_TERMS):
                w = weights[j % 2]
                if w:
                    m.add((2 * j + 1) * w, (g_v + b_v * (j * (j + 1))) * beta)
                if j >= 1 and m.first is not None:

                    def maj(k, n):
                        y = gm + bm * n * (n + 1)
                        return wmax * (2 * n + 1) * y**k * mpmath.exp(-y)

                    if m.tail_small(maj, j):
                        break
            else:
                raise RuntimeError(f"diatomic J ladder at v = {v} did not converge")
        return m.results()

    return run


# --- decimals ----------------------------------------------------------------
def parse_decimal(s):
    """zsum's string -> (value as (mantissa, exponent) with trailing zeros of
    the mantissa removed, number of significant digits printed).
    value = mantissa * 10^exponent exactly; the mantissa carries the sign."""
    t = s.strip()
    sign = 1
    if t[:1] in ("+", "-"):
        sign = -1 if t[0] == "-" else 1
        t = t[1:]
    exp = 0
    if "e" in t.lower():
        t, e = t.lower().split("e")
        exp = int(e)
    ip, _, fp = t.partition(".")
    if not (ip + fp).isdigit():
        raise ValueError(f"not a decimal number: {s!r}")
    nsig = len((ip + fp).lstrip("0"))
    return normal(sign * int(ip + fp), exp - len(fp)), nsig


def normal(mant, exp):
    """(mantissa, exponent) with no trailing zeros in the mantissa."""
    if mant == 0:
        return 0, 0
    while mant % 10 == 0:
        mant //= 10
        exp += 1
    return mant, exp


def round_sig(f, n):
    """Exact rational f != 0 correctly rounded to n significant digits,
    round half to even: (mantissa with n digits and sign, exponent)."""
    sign = -1 if f < 0 else 1
    a = abs(f)
    e = len(str(a.numerator)) - len(str(a.denominator))
    while a >= Fraction(10) ** (e + 1):
        e += 1
    while a < Fraction(10) ** e:
        e -= 1
    scaled = a * Fraction(10) ** (n - 1 - e)
    fl = scaled.numerator // scaled.denominator
    rem = scaled - fl
    if rem > Fraction(1, 2) or (rem == Fraction(1, 2) and fl % 2 == 1):
        fl += 1
    if fl == 10**n:
        fl //= 10
        e += 1
    return sign * fl, e - (n - 1)


def show(mant, exp):
    s = str(abs(mant))
    return ("-" if mant < 0 else "") + (s[0] + "." + s[1:] if len(s) > 1 else s) + f"e{exp + len(s) - 1}"


def settle(value, err, n):
    """The n-digit rounding of the true value if [value - 2 err, value + 2 err]
    decides it, else None."""
    v = mpf_to_fraction(value)
    e = mpf_to_fraction(2 * err)
    lo, hi = v - e, v + e
    if lo == 0 or hi == 0 or (lo < 0) != (hi < 0):
        return None
    a, b = round_sig(lo, n), round_sig(hi, n)
    return a if a == b else None


_cache = {}


def oracle_digits(key, model, n):
    """{field: (n-digit mantissa, exponent)} settled at the lowest dps of
    300, 600, ... that decides every field; checked again at twice that dps.
    Returns (digits, dps used, raw values at that dps)."""
    dps = START_DPS
    while dps <= MAX_DPS:
        got = _values(key, model, dps)
        digits = {f: settle(*got[f], n) for f in FIELDS}
        if all(d is not None for d in digits.values()):
            check = _values(key, model, 2 * dps)
            again = {f: settle(*check[f], n) for f in FIELDS}
            if again != digits:
                raise RuntimeError(
                    f"oracle self-check failed: {n}-digit values at {dps} digits "
                    f"{digits} differ from those at {2 * dps} digits {again}"
                )
            return digits, dps, got
        dps *= 2
    raise RuntimeError(f"oracle could not settle {n} digits within {MAX_DPS} working digits")


def _values(key, model, dps):
    if (key, dps) not in _cache:
        with mp.workdps(dps):
            _cache[(key, dps)] = model(dps)
    return _cache[(key, dps)]


# --- running zsum --------------------------------------------------------------
def run_zsum(binary, args, n):
    cmd = [binary] + args + ["--digits", str(n), "--format", "json"]
    proc = subprocess.run(cmd, capture_output=True, text=True)
    if proc.returncode != 0:
        raise RuntimeError(
            f"exit status {proc.returncode}; stderr: {proc.stderr.strip()}"
        )
    doc = json.loads(proc.stdout)
    rows = doc["rows"]
    if len(rows) != 1:
        raise RuntimeError(f"expected one row, got {len(rows)}")
    return cmd, doc.get("description", ""), rows[0]


def weights_in(description):
    """The nuclear-spin weights zsum's description states (1:1 when it
    states none)."""
    m = re.search(r"weights even J : odd J = (\d+) : (\d+)", description)
    return (int(m.group(1)), int(m.group(2))) if m else (1, 1)


# --- cases ---------------------------------------------------------------------
D = Fraction

# Nuclear-spin statistics of two identical nuclei of spin I (standard
# textbook result): of the (2I+1)^2 spin states, (2I+1)(I+1) are symmetric
# and (2I+1)I antisymmetric. Fermions (half-integer I) put the antisymmetric
# ones with even J, bosons (integer I) the symmetric ones.
def spin_weights(i):
    sym = (2 * i + 1) * (i + 1)
    anti = (2 * i + 1) * i
    fermions = (2 * i) % 2 == 1
    ev, od = (anti, sym) if fermions else (sym, anti)
    return int(ev), int(od)


H2_WEIGHTS = spin_weights(D(1, 2))  # (1, 3)
PARA = (H2_WEIGHTS[0], 0)  # the smaller weight: even J only
ORTHO = (0, H2_WEIGHTS[1])  # the larger weight: odd J only
SPIN1 = spin_weights(D(1))  # (6, 3)

B_H2 = D("59.322")
DIATOMIC_ARGS = ["--we", "2358.57", "--wexe", "14.324", "--Be", "1.99824",
                 "--alpha", "0.017318", "--spin", "1"]


def diatomic_model(t):
    return diatomic(D("2358.57"), D("14.324"), D("1.99824"), D("0.017318"), D(t), SPIN1)


def sanity_oscillator(t, vals):
    """Values from the issue report (from memory, not computed here):
    ln q at 21 K ~ 6.62e-71, at 24 K ~ 3.920725056e-62."""
    lnq = mpf_to_fraction(vals["ln_q"][0])
    if t == 21 and round_sig(lnq, 3) != (662, -73):
        return f"ln q at 21 K = {show(*round_sig(lnq, 12))}, expected ~6.62e-71"
    if t == 24 and round_sig(lnq, 10) != (3920725056, -71):
        return f"ln q at 24 K = {show(*round_sig(lnq, 15))}, expected ~3.920725056e-62"
    return None


def sanity_rotor_1k(t, vals):
    """From the issue report: ln q at 1 K ~ 2.198e-74."""
    lnq = mpf_to_fraction(vals["ln_q"][0])
    if round_sig(lnq, 4) != (2198, -77):
        return f"ln q at 1 K = {show(*round_sig(lnq, 12))}, expected ~2.198e-74"
    return None


def sanity_ortho(t, vals):
    """Odd J only, weight 3: the ground is J = 1 with 9 states, so
    ln q = ln 9 - 2B/kT + (a term ~ (21/9) e^{-10B/kT} ~ 1e-185)."""
    lead = mpmath.log(9) - to_mpf(2 * B_H2 * cm1_beta(t))
    if abs(vals["ln_q"][0] - lead) > mpf("1e-150"):
        return (f"ln q = {mpmath.nstr(vals['ln_q'][0], 40)} is not "
                f"ln 9 - 2B/kT = {mpmath.nstr(lead, 40)} to 1e-150")
    return None


CASES = [
    # name, [(zsum args, temperature, oracle model, weights expected in the
    # description or None, required description text, sanity check)]
    ("oscillator_2358_cm1_from_3_to_24_k",
     [(["sum", "oscillator", "--freq", "2358.57", "--T", str(t)], t,
       oscillator(D("2358.57"), D(t)), (1, 1), "energies from the ground state",
       sanity_oscillator) for t in (3, 6, 21, 24)]),
    ("hydrogen_rotor_at_1_k",
     [(["thermo", "rotor", "--B", "59.322", "--T", "1"], 1,
       rotor(B_H2, D(1), (1, 1)), (1, 1), "rigid linear rotor", sanity_rotor_1k)]),
    ("hydrogen_rotor_at_5_k",
     [(["thermo", "rotor", "--B", "59.322", "--T", "5"], 5,
       rotor(B_H2, D(5), (1, 1)), (1, 1), "rigid linear rotor", None)]),
    ("para_hydrogen_rotor_at_2_k",
     [(["thermo", "rotor", "--B", "59.322", "--spin", "1/2", "--only", "para", "--T", "2"], 2,
       rotor(B_H2, D(2), PARA), PARA, "rigid linear rotor", None)]),
    ("ortho_hydrogen_rotor_at_2_k",
     [(["thermo", "rotor", "--B", "59.322", "--spin", "1/2", "--only", "ortho", "--T", "2"], 2,
       rotor(B_H2, D(2), ORTHO), ORTHO, "rigid linear rotor", sanity_ortho)]),
    ("vibrating_rotor_spin_1_at_1_k",
     [(["thermo", "diatomic"] + DIATOMIC_ARGS + ["--T", "1"], 1,
       diatomic_model(1), SPIN1,
       f"D_e = 0 cm-1, bound v = 0..{dunham_v_max(D('2358.57'), D('14.324'))}", None)]),
    ("vibrating_rotor_spin_1_at_2_k",
     [(["thermo", "diatomic"] + DIATOMIC_ARGS + ["--T", "2"], 2,
       diatomic_model(2), SPIN1,
       f"D_e = 0 cm-1, bound v = 0..{dunham_v_max(D('2358.57'), D('14.324'))}", None)]),
]


def check_run(binary, args, t, model, weights, must_say, sanity, n):
    """Returns (problems, summary) for one zsum command at n digits."""
    key = (tuple(args), t)
    digits, dps, raw = oracle_digits(key, model, n)
    if sanity is not None:
        bad = sanity(t, raw)
        if bad:
            raise RuntimeError(f"oracle sanity check failed: {bad}")
    cmd, desc, row = run_zsum(binary, args, n)
    shown = "zsum " + " ".join(cmd[1:])
    problems = []
    stated = weights_in(desc)
    if stated != weights:
        problems.append(f"    description states weights even J : odd J = {stated[0]} : "
                        f"{stated[1]}, the oracle derives {weights[0]} : {weights[1]} "
                        f"({desc!r})")
    if must_say not in desc:
        problems.append(f"    description {desc!r} does not say {must_say!r}")
    if row.get("certified") is not True:
        problems.append(f"    certified = {row.get('certified')!r}, expected true")
    for f in FIELDS:
        want = digits[f]
        if f not in row:
            problems.append(f"    {f}: missing from zsum's JSON row")
            continue
        zs = row[f]
        why = []
        if zs.endswith("*"):
            why.append("marked * (not certified)")
            body = zs.rstrip("*")
        else:
            body = zs
        try:
            got, nsig = parse_decimal(body)
        except ValueError as exc:
            problems.append(f"    {f}: {exc}")
            continue
        if nsig != n:
            why.append(f"prints {nsig} significant digits, expected {n}")
        if got != normal(*want):
            why.append(f"differs from the oracle rounded to {n} digits")
        if why:
            problems.append(
                f"    {f}: " + "; ".join(why) + "\n"
                f"      command              : {shown}\n"
                f"      zsum                 : {zs}\n"
                f"      oracle ({n} digits)   : {show(*want)}\n"
                f"      oracle ({n + 10} digits)   : {mpmath.nstr(raw[f][0], n + 10)}"
            )
    if problems:
        problems.insert(0, f"    command: {shown}")
    return problems, (shown, dps, row)


def main(argv):
    if len(argv) == 2 and argv[1] == "--list":
        for name, _ in CASES:
            print(name)
        return 0
    if len(argv) < 2:
        sys.stderr.write("usage: cold_oracle.py ZSUM_BINARY [CASE ...] | --list\n")
        return 2
    binary = argv[1]
    wanted = argv[2:]
    mp.dps = START_DPS
    names = [c[0] for c in CASES]
    for w in wanted:
        if w not in names:
            sys.stderr.write(f"unknown case {w!r}; cases: {', '.join(names)}\n")
            return 2
    print(f"zsum cold-end oracle: mpmath {mpmath.__version__}, plain sums from "
          f"mp.dps = {START_DPS} (raised where the error bound needs it)")
    failures = 0
    ran = 0
    for name, runs in CASES:
        if wanted and name not in wanted:
            continue
        ran += 1
        report = []
        notes = []
        for args, t, model, weights, must_say, sanity in runs:
            for n in DIGIT_SETTINGS:
                try:
                    problems, (shown, dps, row) = check_run(
                        binary, args, t, model, weights, must_say, sanity, n)
                except Exception as exc:  # an oracle or zsum failure fails too
                    report.append(f"    {' '.join(args)} --digits {n}: {exc}")
                    continue
                report.extend(problems)
                if n == DIGIT_SETTINGS[-1]:
                    notes.append(f"T = {t} K: ln q = {row['ln_q']} (oracle at {dps} digits)")
        if report:
            failures += 1
            print(f"FAIL  {name}")
            for line in report:
                print(line)
        else:
            print(f"PASS  {name}: all {len(FIELDS)} values at --digits "
                  f"{' and '.join(map(str, DIGIT_SETTINGS))} equal the oracle's, "
                  f"correctly rounded; " + "; ".join(notes))
        sys.stdout.flush()
    if failures:
        print(f"{failures} of {ran} cases FAILED")
        return 1
    print(f"all {ran} cases agree with the mpmath oracle")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
