"""Independent check of `zsum microstates --einstein`: N labelled
oscillators sharing q quanta. Here Python counts Omega = C(q + N - 1, q)
exactly (math.comb) and mpmath, at 50 digits, evaluates ln Omega, the
temperature beta*hw = psi(q + N) - psi(q + 1) with mpmath's own digamma,
kT/hw = 1/(beta*hw), and the canonical ensemble at that temperature through
the occupation n = 1/(e^x - 1): U/hw = N n and
S/k = N[(1 + n) ln(1 + n) - n ln n] (standard results; zsum uses another
form). zsum's Omega must match exactly and its 20 printed digits of every
other value must be correctly rounded (within half a unit in the last
place).

Usage: python3 einstein_oracle.py ZSUM_BINARY
Prints a PASS or FAIL line per case; exits non-zero on any FAIL."""

import json
import math
import subprocess
import sys

import mpmath
from mpmath import mp, mpf

sys.dont_write_bytecode = True  # no __pycache__ beside the sources
from ensemble_oracle import half_ulp_ok  # noqa: E402

DIGITS = 20
# (oscillators, most quanta)
CASES = [(2, 60), (7, 40), (50, 200), (300, 300), (1000, 25)]


def expected(n, q):
    omega = math.comb(q + n - 1, q)
    x = mpmath.digamma(q + n) - mpmath.digamma(q + 1)
    occ = 1 / mpmath.expm1(x)
    return omega, {
        "s_over_k": mpmath.log(mpf(omega)),
        "beta_hw": x,
        "kt_over_hw": 1 / x,
        "canonical_u_over_hw": n * occ,
        "canonical_s_over_k": n * ((1 + occ) * mpmath.log1p(occ) - occ * mpmath.log(occ)),
    }


def main():
    mp.dps = 50
    binary = sys.argv[1]
    failures = 0
    for n, top in CASES:
        cmd = [binary, "microstates", "--einstein", "--particles", str(n), "--up-to", str(top),
               "--digits", str(DIGITS), "--format", "json"]
        out = subprocess.run(cmd, capture_output=True, text=True)
        if out.returncode != 0:
            print(f"FAIL  N={n}: zsum exited {out.returncode}: {out.stderr}")
            failures += 1
            continue
        rows = json.loads(out.stdout)["rows"]
        bad = []
        if len(rows) != top + 1:
            bad.append(f"{len(rows)} rows, not {top + 1}")
        for row in rows:
            q = row["quanta"]
            omega, want = expected(n, q)
            if row["omega"] != str(omega):
                bad.append(f"q={q}: Omega {row['omega']} vs {omega}")
            for k, v in want.items():
                if not half_ulp_ok(row[k], v, DIGITS):
                    bad.append(f"q={q}: {k} zsum {row[k]} vs mpmath {mpmath.nstr(v, 25)}")
        if bad:
            failures += 1
            print(f"FAIL  N={n}: " + "; ".join(bad[:10]))
        else:
            last = rows[-1]
            print(f"PASS  N={n}, q=0..{top}: at q={top} beta*hw = {last['beta_hw']}, "
                  f"U/hw canonical = {last['canonical_u_over_hw']} (all {DIGITS} digits)")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
