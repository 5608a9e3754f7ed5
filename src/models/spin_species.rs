//! Nuclear-spin statistics of symmetric and spherical tops, in exact
//! integers: which rotational species a J level holds, how many
//! nuclear-spin functions of each species a set of equivalent nuclei has,
//! and the statistical weight that follows for each level.
//!
//! # Rotational species from the character formula
//! The 2J+1 functions of a rotational level J (its K-sublevels, for fixed
//! M) carry the rotation representation D^J, whose character at a rotation
//! by α is
//!
//! ```text
//! χ_J(α) = Σ_{m=−J}^{J} e^{imα}.
//! ```
//!
//! For α = 2π/k with k = 1, 2, 3, 4, 6, e^{imα} depends only on m mod k, so
//! χ_J(α) = Σ_r c_r cos(2π r/k), c_r the number of m ≡ r (mod k) in −J..J
//! (the sine parts cancel between m and −m). These cosines are rational
//! (1, 1/2, 0, −1/2, −1), so χ_J is an exact integer:
//! [`rotation_character`]. No species is tabulated by hand: the counts
//! follow from projecting with a character table.
//!
//! # The rotation group T of a spherical top
//! The proper rotations of a regular tetrahedron (methane-like) form T, of
//! order 12: the identity, three rotations by π (C2) and eight by 2π/3
//! (C3). Its species (characters on E, C2, C3): A (1, 1, 1); E, the pair of
//! complex conjugate one-dimensional species taken together as one real
//! two-dimensional species (2, 2, −1); F (3, −1, 0). The number of times
//! a species Γ occurs in a representation of character χ is
//! ⟨χ_Γ, χ⟩ = (1/12) Σ_g χ_Γ(g) χ(g); for the real pair E the product is
//! divided by ⟨χ_E, χ_E⟩ = 2, so that `e` counts E *pairs*.
//! ([`rotation_species_t`]; 1·a + 2·e + 3·f = 2J + 1.)
//!
//! # Nuclear-spin functions
//! With n = 2I + 1 spin states per nucleus, a permutation of the nuclei
//! fixes n^c product spin functions, c its number of cycles. The four
//! nuclei of a tetrahedron: E fixes n⁴, a C2 (two 2-cycles) n², a C3 (a
//! 3-cycle and a fixed nucleus) n²; projecting gives the numbers of A
//! functions, E pairs and F triplets ([`tetrahedral_spin`]; protons: 5, 1,
//! 3, i.e. 5 + 2 + 9 = 16 functions). Three nuclei on a three-fold axis
//! (ammonia-like) permute as S3 ≅ C3v: E fixes n³, the two 3-cycles n, the
//! three transpositions n²; with the characters A1 (1, 1, 1), A2 (1, 1, −1),
//! E (2, −1, 0): m_A1 = (n³ + 2n + 3n²)/6, m_A2 = (n³ + 2n − 3n²)/6,
//! m_E = (2n³ − 2n)/6 ([`three_fold_spin`]; protons 4, 0, 2; deuterons 10,
//! 1, 8).
//!
//! # Statistical weights
//! *Spherical top.* Every rotation of T permutes the four nuclei evenly, so
//! for fermions and bosons alike a rotation–spin state is allowed when it
//! is invariant under T: the number of allowed states built on one
//! rotational multiplet of species Γ is the number of times A occurs in
//! Γ ⊗ (spin functions). A ⊗ A holds A once per A spin function: an A
//! sublevel weighs m_A. F ⊗ F holds A once: an F triplet weighs m_F. The E
//! pair is two complex conjugate species E₁, E₂; E₁ ⊗ E₂ and E₂ ⊗ E₁ each
//! hold A once, so an E pair with an E-pair spin function gives 2: an E
//! pair weighs 2·m_E. A level J therefore has
//!
//! ```text
//! g(J) = (2J+1)_M × [a·m_A + e·2·m_E + f·m_F]        (methane: A 5, E 2, F 3)
//! ```
//!
//! states ([`spherical_weight`]). The same count is (1/12) Σ_g χ_J(g)
//! χ_spin(g) (invariants of D^J ⊗ spin), so Σ_J-averaged g(J)/(2J+1)²
//! tends to n⁴/12 (16/12 for methane: symmetry number 12), and for large J
//! D^J approaches (2J+1)/12 copies of the regular representation (one A,
//! one E pair, three F triplets per 12 functions), so the states fall into
//! the classes A : E : F as m_A : 2m_E : 3m_F (5 : 2 : 9 for protons).
//!
//! *Symmetric top with three equivalent nuclei* (ammonia-like), per (J, |K|)
//! level with ±K and both inversion components merged: K = 0 weighs
//! m_A1 + m_A2, K ≡ 0 (mod 3) with K > 0 weighs 2(m_A1 + m_A2), and
//! K ≢ 0 (mod 3) weighs 2·m_E, the factor 2 being the two inversion
//! components, which coincide without tunnelling (common practice).
//! Protons: 4, 8, 4. Per K-state (a K > 0 level holds two) that is 4, 4
//! and 2, averaging n³/3 = 8/3 (8 spin functions over symmetry number 3);
//! the K ≡ 0 (mod 3) class (ortho) and the rest (para) each hold half.
//! With an inversion splitting, each (J, |K|) level is a lower "s" and an
//! upper "a" component ([`three_fold_weight`]): K ≢ 0 (mod 3) weighs m_E
//! each, K ≡ 0 (mod 3), K > 0 weighs m_A1 + m_A2 each, and for K = 0 one
//! component weighs m_A1 and the other m_A2: for fermions (half-integer I)
//! the s component gets m_A1 when J is even and m_A2 when J is odd; for
//! bosons the other way round (from memory: ammonia's (J, K) = (0, 0)
//! level exists only as its lower, symmetric inversion component).

use crate::error::{Error, Result};

/// The largest 2I accepted for a nucleus (I = 10).
pub const MAX_TWICE_SPIN: u32 = 20;

/// The number of integers m in `lo..=hi` with m ≡ r (mod k).
fn count_residue(lo: i128, hi: i128, r: i128, k: i128) -> i128 {
    if hi < lo {
        return 0;
    }
    (hi - r).div_euclid(k) - (lo - 1 - r).div_euclid(k)
}

/// Twice the cosine of 2π·t/12 for the t that rotations by 2π/k with
/// k = 1, 2, 3, 4, 6 produce (t a multiple of 2 or 3): the exact values on
/// the unit circle at multiples of 60° and 90°. `None` for the irrational
/// ones (t = 1, 5, 7, 11: ±√3).
fn twice_cos_twelfths(t: i128) -> Option<i128> {
    match t.rem_euclid(12) {
        0 => Some(2),
        2 | 10 => Some(1),
        3 | 9 => Some(0),
        4 | 8 => Some(-1),
        6 => Some(-2),
        _ => None,
    }
}

/// The character χ_J(2π/k) = Σ_{m=−J}^{J} e^{2πim/k} of the rotation
/// representation D^J at a rotation by 2π/k, exactly, for k = 1, 2, 3, 4,
/// 6: the m are grouped by m mod k and each group weighs the (rational)
/// cosine of its angle.
///
/// ```
/// use zsum::models::spin_species::rotation_character;
/// // χ_J(0) = 2J+1; χ_J(π) = (−1)^J; χ_J(2π/3) = 1, 0, −1 for J ≡ 0, 1, 2 (mod 3).
/// assert_eq!(rotation_character(4, 1).unwrap(), 9);
/// assert_eq!(rotation_character(3, 2).unwrap(), -1);
/// assert_eq!(rotation_character(2, 3).unwrap(), -1);
/// assert!(rotation_character(2, 5).is_err());
/// ```
pub fn rotation_character(j: u64, k: u32) -> Result<i128> {
    if ![1, 2, 3, 4, 6].contains(&k) {
        return Err(Error::invalid(
            "rotation order k",
            k,
            "the character is exact (rational cosines) only for rotations by 2π/k with k = 1, 2, \
             3, 4 or 6",
        ));
    }
    let (j, k) = (i128::from(j), i128::from(k));
    let mut twice = 0i128;
    for r in 0..k {
        let c = count_residue(-j, j, r, k);
        // The angle 2π r/k is 2π (12r/k)/12.
        let cos2 = twice_cos_twelfths(12 * r / k).unwrap_or(0);
        twice += c * cos2;
    }
    // Σ_r c_r·2cos is even: the character is an integer.
    Ok(twice / 2)
}

/// How often each species of the rotation group T occurs in a
/// representation: A, E pairs, F.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct TSpecies {
    /// The number of A species.
    pub a: u64,
    /// The number of E pairs (each two functions).
    pub e: u64,
    /// The number of F triplets.
    pub f: u64,
}

/// A species class of the rotation group T.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum TClass {
    /// One-dimensional, totally symmetric.
    A,
    /// The two-dimensional real pair of complex conjugate species.
    E,
    /// Three-dimensional.
    F,
}

impl TClass {
    /// All three, in the order A, E, F.
    pub const ALL: [TClass; 3] = [TClass::A, TClass::E, TClass::F];
}

impl TSpecies {
    /// The count of class `c`.
    pub fn get(&self, c: TClass) -> u64 {
        match c {
            TClass::A => self.a,
            TClass::E => self.e,
            TClass::F => self.f,
        }
    }
}

/// Projects a class function of T, given on (E, C2, C3), onto its species
/// (class sizes 1, 3, 8). The quotients are exact for any character of a
/// representation (a theorem of characters), so the integer division loses
/// nothing.
fn project_t(chi: [i128; 3]) -> TSpecies {
    let [e, c2, c3] = chi;
    let a = (e + 3 * c2 + 8 * c3) / 12;
    // ⟨χ_E, χ⟩ / ⟨χ_E, χ_E⟩ with ⟨χ_E, χ_E⟩ = 2.
    let ep = (2 * e + 6 * c2 - 8 * c3) / 24;
    let f = (3 * e - 3 * c2) / 12;
    let u = |x: i128| u64::try_from(x).unwrap_or(u64::MAX);
    TSpecies {
        a: u(a),
        e: u(ep),
        f: u(f),
    }
}

/// The species of T in D^J: the K-sublevels of a spherical top's level J
/// (methane-like), from the exact characters at the identity, π and 2π/3.
///
/// ```
/// use zsum::models::spin_species::{rotation_species_t, TSpecies};
/// assert_eq!(rotation_species_t(2), TSpecies { a: 0, e: 1, f: 1 });
/// let s = rotation_species_t(3); // A + 2F: 1 + 6 = 7 functions
/// assert_eq!(s.a + 2 * s.e + 3 * s.f, 7);
/// ```
pub fn rotation_species_t(j: u64) -> TSpecies {
    let chi = |k| rotation_character(j, k).unwrap_or(0);
    project_t([chi(1), chi(2), chi(3)])
}

fn spin_states(twice_spin: u32) -> Result<i128> {
    if twice_spin > MAX_TWICE_SPIN {
        return Err(Error::invalid(
            "twice the nuclear spin (2I)",
            twice_spin,
            &format!("give 0 to {MAX_TWICE_SPIN} (I = 0 to 10)"),
        ));
    }
    Ok(i128::from(twice_spin) + 1)
}

/// The nuclear-spin functions of four equivalent nuclei of spin
/// `twice_spin`/2 on a tetrahedron, by species of T: A functions, E pairs,
/// F triplets, from the permutation characters (n⁴, n², n²). A spin beyond
/// [`MAX_TWICE_SPIN`] is refused.
///
/// ```
/// use zsum::models::spin_species::{tetrahedral_spin, TSpecies};
/// // Four protons: 5 A, 1 E pair, 3 F triplets (5 + 2 + 9 = 16 functions).
/// assert_eq!(tetrahedral_spin(1)?, TSpecies { a: 5, e: 1, f: 3 });
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn tetrahedral_spin(twice_spin: u32) -> Result<TSpecies> {
    let n = spin_states(twice_spin)?;
    Ok(project_t([n.pow(4), n * n, n * n]))
}

/// The nuclear-spin functions of three equivalent nuclei under S3 ≅ C3v:
/// A1 and A2 functions and E pairs.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct S3Species {
    /// Totally symmetric functions.
    pub a1: u64,
    /// Functions antisymmetric under transpositions.
    pub a2: u64,
    /// Two-dimensional E pairs.
    pub e: u64,
}

/// The nuclear-spin functions of three equivalent nuclei of spin
/// `twice_spin`/2 (ammonia-like), projected from the permutation
/// characters (n³, n, n²) on (E, 3-cycles, transpositions). A spin beyond
/// [`MAX_TWICE_SPIN`] is refused.
///
/// ```
/// use zsum::models::spin_species::{three_fold_spin, S3Species};
/// assert_eq!(three_fold_spin(1)?, S3Species { a1: 4, a2: 0, e: 2 });
/// assert_eq!(three_fold_spin(2)?, S3Species { a1: 10, a2: 1, e: 8 });
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn three_fold_spin(twice_spin: u32) -> Result<S3Species> {
    let n = spin_states(twice_spin)?;
    let (e, c3, c2) = (n.pow(3), n, n * n);
    let u = |x: i128| u64::try_from(x).unwrap_or(u64::MAX);
    Ok(S3Species {
        a1: u((e + 2 * c3 + 3 * c2) / 6),
        a2: u((e + 2 * c3 - 3 * c2) / 6),
        e: u((2 * e - 2 * c3) / 6),
    })
}

/// The allowed rotation–spin states built on one rotational multiplet of
/// class `c` (per M): A m_A, an E pair 2·m_E, an F triplet m_F.
pub fn multiplet_weight(spin: &TSpecies, c: TClass) -> u64 {
    match c {
        TClass::A => spin.a,
        TClass::E => 2 * spin.e,
        TClass::F => spin.f,
    }
}

/// The statistical weight (per M) of a spherical-top level with rotational
/// species `rot`: a·m_A + e·2·m_E + f·m_F, or only the term of class
/// `only`.
///
/// ```
/// use zsum::models::spin_species::{rotation_species_t, spherical_weight, tetrahedral_spin};
/// let protons = tetrahedral_spin(1)?;
/// // J = 2 holds E + F: 2 + 3 = 5 states per M, 25 in all.
/// assert_eq!(spherical_weight(&rotation_species_t(2), &protons, None), 5);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn spherical_weight(rot: &TSpecies, spin: &TSpecies, only: Option<TClass>) -> u128 {
    TClass::ALL
        .iter()
        .filter(|c| only.is_none_or(|o| o == **c))
        .map(|&c| u128::from(rot.get(c)) * u128::from(multiplet_weight(spin, c)))
        .sum()
}

/// The two classes of a three-fold symmetric top's levels.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ThreeFoldClass {
    /// K ≡ 0 (mod 3): A1 and A2 spin functions.
    Ortho,
    /// K ≢ 0 (mod 3): E spin functions.
    Para,
}

impl ThreeFoldClass {
    /// The class of |K|.
    pub fn of(k: u64) -> Self {
        if k % 3 == 0 {
            ThreeFoldClass::Ortho
        } else {
            ThreeFoldClass::Para
        }
    }
}

/// The weights (per M) of the lower "s" and upper "a" inversion components
/// of the (J, |K|) level of a symmetric top with three equivalent nuclei
/// (±K together); `fermion` for half-integer nuclear spin. Merged (no
/// tunnelling) the level weighs their sum.
///
/// ```
/// use zsum::models::spin_species::{three_fold_spin, three_fold_weight};
/// let h3 = three_fold_spin(1)?;
/// assert_eq!(three_fold_weight(&h3, true, 0, 0), (4, 0)); // (0, 0): s only
/// assert_eq!(three_fold_weight(&h3, true, 1, 0), (0, 4)); // (1, 0): a only
/// assert_eq!(three_fold_weight(&h3, true, 3, 3), (4, 4));
/// assert_eq!(three_fold_weight(&h3, true, 2, 1), (2, 2));
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn three_fold_weight(spin: &S3Species, fermion: bool, j: u64, k: u64) -> (u64, u64) {
    if k == 0 {
        let (sym, anti) = (spin.a1, spin.a2);
        if (j % 2 == 0) == fermion {
            (sym, anti)
        } else {
            (anti, sym)
        }
    } else if k % 3 == 0 {
        (spin.a1 + spin.a2, spin.a1 + spin.a2)
    } else {
        (spin.e, spin.e)
    }
}

/// One spin isomer of a model: its name and its number of nuclear-spin
/// functions.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct IsomerInfo {
    /// Its name (`meta`, `para`, `ortho`).
    pub name: &'static str,
    /// How many nuclear-spin functions belong to it.
    pub spin_functions: u64,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn characters_match_the_closed_form() {
        // χ_J(α) = sin((2J+1)α/2)/sin(α/2): at π it is (−1)^J, at π/2 it
        // runs 1, 1, −1, −1 with period 4 (J = 0..3), at π/3 it runs
        // 1, 2, 1, −1, −2, −1 (J = 0..5) (closed form, from memory).
        for j in 0..40u64 {
            assert_eq!(rotation_character(j, 1).unwrap(), 2 * j as i128 + 1);
            let sign = if j % 2 == 0 { 1 } else { -1 };
            assert_eq!(rotation_character(j, 2).unwrap(), sign);
            assert_eq!(
                rotation_character(j, 4).unwrap(),
                [1, 1, -1, -1][j as usize % 4]
            );
            assert_eq!(
                rotation_character(j, 6).unwrap(),
                [1, 2, 1, -1, -2, -1][j as usize % 6]
            );
        }
    }
}
