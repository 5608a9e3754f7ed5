//! Exact vibrational state counts and Einstein-solid microstates against
//! binomial coefficients (Pascal's triangle, computed here) and brute force.

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
    use zsum::microstates::{whitten_rabinovitch, CensusErrorMap};
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
    let rep = CensusErrorMap::new(&c, "cm-1", 20, 6).unwrap();
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
    use zsum::microstates::CensusReport;
    let rows = |modes: &str, up_to: &str| {
        let c = beyer_swinehart(
            &parse_modes(modes).unwrap(),
            &r("1"),
            &r(up_to),
            &Budget::default(),
        )
        .unwrap();
        CensusReport::new(&c, "cm-1", &Budget::default())
            .unwrap()
            .rows
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
