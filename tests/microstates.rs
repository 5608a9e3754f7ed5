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
    // Frequencies in cm-1 on a 0.5 cm-1 grain: 1.5, 2.5 x2, 3.5, 5.5.
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
    assert!(e.to_string().contains("grain"), "{e}");
    let e = beyer_swinehart(
        &parse_modes("0.2").unwrap(),
        &r("1"),
        &r("10"),
        &Budget::default(),
    )
    .unwrap_err();
    assert!(e.to_string().contains("rounds to 0 grains"), "{e}");
    let e = beyer_swinehart(&m, &r("1"), &r("1e9"), &Budget::bytes(1 << 20)).unwrap_err();
    assert!(e.to_string().contains("memory budget"), "{e}");
    assert!(parse_modes("1000,x2").is_err());
    assert!(parse_modes("1000x0").is_err());
    assert!(parse_modes("-5").is_err());
}

/// `zsum vibsum`: with modes 1000, 1500 (x2), 3000 cm-1 the bin at 3000 holds
/// 5 states (3 quanta of 1000; 2 quanta shared by the 1500 pair in 3 ways;
/// one of 3000), counted by hand.
#[test]
fn vibsum_cli_counts_and_refuses() {
    let run = |args: &[&str]| {
        std::process::Command::new(env!("CARGO_BIN_EXE_zsum"))
            .args(args)
            .output()
            .unwrap()
    };
    let out = run(&[
        "vibsum",
        "--modes",
        "1000,1500x2,3000",
        "--unit",
        "cm-1",
        "--grain",
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
    assert_eq!(last["count"], "5");
    assert_eq!(last["sum"], "12");
    let bad = run(&["vibsum", "--modes", "1000", "--grain", "0", "--up-to", "10"]);
    assert_eq!(bad.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&bad.stderr).contains("grain 0"));
}

/// Stein–Rabinovitch against brute force: modes of 3 and 5 grains and an
/// extra degree of freedom with levels at 0 (1 state), 2 (3) and 7 (2)
/// grains; every combination (n1, n2, level) is enumerated.
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

/// A free internal rotor (E = B m², B = 1 grain, m = 0, ±1, ...) convolved
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
    use zsum::microstates::{whitten_rabinovitch, WrReport};
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
    let rep = WrReport::new(&c, "cm-1", 20).unwrap();
    let mut far = 0;
    for row in &rep.rows {
        let ep: f64 = row.reduced.parse().unwrap();
        let err: f64 = row.sum_error.parse().unwrap();
        if ep >= 0.5 {
            assert!(err.abs() < 0.06, "E' = {ep}: {err}");
            if ep >= 4.0 {
                assert!(err.abs() < 0.015, "E' = {ep}: {err}");
                far += 1;
            }
            let derr: f64 = row.density_error.parse().unwrap();
            assert!(derr.abs() < 0.06, "E' = {ep}: density {derr}");
        }
    }
    assert!(far >= 5);
}
