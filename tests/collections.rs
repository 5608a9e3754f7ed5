//! Microstate counts of N particles (labelled, bosons, fermions) and the
//! canonical N-particle partition functions, against brute force and
//! closed forms.

use num_bigint::BigUint;
use num_rational::BigRational;
use proptest::prelude::*;
use zsum::exact::parse_rational;
use zsum::level::{Level, LevelList};
use zsum::microstates::{
    count_on_grid, einstein_solid, ensemble_point, microstates, Grid, Statistics,
};
use zsum::models::level_file::LevelFile;
use zsum::models::oscillator::HarmonicModes;
use zsum::models::ParticleInBox;
use zsum::spectrum::Budget;
use zsum::sum::Temperature;
use zsum::units::EnergyUnit;
use zsum::ErrorKind;

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn unit_osc() -> HarmonicModes {
    HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin).unwrap()
}

/// C(n, k) by Pascal's rule, independent of the code under test.
fn pascal(n: usize, k: usize) -> BigUint {
    let mut row = vec![BigUint::from(1u32)];
    for _ in 0..n {
        let mut next = vec![BigUint::from(1u32); row.len() + 1];
        for i in 1..row.len() {
            next[i] = &row[i - 1] + &row[i];
        }
        row = next;
    }
    row.get(k).cloned().unwrap_or_default()
}

#[test]
fn einstein_solid_counts_are_binomials() {
    // Ω(N, q) = C(q + N − 1, q) (standard result), up to a few hundred.
    for &n in &[1u64, 2, 7, 50, 300] {
        let o = microstates(
            &unit_osc(),
            n,
            Statistics::Distinct,
            &r("300"),
            None,
            &Budget::default(),
        )
        .unwrap();
        assert_eq!(o.counts.len(), 301);
        for q in [0usize, 1, 2, 17, 150, 299, 300] {
            let want = pascal(q + n as usize - 1, q);
            assert_eq!(o.counts[q], want, "N = {n}, q = {q}");
            assert_eq!(einstein_solid(n, q as u64), want);
        }
    }
    // The named model's closed-form path gives the same counts.
    let closed =
        zsum::microstates::einstein_omega(300, 300, EnergyUnit::Kelvin, &Budget::default())
            .unwrap();
    let dp = microstates(
        &unit_osc(),
        300,
        Statistics::Distinct,
        &r("300"),
        None,
        &Budget::default(),
    )
    .unwrap();
    assert_eq!(closed.counts, dp.counts);
    // Well past 128 bits: C(599, 300) has about 595 bits.
    assert!(einstein_solid(300, 300).bits() > 590);
}

/// Orbital energies (one orbital each; equal energies are a degenerate level).
const ORBITALS: [u64; 12] = [0, 1, 1, 2, 3, 3, 3, 5, 6, 8, 9, 11];

fn grid() -> Grid {
    let mut levels: Vec<(u64, BigUint)> = Vec::new();
    for &e in &ORBITALS {
        match levels.last_mut() {
            Some((le, g)) if *le == e => *g += 1u32,
            _ => levels.push((e, 1u32.into())),
        }
    }
    Grid {
        unit: EnergyUnit::Kelvin,
        ground: BigRational::from_integer(0.into()),
        step: BigRational::from_integer(1.into()),
        levels,
    }
}

/// Every occupation pattern of `n` particles in the 12 orbitals, tallied by
/// total energy: all n-tuples (labelled), multisets (bosons), subsets
/// (fermions).
fn brute(n: usize, stats: Statistics, bins: usize) -> Vec<u64> {
    let mut out = vec![0u64; bins];
    let m = ORBITALS.len();
    let mut idx = vec![0usize; n];
    loop {
        let ok = match stats {
            Statistics::Distinct => true,
            Statistics::Bose => idx.windows(2).all(|w| w[0] <= w[1]),
            Statistics::Fermi => idx.windows(2).all(|w| w[0] < w[1]),
        };
        if ok {
            let e: u64 = idx.iter().map(|&i| ORBITALS[i]).sum();
            if (e as usize) < bins {
                out[e as usize] += 1;
            }
        }
        // Next n-tuple in base m.
        let mut i = 0;
        while i < n {
            idx[i] += 1;
            if idx[i] < m {
                break;
            }
            idx[i] = 0;
            i += 1;
        }
        if i == n {
            return out;
        }
    }
}

#[test]
fn dynamic_programming_matches_brute_force() {
    let g = grid();
    for n in 1..=6usize {
        for stats in [Statistics::Distinct, Statistics::Bose, Statistics::Fermi] {
            let bins = 40;
            let got = count_on_grid(&g, n as u64, stats, bins, &Budget::default()).unwrap();
            let want = brute(n, stats, bins);
            let want: Vec<BigUint> = want.into_iter().map(BigUint::from).collect();
            assert_eq!(got, want, "N = {n}, {stats:?}");
        }
    }
}

#[test]
fn fermions_fill_the_lowest_orbitals() {
    // 3D cube, levels 3 (1 state), 6 (3), 9 (3), 11 (3), 12 (1), 14 (6):
    // 5 fermions fill 3 and 6 and put one in the three states at 9, so the
    // ground energy is 3 + 18 + 9 = 30 with C(3, 1) = 3 states; 8 fermions
    // fill 3, 6, 9 (1 + 3 + 3) and take one of three at 11: 3 + 18 + 27 + 11
    // = 59, again 3 ways; 9 fermions take two of three at 11: 70, C(3, 2) = 3.
    let cube = ParticleInBox::cube(3).unwrap();
    for (n, ground, ways) in [
        (5u64, 30u64, 3u32),
        (7, 48, 1),
        (8, 59, 3),
        (9, 70, 3),
        (10, 81, 1),
    ] {
        let o = microstates(
            &cube,
            n,
            Statistics::Fermi,
            &r("200"),
            None,
            &Budget::default(),
        )
        .unwrap();
        let first = o.counts.iter().position(|c| c.bits() > 0).unwrap();
        assert_eq!(
            o.energy(first),
            BigRational::from_integer(ground.into()),
            "N = {n}"
        );
        assert_eq!(o.counts[first], BigUint::from(ways), "N = {n}");
        assert_eq!(first as u64, o.lowest);
    }
}

/// The error that counting `n` particles up to `cut` must give.
fn refusal(s: &dyn zsum::spectrum::Spectrum, n: u64, stats: Statistics, cut: &str) -> zsum::Error {
    microstates(s, n, stats, &r(cut), None, &Budget::default()).unwrap_err()
}

#[test]
fn grids_name_the_offending_level() {
    let list = LevelFile::parse("0 K 1\n1.5 K 2\n2.25 K 1\n", "demo").unwrap();
    let levels = zsum::spectrum::Spectrum::levels_up_to(&list, &r("10")).unwrap();
    let g = Grid::new(&levels, None).unwrap();
    assert_eq!(g.step, r("0.75"));
    let e = Grid::new(&levels, Some(&r("0.5"))).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(e.message().contains("2.25 K"), "{}", e.message());
    let e = refusal(&list, 0, Statistics::Bose, "3");
    assert!(
        e.message().contains("between 1 and 1000"),
        "{}",
        e.message()
    );
    let e = refusal(&list, 1001, Statistics::Bose, "3");
    assert!(e.message().contains("1001"), "{}", e.message());
    // Five fermions, four orbitals.
    let e = refusal(&list, 5, Statistics::Fermi, "10");
    assert!(
        e.message().contains("5 fermions") && e.message().contains("only 4"),
        "{}",
        e.message()
    );
    // Four fit, but their lowest filling (0 + 3 + 2.25 = 5.25 K) lies above a cutoff of 5 K.
    let e = refusal(&list, 4, Statistics::Fermi, "5");
    assert!(e.message().contains("5.25 K"), "{}", e.message());
    // A fine grid over a wide range is refused before any work.
    let fine = LevelFile::parse("0 K 1\n1 K 1\n1.000001 K 1\n", "demo").unwrap();
    let e = microstates(
        &fine,
        10,
        Statistics::Bose,
        &r("100000"),
        None,
        &Budget::bytes(32 << 20),
    )
    .unwrap_err();
    assert_eq!(e.kind(), ErrorKind::Budget);
    assert!(e.message().contains("1.000001 K"), "{}", e.message());
    // 1000 labelled oscillators over 100 000 quanta by the general recurrence
    // would take far too long: refused by estimate, before any work.
    let e = microstates(
        &unit_osc(),
        1000,
        Statistics::Distinct,
        &r("100000"),
        None,
        &Budget::default(),
    )
    .unwrap_err();
    assert_eq!(e.kind(), ErrorKind::Budget);
    assert!(e.message().contains("would take about"), "{}", e.message());
}

/// ln Q_N by brute force over the occupation patterns of the 12 orbitals at
/// kT = `t` (all states: the orbitals are the whole spectrum).
fn brute_ln_q(n: usize, stats: Statistics, t: f64) -> f64 {
    let counts = brute(n, stats, 11 * n + 1);
    counts
        .iter()
        .enumerate()
        .map(|(e, c)| *c as f64 * (-(e as f64) / t).exp())
        .sum::<f64>()
        .ln()
}

#[test]
fn recursion_matches_brute_force() {
    let text: String = ORBITALS.iter().map(|e| format!("{e} K 1\n")).collect();
    let list = LevelFile::parse(&text, "orbitals").unwrap();
    for n in 1..=5usize {
        for stats in [Statistics::Bose, Statistics::Fermi, Statistics::Distinct] {
            for t in ["0.7", "3", "40"] {
                let p =
                    ensemble_point(&list, n as u64, stats, &Temperature::Kelvin(r(t)), 12).unwrap();
                assert!(p.certified);
                let want = brute_ln_q(n, stats, t.parse().unwrap());
                let got = p.ln_q.to_f64();
                assert!(
                    (got - want).abs() < 1e-9 * want.abs().max(1.0),
                    "N = {n} {stats:?} T = {t}: {got} vs {want}"
                );
            }
        }
    }
}

#[test]
fn fermions_beyond_a_finite_spectrum_are_refused() {
    // The 12 orbitals hold at most 12 fermions: Q_13 = 0, refused by name.
    let text: String = ORBITALS.iter().map(|e| format!("{e} K 1\n")).collect();
    let list = LevelFile::parse(&text, "orbitals").unwrap();
    let p = ensemble_point(
        &list,
        12,
        Statistics::Fermi,
        &Temperature::Kelvin(r("3")),
        10,
    )
    .unwrap();
    // All 12 filled: one state, Q = e^{-ΣE/kT}, ΣE = 52 K.
    let want = -52.0 / 3.0;
    assert!((p.ln_q.to_f64() - want).abs() < 1e-8, "{:?}", p.ln_q);
    let e = ensemble_point(
        &list,
        13,
        Statistics::Fermi,
        &Temperature::Kelvin(r("3")),
        10,
    )
    .unwrap_err();
    assert!(
        e.message()
            .contains("13 fermions cannot share the 12 orbitals"),
        "{}",
        e.message()
    );
}

#[test]
fn harmonic_trap_closed_forms() {
    // Bosons in a 1D harmonic trap (levels n ħω): Q_N = Π_{j=1}^{N} 1/(1 − x^j),
    // fermions: x^{N(N−1)/2} times the same, x = e^{−ħω/kT} (standard
    // results, from memory).
    let trap = unit_osc();
    for t in ["0.5", "2", "13"] {
        let x = (-1.0 / t.parse::<f64>().unwrap()).exp();
        for n in 1..=8u64 {
            let ln_prod: f64 = (1..=n).map(|j| -(1.0 - x.powi(j as i32)).ln()).sum();
            let pb =
                ensemble_point(&trap, n, Statistics::Bose, &Temperature::Kelvin(r(t)), 14).unwrap();
            let pf = ensemble_point(&trap, n, Statistics::Fermi, &Temperature::Kelvin(r(t)), 14)
                .unwrap();
            let lb = pb.ln_q.to_f64();
            let lf = pf.ln_q.to_f64();
            let want_f = ln_prod + (n * (n - 1) / 2) as f64 * x.ln();
            assert!(
                (lb - ln_prod).abs() < 1e-12 * ln_prod.abs().max(1.0),
                "bose N={n} T={t}"
            );
            assert!(
                (lf - want_f).abs() < 1e-12 * want_f.abs().max(1.0),
                "fermi N={n} T={t}"
            );
            assert!(pb.certified && pf.certified);
        }
    }
}

#[test]
fn high_temperature_approaches_boltzmann_counting() {
    // In a 3D box at kT ≫ level spacing with q ≫ N, Q_N → q^N/N!: the
    // relative error falls as the temperature rises.
    let cube = ParticleInBox::cube(3).unwrap();
    for stats in [Statistics::Bose, Statistics::Fermi] {
        let mut last = f64::INFINITY;
        for kt in ["100", "1000", "10000"] {
            let p =
                ensemble_point(&cube, 6, stats, &Temperature::ThermalEnergy(r(kt)), 10).unwrap();
            let e = p.boltzmann_error_q.to_f64();
            assert!(e.abs() < last, "{stats:?} kT = {kt}: {e}");
            last = e.abs();
        }
        assert!(last < 1e-3, "{stats:?}: {last}");
    }
}

/// A unit grid with one ground orbital and the given excited levels
/// (duplicate excitations dropped).
fn random_grid(mut levels: Vec<(u64, u32)>) -> Grid {
    levels.sort();
    levels.dedup_by_key(|x| x.0);
    let mut lv = vec![(0u64, BigUint::from(1u32))];
    lv.extend(levels.into_iter().map(|(e, g)| (e, BigUint::from(g))));
    Grid {
        unit: EnergyUnit::Kelvin,
        ground: BigRational::from_integer(0.into()),
        step: BigRational::from_integer(1.into()),
        levels: lv,
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    #[test]
    fn boson_totals_grow_with_n(levels in prop::collection::vec((1u64..12, 1u32..4), 1..6), cut in 0usize..30, n in 1u64..6) {
        let g = random_grid(levels);
        let total = |n: u64| -> BigUint {
            count_on_grid(&g, n, Statistics::Bose, cut + 1, &Budget::default()).unwrap().into_iter().sum()
        };
        prop_assert!(total(n) <= total(n + 1));
    }

    #[test]
    fn fermions_beyond_the_orbitals_vanish(levels in prop::collection::vec((1u64..12, 1u32..4), 0..5), cut in 0u64..15, extra in 1u64..4) {
        let g = random_grid(levels);
        let below: u64 = g.orbitals_up_to(cut).try_into().unwrap();
        let c = count_on_grid(&g, below + extra, Statistics::Fermi, cut as usize + 1, &Budget::default()).unwrap();
        prop_assert!(c.iter().all(|x| x.bits() == 0));
        // With exactly as many fermions as orbitals, the single filled state shows.
        let full = count_on_grid(&g, below, Statistics::Fermi, cut as usize + 1, &Budget::default()).unwrap();
        let filled: u64 = g.levels.iter().filter(|(e, _)| *e <= cut).map(|(e, d)| e * u64::try_from(d).unwrap()).sum();
        if (filled as usize) <= cut as usize {
            prop_assert_eq!(&full[filled as usize], &BigUint::from(1u32));
        }
    }
}

#[test]
fn levels_helper_is_exact() {
    // The level list used in docs: exact energies survive.
    let l = LevelList::new(
        EnergyUnit::Kelvin,
        vec![Level::new(r("1/3"), 1u32), Level::new(r("1"), 2u32)],
    );
    let g = Grid::new(&l, None).unwrap();
    assert_eq!(g.step, r("2/3"));
    assert_eq!(g.levels[1].0, 1);
}

#[test]
fn fermion_cancellation_raises_precision() {
    // 40 fermions in a 1D harmonic trap at kT = 2 ħω (deeply degenerate): the alternating
    // recursion cancels many bits. The closed form x^{N(N−1)/2} Π 1/(1 − x^j)
    // (standard result, from memory), evaluated here in 400-bit MPFR,
    // must agree to all 25 printed digits.
    use rug::Float;
    let (n, p) = (40u32, 400u32);
    let x = Float::with_val(p, Float::with_val(p, -1) / 2u32).exp();
    let mut ln = Float::with_val(p, x.ln_ref()) * (n * (n - 1) / 2);
    for j in 1..=n {
        let xj = Float::with_val(p, rug::ops::Pow::pow(&x, j));
        ln -= Float::with_val(p, 1 - xj).ln();
    }
    let pf = ensemble_point(
        &unit_osc(),
        n as u64,
        Statistics::Fermi,
        &Temperature::Kelvin(r("2")),
        25,
    )
    .unwrap();
    assert!(pf.certified);
    assert!(pf.cancelled_bits > 20, "{}", pf.cancelled_bits);
    let want = zsum::sum::float_to_decimal(&ln, 0.0, 0.0, 25).0;
    assert_eq!(pf.ln_q.decimal(25).unwrap(), want);
}

/// The microcanonical numbers, as a library user gets them: for an Einstein
/// solid (N oscillators of one quantum, labelled) Ω(q) = C(q + N − 1, q)
/// against Pascal's rule, the S/k ball holds ln Ω (summed here in 300-bit
/// MPFR from the exact count), and the central-difference kT equals
/// 2/ln(Ω(q + 1)/Ω(q − 1)) = 2/ln((q + N)(q + N − 1)/(q(q + 1))) quanta.
/// At the compared energy the canonical mean energy is N/(e^β − 1) quanta
/// (standard result) at the rounded β the comparison reports.
#[test]
fn microcanonical_numbers_for_an_einstein_solid() {
    use rug::Float;
    use zsum::microstates::microcanonical;
    let n = 6u64;
    let o = microstates(
        &unit_osc(),
        n,
        Statistics::Distinct,
        &r("40"),
        None,
        &Budget::default(),
    )
    .unwrap();
    let m = microcanonical(&unit_osc(), o, &r("40"), 1, 12).unwrap();
    assert_eq!(m.rows.len(), 41);
    assert_eq!((m.particles(), m.statistics()), (n, Statistics::Distinct));
    for row in &m.rows {
        let q = row.steps as usize;
        let want = pascal(q + n as usize - 1, q);
        assert_eq!(m.count(row), &want, "q = {q}");
        assert_eq!(m.energy(row), r(&q.to_string()));
        let exact = Float::with_val(
            300,
            rug::Integer::from_str_radix(&want.to_string(), 10).unwrap(),
        );
        let ln = exact.ln();
        let (lo, hi) = row.s_over_k.interval();
        assert!(lo <= ln && ln <= hi, "q = {q}");
        if (1..40).contains(&q) {
            let (qf, nf) = (q as f64, n as f64);
            let kt = 2.0 / ((qf + nf) * (qf + nf - 1.0) / (qf * (qf + 1.0))).ln();
            let got = row.kt.as_ref().unwrap().to_f64();
            assert!((got - kt).abs() < 1e-12 * kt, "q = {q}: {got} against {kt}");
        }
    }
    let compared: Vec<_> = m.rows.iter().filter_map(|r| r.canonical.as_ref()).collect();
    assert_eq!(compared.len(), 1);
    let c = compared[0];
    let beta = num_traits::ToPrimitive::to_f64(&c.beta).unwrap();
    let u = n as f64 / beta.exp_m1();
    assert!(
        (c.u.to_f64() - u).abs() < 1e-10 * u,
        "{:?} against {u}",
        c.u
    );
}

/// The ensemble sweep's numbers: every ln Q_N ball holds the closed form
/// for bosons in a 1D harmonic trap, ln Q_N = −Σ_{j=1}^{N} ln(1 − x^j),
/// x = e^{−1/T} (standard result), evaluated here in 300-bit MPFR; the
/// crossing found brackets the tolerance: the Boltzmann error, computed
/// afresh, exceeds it just below and not just above.
#[test]
fn ensemble_sweep_numbers_hold_the_closed_form() {
    use rug::Float;
    use zsum::budget::Meter;
    use zsum::microstates::ensemble_sweep;
    let trap = unit_osc();
    let n = 4u64;
    let grid = [r("0.5"), r("3"), r("40")];
    let e = ensemble_sweep(
        &trap,
        n,
        Statistics::Bose,
        &grid,
        true,
        15,
        &r("0.2"),
        &Meter::unlimited(),
    )
    .unwrap();
    assert_eq!(e.points.len(), 3);
    for (p, t) in e.points.iter().zip(["0.5", "3", "40"]) {
        assert_eq!(p.temperature, Temperature::Kelvin(r(t)));
        assert!(p.certified);
        let x = Float::with_val(
            300,
            -Float::with_val(300, 1) / Float::with_val(300, t.parse::<f64>().unwrap()),
        )
        .exp();
        let mut ln = Float::with_val(300, 0);
        for j in 1..=n as u32 {
            let xj = Float::with_val(300, rug::ops::Pow::pow(&x, j));
            ln -= Float::with_val(300, 1 - xj).ln();
        }
        let (lo, hi) = p.ln_q.interval();
        assert!(lo <= ln && ln <= hi, "T = {t}");
        // S/k = ln Q + U/kT, as balls.
        let s = p.ln_q.add(&p.u_over_kt);
        assert_eq!(s.decimal(15), p.s_over_k.decimal(15));
    }
    assert_eq!(e.crossings.len(), 1);
    let cross = &e.crossings[0];
    assert!(cross.exceeds_below);
    let err = |t: f64| {
        let tr = num_rational::BigRational::from_float(t).unwrap();
        zsum::microstates::ensemble_point(&trap, n, Statistics::Bose, &Temperature::Kelvin(tr), 10)
            .unwrap()
            .boltzmann_error_q
            .to_f64()
            .abs()
    };
    let t: f64 = num_traits::ToPrimitive::to_f64(&cross.temperature).unwrap();
    assert!(err(t * 0.995) > 0.2 && err(t * 1.005) < 0.2, "T = {t}");
}

/// Levels on a grid too fine for the memory budget are refused by name,
/// and the message names quantities (the cutoff, the memory budget), not
/// command-line options: 1 K and 1.001 K above the ground share a grid of
/// 1/1000 K, so a cutoff of 1000 K needs 10^6 energies.
#[test]
fn too_fine_a_grid_is_refused_naming_quantities() {
    let list = LevelFile::parse("0 K 1\n1 K 1\n1.001 K 1\n", "fine").unwrap();
    let e = microstates(
        &list,
        2,
        Statistics::Distinct,
        &r("1000"),
        None,
        &Budget::bytes(20_000_000),
    )
    .unwrap_err();
    let m = e.message();
    assert!(m.contains("common grid of 0.001 K"), "{m}");
    assert!(m.contains("the level at 1.001 K"), "{m}");
    assert!(m.contains("lower the cutoff"), "{m}");
    assert!(!m.contains("--"), "{m}");
}
