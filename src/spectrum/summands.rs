//! A level list converted once into GMP numbers for the summation engine:
//! the sums of a temperature sweep take each level's exact energy and
//! degeneracy from here instead of converting (and reducing) the
//! public big rationals again at every temperature.

use crate::level::LevelList;
use rug::{Integer, Rational};
use std::sync::{Arc, OnceLock};

/// A listed spectrum's levels with their energies, lower ends and
/// degeneracies as GMP numbers, made once per listing (lazily, on the
/// first sum that asks) and shared by every temperature and core of a
/// sweep. Opaque outside the crate: the public API speaks
/// [`LevelList`].
#[derive(Debug)]
pub struct Summands {
    list: Arc<LevelList>,
    converted: OnceLock<Vec<Summand>>,
}

/// One level in GMP form.
#[derive(Debug)]
pub(crate) struct Summand {
    /// The listed energy (a rational inside the enclosure when inexact).
    pub(crate) energy: Rational,
    /// The lowest value the energy may take.
    pub(crate) lowest: Rational,
    pub(crate) degeneracy: Integer,
    /// Half the enclosure's width as `Enclosure::radius_f64`; `None` when
    /// the energy is exact.
    pub(crate) radius: Option<f64>,
}

impl Summands {
    /// Wraps a listing; nothing is converted yet.
    pub fn new(list: Arc<LevelList>) -> Self {
        Summands {
            list,
            converted: OnceLock::new(),
        }
    }

    /// The listing as the public types.
    pub fn list(&self) -> &Arc<LevelList> {
        &self.list
    }

    fn converted(&self) -> &[Summand] {
        self.converted.get_or_init(|| {
            self.list
                .iter()
                .map(|l| {
                    let energy = crate::exact::to_rug(&l.energy);
                    let lowest = match &l.enclosure {
                        None => energy.clone(),
                        Some(e) => crate::exact::to_rug(&e.lo),
                    };
                    Summand {
                        energy,
                        lowest,
                        degeneracy: crate::exact::to_rug_uint(&l.degeneracy),
                        radius: l.enclosure.as_ref().map(|e| e.radius_f64()),
                    }
                })
                .collect()
        })
    }

    /// The indices (into [`Summands::list`]) and converted levels of every
    /// level that may lie at or below `cutoff`, in the list's order: as
    /// [`LevelList::truncated`] keeps them.
    pub(crate) fn up_to<'s>(
        &'s self,
        cutoff: &'s Rational,
    ) -> impl Iterator<Item = (usize, &'s Summand)> + 's {
        let all = self.converted();
        // An exact list is sorted by energy: its levels up to the cutoff
        // are a prefix. An enclosed one is sorted by its listed energies,
        // and a lower end may dip below the cutoff after a level above it.
        let end = if self.list.is_exact() {
            all.partition_point(|s| s.energy <= *cutoff)
        } else {
            all.len()
        };
        all[..end]
            .iter()
            .enumerate()
            .filter(move |(_, s)| s.lowest <= *cutoff)
    }
}
