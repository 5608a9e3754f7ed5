//! Checks every model must pass, whatever it is (a shared helper: each
//! model's test file calls `check_spectrum`).

#![allow(dead_code)]

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::Zero;
use std::collections::HashSet;
use zsum::spectrum::Spectrum;

/// Generic consistency of a spectrum up to `cutoff`:
/// - levels strictly increasing, starting at the ground energy, all ≤ cutoff;
/// - every degeneracy positive;
/// - total states = sum of degeneracies = cumulative count at the top;
/// - the counting bound is never below the true count at any level;
/// - for up to `sample` levels, the listed states are distinct, as many as
///   the degeneracy, and absent elsewhere.
pub fn check_spectrum(s: &dyn Spectrum, cutoff: &BigRational, sample: usize) {
    let list = s.levels_up_to(cutoff).expect("levels");
    assert!(
        !list.is_empty(),
        "{}: no levels up to {cutoff}",
        s.describe()
    );
    assert_eq!(list.levels()[0].energy, s.ground_energy(), "ground energy");
    let mut running = BigUint::zero();
    for w in list.levels().windows(2) {
        assert!(w[0].energy < w[1].energy, "levels out of order");
    }
    let step = (list.len() / sample.max(1)).max(1);
    for (i, l) in list.iter().enumerate() {
        assert!(&l.energy <= cutoff);
        assert!(!l.degeneracy.is_zero());
        running += &l.degeneracy;
        assert!(
            s.count_bound(&l.energy) >= running,
            "{}: bound {} below true count {} at E = {}",
            s.describe(),
            s.count_bound(&l.energy),
            running,
            l.energy
        );
        if i % step == 0 {
            let states = s.states_at(&l.energy).expect("states");
            let distinct: HashSet<_> = states.iter().collect();
            assert_eq!(distinct.len(), states.len(), "duplicate states");
            assert_eq!(
                BigUint::from(states.len()),
                l.degeneracy,
                "states at {}",
                l.energy
            );
            for st in &states {
                assert_eq!(st.0.len(), s.quantum_numbers().len());
            }
        }
    }
    assert_eq!(running, list.total_states());
    assert_eq!(list.count_up_to(cutoff), running);
    // Between levels there are no states.
    let mid = (&list.levels()[0].energy + &list.levels()[list.len().min(2) - 1].energy)
        / BigRational::from_integer(2.into());
    if list.len() >= 2 && mid != list.levels()[1].energy && mid != list.levels()[0].energy {
        assert!(s.states_at(&mid).expect("states").is_empty());
    }
}

/// Runs the zsum binary with `args`.
pub fn run(args: &[&str]) -> std::process::Output {
    std::process::Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .output()
        .expect("failed to start the zsum binary")
}

/// Runs zsum, requires success, and reads its JSON.
pub fn json(args: &[&str]) -> serde_json::Value {
    let out = run(args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("valid JSON")
}

/// Requires zsum to refuse `args`: exit status 2, a `zsum: ` message
/// containing `needle`, and nothing on standard output.
pub fn refused(args: &[&str], needle: &str) {
    let out = run(args);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
    assert!(err.starts_with("zsum: "), "{err}");
    assert!(err.contains(needle), "{args:?}: {err}");
    assert!(out.stdout.is_empty(), "{args:?} wrote output");
}

/// nΛ³ of an ideal gas from the SI constants alone, independently of zsum:
/// n = p/kT, Λ = h/sqrt(2π m kT), mass in u. h and k exact (CODATA 2018,
/// the SI 2019 values); u = 1.66053906660e-27 kg (CODATA 2018).
pub fn n_lambda3(mass_u: f64, t: f64, p: f64) -> f64 {
    let (h, k, u) = (6.62607015e-34, 1.380649e-23, 1.66053906660e-27);
    let lambda = h / (2.0 * std::f64::consts::PI * mass_u * u * k * t).sqrt();
    p / (k * t) * lambda.powi(3)
}

/// `x` to 4 significant digits, laid out as zsum prints nΛ³ (plain from
/// 1e-5 up to 1e4, else scientific as `3.087e-6`).
pub fn sig4(x: f64) -> String {
    let e = x.abs().log10().floor() as i32;
    if (-5..4).contains(&e) {
        format!("{:.*}", (3 - e).max(0) as usize, x)
    } else {
        format!("{x:.3e}")
    }
}

/// Whether Python 3 with mpmath is here for the independent cross-checks.
/// `.ci/setup` installs it (pip where allowed, else Debian's
/// `python3-mpmath`); only where that truly failed does a cross-check skip,
/// and then it says so on the terminal (written past the test harness's
/// capture, so the skip is never silent) with what to install.
pub fn mpmath_available(test: &str) -> bool {
    use std::io::Write;
    let why = match std::process::Command::new("python3")
        .args(["-c", "import mpmath"])
        .output()
    {
        Ok(out) if out.status.success() => return true,
        Ok(out) => format!(
            "python3 cannot import mpmath ({})",
            String::from_utf8_lossy(&out.stderr)
                .lines()
                .last()
                .unwrap_or("")
                .trim()
        ),
        Err(e) => format!("python3 cannot be started ({e})"),
    };
    let _ = writeln!(
        std::io::stderr(),
        "SKIPPED {test}: {why}; run `bash .ci/setup` (it installs python3 and mpmath by pip \
         or Debian's python3-mpmath) to run this independent cross-check"
    );
    false
}

/// Starts `python3 tests/crosscheck/<script>` with the JSON document `doc`
/// on its standard input (the oracles read their cases that way); the
/// caller collects its output.
pub fn spawn_oracle(script: &str, doc: &str) -> std::process::Child {
    use std::io::Write;
    use std::process::{Command, Stdio};
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/crosscheck")
        .join(script);
    let mut child = Command::new("python3")
        .arg(&path)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap_or_else(|e| panic!("failed to start python3 on {}: {e}", path.display()));
    child
        .stdin
        .take()
        .unwrap()
        .write_all(doc.as_bytes())
        .unwrap();
    child
}

/// For every level up to `cutoff`: the terms equal the distinct states
/// projected onto the term numbers (a symmetric top's K taken as |K|).
pub fn terms_are_projected_states(s: &dyn Spectrum, cutoff: &str) -> usize {
    let cut = zsum::exact::parse_rational(cutoff).unwrap();
    let names = s.quantum_numbers();
    let pos: Vec<usize> = s
        .term_numbers()
        .iter()
        .map(|t| names.iter().position(|n| n == t).unwrap())
        .collect();
    let terms = s
        .terms_within(&cut, &zsum::spectrum::Budget::default())
        .unwrap();
    let levels = s.levels_up_to(&cut).unwrap();
    let mut seen = 0;
    for l in levels.iter() {
        let got: std::collections::BTreeSet<Vec<i64>> = terms
            .iter()
            .filter(|(e, _)| e == &l.energy)
            .map(|(_, t)| t.clone())
            .collect();
        let want: std::collections::BTreeSet<Vec<i64>> = s
            .states_at(&l.energy)
            .unwrap()
            .iter()
            .map(|st| pos.iter().map(|&i| st.0[i].abs()).collect())
            .collect();
        assert_eq!(got, want, "{} at E = {}", s.describe(), l.energy);
        seen += got.len();
    }
    assert_eq!(seen, terms.len(), "a term lies on no level");
    seen
}

/// The engine's cached J ladders (kept at the widest cutoff asked so far,
/// listed ahead of a rising sweep, cut by bisection) equal the model's own
/// ladders at every cutoff of a rising then falling run of `above`
/// (excitations past the ground). Returns the number of cutoffs checked.
pub fn cached_ladders_match(m: &dyn Spectrum, above: &[&str]) -> usize {
    use zsum::spectrum::Budget;
    let cached = zsum::sum::Cached::new(m);
    let mut run: Vec<&str> = above.to_vec();
    run.extend(above.iter().rev());
    for a in &run {
        let cut = m.ground_energy() + zsum::exact::parse_rational(a).unwrap();
        let own = m.poly_ladders(&cut, &Budget::default()).map(|l| l.unwrap());
        let via = cached
            .poly_ladders(&cut, &Budget::default())
            .map(|l| l.unwrap());
        assert_eq!(via, own, "{} at {} past the ground", m.describe(), a);
    }
    run.len()
}
