"""Independent check of `zsum ensemble`: the canonical N-particle partition
function of ideal bosons and fermions in an isotropic 3D harmonic trap
(examples/systems/atom_trap.toml, spacing 0.1 K, energies from the ground),
computed here with mpmath at 80 digits by the cycle recursion
Q_N = (1/N) sum_k (+-1)^(k+1) q(k beta) Q_(N-k), with
q(beta) = (1 - exp(-beta*0.1 K))^-3, and U/kT, Cv/k from the derivatives
in beta by mpmath's numerical differentiation. zsum's printed digits must
be the correctly rounded values (within half a unit in the last place).

Usage: python3 ensemble_oracle.py ZSUM_BINARY SYSTEM_FILE
Prints PASS/FAIL lines; exits non-zero on any FAIL."""

import json
import subprocess
import sys

import mpmath
from mpmath import mp, mpf

mp.dps = 80
HW = mpf("0.1")  # kelvin
DIGITS = 20


def ln_q_n(beta, n, sign):
    q = [1 / (1 - mpmath.exp(-k * beta * HW)) ** 3 for k in range(1, n + 1)]
    big_q = [mpf(1)]
    for m in range(1, n + 1):
        s = mpf(0)
        for k in range(1, m + 1):
            s += (sign ** (k + 1)) * q[k - 1] * big_q[m - k]
        big_q.append(s / m)
    return mpmath.log(big_q[n])


def half_ulp_ok(text, value, digits):
    z = mpf(text)
    if value == 0:
        return z == 0
    e = int(mpmath.floor(mpmath.log10(abs(value))))
    half = mpf(10) ** (e - digits + 1) / 2
    return abs(z - value) <= half * (1 + mpf("1e-6"))


def main():
    binary, system = sys.argv[1], sys.argv[2]
    failures = 0
    for stats, sign in (("bose", 1), ("fermi", -1)):
        for n in (10, 50):
            for t in ("0.3", "1", "4"):
                beta = 1 / mpf(t)
                f = lambda b: ln_q_n(b, n, sign)
                ln_q = f(beta)
                d1 = mpmath.diff(f, beta)
                d2 = mpmath.diff(f, beta, 2)
                want = {
                    "ln_q": ln_q,
                    "U_over_kT": -beta * d1,
                    "Cv_over_k": beta**2 * d2,
                    "S_over_k": ln_q - beta * d1,
                }
                cmd = [binary, "ensemble", "--system", system, "--particles", str(n),
                       "--stats", stats, "--T", t, "--digits", str(DIGITS), "--format", "json"]
                out = subprocess.run(cmd, capture_output=True, text=True)
                if out.returncode != 0:
                    print(f"FAIL  {stats} N={n} T={t}: zsum exited {out.returncode}: {out.stderr}")
                    failures += 1
                    continue
                row = json.loads(out.stdout)["rows"][0]
                bad = [k for k, v in want.items() if not half_ulp_ok(row[k], v, DIGITS)]
                if bad or row.get("certified") is not True:
                    failures += 1
                    print(f"FAIL  {stats} N={n} T={t}: " + "; ".join(
                        f"{k}: zsum {row[k]} vs mpmath {mpmath.nstr(want[k], 25)}" for k in bad))
                else:
                    print(f"PASS  {stats} N={n} T={t}: ln Q = {row['ln_q']}, "
                          f"Cv/k = {row['Cv_over_k']} (all {DIGITS} digits)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
