//! The asymmetric top's certified levels (`zsum::models::asymmetric`),
//! checked against what does not depend on zsum's method: the trace of the
//! Hamiltonian (an exact identity), the closed forms of J ≤ 2 and of the
//! prolate, oblate and spherical limits, an independent full-matrix
//! diagonalisation in mpmath (`tests/crosscheck/asym_oracle.py`), observed
//! term values of water, and the τ order of the rigid top's levels.

mod common;

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use proptest::prelude::*;
use zsum::error::ErrorKind;
use zsum::exact::parse_rational;
use zsum::models::asymmetric::{
    joint_spectrum, AsymLevel, AsymState, AsymmetricTopMath, Effort, Energy, Overlap, Quartic,
    Tridiagonal, Wang, MAX_J,
};

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn int(n: u64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

fn rigid(a: &str, b: &str, c: &str) -> AsymmetricTopMath {
    AsymmetricTopMath::rigid(r(a), r(b), r(c)).unwrap()
}

/// Ground-state rotational constants of H₂¹⁶O in cm⁻¹ (A, B, C), from
/// memory (the values quoted in standard spectroscopy tables, rounded to
/// four decimals).
const WATER: [&str; 3] = ["27.8806", "14.5218", "9.2777"];

/// Quartic constants of the size of water's A-reduced ones, in cm⁻¹ (Δ_J,
/// Δ_JK, Δ_K, δ_J, δ_K; from memory and rounded: a test of the
/// mathematics, not spectroscopic data).
const WATER_QUARTIC: [&str; 5] = ["0.00125", "-0.0058", "0.0326", "0.00051", "0.0013"];

fn quartic(q: [&str; 5]) -> Quartic {
    Quartic {
        delta_j: r(q[0]),
        delta_jk: r(q[1]),
        delta_k: r(q[2]),
        small_delta_j: r(q[3]),
        small_delta_k: r(q[4]),
    }
}

fn water() -> AsymmetricTopMath {
    rigid(WATER[0], WATER[1], WATER[2])
}

fn distorted_water() -> AsymmetricTopMath {
    AsymmetricTopMath::new(
        r(WATER[0]),
        r(WATER[1]),
        r(WATER[2]),
        Some(quartic(WATER_QUARTIC)),
    )
    .unwrap()
}

/// Every state's enclosure, ascending (a merged level once per state).
fn state_values(levels: &[AsymLevel]) -> Vec<Energy> {
    levels
        .iter()
        .flat_map(|l| std::iter::repeat_n(l.value.clone(), l.states.len()))
        .collect()
}

/// The level holding J_{Ka,Kc}.
fn level_of(levels: &[AsymLevel], ka: u64, kc: u64) -> &AsymLevel {
    levels
        .iter()
        .find(|l| l.states.iter().any(|s| s.ka == ka && s.kc == kc))
        .unwrap_or_else(|| panic!("no level {ka},{kc}"))
}

/// The trace of the full Hamiltonian of J: Σ_{K=−J..J} ⟨K|H|K⟩ (the
/// off-diagonal elements do not enter), with the power sums
/// Σ1 = 2J+1, ΣK² = n(2J+1)/3, ΣK⁴ = n(2J+1)(3n−1)/15 (common practice).
fn trace(abc: [&BigRational; 3], q: Option<&Quartic>, j: u64) -> BigRational {
    let [a, b, c] = abc;
    let n = int(j * (j + 1));
    let s0 = int(2 * j + 1);
    let s2 = &n * &s0 / int(3);
    let s4 = &n * &s0 * (int(3) * &n - int(1)) / int(15);
    let half = (b + c) / int(2);
    let mut t = &s0 * &half * &n + (a - &half) * &s2;
    if let Some(q) = q {
        t -= &s0 * &q.delta_j * &n * &n + &q.delta_jk * &n * &s2 + &q.delta_k * &s4;
    }
    t
}

#[test]
fn the_levels_of_each_j_sum_to_the_trace_of_the_hamiltonian() {
    // Rigid: trace = (2J+1) n (A+B+C)/3. Several shapes: water, κ = 0,
    // near prolate, near oblate, fractions; and water-like distortion.
    let tops = [
        water(),
        rigid("5", "3", "1"),
        rigid("10", "1.1", "1"),
        rigid("3", "2.9", "1"),
        rigid("7/3", "5/3", "1/7"),
        distorted_water(),
    ];
    let width = r("1e-25");
    for top in &tops {
        for j in 0..=30u64 {
            let levels = top.levels_of_j(j, &width).unwrap();
            let states = state_values(&levels);
            assert_eq!(states.len() as u64, 2 * j + 1);
            let t = trace(top.constants(), top.quartic(), j);
            if top.quartic().is_none() {
                let [a, b, c] = top.constants();
                assert_eq!(t, int(2 * j + 1) * int(j * (j + 1)) * (a + b + c) / int(3));
            }
            let lo: BigRational = states.iter().map(|e| e.lo().clone()).sum();
            let hi: BigRational = states.iter().map(|e| e.hi().clone()).sum();
            assert!(lo <= t && t <= hi, "J = {j}: {lo} ≤ {t} ≤ {hi} fails");
            for l in &levels {
                assert!(l.value.width() <= width);
                assert_eq!(l.overlap, Overlap::Isolated);
            }
        }
    }
}

#[test]
fn j_up_to_2_match_the_closed_forms_of_the_rigid_top() {
    // Standard table of rigid asymmetric-rotor energies (from memory):
    // 1_01 = B+C, 1_11 = A+C, 1_10 = A+B; 2_12 = A+B+4C, 2_11 = A+4B+C,
    // 2_21 = 4A+B+C; 2_02 and 2_20 = 2(A+B+C) ∓ 2 sqrt((B−C)² + (A−C)(A−B)),
    // i.e. sum 4(A+B+C), product 4(A+B+C)² − 4((B−C)² + (A−C)(A−B)).
    for abc in [WATER, ["5", "3", "1"], ["7/3", "5/3", "1/7"]] {
        let top = rigid(abc[0], abc[1], abc[2]);
        let (a, b, c) = (r(abc[0]), r(abc[1]), r(abc[2]));
        let one = top.levels_of_j(1, &r("1e-40")).unwrap();
        let exact = |l: &AsymLevel| l.value.exact().cloned().expect("exact");
        assert_eq!(exact(level_of(&one, 0, 1)), &b + &c);
        assert_eq!(exact(level_of(&one, 1, 1)), &a + &c);
        assert_eq!(exact(level_of(&one, 1, 0)), &a + &b);
        let two = top.levels_of_j(2, &r("1e-40")).unwrap();
        assert_eq!(exact(level_of(&two, 1, 2)), &a + &b + int(4) * &c);
        assert_eq!(exact(level_of(&two, 1, 1)), &a + int(4) * &b + &c);
        assert_eq!(exact(level_of(&two, 2, 1)), int(4) * &a + &b + &c);
        let (low, high) = (&level_of(&two, 0, 2).value, &level_of(&two, 2, 0).value);
        assert!(
            low.exact().is_none() && high.exact().is_none(),
            "irrational"
        );
        let s = int(4) * (&a + &b + &c);
        let p = &s * &s / int(4) - int(4) * ((&b - &c) * (&b - &c) + (&a - &c) * (&a - &b));
        assert!(low.lo() + high.lo() <= s && s <= low.hi() + high.hi());
        assert!(low.lo() * high.lo() <= p && p <= low.hi() * high.hi());
        assert!(low.hi() < high.lo());
    }
}

/// A symmetric-top limit: every level exact, E = B n + (X − B) K² with
/// K = `k_of(state)` shared by the level's states, each K > 0 twice (±K).
/// `unique` is the index of X among (A, B, C).
fn check_symmetric_limit(abc: [&str; 3], unique: usize, k_of: fn(&AsymState) -> u64) {
    let top = rigid(abc[0], abc[1], abc[2]);
    let (b, x) = (r(abc[1]), r(abc[unique]));
    let kappa = if unique == 0 { -1 } else { 1 };
    assert_eq!(top.kappa(), Some(BigRational::from_integer(kappa.into())));
    for j in 0..=15u64 {
        let levels = top.levels_of_j(j, &r("1e-20")).unwrap();
        assert_eq!(levels.len() as u64, j + 1, "J = {j}");
        for l in &levels {
            let k = k_of(&l.states[0]);
            assert!(l.states.iter().all(|s| k_of(s) == k), "{l:?}");
            assert_eq!(l.degeneracy(), if k == 0 { 1 } else { 2 });
            let want = &b * int(j * (j + 1)) + (&x - &b) * int(k * k);
            assert_eq!(l.value, Energy::Exact(want));
        }
    }
}

#[test]
fn the_prolate_limit_is_exact_with_k_doublets_merged() {
    // B = C: E = B n + (A − B) K², K = Ka. The off-diagonal vanishes, the
    // blocks split into 1×1 blocks, and equal values are merged exactly.
    for abc in [["5", "2", "2"], ["13/2", "3/7", "3/7"]] {
        check_symmetric_limit(abc, 0, |s| s.ka);
    }
}

#[test]
fn the_oblate_limit_is_exact_with_k_doublets_merged() {
    // A = B: E = B n + (C − B) K², K = Kc. Here the Wang blocks do not
    // split: each eigenvalue is found rational by the exact root test, and
    // the ±Kc pair from two blocks is merged because both are exact.
    for abc in [["3", "3", "1"], ["9/4", "9/4", "1/3"]] {
        check_symmetric_limit(abc, 2, |s| s.kc);
    }
}

#[test]
fn the_spherical_top_is_one_level_per_j() {
    let top = rigid("2", "2", "2");
    assert_eq!(top.kappa(), None);
    for j in 0..=12u64 {
        let levels = top.levels_of_j(j, &r("1e-20")).unwrap();
        assert_eq!(levels.len(), 1);
        assert_eq!(levels[0].degeneracy() as u64, 2 * j + 1);
        assert_eq!(levels[0].value, Energy::Exact(int(2 * j * (j + 1))));
    }
}

#[test]
fn water_term_values_are_near_the_observed_ones() {
    // Observed term values of H₂¹⁶O in cm⁻¹, from memory. The rigid model
    // leaves out centrifugal distortion, about Δ_K K⁴ ≈ 0.03·16 ≈ 0.5 cm⁻¹
    // for Ka = 2 (0.4 % of 135 cm⁻¹) plus smaller terms, so a tolerance of
    // 1 % of each value is what a rigid model can be asked for at J ≤ 2.
    let observed = [
        (1, 0, 1, "23.79"),
        (1, 1, 1, "37.14"),
        (1, 1, 0, "42.37"),
        (2, 0, 2, "70.09"),
        (2, 1, 2, "79.50"),
        (2, 1, 1, "95.18"),
        (2, 2, 1, "134.90"),
        (2, 2, 0, "136.16"),
    ];
    let top = water();
    let mut previous = BigRational::zero();
    for (j, ka, kc, obs) in observed {
        let levels = top.levels_of_j(j, &r("1e-30")).unwrap();
        let e = level_of(&levels, ka, kc).value.lo().clone();
        let obs = r(obs);
        let rel = ((&e - &obs) / &obs).abs();
        assert!(
            rel <= r("0.01"),
            "{j}_{ka}{kc}: {} vs {obs}",
            e.to_f64().unwrap()
        );
        // The observed order is reproduced too.
        assert!(e > previous);
        previous = e;
    }
}

/// Runs the mpmath oracle on one set of constants and returns the
/// eigenvalues of each J it was asked for.
fn spawn_oracle(
    name: &str,
    abc: [&str; 3],
    q: Option<[&str; 5]>,
    js: &[u64],
) -> std::process::Child {
    let quartic = match q {
        None => "null".to_string(),
        Some(q) => format!(
            r#"{{"DJ":"{}","DJK":"{}","DK":"{}","dJ":"{}","dK":"{}"}}"#,
            q[0], q[1], q[2], q[3], q[4]
        ),
    };
    let doc = format!(
        r#"{{"sets":[{{"name":"{name}","A":"{}","B":"{}","C":"{}","quartic":{quartic},"j":{js:?}}}]}}"#,
        abc[0], abc[1], abc[2]
    );
    common::spawn_oracle("asym_oracle.py", &doc)
}

/// An oracle case: name, A:B:C, quartic constants, the J to compare.
type OracleSet<'a> = (&'a str, [&'a str; 3], Option<[&'a str; 5]>, Vec<u64>);

#[test]
fn every_level_agrees_with_a_full_matrix_diagonalisation_in_mpmath() {
    // Independent oracle: tests/crosscheck/asym_oracle.py builds the full
    // (2J+1)×(2J+1) matrix in |J,K⟩, K = −J..J (no Wang blocks), and
    // diagonalises it with mpmath's mp.eigsy at 50 significant digits. Its
    // values are trusted to 1e-40 relative (ten digits of margin for the
    // eigensolver's rounding); zsum's enclosures are 1e-30 wide. Every
    // oracle eigenvalue must lie in the enclosure of the state of the same
    // rank, so the multisets agree.
    if !common::mpmath_available("every_level_agrees_with_a_full_matrix_diagonalisation_in_mpmath")
    {
        return;
    }
    let all: Vec<u64> = (0..=20).collect();
    let even: Vec<u64> = (0..=20).step_by(2).collect();
    let upto = |n: u64| (0..=n).collect::<Vec<u64>>();
    let distorted_to = distorted_water().turnover_j().unwrap().min(16);
    // Invented constants (not spectroscopic data) for the two limits.
    let near_oblate_q = ["0.0002", "0.0011", "-0.0004", "0.00003", "0.0002"];
    let sets: Vec<OracleSet> = vec![
        ("water", WATER, None, all),
        (
            "water-quartic",
            WATER,
            Some(WATER_QUARTIC),
            upto(distorted_to),
        ),
        ("near-prolate", ["10", "1.1", "1"], None, even),
        (
            "near-oblate-quartic",
            ["3", "2.9", "1"],
            Some(near_oblate_q),
            upto(12),
        ),
    ];
    // The oracles run side by side while zsum computes.
    let children: Vec<_> = sets
        .iter()
        .map(|(name, abc, q, js)| spawn_oracle(name, *abc, *q, js))
        .collect();
    let width = r("1e-30");
    let tolerance = r("1e-40");
    let mut compared = 0;
    for ((name, abc, q, js), child) in sets.iter().zip(children) {
        let out = child.wait_with_output().unwrap();
        let stdout = String::from_utf8_lossy(&out.stdout);
        assert!(
            out.status.success(),
            "{name}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        assert!(stdout.contains(&format!("DONE {}", js.len())), "{stdout}");
        let top = AsymmetricTopMath::new(r(abc[0]), r(abc[1]), r(abc[2]), q.map(quartic)).unwrap();
        for &j in js {
            let oracle: Vec<BigRational> = stdout
                .lines()
                .filter_map(|l| {
                    let f: Vec<&str> = l.split_whitespace().collect();
                    (f.len() == 4 && f[0] == "EIG" && f[1] == *name && f[2] == j.to_string())
                        .then(|| r(f[3]))
                })
                .collect();
            let levels = top.levels_of_j(j, &width).unwrap();
            assert!(levels.iter().all(|l| l.overlap == Overlap::Isolated));
            let ours = state_values(&levels);
            assert_eq!(ours.len(), oracle.len(), "{name} J = {j}");
            for (e, v) in ours.iter().zip(&oracle) {
                let slack = &tolerance * v.abs().max(BigRational::one());
                assert!(
                    &(e.lo() - &slack) <= v && v <= &(e.hi() + &slack),
                    "{name} J = {j}: mpmath {v} outside [{}, {}]",
                    e.lo(),
                    e.hi()
                );
                compared += 1;
            }
        }
    }
    assert!(compared > 1000, "only {compared} eigenvalues compared");
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    /// King, Hainer and Cross (1943; from memory): the rigid top's levels
    /// of one J never cross as κ varies, so sorted by energy they run
    /// τ = Ka − Kc = −J, …, J. This checks the Ka assignment and the Kc
    /// parities of the four Wang blocks together.
    #[test]
    fn rigid_levels_run_in_order_of_tau(c in 1u32..2000, db in 1u32..2000, da in 1u32..2000, j in 0u64..=14) {
        let c = BigRational::new(c.into(), 97.into());
        let b = &c + BigRational::new(db.into(), 89.into());
        let a = &b + BigRational::new(da.into(), 83.into());
        let top = AsymmetricTopMath::rigid(a, b, c).unwrap();
        let levels = top.levels_of_j(j, &r("1e-24")).unwrap();
        prop_assert_eq!(levels.len() as u64, 2 * j + 1);
        let taus: Vec<i64> = levels.iter().map(|l| l.states[0].tau()).collect();
        let want: Vec<i64> = (-(j as i64)..=j as i64).collect();
        prop_assert_eq!(taus, want);
        for w in levels.windows(2) {
            prop_assert!(w[0].value.hi() < w[1].value.lo());
        }
        // Within each Wang block, ascending Ka, disjoint enclosures.
        for block in Wang::ALL {
            let mine: Vec<&AsymLevel> = levels.iter().filter(|l| l.states[0].block == block).collect();
            prop_assert_eq!(mine.len(), block.ks(j).len());
            for w in mine.windows(2) {
                prop_assert!(w[0].states[0].ka < w[1].states[0].ka);
                prop_assert!(w[0].value.hi() < w[1].value.lo());
            }
        }
    }
}

#[test]
fn the_lower_bound_is_below_every_level() {
    let tops = [water(), rigid("10", "1.1", "1"), distorted_water()];
    for top in &tops {
        for j in 0..=16u64 {
            let bound = top.lower_bound(j);
            if top.quartic().is_none() {
                assert_eq!(bound, top.constants()[2] * int(j * (j + 1)));
            }
            for l in top.levels_of_j(j, &r("1e-10")).unwrap() {
                assert!(&bound <= l.value.lo(), "J = {j}");
            }
        }
    }
}

/// ⟨J,K|H|J,K⟩ written out again here, for the turnover checks.
fn diagonal(top: &AsymmetricTopMath, j: u64, k: u64) -> BigRational {
    let [a, b, c] = top.constants();
    let n = int(j * (j + 1));
    let k2 = int(k * k);
    let half = (b + c) / int(2);
    let q = top.quartic().unwrap();
    &half * &n + (a - &half) * &k2
        - &q.delta_j * &n * &n
        - &q.delta_jk * &n * &k2
        - &q.delta_k * &k2 * &k2
}

fn well_behaved(top: &AsymmetricTopMath, j: u64) -> bool {
    (1..=j).all(|k| diagonal(top, j, k) > diagonal(top, j, k - 1))
        && (j == 0 || diagonal(top, j, 0) > diagonal(top, j - 1, 0))
}

#[test]
fn the_turnover_is_where_a_ladder_first_folds() {
    assert_eq!(water().turnover_j(), None);
    // Water-like distortion folds the Ka ladder (Δ_K K⁴) near K = 17.
    let k_fold = distorted_water();
    // A large Δ_J alone folds the J ladder: B + C ≤ 4 Δ_J J² first at J = 8.
    let with = |q| AsymmetricTopMath::new(r("3"), r("2"), r("1"), Some(quartic(q)));
    let j_fold = with(["0.012", "0", "0", "0", "0"]).unwrap();
    for (top, want) in [(&k_fold, None), (&j_fold, Some(7))] {
        let last = top.turnover_j().expect("turns over");
        if let Some(w) = want {
            assert_eq!(last, w);
        }
        assert!((0..=last).all(|j| well_behaved(top, j)));
        assert!(!well_behaved(top, last + 1));
    }
    assert!((10..25).contains(&k_fold.turnover_j().unwrap()));
    // A distortion that folds at J = 1 is refused, naming the constant.
    let err = with(["0", "0", "5", "0", "0"]).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::InvalidParameter);
    assert!(err.message().contains("Δ_K"), "{}", err.message());
    // All-zero quartic constants are the rigid top (a spherical one too,
    // whose flat K ladder would otherwise count as folded).
    let zero = ["0", "0", "0", "0", "0"];
    let same = with(zero).unwrap();
    assert_eq!(same.quartic(), None);
    assert_eq!(same.turnover_j(), None);
    let sphere = AsymmetricTopMath::new(r("2"), r("2"), r("2"), Some(quartic(zero))).unwrap();
    assert_eq!(sphere.lower_bound(3), int(24));
}

#[test]
fn bad_constants_and_requests_are_refused_with_what_is_allowed() {
    let bad = [
        (["3", "2", "0"], "rotational constant C"),
        (["3", "1", "2"], "rotational constant B"),
        (["1", "2", "1"], "rotational constant A"),
    ];
    for (abc, what) in bad {
        let e = AsymmetricTopMath::rigid(r(abc[0]), r(abc[1]), r(abc[2])).unwrap_err();
        assert_eq!(e.kind(), ErrorKind::InvalidParameter);
        assert!(e.message().contains(what), "{}", e.message());
    }
    let e = AsymmetricTopMath::rigid(r("3"), r("1"), r("2")).unwrap_err();
    assert!(e.message().contains("A ≥ B ≥ C"), "{}", e.message());
    let top = water();
    let e = top.levels_of_j(3, &r("0")).unwrap_err();
    assert!(e.message().contains("enclosure width"), "{}", e.message());
    let e = top.levels_of_j(MAX_J + 1, &r("1")).unwrap_err();
    assert!(e.message().contains("at most"), "{}", e.message());
    // A width beyond the effort limit is a budget refusal.
    let small = top.clone().with_effort(Effort {
        max_bits: 64,
        ..Effort::default()
    });
    assert_eq!(
        small.levels_of_j(5, &r("1e-30")).unwrap_err().kind(),
        ErrorKind::Budget
    );
    let neg = Tridiagonal {
        diagonal: vec![r("1"), r("2")],
        off_squared: vec![r("-1")],
    };
    assert!(joint_spectrum(&[neg], &r("1e-5"), &Effort::default()).is_err());
}

#[test]
fn kappa_is_rays_asymmetry_parameter() {
    assert_eq!(rigid("5", "3", "1").kappa(), Some(BigRational::zero()));
    let [a, b, c] = WATER.map(r);
    let k = water().kappa().unwrap();
    assert_eq!(k, (int(2) * &b - &a - &c) / (&a - &c));
    // Water is a near-prolate top, κ ≈ −0.44 (common practice).
    assert!(k > r("-0.45") && k < r("-0.43"));
}

fn pair(d0: &str, d1: &str, e: &str) -> Tridiagonal {
    Tridiagonal {
        diagonal: vec![r(d0), r(d1)],
        off_squared: vec![r(e)],
    }
}

#[test]
fn equal_irrational_eigenvalues_are_merged_only_when_proven() {
    // [[0,1],[1,1]] and [[1,1],[1,0]] both have (1 ± √5)/2: merged by the
    // exact gcd test, not by closeness.
    let same = [pair("0", "1", "1"), pair("1", "0", "1")];
    let levels = joint_spectrum(&same, &r("1e-25"), &Effort::default()).unwrap();
    assert_eq!(levels.len(), 2);
    for (i, l) in levels.iter().enumerate() {
        assert_eq!(l.members, vec![(0, i), (1, i)]);
        assert_eq!(l.overlap, Overlap::Isolated);
        // x² = x + 1 at both roots.
        let (lo, hi) = (l.value.lo(), l.value.hi());
        let f = |x: &BigRational| x * x - x - int(1);
        assert!(f(lo).signum() != f(hi).signum());
    }
    // Two different quadratic irrationals 1e-31 apart: 2Q√2 (the block
    // [[0, ·], [·, 0]] with e = 8Q²) and P + Q√2 ([[P, ·], [·, P]], e = 2Q²),
    // where P + Q√2 = (1 + √2)^80, so P − Q√2 = (1 − √2)^80 ≈ 2e-31 while
    // both are about 1e30 (common practice: Pell's equation). Default
    // effort separates them; a smaller one proves them different without
    // separating them (Distinct); without the gcd test it can only say
    // Undecided. Never merged.
    let (mut p, mut q) = (BigInt::one(), BigInt::one());
    for _ in 1..80 {
        (p, q) = (&p + &q * 2, &p + &q);
    }
    let big = |x: &BigInt| BigRational::from_integer(x.clone());
    let family = [
        Tridiagonal {
            diagonal: vec![int(0), int(0)],
            off_squared: vec![big(&(&q * &q * 8))],
        },
        Tridiagonal {
            diagonal: vec![big(&p), big(&p)],
            off_squared: vec![big(&(&q * &q * 2))],
        },
    ];
    let width = r("1e-10");
    let levels = joint_spectrum(&family, &width, &Effort::default()).unwrap();
    assert_eq!(levels.len(), 4);
    assert!(levels.iter().all(|l| l.overlap == Overlap::Isolated));
    // 2Q√2 < P + Q√2.
    assert_eq!(levels[2].members, vec![(0, 1)]);
    assert_eq!(levels[3].members, vec![(1, 1)]);
    for (effort, want) in [
        (
            Effort {
                max_bits: 180,
                max_gcd_degree: 512,
            },
            Overlap::Distinct,
        ),
        (
            Effort {
                max_bits: 180,
                max_gcd_degree: 0,
            },
            Overlap::Undecided,
        ),
    ] {
        let levels = joint_spectrum(&family, &width, &effort).unwrap();
        assert_eq!(levels.len(), 4, "listed apart, never merged");
        assert_eq!(levels[0].overlap, Overlap::Isolated);
        assert_eq!(levels[1].overlap, Overlap::Isolated);
        assert_eq!(levels[2].overlap, want, "{levels:?}");
        assert_eq!(levels[3].overlap, want);
        assert!(levels[2].value.hi() >= levels[3].value.lo());
    }
}

#[test]
fn near_degenerate_doublets_are_flagged_when_the_effort_runs_out() {
    // A near-prolate top's high-Ka doublets at J = 30 are split far below
    // 2^-120 of the energy: with the refinement capped there they stay
    // overlapping, each proven distinct (E± blocks share no eigenvalue), and
    // every state is still listed; by default they are separated.
    let top = rigid("10", "1.1", "1");
    let capped = top.clone().with_effort(Effort {
        max_bits: 120,
        ..Effort::default()
    });
    let width = r("1e-28");
    let flagged = capped.levels_of_j(30, &width).unwrap();
    assert_eq!(state_values(&flagged).len(), 61);
    let distinct: Vec<&AsymLevel> = flagged
        .iter()
        .filter(|l| l.overlap == Overlap::Distinct)
        .collect();
    assert!(distinct.len() >= 2, "{flagged:?}");
    assert!(flagged.iter().all(|l| l.overlap != Overlap::Undecided));
    for l in &distinct {
        assert_eq!(l.degeneracy(), 1);
        let partner = flagged
            .iter()
            .any(|o| o != *l && o.value.lo() <= l.value.hi() && l.value.lo() <= o.value.hi());
        assert!(partner);
    }
    let full = top.levels_of_j(30, &width).unwrap();
    assert_eq!(full.len(), 61);
    assert!(full.iter().all(|l| l.overlap == Overlap::Isolated));
}

#[test]
fn the_parallel_listing_is_the_per_j_listing() {
    let top = distorted_water();
    let width = r("1e-20");
    let all = top.levels_up_to_j(12, &width).unwrap();
    assert_eq!(all.len(), 13);
    for (j, levels) in all.iter().enumerate() {
        assert_eq!(levels, &top.levels_of_j(j as u64, &width).unwrap());
    }
}
#[test]
fn entries_beyond_f64_are_solved_by_certified_bisection_alone() {
    // f64 cannot hold 2^±2000, so the eigenvalues are isolated and
    // narrowed by certified counts alone. [[s, ·], [·, s]] with e = s² has
    // the eigenvalues 0 and 2s exactly: the bisection's first midpoint is
    // 0, where the last pivot is exactly zero (the exact Sturm count).
    // [[0, ·], [·, s]] with e = s² has s(1 ± √5)/2, the roots of
    // x² − s x − s².
    for s in [
        BigRational::from_integer(BigInt::one() << 2000),
        BigRational::new(BigInt::one(), BigInt::one() << 2000),
    ] {
        let width = &s * r("1e-30");
        let twin = Tridiagonal {
            diagonal: vec![s.clone(), s.clone()],
            off_squared: vec![&s * &s],
        };
        let levels = joint_spectrum(&[twin], &width, &Effort::default()).unwrap();
        assert_eq!(levels[0].value, Energy::Exact(BigRational::zero()));
        assert_eq!(levels[1].value, Energy::Exact(&s * int(2)));
        let golden = Tridiagonal {
            diagonal: vec![BigRational::zero(), s.clone()],
            off_squared: vec![&s * &s],
        };
        let levels = joint_spectrum(&[golden], &width, &Effort::default()).unwrap();
        assert_eq!(levels.len(), 2);
        for l in &levels {
            let f = |x: &BigRational| x * x - &s * x - &s * &s;
            assert!(f(l.value.lo()).signum() != f(l.value.hi()).signum());
            assert!(l.value.width() <= width);
        }
        assert!(levels[0].value.hi() < &BigRational::zero());
    }
}
