//! Exact vibrational state counts (the census) and Einstein-solid
//! microstates against binomial coefficients (Pascal's triangle, computed
//! here) and brute force; the Einstein table's temperature against the exact
//! harmonic sum, Stirling's form and the central difference.

use num_bigint::BigUint;
use zsum::exact::parse_rational;
use zsum::microstates::{beyer_swinehart, einstein_solid, parse_modes};
use zsum::spectrum::Budget;

fn r(s: &str) -> num_rational::BigRational {
    parse_rational(s).unwrap()
}

/// Pascal's triangle up to row `n`: C(m, k) by additions only.
fn pascal(n: usize) -> Vec<Vec<BigUint>> {
    let mut rows: Vec<Vec<BigUint>> = vec![vec![BigUint::from(1u32)]];
    for m in 1..=n {
        let prev = &rows[m - 1];
        let mut row = vec![BigUint::from(1u32); m + 1];
        for k in 1..m {
            row[k] = &prev[k - 1] + &prev[k];
        }
        rows.push(row);
    }
    rows
}

/// Omega(N, q) = C(q + N − 1, q) for an Einstein solid (standard result).
#[test]
fn einstein_solid_is_the_binomial_coefficient() {
    let c = pascal(600);
    for n in [1u64, 2, 3, 10, 50, 150, 300] {
        for q in [0u64, 1, 2, 7, 100, 299] {
            assert_eq!(
                einstein_solid(n, q),
                c[(q + n - 1) as usize][q as usize],
                "N {n} q {q}"
            );
        }
    }
}

/// s identical modes: C(n + s − 1, s − 1) states at n grains, through the
/// overflow from 128-bit counters into big integers (s = 60, n to 400).
#[test]
fn identical_modes_give_binomials_past_machine_integers() {
    let c = pascal(460);
    for s in [1u32, 2, 5, 60] {
        let counts = beyer_swinehart(
            &parse_modes(&format!("1x{s}")).unwrap(),
            &r("1"),
            &r("400"),
            &Budget::default(),
        )
        .unwrap();
        for n in [0usize, 1, 17, 399, 400] {
            let want = &c[n + s as usize - 1][s as usize - 1];
            assert_eq!(&counts.counts[n], want, "s {s} n {n}");
        }
    }
    assert!(einstein_solid(60, 400) > BigUint::from(u128::MAX));
}

/// Brute force: every tuple of quanta for a small mode set, binned by its
/// energy on the grid.
#[test]
fn mixed_modes_match_brute_force() {
    let freqs = [3u64, 5, 5, 7, 11];
    let cutoff = 60usize;
    let mut brute = vec![0u64; cutoff + 1];
    fn go(i: usize, e: u64, freqs: &[u64], cutoff: usize, brute: &mut [u64]) {
        if i == freqs.len() {
            brute[e as usize] += 1;
            return;
        }
        let mut e2 = e;
        while e2 as usize <= cutoff {
            go(i + 1, e2, freqs, cutoff, brute);
            e2 += freqs[i];
        }
    }
    go(0, 0, &freqs, cutoff, &mut brute);
    // Frequencies in cm-1 on a 0.5 cm-1 step: 1.5, 2.5 x2, 3.5, 5.5.
    let counts = beyer_swinehart(
        &parse_modes("1.5,2.5x2,3.5,5.5").unwrap(),
        &r("0.5"),
        &r("30"),
        &Budget::default(),
    )
    .unwrap();
    let got: Vec<u64> = counts
        .counts
        .iter()
        .map(|c| c.try_into().unwrap())
        .collect();
    assert_eq!(got, brute);
    assert_eq!(counts.rounded, [(3, 1), (5, 2), (7, 1), (11, 1)]);
    let sums = counts.sums();
    assert_eq!(
        sums.last().unwrap(),
        &BigUint::from(brute.iter().sum::<u64>())
    );
}

#[test]
fn bad_input_is_refused() {
    let m = parse_modes("1000").unwrap();
    let e = beyer_swinehart(&m, &r("0"), &r("10"), &Budget::default()).unwrap_err();
    assert!(e.to_string().contains("energy step 0"), "{e}");
    let e = beyer_swinehart(
        &parse_modes("0.2").unwrap(),
        &r("1"),
        &r("10"),
        &Budget::default(),
    )
    .unwrap_err();
    assert!(e.to_string().contains("rounds to 0 steps"), "{e}");
    let e = beyer_swinehart(&m, &r("1"), &r("1e9"), &Budget::bytes(1 << 20)).unwrap_err();
    assert!(e.to_string().contains("memory budget"), "{e}");
    assert!(parse_modes("1000,x2").is_err());
    assert!(parse_modes("1000x0").is_err());
    assert!(parse_modes("-5").is_err());
}

/// `zsum census`: with modes 1000, 1500 (x2), 3000 cm-1 the step at 3000
/// holds 5 states (3 quanta of 1000; 2 quanta shared by the 1500 pair in 3
/// ways; one of 3000), 12 states lie at or below it, counted by hand; the
/// JSON names the units of its columns.
#[test]
fn census_cli_counts_and_refuses() {
    let run = |args: &[&str]| {
        std::process::Command::new(env!("CARGO_BIN_EXE_zsum"))
            .args(args)
            .output()
            .unwrap()
    };
    let out = run(&[
        "census",
        "--modes",
        "1000,1500x2,3000",
        "--unit",
        "cm-1",
        "--step",
        "1",
        "--up-to",
        "3000",
        "--format",
        "json",
    ]);
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let last = v["rows"].as_array().unwrap().last().unwrap().clone();
    assert_eq!(last["energy"], "3000");
    assert_eq!(last["in_step"], "5");
    assert_eq!(last["density"], "5");
    assert_eq!(last["sum_of_states"], "12");
    // log10 12 = 1.07918 (from memory: log10 2 = 0.30103, log10 3 = 0.47712).
    assert_eq!(last["log10_sum"], "1.0792");
    assert_eq!(v["units"]["energy"], "cm-1");
    assert_eq!(v["units"]["density"], "1/cm-1");
    assert_eq!(v["modes"][1]["frequency"], "1500");
    assert_eq!(v["modes"][1]["degeneracy"], 2);
    // A step of 2 cm-1 halves the density of the same 5 states.
    let out = run(&[
        "census",
        "--modes",
        "1000,1500x2,3000",
        "--step",
        "2",
        "--up-to",
        "3000",
        "--format",
        "json",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(
        v["rows"].as_array().unwrap().last().unwrap()["density"],
        "2.5"
    );
    for (args, needle) in [
        (vec!["--step", "0"], "energy step 0"),
        (vec!["--step", "-1"], "energy step -1"),
        (vec!["--step", "x"], "--step"),
    ] {
        let mut all = vec!["census", "--modes", "1000", "--up-to", "10"];
        all.extend(args);
        let bad = run(&all);
        assert_eq!(bad.status.code(), Some(2));
        assert!(bad.stdout.is_empty());
        assert!(
            String::from_utf8_lossy(&bad.stderr).contains(needle),
            "{}",
            String::from_utf8_lossy(&bad.stderr)
        );
    }
}

/// Stein–Rabinovitch against brute force: modes of 3 and 5 steps and an
/// extra degree of freedom with levels at 0 (1 state), 2 (3) and 7 (2)
/// steps; every combination (n1, n2, level) is enumerated.
#[test]
fn stein_rabinovitch_matches_brute_force() {
    use zsum::level::{Level, LevelList};
    use zsum::microstates::stein_rabinovitch;
    use zsum::units::EnergyUnit;
    let cut = 40usize;
    let c = beyer_swinehart(
        &parse_modes("3,5").unwrap(),
        &r("1"),
        &r("40"),
        &Budget::default(),
    )
    .unwrap();
    let extra = LevelList::new(
        EnergyUnit::Wavenumber,
        vec![
            Level::new(r("0"), 1u32),
            Level::new(r("2"), 3u32),
            Level::new(r("7"), 2u32),
        ],
    );
    let got = stein_rabinovitch(c, &extra, &Budget::default()).unwrap();
    let mut brute = vec![0u64; cut + 1];
    for n1 in 0..=cut / 3 {
        for n2 in 0..=cut / 5 {
            for (e, g) in [(0usize, 1u64), (2, 3), (7, 2)] {
                let t = 3 * n1 + 5 * n2 + e;
                if t <= cut {
                    brute[t] += g;
                }
            }
        }
    }
    let got: Vec<u64> = got.counts.iter().map(|x| x.try_into().unwrap()).collect();
    assert_eq!(got, brute);
}

/// A free internal rotor (E = B m², B = 1 step, m = 0, ±1, ...) convolved
/// with a mode far above the cutoff: the sum of states up to E is the number
/// of integers m with m² ≤ E, 2⌊√E⌋ + 1.
#[test]
fn free_rotor_extra_counts_integer_points() {
    use zsum::level::{Level, LevelList};
    use zsum::microstates::stein_rabinovitch;
    use zsum::units::EnergyUnit;
    let c = beyer_swinehart(
        &parse_modes("100000").unwrap(),
        &r("1"),
        &r("400"),
        &Budget::default(),
    )
    .unwrap();
    let levels: Vec<Level> = (0..=20u32)
        .map(|m| {
            Level::new(
                num_rational::BigRational::from_integer((m * m).into()),
                if m == 0 { 1u32 } else { 2 },
            )
        })
        .collect();
    let c = stein_rabinovitch(
        c,
        &LevelList::new(EnergyUnit::Wavenumber, levels),
        &Budget::default(),
    )
    .unwrap();
    let sums = c.sums();
    assert_eq!(sums.len(), 401);
    for (e, s) in sums.iter().enumerate() {
        let root = (e as f64).sqrt().floor() as u64;
        assert_eq!(s, &BigUint::from(2 * root + 1), "E = {e}");
    }
}

/// Whitten–Rabinovitch: the density is the derivative of the sum (checked
/// by central differences on both branches of ω), and against the exact
/// count for a 15-mode demo set its error stays within a few per cent for
/// E/E_z ≥ 0.5 and near one per cent by E/E_z ≈ 4 (the approximation's
/// known behaviour, from memory).
#[test]
fn whitten_rabinovitch_is_consistent_and_close_above_half_the_zero_point() {
    use zsum::microstates::whitten_rabinovitch;
    use zsum::report::CensusErrorMap;
    let freqs: Vec<f64> = [
        3400.0, 3000.0, 3000.0, 1600.0, 1500.0, 1500.0, 1100.0, 1000.0, 1000.0, 900.0, 800.0,
        800.0, 400.0, 400.0, 400.0,
    ]
    .to_vec();
    let ez = 0.5 * freqs.iter().sum::<f64>();
    for ep in [0.3, 0.8, 2.0, 6.0] {
        let e = ep * ez;
        let h = 1e-3 * e;
        let (w1, _, _) = whitten_rabinovitch(&freqs, e - h);
        let (w2, _, _) = whitten_rabinovitch(&freqs, e + h);
        let (_, lr, _) = whitten_rabinovitch(&freqs, e);
        let deriv = (w2.exp() - w1.exp()) / (2.0 * h);
        assert!((deriv / lr.exp() - 1.0).abs() < 1e-4, "E' = {ep}");
    }
    let c = beyer_swinehart(
        &parse_modes("3400,3000x2,1600,1500x2,1100,1000x2,900,800x2,400x3").unwrap(),
        &r("1"),
        &r("60000"),
        &Budget::default(),
    )
    .unwrap();
    let map = zsum::microstates::census_error_map(&c, 20).unwrap();
    let rep = CensusErrorMap::new(&map, "cm-1", 6).unwrap();
    let mut far = 0;
    for row in &rep.rows {
        let ep: f64 = row.e_over_ez.parse().unwrap();
        assert_eq!(row.extrapolated, !(0.1..=8.0).contains(&ep));
        let err: f64 = row.sum_rel_error.parse().unwrap();
        if ep >= 0.5 {
            assert!(err.abs() < 0.06, "E' = {ep}: {err}");
            if ep >= 4.0 {
                assert!(err.abs() < 0.015, "E' = {ep}: {err}");
                far += 1;
            }
            let derr: f64 = row.density_rel_error.parse().unwrap();
            assert!(derr.abs() < 0.06, "E' = {ep}: density {derr}");
        }
    }
    assert!(far >= 5);
}

/// The census's log10 N(E) column: exact at powers of ten (one mode of one
/// step has N(E) = E + 1 states up to E), and for C(2040, 40) states (forty
/// modes of one step up to 2000: C(E + 40, 40), standard result) equal to
/// Σ log10((2000 + i)/i), i = 1..40, summed here in f64 (error about 1e-13,
/// far below the fourth decimal; the check asserts the value is not within
/// 1e-9 of a rounding boundary).
#[test]
fn census_log10_column_is_correctly_rounded() {
    use zsum::report::CensusReport;
    let rows = |modes: &str, up_to: &str| {
        let c = beyer_swinehart(
            &parse_modes(modes).unwrap(),
            &r("1"),
            &r(up_to),
            &Budget::default(),
        )
        .unwrap();
        CensusReport::new(&c, "cm-1", &[]).rows
    };
    let one = rows("1", "999");
    assert_eq!(one[0].log10_sum, "0.0000");
    assert_eq!(one[1].log10_sum, "0.3010"); // log10 2 = 0.30103 (from memory)
    assert_eq!(one[9].log10_sum, "1.0000");
    assert_eq!(one[99].log10_sum, "2.0000");
    assert_eq!(one[999].log10_sum, "3.0000");
    let forty = rows("1x40", "2000");
    let want: f64 = (1..=40)
        .map(|i| ((2000 + i) as f64 / i as f64).log10())
        .sum();
    let scaled = want * 1e4;
    assert!((scaled.fract() - 0.5).abs() > 1e-9);
    assert_eq!(
        forty.last().unwrap().log10_sum,
        format!("{:.4}", (scaled.round()) / 1e4)
    );
}

/// Σ_{k=q+1}^{q+N−1} 1/k, exactly: ψ(q + N) − ψ(q + 1) for whole q, since
/// ψ(n + 1) = H_n − γ (standard result). Independent of the digamma
/// function the report uses.
fn harmonic_difference(n: u64, q: u64) -> num_rational::BigRational {
    (q + 1..q + n).fold(num_rational::BigRational::from_integer(0.into()), |a, k| {
        a + num_rational::BigRational::new(1.into(), k.into())
    })
}

/// The Einstein table: Ω against Pascal's triangle, S/k = ln Ω against
/// Σ ln((q + i)/i) in f64 (relative error about 1e-15, far below the 10th
/// digit), and βħω = ψ(q + N) − ψ(q + 1) and kT/ħω digit for digit against
/// the exact harmonic sum above, correctly rounded by `format_sig`.
#[test]
fn einstein_temperature_is_the_exact_harmonic_difference() {
    use zsum::exact::format_sig;
    use zsum::report::EinsteinReport;
    let c = pascal(620);
    for n in [2u64, 3, 7, 50, 300] {
        for digits in [10u32, 25] {
            let rep = EinsteinReport::build(n, &r("300"), digits, &Budget::default()).unwrap();
            assert_eq!(rep.rows.len(), 301);
            for q in [0u64, 1, 2, 17, 150, 299, 300] {
                let row = &rep.rows[q as usize];
                assert_eq!(row.quanta, q);
                assert_eq!(row.omega, c[(q + n - 1) as usize][q as usize].to_string());
                let h = harmonic_difference(n, q);
                assert_eq!(row.beta_hw, format_sig(&h, digits), "N = {n}, q = {q}");
                assert_eq!(row.kt_over_hw, format_sig(&h.recip(), digits));
                let ln_omega: f64 = (1..n).map(|i| ((q + i) as f64 / i as f64).ln()).sum();
                let s: f64 = row.s_over_k.parse().unwrap();
                assert!(
                    (s - ln_omega).abs() <= 1e-9 * ln_omega.max(1.0),
                    "N = {n}, q = {q}: {s} against {ln_omega}"
                );
            }
        }
    }
}

/// Values exactly halfway between two roundings (βħω = 1/4 and 1/8 for two
/// oscillators at q = 3 and 7, to one digit) are settled from the exact sum,
/// half to even; one oscillator has a flat ln Ω and an infinite temperature.
#[test]
fn einstein_table_settles_halfway_values_and_one_oscillator() {
    use zsum::report::EinsteinReport;
    let rep = EinsteinReport::build(2, &r("7"), 1, &Budget::default()).unwrap();
    assert_eq!(rep.rows[3].beta_hw, "0.2");
    assert_eq!(rep.rows[3].kt_over_hw, "4");
    assert_eq!(rep.rows[7].beta_hw, "0.1");
    assert_eq!(rep.rows[7].kt_over_hw, "8");
    let one = EinsteinReport::build(1, &r("5"), 10, &Budget::default()).unwrap();
    assert!(one
        .rows
        .iter()
        .all(|r| r.omega == "1" && r.beta_hw == "0" && r.kt_over_hw == "inf"));
    for bad in ["-1", "1e30"] {
        assert!(EinsteinReport::build(3, &r(bad), 10, &Budget::default()).is_err());
    }
    assert!(EinsteinReport::build(3, &r("5"), 0, &Budget::default()).is_err());
    assert!(EinsteinReport::build(0, &r("5"), 10, &Budget::default()).is_err());
}

/// For many oscillators and quanta the exact derivative approaches
/// Stirling's ln((q + N)/q): ψ(z) = ln(z − ½) + O(z⁻²) (standard asymptotic
/// series, from memory) puts it at ln((q + N − ½)/(q + ½)), within 1/q of
/// Stirling's. The central difference ½[ln Ω(q + 1) − ln Ω(q − 1)] of the
/// exact count exceeds it by f‴/6 + f⁽⁵⁾/120 + ..., f = ln Γ(q + N) −
/// ln Γ(q + 1), every term positive; to leading order
/// f‴/6 ≈ (1/(q + 1)² − 1/(q + N)²)/6 (from −ψ″(z) = 1/z² + 1/z³ + ...),
/// the neglected terms smaller by O(1/q) (about 1% at q = 100), so the gap
/// agrees with that O(1/q²) estimate to within 2%.
#[test]
fn einstein_temperature_approaches_stirling_and_the_central_difference() {
    use zsum::report::EinsteinReport;
    let n = 1000u64;
    let rep = EinsteinReport::build(n, &r("1001"), 15, &Budget::default()).unwrap();
    let nf = n as f64;
    for q in [100u64, 500, 1000] {
        let x: f64 = rep.rows[q as usize].beta_hw.parse().unwrap();
        let qf = q as f64;
        assert!(((qf + nf) / qf).ln() - x > 0.0);
        assert!(((qf + nf) / qf).ln() - x < 1.0 / qf, "q = {q}");
        let central = 0.5 * ((qf + nf) * (qf + nf - 1.0) / (qf * (qf + 1.0))).ln();
        let leading = (1.0 / (qf + 1.0).powi(2) - 1.0 / (qf + nf).powi(2)) / 6.0;
        let gap = central - x;
        assert!(gap > 0.0, "q = {q}");
        assert!(
            (gap / leading - 1.0).abs() < 0.02,
            "q = {q}: {gap} against {leading}"
        );
    }
}

/// The canonical ensemble at the continuum temperature βħω = ln(1 + N/q)
/// (the derivative of Stirling's ln Ω) holds exactly q quanta, N/(e^x − 1)
/// = q, and its entropy is Stirling's ln Ω, N[(1 + n) ln(1 + n) − n ln n]
/// with n = q/N (standard results). x is ln(1 + N/q) rounded at 300 bits,
/// which moves U by about U·2⁻³⁰⁰, so all 10 certified digits of U read q;
/// S is compared with the f64 closed form to 1e-9 relative (the 10th digit;
/// f64 errs by about 1e-15). At the exact temperature ψ(q + N) − ψ(q + 1)
/// the canonical U is instead N(q + ½)/(N − 1) to within the O(z⁻²) term of
/// ψ's series: x moves by about 1/(24(q + ½)²), and U relatively by that
/// times e^x/(e^x − 1) ≤ (q + N + 1)/(N − 1); the tolerance is half as much
/// again, for the higher terms of the series.
#[test]
fn einstein_canonical_holds_q_quanta_at_the_continuum_temperature() {
    use rug::Float;
    use zsum::microstates::einstein_canonical;
    use zsum::report::EinsteinReport;
    for (n, q) in [(300u64, 1000u64), (1000, 200), (2, 5)] {
        let (nf, qf) = (n as f64, q as f64);
        let x = Float::with_val(300, Float::with_val(300, n) / q).ln_1p();
        let c = einstein_canonical(n, &x, 10).unwrap();
        assert_eq!(
            c.u_over_hw.decimal(10).unwrap(),
            zsum::exact::format_sig(&r(&q.to_string()), 10),
            "N = {n}, q = {q}"
        );
        let occ = qf / nf;
        let stirling = nf * ((1.0 + occ) * (1.0 + occ).ln() - occ * occ.ln());
        let s = c.s_over_k.to_f64();
        assert!((s / stirling - 1.0).abs() < 1e-9, "{s} against {stirling}");
    }
    let n = 1000u64;
    let rep = EinsteinReport::build(n, &r("1000"), 12, &Budget::default()).unwrap();
    let nf = n as f64;
    for q in [200u64, 1000] {
        let qf = q as f64;
        let u: f64 = rep.rows[q as usize].canonical_u_over_hw.parse().unwrap();
        let want = nf * (qf + 0.5) / (nf - 1.0);
        let tol = 1.5 / (24.0 * (qf + 0.5).powi(2)) * (qf + nf + 1.0) / (nf - 1.0);
        assert!((u / want - 1.0).abs() < tol, "q = {q}: {u} against {want}");
    }
    assert!(einstein_canonical(3, &Float::with_val(64, 0), 10).is_err());
    // e^x beyond MPFR's exponent range: refused, not a panic or a hang.
    assert!(einstein_canonical(3, &Float::with_val(64, 1e30), 10).is_err());
    assert!(einstein_canonical(0, &Float::with_val(64, 1), 10).is_err());
}

/// The numbers behind the Einstein table, as a library user gets them: Ω
/// in big integers against Pascal's triangle, summed over q against the
/// hockey-stick identity Σ_{q≤Q} C(q + N − 1, q) = C(Q + N, Q) (standard
/// result); every βħω ball holds the exact harmonic sum x = Σ 1/k,
/// k = q + 1..q + N − 1, and kT/ħω is its reciprocal; the canonical quanta
/// U/ħω = N/(e^x − 1) are at most N/x ≤ N(q + N − 1)/(N − 1), since
/// e^x − 1 ≥ x and each of the N − 1 terms is at least 1/(q + N − 1).
#[test]
fn einstein_numbers_are_exact_counts_and_certified_balls() {
    use zsum::microstates::einstein_table;
    let c = pascal(100);
    for n in [2u64, 5, 30] {
        let t = einstein_table(n, &r("40"), 12, &Budget::default()).unwrap();
        assert_eq!((t.oscillators, t.quanta_up_to, t.digits), (n, 40, 12));
        let mut total = BigUint::from(0u32);
        for row in &t.rows {
            let q = row.quanta;
            assert_eq!(
                row.omega,
                c[(q + n - 1) as usize][q as usize],
                "N {n} q {q}"
            );
            total += &row.omega;
            let h = harmonic_difference(n, q);
            let exact = rug::Rational::from_str_radix(&h.to_string(), 10).unwrap();
            let (lo, hi) = row.beta_hw.interval();
            assert!(
                lo <= exact && exact <= hi,
                "N {n} q {q}: βħω ball misses {h}"
            );
            let kt = row.kt_over_hw.as_ref().unwrap().to_f64();
            assert!((kt * row.beta_hw.to_f64() - 1.0).abs() < 1e-14);
            let u = row.canonical.as_ref().unwrap().u_over_hw.to_f64();
            let bound = (n * (q + n - 1)) as f64 / (n - 1) as f64;
            assert!(u > 0.0 && u <= bound, "N {n} q {q}: U/ħω = {u}");
            let ln_omega: f64 = (1..n).map(|i| ((q + i) as f64 / i as f64).ln()).sum();
            assert!((row.s_over_k.to_f64() - ln_omega).abs() <= 1e-12 * ln_omega.max(1.0));
        }
        assert_eq!(total, c[(40 + n) as usize][40], "N {n}");
    }
    // One oscillator: Ω = 1 at every q and an infinite temperature.
    let one = einstein_table(1, &r("3"), 10, &Budget::default()).unwrap();
    assert!(one.rows.iter().all(|r| r.omega == BigUint::from(1u32)
        && r.kt_over_hw.is_none()
        && r.canonical.is_none()
        && r.beta_hw.to_f64() == 0.0));
}

/// The census as one library call, used for its numbers: one mode of w
/// steps has exactly one state at every multiple of w (its generating
/// function 1/(1 − x^w)), so N(E) = ⌊E/w⌋ + 1 and ρ = 1/step there; with a
/// second, identical mode the count at k·w is k + 1 (C(k + 1, 1)). The
/// certified log₁₀ N(E) holds log₁₀ of the exact count.
#[test]
fn census_numbers_for_one_and_two_modes() {
    use zsum::microstates::census;
    use zsum::units::EnergyUnit;
    let wn = EnergyUnit::Wavenumber;
    let c = census(
        &parse_modes("700").unwrap(),
        &r("50"),
        &r("10000"),
        &wn,
        &[],
        &Budget::default(),
    )
    .unwrap();
    assert_eq!(c.rounded, [(14, 1)]);
    let rows: Vec<_> = c.rows().collect();
    assert_eq!(rows.len(), 10000 / 700 + 1);
    for (i, e) in rows.iter().enumerate() {
        assert_eq!(e.steps, 14 * i as u64);
        assert_eq!(e.energy, r(&(700 * i).to_string()));
        assert_eq!(e.in_step, BigUint::from(1u32));
        assert_eq!(e.sum_of_states, BigUint::from(i as u64 + 1));
        assert_eq!(e.density, r("1/50"));
        let want = ((i + 1) as f64).log10();
        assert!((e.log10_sum.to_f64() - want).abs() < 1e-12, "{i}");
    }
    let two = census(
        &parse_modes("700x2").unwrap(),
        &r("50"),
        &r("10000"),
        &wn,
        &[],
        &Budget::default(),
    )
    .unwrap();
    for e in two.rows() {
        let k = e.steps / 14;
        assert_eq!(e.in_step, BigUint::from(k + 1));
        // Σ_{j≤k} (j + 1) = (k + 1)(k + 2)/2.
        assert_eq!(e.sum_of_states, BigUint::from((k + 1) * (k + 2) / 2));
    }
}

/// Convolving a spectrum through `census` gives the same counts as the
/// Stein–Rabinovitch step by hand, and the report names what was
/// convolved in.
#[test]
fn census_convolves_each_extra_spectrum() {
    use zsum::microstates::{census, stein_rabinovitch_spectrum};
    use zsum::models::rotor::LinearRotor;
    use zsum::spectrum::Spectrum;
    use zsum::units::EnergyUnit;
    let wn = EnergyUnit::Wavenumber;
    let rotor = LinearRotor::rigid(r("1"), wn.clone()).unwrap();
    let modes = parse_modes("5,9x2").unwrap();
    let extras: [&dyn Spectrum; 2] = [&rotor, &rotor];
    let c = census(&modes, &r("1"), &r("60"), &wn, &extras, &Budget::default()).unwrap();
    let mut by_hand = beyer_swinehart(&modes, &r("1"), &r("60"), &Budget::default()).unwrap();
    for _ in 0..2 {
        by_hand = stein_rabinovitch_spectrum(by_hand, &rotor, &wn, &Budget::default()).unwrap();
    }
    assert_eq!(c, by_hand);
    // The two rotors alone (modes far above): the states of two rotors up
    // to E, each level J with 2J + 1 states at J(J + 1).
    let far = census(
        &parse_modes("1000").unwrap(),
        &r("1"),
        &r("30"),
        &wn,
        &extras,
        &Budget::default(),
    )
    .unwrap();
    let mut want = 0u64;
    for j1 in 0u64..6 {
        for j2 in 0u64..6 {
            if j1 * (j1 + 1) + j2 * (j2 + 1) <= 30 {
                want += (2 * j1 + 1) * (2 * j2 + 1);
            }
        }
    }
    assert_eq!(far.sums()[30], BigUint::from(want));
    let rep = zsum::report::CensusReport::new(&far, "cm-1", &extras);
    assert_eq!(rep.convolved.len(), 2);
    assert_eq!(rep.convolved[0], rotor.describe());
}

/// The error map's numbers: exact sums C(k + 3, 3) for three modes of one
/// quantum, exact E/E_z, and the approximation's relative error consistent
/// with its own logarithm.
#[test]
fn error_map_numbers() {
    use zsum::microstates::census_error_map;
    let c = beyer_swinehart(
        &parse_modes("1000x3").unwrap(),
        &r("1"),
        &r("12500"),
        &Budget::default(),
    )
    .unwrap();
    let map = census_error_map(&c, 4).unwrap();
    assert_eq!(
        (map.zero_point.clone(), map.window.clone()),
        (r("1500"), r("1000"))
    );
    let binom = pascal(20);
    for p in &map.points {
        let k = (p.steps / 1000) as usize;
        assert_eq!(p.sum_exact, binom[k + 3][3]);
        assert_eq!(p.e_over_ez, &p.energy / r("1500"));
        let exact: f64 = p.sum_exact.to_string().parse().unwrap();
        let rel = p.ln_sum_approx.exp() / exact - 1.0;
        assert!((rel - p.sum_rel_error.unwrap()).abs() < 1e-12);
    }
    assert!(census_error_map(&c, 0).is_err());
}
