//! Invariants of level lists and boxes, checked on random inputs (proptest).

use num_bigint::BigUint;
use num_rational::BigRational;
use num_traits::Zero;
use proptest::prelude::*;
use zsum::exact::parse_rational;
use zsum::level::{Level, LevelList};
use zsum::models::ParticleInBox;
use zsum::spectrum::Spectrum;
use zsum::units::EnergyUnit;

fn rat(n: i64, d: i64) -> BigRational {
    BigRational::new(n.into(), d.into())
}

fn list_strategy() -> impl Strategy<Value = LevelList> {
    prop::collection::vec((-20i64..40, 1i64..5, 0u32..7), 0..12).prop_map(|v| {
        LevelList::new(
            EnergyUnit::Kelvin,
            v.into_iter()
                .map(|(n, d, g)| Level::new(rat(n, d), g))
                .collect(),
        )
    })
}

fn side_strategy() -> impl Strategy<Value = BigRational> {
    (1i64..5, 1i64..4).prop_map(|(n, d)| rat(n, d))
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn total_states_is_sum_of_degeneracies(l in list_strategy()) {
        let sum: BigUint = l.iter().map(|x| x.degeneracy.clone()).sum();
        prop_assert_eq!(l.total_states(), sum);
        for w in l.levels().windows(2) {
            prop_assert!(w[0].energy < w[1].energy);
        }
        prop_assert!(l.iter().all(|x| !x.degeneracy.is_zero()));
    }

    #[test]
    fn product_is_commutative_and_associative(a in list_strategy(), b in list_strategy(), c in list_strategy()) {
        prop_assert_eq!(a.product(&b).unwrap(), b.product(&a).unwrap());
        let left = a.product(&b).unwrap().product(&c).unwrap();
        let right = a.product(&b.product(&c).unwrap()).unwrap();
        prop_assert_eq!(&left, &right);
        prop_assert_eq!(left.total_states(), a.total_states() * b.total_states() * c.total_states());
    }

    #[test]
    fn truncated_product_is_product_truncated(a in list_strategy(), b in list_strategy(), n in -10i64..60) {
        let cut = rat(n, 1);
        prop_assert_eq!(a.product_up_to(&b, &cut).unwrap(), a.product(&b).unwrap().truncated(&cut));
    }

    #[test]
    fn union_adds_states(a in list_strategy(), b in list_strategy(), n in -10i64..60) {
        let u = a.union(&b).unwrap();
        prop_assert_eq!(u.total_states(), a.total_states() + b.total_states());
        let cut = rat(n, 1);
        prop_assert_eq!(u.count_up_to(&cut), a.count_up_to(&cut) + b.count_up_to(&cut));
        prop_assert_eq!(u, b.union(&a).unwrap());
    }

    #[test]
    fn shift_and_scale_are_exact(a in list_strategy(), s in -9i64..9, f in 1i64..9) {
        let d = rat(s, 3);
        prop_assert_eq!(a.shifted(&d).shifted(&-d.clone()), a.clone());
        let k = rat(f, 7);
        let back = a.scaled(&k, EnergyUnit::Kelvin).unwrap()
            .scaled(&k.recip(), EnergyUnit::Kelvin).unwrap();
        prop_assert_eq!(back, a);
    }

    #[test]
    fn serde_round_trips(a in list_strategy()) {
        let json = serde_json::to_string(&a).unwrap();
        let back: LevelList = serde_json::from_str(&json).unwrap();
        prop_assert_eq!(back, a);
    }

    #[test]
    fn permuting_sides_leaves_the_spectrum_unchanged(a in side_strategy(), b in side_strategy(), c in side_strategy()) {
        let one = ParticleInBox::new(vec![a.clone(), b.clone(), c.clone()]).unwrap();
        let two = ParticleInBox::new(vec![c.clone(), a.clone(), b.clone()]).unwrap();
        let three = ParticleInBox::new(vec![b, a, c]).unwrap();
        let cut = one.ground_energy() * rat(6, 1);
        let l1 = one.levels_up_to(&cut).unwrap();
        prop_assert_eq!(&l1, &two.levels_up_to(&cut).unwrap());
        prop_assert_eq!(&l1, &three.levels_up_to(&cut).unwrap());
    }

    #[test]
    fn box_is_the_product_of_its_axes(a in side_strategy(), b in side_strategy(), c in side_strategy(), extra in 1i64..30) {
        let sides = [a, b, c];
        let full = ParticleInBox::new(sides.to_vec()).unwrap();
        let cut = full.ground_energy() + rat(extra, 1);
        let mut prod: Option<LevelList> = None;
        for s in &sides {
            let axis = ParticleInBox::new(vec![s.clone()]).unwrap().levels_up_to(&cut).unwrap();
            prod = Some(match prod {
                None => axis,
                Some(p) => p.product_up_to(&axis, &cut).unwrap(),
            });
        }
        prop_assert_eq!(prod.unwrap(), full.levels_up_to(&cut).unwrap());
        prop_assert_eq!(full.count_up_to(&cut).unwrap(), full.levels_up_to(&cut).unwrap().total_states());
    }
}

#[test]
fn equal_sides_are_the_cube() {
    let cut = parse_rational("500").unwrap();
    for d in 1..=3 {
        let equal = ParticleInBox::new(vec![parse_rational("1").unwrap(); d]).unwrap();
        let cube = ParticleInBox::cube(d).unwrap();
        assert_eq!(
            equal.levels_up_to(&cut).unwrap(),
            cube.levels_up_to(&cut).unwrap()
        );
        // 1:1:1 written as 2/2 : 3/3 : 1 is still the cube.
    }
    let written = ParticleInBox::new(vec![rat(2, 2), rat(3, 3), rat(1, 1)]).unwrap();
    assert!(written.is_cubic());
    assert_eq!(
        written.levels_up_to(&cut).unwrap(),
        ParticleInBox::cube(3).unwrap().levels_up_to(&cut).unwrap()
    );
}
