//! The box's level listing (blocked, on every core) against two references:
//! the listing as it was before (one walk over the whole dense array, kept
//! as `classified_levels_reference`), and, for the cube, counts of sums of
//! three positive squares made here by brute force.

use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use proptest::prelude::*;
use zsum::error::ErrorKind;
use zsum::exact::parse_rational;
use zsum::models::particle_box::ClassifiedLevel;
use zsum::models::ParticleInBox;
use zsum::spectrum::{Budget, Spectrum};

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

fn boxed(sides: &str) -> ParticleInBox {
    ParticleInBox::new(sides.split(',').map(r).collect()).unwrap()
}

/// The new listing, through both ways out (classified levels and the
/// spectrum's level list), equals the reference at `cutoff`: same energies,
/// degeneracies and family counts in the same order, or the same error. The
/// new listing runs on 1 and on 3 threads, which cut the energies into
/// different runs of blocks. Returns the number of levels compared.
fn same_as_reference(b: &ParticleInBox, cutoff: &BigRational, budget: &Budget) -> usize {
    let old = b.classified_levels_reference(cutoff, budget);
    for threads in [1, 3] {
        let pool = rayon::ThreadPoolBuilder::new()
            .num_threads(threads)
            .build()
            .unwrap();
        let (new, list) = pool.install(|| {
            (
                b.classified_levels(cutoff, budget),
                b.levels_within(cutoff, budget),
            )
        });
        match (new, &old, list) {
            (Ok(new), Ok(old), Ok(list)) => {
                assert_eq!(&new, old, "{b:?} up to {cutoff} on {threads} threads");
                let plain: Vec<_> = old.iter().map(|c| c.level.clone()).collect();
                assert_eq!(list.levels(), &plain[..], "{b:?} up to {cutoff}");
            }
            (Err(new), Err(old), Err(list)) => {
                assert_eq!(new.to_string(), old.to_string());
                assert_eq!(list.to_string(), old.to_string());
                assert_eq!(new.kind(), old.kind());
            }
            (new, old, list) => panic!(
                "{b:?} up to {cutoff}: new {:?}, reference {:?}, list {:?}",
                new.map(|v| v.len()),
                old.as_ref().map(|v| v.len()),
                list.map(|v| v.len())
            ),
        }
    }
    old.map_or(0, |v| v.len())
}

#[test]
fn listing_matches_the_reference_on_several_boxes() {
    // Each box at tiny cutoffs (below, at and just above the ground level),
    // middling ones, and one high enough that the dense enumeration is cut
    // into several blocks (scaled energies beyond 2^17, and beyond 4096
    // times the last weight). The last cutoffs of 2/3:5/7 and 3/2 take the
    // sparse enumeration (the dense array would pass 64 MiB).
    let cases: [(&str, &[&str]); 9] = [
        (
            "1,1,1",
            &["2", "3", "7/2", "38", "1000", "4321/7", "300000"],
        ),
        ("1,1,2", &["3/2", "9/4", "5", "1000", "60000"]),
        ("2,3,5", &["1/4", "2/5", "1", "100", "1000", "2000"]),
        ("3/2,1,1", &["2", "22/9", "500", "20000"]),
        ("1,1", &["1", "2", "50", "12345/7", "2000000"]),
        ("1,2", &["1", "5/4", "50", "1000", "1000000"]),
        ("2/3,5/7", &["1", "100", "50000", "300000"]),
        ("1", &["1/2", "1", "2", "1000", "1000000"]),
        ("3/2", &["4/9", "1000", "500000", "3000000"]),
    ];
    let mut compared = 0;
    for (sides, cutoffs) in cases {
        let b = boxed(sides);
        for c in cutoffs {
            compared += same_as_reference(&b, &r(c), &Budget::default());
        }
    }
    // Real lists were compared, not only errors.
    assert!(compared > 1_000_000, "{compared} levels compared");
}

#[test]
fn tiny_cutoffs_are_refused_as_before() {
    let cube = ParticleInBox::cube(3).unwrap();
    for c in ["0", "1", "2", "29/10"] {
        let e = cube
            .classified_levels(&r(c), &Budget::default())
            .unwrap_err();
        assert!(e.to_string().contains("below the ground level 3"), "{e}");
        assert_eq!(same_as_reference(&cube, &r(c), &Budget::default()), 0);
    }
    // At the ground level exactly: the ground level alone.
    let at = cube.classified_levels(&r("3"), &Budget::default()).unwrap();
    assert_eq!(at.len(), 1);
    assert_eq!(at[0].level.degeneracy, BigUint::from(1u8));
    // Refused by the memory budget with the same message as before.
    let small = Budget::bytes(1 << 20);
    let e = cube.classified_levels(&r("1e9"), &small).unwrap_err();
    assert!(e.to_string().contains("memory budget"), "{e}");
    assert_eq!(same_as_reference(&cube, &r("1e9"), &small), 0);
}

#[test]
fn levels_that_could_hold_2_to_the_32_states_are_refused_by_name() {
    // With no memory budget to speak of, the cube up to 6e9 passes the
    // estimate, but a level there could hold π/4 · 6e9 ≈ 4.7e9 > 2^32
    // states (the area bound), more than half a dense word holds: refused
    // before any memory is taken, naming the cutoff.
    let cube = ParticleInBox::cube(3).unwrap();
    let e = cube
        .classified_levels(&r("6e9"), &Budget::bytes(u64::MAX))
        .unwrap_err();
    assert_eq!(e.kind(), ErrorKind::InvalidParameter);
    assert!(e.to_string().contains("cutoff 6000000000"), "{e}");
    assert!(e.to_string().contains("2^32 states"), "{e}");
    let e = cube
        .levels_within(&r("6e9"), &Budget::bytes(u64::MAX))
        .unwrap_err();
    assert!(e.to_string().contains("2^32 states"), "{e}");
}

/// For every n ≤ `limit`: the number of ordered triples of positive integers
/// with x² + y² + z² = n, and the number of those with x ≤ y ≤ z, by brute
/// force over every ordered triple (nothing from zsum).
fn three_positive_squares(limit: usize) -> (Vec<u64>, Vec<u64>) {
    let mut ordered = vec![0u64; limit + 1];
    let mut sorted = vec![0u64; limit + 1];
    let mut x = 1;
    while x * x <= limit {
        let mut y = 1;
        while x * x + y * y <= limit {
            let mut z = 1;
            while x * x + y * y + z * z <= limit {
                let n = x * x + y * y + z * z;
                ordered[n] += 1;
                if x <= y && y <= z {
                    sorted[n] += 1;
                }
                z += 1;
            }
            y += 1;
        }
        x += 1;
    }
    (ordered, sorted)
}

/// The cube's lowest levels n1²+n2²+n3² and their numbers of states, checked
/// by hand (common practice: every statistical-mechanics text lists them):
/// 3 = 1+1+1 (1 state), 6 = 1+1+4 (3), 9 = 1+4+4 (3), 11 = 1+1+9 (3),
/// 12 = 4+4+4 (1), 14 = 1+4+9 (6).
const TEXTBOOK: [(usize, u64); 6] = [(3, 1), (6, 3), (9, 3), (11, 3), (12, 1), (14, 6)];

fn by_energy(levels: &[ClassifiedLevel], limit: usize) -> (Vec<u64>, Vec<u64>) {
    let mut deg = vec![0u64; limit + 1];
    let mut fam = vec![0u64; limit + 1];
    for l in levels {
        assert!(l.level.energy.is_integer());
        let n = l.level.energy.to_integer().to_usize().unwrap();
        deg[n] = l.level.degeneracy.to_u64().unwrap();
        fam[n] = l.families;
    }
    (deg, fam)
}

#[test]
fn cube_degeneracies_are_counts_of_three_positive_squares() {
    // High enough for several blocks of the dense enumeration.
    const N: usize = 200_000;
    let (ordered, sorted) = three_positive_squares(N);
    // Hand checks of the brute force itself: the textbook levels, and 7
    // and 8, which are no sum of three positive squares.
    for (n, states) in TEXTBOOK.into_iter().chain([(7, 0), (8, 0)]) {
        assert_eq!(ordered[n], states, "brute force at {n}");
    }
    // 27 = 9+9+9 = 1+1+25: 1 + 3 states in two families.
    assert_eq!((ordered[27], sorted[27]), (4, 2));
    let cube = ParticleInBox::cube(3).unwrap();
    let levels = cube
        .classified_levels(&r(&N.to_string()), &Budget::default())
        .unwrap();
    // Every listed level is a sum of three positive squares, in order.
    assert!(levels
        .windows(2)
        .all(|w| w[0].level.energy < w[1].level.energy));
    assert_eq!(levels.len(), ordered.iter().filter(|&&c| c > 0).count());
    let (deg, fam) = by_energy(&levels, N);
    for n in 0..=N {
        assert_eq!(deg[n], ordered[n], "degeneracy at {n}");
        assert_eq!(fam[n], sorted[n], "families at {n}");
    }
    // The same textbook values, read off zsum's own listing.
    for (n, states) in TEXTBOOK {
        assert_eq!(deg[n], states, "zsum at {n}");
    }
}

fn sides_strategy() -> impl Strategy<Value = Vec<BigRational>> {
    let side = prop::sample::select(vec!["1", "1", "1", "2", "1/2", "3/2", "2/3", "5/4", "3"]);
    prop::collection::vec(side, 1..=3).prop_map(|v| v.into_iter().map(r).collect())
}

/// The highest cutoff the random cases reach for a box: about a million
/// states by Weyl's law, and at most two million scaled energies (the
/// energies times the least common multiple of the squared side
/// numerators), so that the dense enumeration spans up to 31 blocks.
fn top_cutoff(b: &ParticleInBox) -> f64 {
    let scale = b
        .sides()
        .iter()
        .fold(BigInt::from(1), |d, s| d.lcm(&(s.numer() * s.numer())));
    let mut hi = 2e6 / scale.to_f64().unwrap();
    if b.weyl_estimate(hi) > 1e6 {
        let mut lo = 0.0;
        for _ in 0..60 {
            let mid = (lo + hi) / 2.0;
            if b.weyl_estimate(mid) > 1e6 {
                hi = mid;
            } else {
                lo = mid;
            }
        }
    }
    hi
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(40))]

    /// Random boxes at random cutoffs p/q, from below the ground level to
    /// the top of [`top_cutoff`].
    #[test]
    fn listing_matches_the_reference_at_random_cutoffs(
        sides in sides_strategy(),
        fraction in 0.0..1.0f64,
        q in 1u64..13,
    ) {
        let b = ParticleInBox::new(sides).unwrap();
        let p = (top_cutoff(&b) * fraction * q as f64).floor() as u64;
        let cutoff = BigRational::new(p.into(), q.into());
        same_as_reference(&b, &cutoff, &Budget::default());
    }
}
