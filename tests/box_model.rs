//! The particle in a box against outside facts: textbook levels, OEIS
//! A005875 (representations as sums of three squares), Legendre's
//! three-square theorem and Weyl's law.

mod common;

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use zsum::exact::parse_rational;
use zsum::models::particle_box::Origin;
use zsum::models::ParticleInBox;
use zsum::spectrum::{Budget, Spectrum, State};

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

#[test]
fn lowest_cubic_levels_are_the_textbook_ones() {
    // Energies n1²+n2²+n3² and degeneracies of the cubic box (common
    // practice: every statistical-mechanics text lists these), including the
    // coincidence 27 = 3²+3²+3² = 1²+1²+5² and 38 = 1²+1²+6² = 2²+3²+5².
    let expected = [
        (3, 1),
        (6, 3),
        (9, 3),
        (11, 3),
        (12, 1),
        (14, 6),
        (17, 3),
        (18, 3),
        (19, 3),
        (21, 6),
        (22, 3),
        (24, 3),
        (26, 6),
        (27, 4),
        (29, 6),
        (30, 6),
        (33, 6),
        (34, 3),
        (35, 6),
        (36, 3),
        (38, 9),
    ];
    let cube = ParticleInBox::cube(3).unwrap();
    let levels = cube
        .classified_levels(&r("38"), &Budget::default())
        .unwrap();
    let got: Vec<(u64, u64)> = levels
        .iter()
        .map(|l| {
            (
                l.level.energy.to_integer().to_u64().unwrap(),
                l.level.degeneracy.to_u64().unwrap(),
            )
        })
        .collect();
    assert_eq!(got, expected);
    let at = |e: u64| {
        levels
            .iter()
            .find(|l| l.level.energy == r(&e.to_string()))
            .unwrap()
    };
    assert_eq!(at(3).origin(), Origin::Single);
    assert_eq!(at(6).origin(), Origin::Symmetry);
    assert_eq!(at(27).origin(), Origin::Coincidence);
    assert_eq!(at(27).families, 2);
    assert_eq!(at(38).families, 2);
    // The 6-unit level is (1,1,2) and its permutations.
    let states = cube.states_at(&r("6")).unwrap();
    let want: Vec<State> = vec![
        State(vec![1, 1, 2]),
        State(vec![1, 2, 1]),
        State(vec![2, 1, 1]),
    ];
    assert_eq!(states, want);
}

/// The first 41 terms of OEIS A005875, r3(n) = number of ways to write n as
/// an ordered sum of three squares of integers of any sign (from memory;
/// re-derived below by brute force before use).
const A005875_HEAD: [u64; 41] = [
    1, 6, 12, 8, 6, 24, 24, 0, 12, 30, 24, 24, 8, 24, 48, 0, 6, 48, 36, 24, 24, 48, 24, 0, 24, 30,
    72, 32, 0, 72, 48, 0, 12, 48, 48, 48, 30, 24, 72, 0, 24,
];

/// r_k(n) for k = 1, 2, 3 and n ≤ limit by brute force over signed integers
/// (a method independent of zsum's enumeration).
fn brute_r(limit: usize) -> [Vec<u64>; 3] {
    let b = (limit as f64).sqrt() as i64 + 1;
    let mut r1 = vec![0u64; limit + 1];
    let mut r2 = vec![0u64; limit + 1];
    let mut r3 = vec![0u64; limit + 1];
    for x in -b..=b {
        let x2 = (x * x) as usize;
        if x2 <= limit {
            r1[x2] += 1;
        }
        for y in -b..=b {
            let s2 = x2 + (y * y) as usize;
            if s2 > limit {
                continue;
            }
            r2[s2] += 1;
            for z in -b..=b {
                let s3 = s2 + (z * z) as usize;
                if s3 <= limit {
                    r3[s3] += 1;
                }
            }
        }
    }
    [r1, r2, r3]
}

#[test]
fn degeneracies_match_a005875_up_to_ten_thousand() {
    const N: usize = 10_000;
    let [r1, r2, r3] = brute_r(N);
    assert_eq!(
        &r3[..A005875_HEAD.len()],
        &A005875_HEAD[..],
        "brute force vs OEIS"
    );
    // Legendre's three-square theorem: r3(n) = 0 exactly when n = 4^a(8b+7).
    for (n, &v) in r3.iter().enumerate().skip(1) {
        let mut m = n;
        while m % 4 == 0 {
            m /= 4;
        }
        assert_eq!(v == 0, m % 8 == 7, "Legendre at {n}");
    }
    // Inclusion-exclusion over zero coordinates and signs:
    // r3 = [n=0] + 3·2·p1 + 3·4·p2 + 8·p3, r2 = [n=0] + 2·2·p1 + 4·p2,
    // r1 = [n=0] + 2·p1, where p_k counts positive k-tuples.
    let cube = ParticleInBox::cube(3).unwrap();
    let levels = cube.levels_up_to(&r(&N.to_string())).unwrap();
    let mut deg = vec![0u64; N + 1];
    for l in levels.iter() {
        deg[l.energy.to_integer().to_usize().unwrap()] = l.degeneracy.to_u64().unwrap();
    }
    for n in 1..=N {
        let p1 = r1[n] / 2;
        let p2 = (r2[n] - 4 * p1) / 4;
        let p3 = (r3[n] - 6 * p1 - 12 * p2) / 8;
        assert_eq!(deg[n], p3, "degeneracy of level {n}");
    }
}

#[test]
fn counter_agrees_with_summed_degeneracies() {
    for sides in ["1", "1,1", "1,1,1", "1,1,2", "2,3,5", "1,1/2", "3/2,1,1"] {
        let s: Vec<BigRational> = sides.split(',').map(r).collect();
        let b = ParticleInBox::new(s).unwrap();
        for cut in ["3", "50", "1000", "4321/7", "5000"] {
            let c = r(cut);
            if c < b.ground_energy() {
                continue;
            }
            let listed = b.levels_up_to(&c).unwrap().total_states();
            assert_eq!(
                b.count_up_to(&c).unwrap(),
                listed,
                "sides {sides} cutoff {cut}"
            );
        }
    }
}

#[test]
fn cube_counter_agrees_with_general_counter_at_large_cutoffs() {
    // Two independent code paths (the symmetric wedge walk and the general
    // ellipsoid walk) must give the same exact count.
    use zsum::counting::lattice::{count_3d, count_cube};
    for m in [3u64, 4, 6, 99, 12_345, 1_000_000, 31_415_926] {
        assert_eq!(count_cube(m), count_3d([1, 1, 1], m), "m = {m}");
    }
}

#[test]
fn weyl_gap_shrinks_with_energy() {
    // Weyl (1911) with the Dirichlet boundary term: the relative gap between
    // the exact count and (π/6)E^{3/2} − (3π/8)E + (3/4)E^{1/2} falls as E grows.
    let cube = ParticleInBox::cube(3).unwrap();
    let gap = |e: u64| {
        let n = cube
            .count_up_to(&r(&e.to_string()))
            .unwrap()
            .to_f64()
            .unwrap();
        ((cube.weyl_estimate(e as f64) - n) / n).abs()
    };
    let gaps: Vec<f64> = [1e3, 1e5, 1e7, 1e9]
        .iter()
        .map(|&e| gap(e as u64))
        .collect();
    for w in gaps.windows(2) {
        assert!(w[1] < w[0], "gaps {gaps:?}");
    }
    assert!(gaps[3] < 1e-7, "gap at 1e9: {}", gaps[3]);
    // Without the boundary term the gap is of order (9/4)/E^{1/2}: much larger.
    let e = 1e7_f64;
    let n = cube.count_up_to(&r("1e7")).unwrap().to_f64().unwrap();
    let volume_only = std::f64::consts::PI / 6.0 * e.powf(1.5);
    assert!(((volume_only - n) / n).abs() > 100.0 * gaps[2]);
}

#[test]
fn full_lattice_identity_links_the_counters() {
    // Summing OEIS A005875 (brute-forced r3) up to 10^4 counts every integer
    // point of the ball; splitting by zero coordinates and signs gives
    // N_full = 1 + 6·N1 + 12·N2 + 8·N3 with N_k the positive counts.
    let cube = ParticleInBox::cube(3).unwrap();
    let [_, _, r3] = brute_r(10_000);
    let full: u64 = r3.iter().sum();
    // N_full = 1 + 6 N1 + 12 N2 + 8 N3 over n ≤ 10^4.
    let n1 = 100u64;
    let n2 = ParticleInBox::cube(2)
        .unwrap()
        .count_up_to(&r("10000"))
        .unwrap()
        .to_u64()
        .unwrap();
    let n3 = cube.count_up_to(&r("10000")).unwrap().to_u64().unwrap();
    assert_eq!(full, 1 + 6 * n1 + 12 * n2 + 8 * n3);
}

#[test]
fn every_box_passes_the_generic_checks() {
    for sides in ["1", "1,1", "1,1,1", "1,1,2", "2,3,5", "1,2"] {
        let s: Vec<BigRational> = sides.split(',').map(r).collect();
        let b = ParticleInBox::new(s).unwrap();
        common::check_spectrum(&b, &r("400"), 40);
    }
}

#[test]
fn bound_is_rigorous_far_out() {
    let cube = ParticleInBox::cube(3).unwrap();
    for e in ["1e6", "123456789", "1e9"] {
        let exact = cube.count_up_to(&r(e)).unwrap();
        assert!(cube.count_bound(&r(e)) >= exact);
    }
    let seg = ParticleInBox::new(vec![r("5/3")]).unwrap();
    // 1D: floor(a sqrt(E)) exactly; the bound is within one of it.
    let exact = seg.count_up_to(&r("1e8")).unwrap();
    let bound = seg.count_bound(&r("1e8"));
    assert!(bound >= exact && &bound - &exact <= BigUint::from(1u8));
}

#[test]
fn bad_boxes_are_refused_with_clear_messages() {
    assert!(ParticleInBox::cube(0)
        .unwrap_err()
        .to_string()
        .contains("1, 2 or 3"));
    assert!(ParticleInBox::cube(4).is_err());
    let e = ParticleInBox::new(vec![r("1"), r("0")]).unwrap_err();
    assert!(e.to_string().contains("side 0"), "{e}");
    let e = ParticleInBox::new(vec![r("-1")]).unwrap_err();
    assert!(e.to_string().contains("-1"), "{e}");
    let cube = ParticleInBox::cube(3).unwrap();
    let e = cube.levels_up_to(&r("2")).unwrap_err();
    assert!(e.to_string().contains("below the ground level 3"), "{e}");
    let e = cube
        .levels_within(&r("1e9"), &Budget::bytes(1 << 20))
        .unwrap_err();
    assert!(e.to_string().contains("count"), "{e}");
}
