//! The cold end and the hot end of every built-in model: values of order
//! e^{−x} with x up to 10⁵ certified relative to themselves, the same digits
//! at 30 and 60 digits over nine decades of temperature, and the extremes
//! answered at once or refused with the estimate.

mod common;

use common::{json, refused, run};
use num_rational::BigRational;
use proptest::prelude::*;
use rug::Float;
use zsum::level::{Level, LevelList};
use zsum::spectrum::{Budget, Spectrum, State};
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

/// The per-particle values of every `sum`/`thermo` JSON row.
const VALUE_KEYS: [&str; 6] = [
    "q",
    "ln_q",
    "U_over_kT",
    "Cv_over_k",
    "S_over_k",
    "F_over_kT",
];

/// A decimal string as (negative, significant digits, decimal exponent of
/// the first digit), so `0.00123` and `1.23e-3` compare alike.
fn normal(s: &str) -> (bool, String, i64) {
    let (neg, s) = match s.strip_prefix('-') {
        Some(r) => (true, r),
        None => (false, s),
    };
    let (mant, exp) = match s.split_once('e') {
        Some((m, e)) => (m, e.parse::<i64>().unwrap()),
        None => (s, 0),
    };
    let (int, frac) = mant.split_once('.').unwrap_or((mant, ""));
    let all = format!("{int}{frac}");
    let lead = all.len() - all.trim_start_matches('0').len();
    let digits = all.trim_start_matches('0').to_string();
    let e = exp + int.len() as i64 - 1 - lead as i64;
    (neg, digits, e)
}

/// `x` correctly rounded to `n` significant digits, normalised.
fn rounded(x: &Float, n: usize) -> (bool, String, i64) {
    let (neg, ds, e) = x.to_sign_string_exp(10, Some(n));
    (neg, ds, e.unwrap_or(0) as i64 - 1)
}

/// An exact rational for rug, through its decimal numerator and denominator.
fn rug_of(r: &BigRational) -> rug::Rational {
    let n = rug::Integer::from_str_radix(&r.numer().to_string(), 10).unwrap();
    let d = rug::Integer::from_str_radix(&r.denom().to_string(), 10).unwrap();
    rug::Rational::from((n, d))
}

/// A finite spectrum of given levels (kelvin), summed directly.
struct Listed(LevelList);

impl Spectrum for Listed {
    fn describe(&self) -> String {
        "listed test levels".into()
    }
    fn unit(&self) -> EnergyUnit {
        EnergyUnit::Kelvin
    }
    fn quantum_numbers(&self) -> Vec<String> {
        vec!["i".into()]
    }
    fn ground_energy(&self) -> BigRational {
        self.0.levels()[0].energy.clone()
    }
    fn levels_within(&self, cutoff: &BigRational, _: &Budget) -> zsum::Result<LevelList> {
        Ok(self.0.truncated(cutoff))
    }
    fn states_at(&self, _: &BigRational) -> zsum::Result<Vec<State>> {
        Ok(vec![])
    }
    fn count_bound(&self, e: &BigRational) -> num_bigint::BigUint {
        self.0.count_up_to(e)
    }
    fn highest_energy(&self) -> Option<BigRational> {
        self.0.levels().last().map(|l| l.energy.clone())
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(40))]

    /// Random levels whose first excitation lies 10 to 10⁵ kT above the
    /// ground: zsum's certified ln q, U/kT and Cv/k equal a plain sum
    /// S0 = Σ g e^{−x}, S1 = Σ g x e^{−x}, S2 = Σ g x² e^{−x} done here at a
    /// precision chosen from the gap (ln q ≈ e^{−gap} needs gap/ln 2 bits
    /// before its first digit; three times that plus room), with plain ln,
    /// no ratio formulas, in every printed digit.
    #[test]
    fn ground_dominated_level_lists_match_a_plain_sum(
        gap_exp in 1.0f64..5.0,
        g0 in 1u32..5,
        rest in prop::collection::vec((1u32..2000, 1u32..50), 1..8),
        e0 in -50i64..50,
        digits in prop::sample::select(vec![15u32, 30]),
    ) {
        let gap = 10f64.powf(gap_exp).round();
        let mut levels = vec![Level::new(BigRational::from_integer(e0.into()), g0)];
        let mut e = BigRational::from_integer(e0.into()) + BigRational::from_float(gap).unwrap();
        for (step, g) in &rest {
            levels.push(Level::new(e.clone(), *g));
            e += BigRational::new((*step).into(), 100.into());
        }
        let s = Listed(LevelList::new(EnergyUnit::Kelvin, levels.clone()));
        let p = zsum::report::ThermoPoint::of(&thermo(&s, &Temperature::Kelvin(BigRational::from_integer(1.into())), digits).unwrap());
        prop_assert!(p.certified, "{p:?}");
        let prec = (3.0 * (gap * 1.45 + 4.0 * digits as f64 + 64.0)) as u32 + 256;
        let (mut s0, mut s1, mut s2) = (Float::new(prec), Float::new(prec), Float::new(prec));
        for l in &levels {
            let x = Float::with_val(prec, rug_of(&l.energy));
            let g = Float::with_val(prec, rug::Integer::from_str_radix(&l.degeneracy.to_string(), 10).unwrap());
            let w = Float::with_val(prec, (-x.clone()).exp()) * &g;
            s0 += &w;
            s1 += Float::with_val(prec, &w * &x);
            s2 += Float::with_val(prec, &w * &x) * &x;
        }
        let ln_q = Float::with_val(prec, s0.ln_ref());
        let u = Float::with_val(prec, &s1 / &s0);
        let m2 = Float::with_val(prec, &s2 / &s0);
        let cv = m2 - Float::with_val(prec, &u * &u);
        let n = digits as usize;
        prop_assert_eq!(normal(&p.ln_q), rounded(&ln_q, n), "ln q");
        prop_assert_eq!(normal(&p.u_over_kt), rounded(&u, n), "U/kT");
        prop_assert_eq!(normal(&p.cv_over_k), rounded(&cv, n), "Cv/k");
    }
}

/// Every built-in model over T = 0.01 K to 10⁴ K (or the widest range its
/// constants allow): at 30 digits nothing is marked, and the 30-digit values
/// are the 60-digit values rounded.
#[test]
fn every_model_is_certified_from_the_cold_end_to_the_hot_end() {
    let models: &[&[&str]] = &[
        &["rotor", "--B", "59.322"],
        &["rotor", "--B", "59.322", "--spin", "1/2", "--only", "ortho"],
        &["rotor", "--B", "1.99824", "--D", "5.76e-6"],
        &["oscillator", "--freq", "2358.57"],
        &["oscillator", "--freq", "1000,667x2", "--zero-point"],
        &["oscillator", "--we", "2358.57", "--wexe", "14.324"],
        &[
            "diatomic", "--we", "2358.57", "--wexe", "14.324", "--Be", "1.99824", "--alpha",
            "0.017318", "--spin", "1",
        ],
        &["top", "--spherical", "--B", "5.24"],
        &["zeeman", "--J", "7/2", "--g", "2", "--field", "1T"],
        &["box", "--mass", "4.0026u", "--side", "1nm"],
    ];
    // The prolate top lists about 10⁶ levels at 10⁴ K (minutes of exact
    // rational arithmetic); it is swept to 100 K (T/θ_B = 280).
    let top: &[&str] = &["top", "--A", "5.28", "--B", "0.25"];
    let runs = models
        .iter()
        .map(|m| (*m, "log:0.01:10000:10"))
        .chain([(top, "log:0.01:100:8")]);
    for (m, grid) in runs {
        let get = |digits: &str| {
            let mut args = vec!["thermo"];
            args.extend_from_slice(m);
            args.extend(["--T", grid, "--digits", digits, "--format", "json"]);
            json(&args)
        };
        let (a, b) = (get("30"), get("60"));
        for (ra, rb) in a["rows"]
            .as_array()
            .unwrap()
            .iter()
            .zip(b["rows"].as_array().unwrap())
        {
            assert_eq!(ra["certified"], true, "{m:?} at T = {}", ra["T"]);
            for key in VALUE_KEYS {
                let (sa, sb) = (ra[key].as_str().unwrap(), rb[key].as_str().unwrap());
                assert!(!sa.ends_with('*'), "{m:?} {key} at T = {}: {sa}", ra["T"]);
                let wide = normal(sb);
                let x = Float::with_val(400, Float::parse(sb).unwrap());
                let narrow = normal(sa);
                if wide.1 == "0" || wide.1.is_empty() {
                    assert_eq!(narrow.1.trim_end_matches('0'), wide.1.trim_end_matches('0'));
                    continue;
                }
                assert_eq!(
                    narrow,
                    rounded(&x, 30),
                    "{m:?} {key} at T = {}: {sa} vs {sb}",
                    ra["T"]
                );
            }
        }
    }
}

#[test]
fn oscillator_2358_cm1_at_21_k_is_not_zero() {
    // ln q = −ln(1 − e^{−x}) ≈ e^{−x}, x = hcν̃/kT = 161.6 at 21 K (closed
    // form of the geometric series; value from the issue report).
    let v = json(&[
        "sum",
        "oscillator",
        "--freq",
        "2358.57",
        "--T",
        "21",
        "--digits",
        "15",
        "--format",
        "json",
    ]);
    let row = &v["rows"][0];
    assert_eq!(row["certified"], true);
    assert!(
        row["ln_q"].as_str().unwrap().starts_with("6.622014965119"),
        "{row}"
    );
}

#[test]
fn vibrating_rotor_recipe_prints_exactly_the_digits_asked_for() {
    let v = json(&[
        "thermo",
        "diatomic",
        "--we",
        "2358.57",
        "--wexe",
        "14.324",
        "--Be",
        "1.99824",
        "--alpha",
        "0.017318",
        "--spin",
        "1",
        "--T",
        "log:1:3000:40",
        "--digits",
        "10",
        "--format",
        "json",
    ]);
    for row in v["rows"].as_array().unwrap() {
        assert_eq!(row["certified"], true, "{row}");
        for key in VALUE_KEYS {
            let (_, ds, _) = normal(row[key].as_str().unwrap());
            assert_eq!(ds.len(), 10, "{key} = {} at T = {}", row[key], row["T"]);
        }
    }
}

#[test]
fn rotor_with_b_1e_308_at_300_k_answers_or_refuses_at_once() {
    refused(
        &["sum", "rotor", "--B", "1e-308", "--T", "300"],
        "terms of its ladder",
    );
}

#[test]
fn rotor_at_t_1e308_is_refused_with_the_estimate() {
    refused(
        &["sum", "rotor", "--B", "1", "--T", "1e308"],
        "terms of its ladder",
    );
}

#[test]
fn rotor_at_kt_1e30_is_refused_with_the_estimate() {
    refused(
        &["sum", "rotor", "--B", "1", "--kT", "1e30", "--digits", "15"],
        "1.0e16 terms",
    );
}

#[test]
fn crossover_over_600_decades_is_refused_with_the_scan_length() {
    refused(
        &[
            "crossover",
            "rotor",
            "--B",
            "1",
            "--unit",
            "K",
            "--range",
            "1e-300:1e300",
        ],
        "600 decades",
    );
}

#[test]
fn distorted_rotor_with_d_1e_12_sums_only_what_it_needs() {
    // B/D = 10¹²: the ladder turns over near J = 7·10⁵, far beyond the
    // J ≈ 200 that matter at 300 K; the rigid value differs from the
    // distorted one only by about D⟨x²⟩/kT ≈ 4e-8 relative (first-order
    // perturbation, standard result).
    let d = json(&[
        "sum", "rotor", "--B", "1", "--D", "1e-12", "--T", "300", "--format", "json",
    ]);
    let rigid = json(&["sum", "rotor", "--B", "1", "--T", "300", "--format", "json"]);
    assert_eq!(d["rows"][0]["certified"], true);
    let qd: f64 = d["rows"][0]["q"].as_str().unwrap().parse().unwrap();
    let qr: f64 = rigid["rows"][0]["q"].as_str().unwrap().parse().unwrap();
    assert!(qd > qr && (qd / qr - 1.0) < 1e-6, "{qd} vs {qr}");
}

#[test]
fn rotor_in_joules_at_300_k_is_refused_not_zero() {
    let out = run(&[
        "sum", "rotor", "--B", "1.9", "--unit", "J", "--only", "odd", "--T", "300",
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(out.stdout.is_empty());
    assert!(String::from_utf8_lossy(&out.stderr).contains("kT above the ground level"));
}

#[test]
fn max_bits_below_the_digits_need_is_refused() {
    refused(
        &[
            "sum",
            "rotor",
            "--B",
            "1",
            "--T",
            "300",
            "--digits",
            "30",
            "--max-bits",
            "64",
        ],
        "--max-bits",
    );
}

/// Every built-in species from 20 K (where every gas is far from
/// degenerate at 1 bar: nΛ³ < 0.01) to 10⁴ K: the 30-digit values are the
/// 60-digit values rounded, so the guard digits behind every printed digit
/// hold at both ends.
#[test]
fn every_species_agrees_at_30_and_60_digits_from_20_k_to_1e4_k() {
    let species = [
        "He", "Ne", "Ar", "Kr", "Xe", "H2", "HD", "D2", "N2", "O2", "CO", "NO", "HCl",
    ];
    for sp in species {
        for t in ["20", "300", "10000"] {
            // JSON is a list of rows, one here.
            let get = |d: &str| {
                json(&["thermo", sp, "--T", t, "--digits", d, "--format", "json"])[0].clone()
            };
            let (a, b) = (get("30"), get("60"));
            for key in [
                "S",
                "S_total",
                "Cp",
                "Cv",
                "H_minus_H0",
                "minus_G_minus_H0_over_T",
            ] {
                let (sa, sb) = (a[key].as_str().unwrap(), b[key].as_str().unwrap());
                let x = Float::with_val(400, Float::parse(sb).unwrap());
                assert_eq!(
                    normal(sa),
                    rounded(&x, 30),
                    "{sp} {key} at {t} K: {sa} vs {sb}"
                );
            }
        }
    }
}

/// A value on a rounding boundary (U/kT = E₀/kT = 0.15 exactly, asked to
/// one digit) cannot be settled at any precision: the engine doubles its
/// bits to the effort limit, then marks the point and says why.
#[test]
fn an_unsettled_value_is_marked_with_the_reason_at_the_effort_limit() {
    let one = vec![Level::new(BigRational::new(3.into(), 20.into()), 1u32)];
    let s = Listed(LevelList::new(EnergyUnit::Kelvin, one));
    let t = Temperature::Kelvin(BigRational::from_integer(1.into()));
    let p = zsum::report::ThermoPoint::of(
        &zsum::sum::thermo_limited(&s, &t, 1, zsum::sum::Path::Auto, 512).unwrap(),
    );
    assert!(!p.certified);
    assert_eq!(p.precision_bits, 512);
    assert_eq!(p.max_bits, 512);
    assert_eq!(p.certified_digits, 0);
    let why = p.shortfall().unwrap();
    assert!(
        why.contains("1st") && why.contains("512") && why.contains("max bits"),
        "{why}"
    );
    // The same spectrum at two digits is exact: 0.15.
    let p2 = zsum::report::ThermoPoint::of(
        &zsum::sum::thermo_limited(&s, &t, 2, zsum::sum::Path::Auto, 512).unwrap(),
    );
    assert!(p2.certified);
    assert_eq!(p2.u_over_kt, "0.15");
}
