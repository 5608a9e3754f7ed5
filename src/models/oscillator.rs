//! Vibrations: sets of harmonic modes ([`HarmonicModes`]) and the
//! anharmonic vibration of a diatomic molecule ([`AnharmonicOscillator`]).
//!
//! # Harmonic modes
//! Mode `i` has an energy quantum ω_i (a positive rational, in the model's
//! unit, e.g. cm⁻¹) and a degeneracy d_i (1 for a stretch, 2 for a doubly
//! degenerate bend). With v_i the total number of quanta in mode i,
//!
//! ```text
//! E = Σ_i ω_i (v_i + d_i/2)      with zero-point energy,
//! E = Σ_i ω_i v_i                without (energies from the ground state),
//! ```
//!
//! and v quanta in a d-fold mode make C(v+d−1, d−1) states (the ways of
//! sharing v quanta among d components). A single mode of degeneracy n is
//! the isotropic n-dimensional oscillator.
//!
//! # Anharmonic diatomic vibration
//! Term values as spectroscopists write them,
//!
//! ```text
//! G(v) = we (v+1/2) − wexe (v+1/2)² + weye (v+1/2)³,
//! ```
//!
//! all exact rationals, one state per level.
//!
//! **Which levels are bound (the convention).** Write u = v + 1/2 and read
//! G as a function of a continuous u. Starting from u = 0, G rises (its
//! slope there is we > 0) until its first maximum at u*; past u* the
//! expansion describes nothing physical. The bound levels are those on the
//! rising branch, **v = 0, 1, …, v_max with v_max + 1/2 ≤ u* < v_max + 3/2**.
//! For weye = 0, u* = we/(2 wexe), so
//!
//! ```text
//! v_max = floor(we/(2 wexe) − 1/2),
//! ```
//!
//! the standard textbook count (a level exactly at the maximum, v + 1/2 =
//! we/(2 wexe), is kept). The listed G(v) increase strictly. Note that the
//! rule "keep v while G(v) > G(v−1)" is *not* the same: when the fractional
//! part of we/(2 wexe) lies in (0, 1/2) it keeps one more level, which lies
//! past the maximum (e.g. we/(2 wexe) = 10.3: G(10) > G(9), but v = 10 at
//! u = 10.5 is beyond u* = 10.3); zsum does not list it. For weye ≠ 0,
//! u* is the first positive root of dG/du = we − 2 wexe u + 3 weye u²,
//! found exactly by comparisons (no square roots are taken). When G has no
//! maximum (wexe = weye = 0, or weye > 0 with wexe² ≤ 3 weye we) the ladder
//! never ends and only the cutoff stops it.
//!
//! **Morse.** [`AnharmonicOscillator::morse`] takes the dissociation energy
//! De and we and sets wexe = we²/(4 De), weye = 0, so that G(v) =
//! De − wexe (u − u*)² with u* = 2De/we. The bound levels are those with
//! G(v) < De on the rising branch, i.e. v + 1/2 < 2De/we strictly, giving
//! `v_max = ceil(2De/we − 1/2) − 1`: a level exactly at the dissociation
//! limit (2De/we − 1/2 a whole number) is a threshold state, not a bound
//! one. Apart from that tie this is the standard count floor(2De/we − 1/2) + 1.

use crate::error::{Error, Result};
use crate::exact::{floor_nonneg, format_sig, parse_rational, pow10, rational_string};
use crate::level::{Level, LevelList};
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// Bytes per level in a list (exact energy and degeneracy).
pub(crate) const LEVEL_BYTES: f64 = 128.0;
/// Bytes per listed state, besides its quantum numbers.
pub(crate) const STATE_BYTES: f64 = 64.0;
/// Largest vibrational quantum number zsum represents (quantum numbers are
/// stored as 64-bit integers).
pub const MAX_QUANTUM: u64 = 1 << 62;
/// Largest total number of oscillator components (the sum of the mode
/// degeneracies) a [`HarmonicModes`] accepts.
pub const MAX_COMPONENTS: u64 = 1024;

/// Search steps beyond which [`last_true`] gives up doubling (a guard; the
/// callers' predicates turn false long before).
const MAX_SEARCH_BITS: u64 = 1 << 16;

pub(crate) fn int(n: impl Into<BigInt>) -> BigRational {
    BigRational::from_integer(n.into())
}

pub(crate) fn half() -> BigRational {
    BigRational::new(BigInt::one(), BigInt::from(2))
}

/// Writes an exact rational briefly: as an exact decimal when it is one
/// (`2349.1`, `0.25`), otherwise as a reduced fraction (`1/3`); a value
/// whose exact form would run past 40 characters is written in scientific
/// notation, prefixed with `~` when that rounds it.
pub(crate) fn show(r: &BigRational) -> String {
    let exact = exact_text(r);
    if exact.len() <= 40 {
        return exact;
    }
    let s = format_sig(r, 12);
    let rounded = parse_rational(&s).map_or(true, |v| &v != r);
    // Drop the trailing zeros of the mantissa ("1.00000000000e300" -> "1e300").
    let tidy = match s.split_once('e') {
        Some((m, e)) if m.contains('.') => {
            format!("{}e{e}", m.trim_end_matches('0').trim_end_matches('.'))
        }
        _ => s,
    };
    if rounded {
        format!("~{tidy}")
    } else {
        tidy
    }
}

fn exact_text(r: &BigRational) -> String {
    let mut d = r.denom().clone();
    let (two, five) = (BigInt::from(2), BigInt::from(5));
    let (mut a, mut b) = (0u32, 0u32);
    while d.is_even() && !d.is_zero() {
        d /= &two;
        a += 1;
    }
    while (&d % &five).is_zero() && !d.is_zero() {
        d /= &five;
        b += 1;
    }
    let k = a.max(b);
    if !d.is_one() || k > 40 {
        return rational_string(r);
    }
    if k == 0 {
        return r.numer().to_string();
    }
    let scaled = (r * BigRational::from_integer(pow10(k))).to_integer();
    let digits = format!("{:0>width$}", scaled.abs(), width = k as usize + 1);
    let (i, f) = digits.split_at(digits.len() - k as usize);
    let sign = if scaled.is_negative() { "-" } else { "" };
    format!("{sign}{i}.{}", f.trim_end_matches('0'))
}

/// The largest `n` in `0..=hi` (no upper limit if `hi` is `None`) for which
/// `pred(n)` holds, where `pred` is true on an initial segment and false
/// after it; `None` if `pred(0)` is false. The search starts at `hint` and
/// gallops (doubling steps) before bisecting, so it costs O(log |answer −
/// hint|) evaluations.
pub(crate) fn last_true(
    pred: impl Fn(&BigInt) -> bool,
    hi: Option<&BigInt>,
    hint: &BigInt,
) -> Option<BigInt> {
    let zero = BigInt::zero();
    if hi.is_some_and(|h| h < &zero) {
        return None;
    }
    let mut h = hint.max(&zero).clone();
    if let Some(top) = hi {
        if &h > top {
            h = top.clone();
        }
    }
    let (mut lo, mut up);
    if pred(&h) {
        lo = h;
        let mut step = BigInt::one();
        loop {
            let mut c = &lo + &step;
            if let Some(top) = hi {
                if &lo == top {
                    return Some(lo);
                }
                if &c > top {
                    c = top.clone();
                }
            }
            if pred(&c) {
                lo = c;
                step <<= 1;
                if step.bits() > MAX_SEARCH_BITS {
                    return Some(lo);
                }
            } else {
                up = c;
                break;
            }
        }
    } else {
        if h.is_zero() {
            return None;
        }
        up = h;
        let mut step = BigInt::one();
        loop {
            let c = (&up - &step).max(zero.clone());
            if pred(&c) {
                lo = c;
                break;
            }
            if c.is_zero() {
                return None;
            }
            up = c;
            step <<= 1;
        }
    }
    // pred(lo) holds, pred(up) fails, lo < up.
    while &up - &lo > BigInt::one() {
        let mid: BigInt = (&lo + &up) >> 1;
        if pred(&mid) {
            lo = mid;
        } else {
            up = mid;
        }
    }
    Some(lo)
}

/// The gcd of two positive rationals: the largest rational of which both are
/// whole multiples.
fn rational_gcd(a: &BigRational, b: &BigRational) -> BigRational {
    BigRational::new(a.numer().gcd(b.numer()), a.denom().lcm(b.denom()))
}

/// A name for component `c` (0-based) of a degenerate mode: a, b, …, z, aa,
/// ab, …
fn component_letters(c: usize) -> String {
    let mut n = c + 1;
    let mut s = Vec::new();
    while n > 0 {
        let r = (n - 1) % 26;
        s.push(b'a' + r as u8);
        n = (n - 1) / 26;
    }
    s.reverse();
    String::from_utf8(s).unwrap_or_default()
}

fn degeneracy_word(d: u32) -> String {
    match d {
        1 => "non-degenerate".to_string(),
        2 => "doubly degenerate".to_string(),
        3 => "triply degenerate".to_string(),
        _ => format!("{d}-fold degenerate"),
    }
}

/// A set of independent harmonic modes, each with a positive rational
/// energy quantum and a degeneracy, with or without zero-point energy.
///
/// ```
/// use zsum::models::oscillator::HarmonicModes;
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// use num_rational::BigRational;
/// let e = |n: i64| BigRational::from_integer(n.into());
/// // The isotropic 3D oscillator: (v+1)(v+2)/2 states at E = v ω.
/// let osc = HarmonicModes::isotropic(e(1), 3, false, EnergyUnit::Wavenumber).unwrap();
/// let levels = osc.levels_up_to(&e(3)).unwrap();
/// let degs: Vec<String> = levels.iter().map(|l| l.degeneracy.to_string()).collect();
/// assert_eq!(degs, ["1", "3", "6", "10"]);
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct HarmonicModes {
    modes: Vec<(BigRational, u32)>,
    zero_point: bool,
    unit: EnergyUnit,
}

impl HarmonicModes {
    /// Modes given as `(quantum, degeneracy)` pairs: every quantum greater
    /// than zero, every degeneracy at least 1, at least one mode, and at
    /// most [`MAX_COMPONENTS`] components in all. With `zero_point` the
    /// energies include Σ ω_i d_i / 2; without it the ground state is at 0.
    pub fn new(modes: Vec<(BigRational, u32)>, zero_point: bool, unit: EnergyUnit) -> Result<Self> {
        if modes.is_empty() {
            return Err(Error::invalid(
                "number of modes",
                0,
                "give at least one harmonic mode",
            ));
        }
        let mut components = 0u64;
        for (i, (w, d)) in modes.iter().enumerate() {
            if !w.is_positive() {
                return Err(Error::invalid(
                    &format!("frequency of mode {}", i + 1),
                    show(w),
                    "every mode frequency (its energy quantum) must be greater than zero",
                ));
            }
            if *d == 0 {
                return Err(Error::invalid(
                    &format!("degeneracy of mode {}", i + 1),
                    d,
                    "a mode degeneracy is a whole number of at least 1 (1 for a stretch, 2 for \
                     a doubly degenerate bend)",
                ));
            }
            components += u64::from(*d);
        }
        if components > MAX_COMPONENTS {
            return Err(Error::invalid(
                "total number of oscillator components",
                components,
                &format!("the mode degeneracies may add up to at most {MAX_COMPONENTS}"),
            ));
        }
        Ok(HarmonicModes {
            modes,
            zero_point,
            unit,
        })
    }

    /// The one-dimensional harmonic oscillator with quantum `freq`.
    pub fn one_d(freq: BigRational, zero_point: bool, unit: EnergyUnit) -> Result<Self> {
        HarmonicModes::new(vec![(freq, 1)], zero_point, unit)
    }

    /// The isotropic oscillator in `dims` dimensions (one mode of degeneracy
    /// `dims`): C(v+dims−1, dims−1) states with v quanta.
    pub fn isotropic(
        freq: BigRational,
        dims: u32,
        zero_point: bool,
        unit: EnergyUnit,
    ) -> Result<Self> {
        if dims == 0 {
            return Err(Error::invalid(
                "number of dimensions",
                dims,
                "an isotropic oscillator has at least 1 dimension",
            ));
        }
        HarmonicModes::new(vec![(freq, dims)], zero_point, unit)
    }

    /// The modes as `(quantum, degeneracy)` pairs, in the order given.
    pub fn modes(&self) -> &[(BigRational, u32)] {
        &self.modes
    }

    /// Whether energies include the zero-point energy.
    pub fn zero_point(&self) -> bool {
        self.zero_point
    }

    /// The number of components (the sum of the mode degeneracies): the
    /// number of quantum numbers of a state.
    pub fn components(&self) -> usize {
        self.modes.iter().map(|(_, d)| *d as usize).sum()
    }

    /// The number of states of `v` quanta in a mode of degeneracy `d`:
    /// C(v+d−1, d−1) (zero for `d = 0`).
    pub fn mode_degeneracy(d: u32, v: u64) -> BigUint {
        if d == 0 {
            return BigUint::zero();
        }
        let mut c = BigUint::one();
        for k in 1..u64::from(d) {
            c = c * BigUint::from(v + k) / BigUint::from(k);
        }
        c
    }

    /// The levels of mode `i` alone with `0..=top` quanta, energies counted
    /// from its own ground state.
    fn mode_list(&self, i: usize, top: u64) -> LevelList {
        let (w, d) = &self.modes[i];
        let mut levels = Vec::with_capacity(top.min(1 << 20) as usize + 1);
        let mut c = BigUint::one();
        for v in 0..=top {
            if v > 0 {
                c = c * BigUint::from(v + u64::from(*d) - 1) / BigUint::from(v);
            }
            levels.push(Level::new(w * int(v), c.clone()));
        }
        LevelList::from_sorted(self.unit.clone(), levels)
    }

    /// An upper bound on the number of levels held at once while forming
    /// the products up to excitation energy `x`, from three counts: the box
    /// Π (floor(x/ω_i)+1), the simplex volume (see `count_bound`) and the
    /// lattice bound floor(x/g)+1 with g the gcd of the quanta.
    fn estimated_peak(&self, x: &BigRational, tops: &[BigUint]) -> f64 {
        let xf = x.to_f64().unwrap_or(f64::INFINITY);
        let n: Vec<f64> = tops
            .iter()
            .map(|t| t.to_f64().unwrap_or(f64::INFINITY) + 1.0)
            .collect();
        let mut list = n[0];
        let mut peak = n[0];
        let mut box_count = n[0];
        let mut sum_w = self.modes[0].0.to_f64().unwrap_or(0.0);
        let mut ln_prod_w = sum_w.ln();
        let mut ln_fact = 0.0f64;
        let mut g = self.modes[0].0.clone();
        for (j, ((w, _), &nj)) in self.modes.iter().zip(&n).enumerate().skip(1) {
            let wf = w.to_f64().unwrap_or(0.0);
            box_count *= nj;
            sum_w += wf;
            ln_prod_w += wf.ln();
            ln_fact += ((j + 1) as f64).ln();
            let simplex = ((j + 1) as f64 * (xf + sum_w).ln() - ln_fact - ln_prod_w).exp();
            let tuples = box_count.min(simplex);
            let pairs = tuples.min(list * nj);
            g = rational_gcd(&g, w);
            let lattice = floor_nonneg(&(x / &g)).to_f64().unwrap_or(f64::INFINITY) + 1.0;
            list = tuples.min(lattice).min(pairs);
            peak = peak.max(pairs + list);
        }
        peak
    }

    /// Per-mode quantum limits up to excitation energy `x`, after checking
    /// the work against `budget`.
    fn prepare(&self, x: &BigRational, budget: &Budget, what: &str) -> Result<Vec<u64>> {
        let tops: Vec<BigUint> = self
            .modes
            .iter()
            .map(|(w, _)| floor_nonneg(&(x / w)))
            .collect();
        let peak = self.estimated_peak(x, &tops);
        budget.check_levels(what, peak, LEVEL_BYTES * 2.0, "give a lower cutoff")?;
        tops.iter()
            .map(|t| {
                t.to_u64().filter(|&t| t < MAX_QUANTUM).ok_or_else(|| {
                    Error::budget(format!(
                        "{what} would need more than {MAX_QUANTUM} quanta in one mode; give a \
                         lower cutoff"
                    ))
                })
            })
            .collect()
    }

    /// Every tuple of mode quanta with excitation at most `rem` (from mode
    /// `cur.len()` on), pushed with its energy `e` plus that excitation.
    fn every_tuple(
        &self,
        rem: &BigRational,
        e: &BigRational,
        cur: &mut Vec<i64>,
        out: &mut Vec<(BigRational, Vec<i64>)>,
    ) {
        let Some((w, _)) = self.modes.get(cur.len()) else {
            out.push((e.clone(), cur.clone()));
            return;
        };
        let mut v = 0;
        let mut used = BigRational::zero();
        while &used <= rem {
            cur.push(v);
            self.every_tuple(&(rem - &used), &(e + &used), cur, out);
            cur.pop();
            v += 1;
            used += w;
        }
    }

    /// Finds every tuple of mode quanta whose excitation energy is exactly
    /// `rem` (from mode `j` on), using `suffix[j+1]` (the energies reachable
    /// by the later modes) to prune: every branch followed ends in a tuple.
    fn find_tuples(
        &self,
        j: usize,
        rem: &BigRational,
        suffix: &[LevelList],
        tops: &[u64],
        cur: &mut Vec<u64>,
        out: &mut Vec<Vec<u64>>,
    ) {
        if j == self.modes.len() {
            if rem.is_zero() {
                out.push(cur.clone());
            }
            return;
        }
        let w = &self.modes[j].0;
        let top = floor_nonneg(&(rem / w))
            .to_u64()
            .unwrap_or(u64::MAX)
            .min(tops[j]);
        for v in 0..=top {
            let r = rem - w * int(v);
            let reachable = suffix[j + 1]
                .levels()
                .binary_search_by(|l| l.energy.cmp(&r))
                .is_ok();
            if reachable {
                cur.push(v);
                self.find_tuples(j + 1, &r, suffix, tops, cur, out);
                cur.pop();
            }
        }
    }
}

/// Every way of sharing `v` quanta among `d` components, in lexicographic
/// order.
fn compositions(v: u64, d: usize) -> Vec<Vec<i64>> {
    fn rec(left: u64, d: usize, cur: &mut Vec<i64>, out: &mut Vec<Vec<i64>>) {
        if d == 1 {
            cur.push(left as i64);
            out.push(cur.clone());
            cur.pop();
            return;
        }
        for first in 0..=left {
            cur.push(first as i64);
            rec(left - first, d - 1, cur, out);
            cur.pop();
        }
    }
    let mut out = Vec::new();
    rec(v, d.max(1), &mut Vec::with_capacity(d), &mut out);
    out
}

impl Spectrum for HarmonicModes {
    fn describe(&self) -> String {
        let zp = if self.zero_point {
            "with zero-point energy"
        } else {
            "energies from the ground state"
        };
        match self.modes.as_slice() {
            [(w, 1)] => format!(
                "1D harmonic oscillator, quantum {} {}, {zp}",
                show(w),
                self.unit
            ),
            [(w, d)] => format!(
                "isotropic {d}D harmonic oscillator, quantum {} {}, {zp}",
                show(w),
                self.unit
            ),
            modes => {
                let parts: Vec<String> = modes
                    .iter()
                    .map(|(w, d)| {
                        if *d == 1 {
                            show(w)
                        } else {
                            format!("{} ({})", show(w), degeneracy_word(*d))
                        }
                    })
                    .collect();
                format!(
                    "{} harmonic modes, quanta {} {}, {zp}",
                    modes.len(),
                    parts.join(", "),
                    self.unit
                )
            }
        }
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    /// `v1`, `v2`, … for non-degenerate modes; `v{i}a`, `v{i}b`, … (one
    /// occupation number per component) for a degenerate mode `i`.
    fn quantum_numbers(&self) -> Vec<String> {
        let mut names = Vec::new();
        for (i, (_, d)) in self.modes.iter().enumerate() {
            if *d == 1 {
                names.push(format!("v{}", i + 1));
            } else {
                for c in 0..*d as usize {
                    names.push(format!("v{}{}", i + 1, component_letters(c)));
                }
            }
        }
        names
    }

    fn ground_energy(&self) -> BigRational {
        if !self.zero_point {
            return BigRational::zero();
        }
        self.modes
            .iter()
            .map(|(w, d)| w * int(*d) * half())
            .fold(BigRational::zero(), |a, b| a + b)
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let e0 = self.ground_energy();
        let x = cutoff - &e0;
        let tops = self.prepare(
            &x,
            budget,
            &format!("listing the oscillator levels up to {}", show(cutoff)),
        )?;
        let mut acc = self.mode_list(0, tops[0]);
        for (i, &top) in tops.iter().enumerate().skip(1) {
            acc = acc.product_up_to(&self.mode_list(i, top), &x)?;
        }
        Ok(acc.shifted(&e0))
    }

    /// `v1`, `v2`, …: the quanta in each mode (a degenerate mode's total
    /// over its components).
    fn term_numbers(&self) -> Vec<String> {
        (1..=self.modes.len()).map(|i| format!("v{i}")).collect()
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        check_cutoff(self, cutoff)?;
        let e0 = self.ground_energy();
        let x = cutoff - &e0;
        let what = format!("listing the vibrational terms up to {}", show(cutoff));
        self.prepare(&x, budget, &what)?;
        // Each term holds at least one state, so the state bound bounds them.
        let terms = self.count_bound(cutoff).to_f64().unwrap_or(f64::INFINITY);
        budget.check(
            &what,
            terms * (STATE_BYTES + 8.0 * self.modes.len() as f64),
            "give a lower cutoff",
        )?;
        let mut out = Vec::new();
        let mut cur = Vec::with_capacity(self.modes.len());
        self.every_tuple(&x, &e0, &mut cur, &mut out);
        Ok(out)
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let e0 = self.ground_energy();
        if energy < &e0 {
            return Ok(Vec::new());
        }
        let x = energy - &e0;
        let what = format!("finding the states at {}", show(energy));
        let tops = self.prepare(&x, &Budget::default(), &what)?;
        let k = self.modes.len();
        // suffix[j]: the excitation energies of modes j.. up to x.
        let mut suffix = vec![LevelList::empty(self.unit.clone()); k + 1];
        suffix[k] = LevelList::from_sorted(
            self.unit.clone(),
            vec![Level::new(BigRational::zero(), 1u32)],
        );
        for j in (0..k).rev() {
            suffix[j] = self
                .mode_list(j, tops[j])
                .product_up_to(&suffix[j + 1], &x)?;
        }
        let degeneracy = match suffix[0].levels().binary_search_by(|l| l.energy.cmp(&x)) {
            Ok(i) => suffix[0].levels()[i].degeneracy.clone(),
            Err(_) => return Ok(Vec::new()),
        };
        let n = self.components() as f64;
        Budget::default().check(
            format!("listing the {degeneracy} states at {}", show(energy)),
            degeneracy.to_f64().unwrap_or(f64::INFINITY) * (STATE_BYTES + 8.0 * n),
            "choose a lower level",
        )?;
        let mut tuples = Vec::new();
        self.find_tuples(0, &x, &suffix, &tops, &mut Vec::new(), &mut tuples);
        let mut states = Vec::new();
        for t in tuples {
            let mut partial: Vec<Vec<i64>> = vec![Vec::new()];
            for (v, (_, d)) in t.iter().zip(&self.modes) {
                let comps = compositions(*v, *d as usize);
                let mut next = Vec::with_capacity(partial.len() * comps.len());
                for p in &partial {
                    for c in &comps {
                        let mut s = p.clone();
                        s.extend_from_slice(c);
                        next.push(s);
                    }
                }
                partial = next;
            }
            states.extend(partial.into_iter().map(State));
        }
        states.sort();
        Ok(states)
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Harmonic(self.modes().to_vec(), self.zero_point())
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(self.components() as f64)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        let e0 = self.ground_energy();
        if energy < &e0 {
            return BigUint::zero();
        }
        let x = energy - &e0;
        // Two rigorous bounds; the answer is the smaller.
        //
        // Box: every component j (quantum ω_j) of a state with excitation
        // Σ ω_j v_j ≤ x has ω_j v_j ≤ x, so v_j ∈ 0..=floor(x/ω_j); there
        // are at most Π_j (floor(x/ω_j) + 1) such states.
        //
        // Simplex: give the state v ∈ ℤⁿ_{≥0} (n components) the unit cell
        // [v, v+1) = Π_j [v_j, v_j+1). Cells of distinct states are disjoint
        // and each has volume 1. A point y of the cell has y ≥ 0 and
        // Σ ω_j y_j < Σ ω_j (v_j + 1) ≤ x + Σ ω_j, so the cell lies in the
        // simplex S = {y ≥ 0 : Σ ω_j y_j ≤ x + Σ ω_j}, whose volume is
        // (x + Σ ω_j)ⁿ / (n! Π ω_j). Hence N(E) ≤ vol(S), and as N(E) is an
        // integer, N(E) ≤ floor(vol(S)).
        let mut boxed = BigUint::one();
        let mut sum_w = BigRational::zero();
        let mut prod_w = BigRational::one();
        for (w, d) in &self.modes {
            let per = floor_nonneg(&(&x / w)) + BigUint::one();
            boxed *= num_traits::pow(per, *d as usize);
            sum_w += w * int(*d);
            prod_w *= num_traits::pow(w.clone(), *d as usize);
        }
        let n = self.components();
        let fact: BigInt = (1..=n as u64).map(BigInt::from).product();
        let simplex = num_traits::pow(&x + &sum_w, n) / (prod_w * BigRational::from_integer(fact));
        boxed.min(floor_nonneg(&simplex))
    }
}

/// The vibration of a diatomic molecule, from the spectroscopic expansion
/// G(v) = we(v+1/2) − wexe(v+1/2)² + weye(v+1/2)³ or from a Morse
/// potential, listing only the bound levels (see the [module
/// docs](self) for the convention).
///
/// ```
/// use zsum::models::oscillator::AnharmonicOscillator;
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// use num_rational::BigRational;
/// let e = |n: i64| BigRational::from_integer(n.into());
/// // we/(2 wexe) = 10: levels v = 0..=9 (floor(10 − 1/2) = 9).
/// let osc = AnharmonicOscillator::new(e(1000), e(50), e(0), EnergyUnit::Wavenumber).unwrap();
/// assert_eq!(osc.v_max(), Some(9));
/// assert_eq!(osc.levels_up_to(&e(100_000)).unwrap().len(), 10);
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct AnharmonicOscillator {
    we: BigRational,
    wexe: BigRational,
    weye: BigRational,
    /// The Morse dissociation energy, for a Morse oscillator.
    morse_de: Option<BigRational>,
    v_max: Option<u64>,
    unit: EnergyUnit,
}

impl AnharmonicOscillator {
    /// The expansion G(v) = we(v+1/2) − wexe(v+1/2)² + weye(v+1/2)³ (give
    /// `weye = 0` for the two-term form). Requires we > 0, wexe ≥ 0, and at
    /// least the level v = 0 on the rising branch of G (for weye = 0:
    /// wexe ≤ we).
    pub fn new(
        we: BigRational,
        wexe: BigRational,
        weye: BigRational,
        unit: EnergyUnit,
    ) -> Result<Self> {
        check_we(&we)?;
        if wexe.is_negative() {
            return Err(Error::invalid(
                "wexe",
                show(&wexe),
                "the anharmonicity constant must be zero or positive",
            ));
        }
        let mut osc = AnharmonicOscillator {
            we,
            wexe,
            weye,
            morse_de: None,
            v_max: None,
            unit,
        };
        if osc.has_maximum() {
            let top = last_true(|v| osc.on_rising_branch(v), None, &BigInt::zero());
            let (what, value) = osc.anharmonicity_name();
            let top = match top {
                Some(t) => t,
                None => {
                    let advice = if osc.weye.is_zero() {
                        "lower wexe (with weye = 0 it may be at most we)"
                    } else {
                        "make wexe or weye smaller in size"
                    };
                    return Err(Error::invalid(
                        &what,
                        value,
                        &format!(
                            "with we = {} the term values G(v) reach their maximum before \
                             v = 0, so no vibrational level is bound; {advice}",
                            show(&osc.we),
                        ),
                    ));
                }
            };
            osc.v_max = Some(checked_quantum(&top, &what, &value)?);
        }
        Ok(osc)
    }

    /// How errors name the anharmonicity: `wexe` alone when weye = 0.
    fn anharmonicity_name(&self) -> (String, String) {
        if self.weye.is_zero() {
            ("wexe".to_string(), show(&self.wexe))
        } else {
            (
                "anharmonicity (wexe, weye)".to_string(),
                format!("({}, {})", show(&self.wexe), show(&self.weye)),
            )
        }
    }

    /// The Morse oscillator with harmonic constant `we` and dissociation
    /// energy `de` (measured from the potential minimum, like G):
    /// wexe = we²/(4 De), weye = 0. The bound levels are those with
    /// G(v) < De, v = 0, …, ceil(2De/we − 1/2) − 1; requires we > 0 and
    /// De > we/4 (else no level is bound).
    pub fn morse(we: BigRational, de: BigRational, unit: EnergyUnit) -> Result<Self> {
        check_we(&we)?;
        if !de.is_positive() {
            return Err(Error::invalid(
                "dissociation energy De",
                show(&de),
                "it must be greater than zero",
            ));
        }
        let quarter_we = &we / int(4);
        if de <= quarter_we {
            return Err(Error::invalid(
                "dissociation energy De",
                show(&de),
                &format!(
                    "with we = {} no vibrational level lies below it: a Morse oscillator binds a \
                     level only if De > we/4 = {}",
                    show(&we),
                    show(&quarter_we)
                ),
            ));
        }
        let wexe = &we * &we / (int(4) * &de);
        // v + 1/2 < 2De/we  ⇔  v ≤ ceil(2De/we − 1/2) − 1.
        let y = int(2) * &de / &we - half();
        let top = y.ceil().to_integer() - BigInt::one();
        let v_max = checked_quantum(&top, "dissociation energy De", &show(&de))?;
        Ok(AnharmonicOscillator {
            we,
            wexe,
            weye: BigRational::zero(),
            morse_de: Some(de),
            v_max: Some(v_max),
            unit,
        })
    }

    /// The harmonic constant we.
    pub fn we(&self) -> &BigRational {
        &self.we
    }

    /// The anharmonicity constant wexe.
    pub fn wexe(&self) -> &BigRational {
        &self.wexe
    }

    /// The second anharmonicity constant weye (zero unless given).
    pub fn weye(&self) -> &BigRational {
        &self.weye
    }

    /// The Morse dissociation energy De, for an oscillator built by
    /// [`AnharmonicOscillator::morse`].
    pub fn dissociation_energy(&self) -> Option<&BigRational> {
        self.morse_de.as_ref()
    }

    /// The last bound level; `None` when G increases for ever (no
    /// anharmonicity, or a weye that keeps G rising) and only the cutoff
    /// ends the ladder.
    pub fn v_max(&self) -> Option<u64> {
        self.v_max
    }

    /// The number of bound levels, v_max + 1; `None` for an endless ladder.
    pub fn bound_levels(&self) -> Option<u64> {
        self.v_max.map(|v| v + 1)
    }

    /// The term value G(v), exactly (whether or not v is bound).
    pub fn term_value(&self, v: u64) -> BigRational {
        self.g(&BigInt::from(v))
    }

    pub(crate) fn g(&self, v: &BigInt) -> BigRational {
        // With w = 2v + 1 and L the common denominator of the constants,
        // G = (4 we L w − 2 wexe L w² + weye L w³) / (8 L): integer products
        // and one reduction instead of a chain of reduced rational products
        // (this runs inside every search over v).
        use num_integer::Integer;
        let l = self
            .we
            .denom()
            .lcm(self.wexe.denom())
            .lcm(self.weye.denom());
        let on = |r: &BigRational| r.numer() * (&l / r.denom());
        let w = v * 2u32 + 1u32;
        let w2 = &w * &w;
        let num =
            on(&self.we) * &w * 4u32 - on(&self.wexe) * &w2 * 2u32 + on(&self.weye) * &w2 * &w;
        BigRational::new(num, l * 8u32)
    }

    /// Whether G, as a function of continuous u = v + 1/2, has a maximum
    /// for u > 0 (its slope we − 2 wexe u + 3 weye u² turns negative).
    fn has_maximum(&self) -> bool {
        if self.weye.is_zero() {
            self.wexe.is_positive()
        } else if self.weye.is_negative() {
            true
        } else {
            // weye > 0: the slope (an upward parabola, positive at u = 0)
            // dips below zero iff its discriminant is positive.
            &self.wexe * &self.wexe > int(3) * &self.weye * &self.we
        }
    }

    /// Whether u = v + 1/2 lies at or before the first maximum u* of G.
    fn on_rising_branch(&self, v: &BigInt) -> bool {
        let u = BigRational::from_integer(v.clone()) + half();
        let slope = &self.we - int(2) * &self.wexe * &u + int(3) * &self.weye * &u * &u;
        // For weye > 0 the slope is non-negative before its first root and
        // again after its second; the first branch is the one with
        // u ≤ wexe/(3 weye), the slope's own minimum.
        !slope.is_negative() && (!self.weye.is_positive() || int(3) * &self.weye * &u <= self.wexe)
    }

    /// The number of bound levels with G(v) ≤ `e` (G increases strictly on
    /// the bound levels).
    pub(crate) fn count_levels_up_to(&self, e: &BigRational) -> BigInt {
        let hi = self.v_max.map(BigInt::from);
        match last_true(|v| &self.g(v) <= e, hi.as_ref(), &BigInt::zero()) {
            Some(v) => v + 1,
            None => BigInt::zero(),
        }
    }
}

fn check_we(we: &BigRational) -> Result<()> {
    if !we.is_positive() {
        return Err(Error::invalid(
            "we",
            show(we),
            "the harmonic vibrational constant must be greater than zero",
        ));
    }
    Ok(())
}

fn checked_quantum(v: &BigInt, what: &str, value: &str) -> Result<u64> {
    v.to_u64().filter(|&v| v <= MAX_QUANTUM).ok_or_else(|| {
        Error::invalid(
            what,
            value,
            &format!(
                "it puts the last bound level beyond v = {MAX_QUANTUM}, more than zsum \
                 represents; give a larger anharmonicity"
            ),
        )
    })
}

impl Spectrum for AnharmonicOscillator {
    fn describe(&self) -> String {
        let levels = match self.v_max {
            Some(v) => format!("{} bound levels, v = 0..{v}", v + 1),
            None => "no last bound level (G increases for ever)".to_string(),
        };
        match &self.morse_de {
            Some(de) => format!(
                "Morse oscillator, we = {}, De = {} {} (wexe = we^2/(4 De) = {}), {levels}",
                show(&self.we),
                show(de),
                self.unit,
                show(&self.wexe)
            ),
            None => {
                let y = if self.weye.is_zero() {
                    String::new()
                } else {
                    format!(", weye = {}", show(&self.weye))
                };
                format!(
                    "anharmonic oscillator, we = {}, wexe = {}{y} {}, {levels}",
                    show(&self.we),
                    show(&self.wexe),
                    self.unit
                )
            }
        }
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        vec!["v".to_string()]
    }

    fn ground_energy(&self) -> BigRational {
        self.g(&BigInt::zero())
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        check_cutoff(self, cutoff)?;
        let n = self.count_levels_up_to(cutoff);
        budget.check_levels(
            format!("listing the vibrational levels up to {}", show(cutoff)),
            n.to_f64().unwrap_or(f64::INFINITY),
            LEVEL_BYTES,
            "give a lower cutoff",
        )?;
        let n = n.to_u64().ok_or_else(|| {
            Error::budget(format!(
                "listing the {n} vibrational levels up to {} is beyond zsum; give a lower cutoff",
                show(cutoff)
            ))
        })?;
        let levels = (0..n)
            .map(|v| Level::new(self.term_value(v), 1u32))
            .collect();
        Ok(LevelList::new(self.unit.clone(), levels))
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["v".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        // Bound levels only, one per v (the listing's own count and budget).
        let n = self.levels_within(cutoff, budget)?.len() as u64;
        Ok((0..n)
            .map(|v| (self.term_value(v), vec![v as i64]))
            .collect())
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let n = self.count_levels_up_to(energy);
        if n.is_zero() {
            return Ok(Vec::new());
        }
        let v = n - BigInt::one();
        if &self.g(&v) != energy {
            return Ok(Vec::new());
        }
        let v = v.to_i64().ok_or_else(|| {
            Error::invalid(
                "energy",
                show(energy),
                "its level number is beyond the range of quantum numbers (2^63)",
            )
        })?;
        Ok(vec![State(vec![v])])
    }

    fn highest_energy(&self) -> Option<BigRational> {
        self.v_max().map(|v| self.term_value(v))
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.0)
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Exact: G increases strictly on the bound levels, so the count is
        // one more than the last v with G(v) ≤ E (found by bisection).
        self.count_levels_up_to(energy)
            .to_biguint()
            .unwrap_or_default()
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let Some(v) = self.v_max else {
            return Vec::new();
        };
        let top = self.term_value(v);
        if cutoff <= &top {
            return Vec::new();
        }
        let why = match &self.morse_de {
            Some(de) => format!("the dissociation energy is De = {} {}", show(de), self.unit),
            None => "past it G(v) would fall".to_string(),
        };
        vec![format!(
            "levels end at v = {v}, the last bound level; E({v}) = {} {}, below the cutoff {} ({why})",
            show(&top),
            self.unit,
            show(cutoff)
        )]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn show_writes_exact_decimals_or_fractions() {
        let r = |n: i64, d: i64| BigRational::new(n.into(), d.into());
        assert_eq!(show(&r(23491, 10)), "2349.1");
        assert_eq!(show(&r(1, 4)), "0.25");
        assert_eq!(show(&r(-3, 8)), "-0.375");
        assert_eq!(show(&r(1, 3)), "1/3");
        assert_eq!(show(&r(667, 1)), "667");
        let big = parse_rational("1e300").unwrap();
        assert_eq!(show(&big), "1e300");
        assert_eq!(show(&big.recip()), "1e-300");
        assert_eq!(show(&(big.recip() / r(3, 1))), "~3.33333333333e-301");
    }

    #[test]
    fn last_true_finds_the_boundary_from_any_hint() {
        for target in [0i64, 1, 2, 7, 100, 1023, 1024, 99_999] {
            for hint in [0i64, 1, 5, 100, 5000, 1 << 20] {
                let got = last_true(|n| n <= &BigInt::from(target), None, &BigInt::from(hint));
                assert_eq!(got, Some(BigInt::from(target)));
                let capped = last_true(
                    |n| n <= &BigInt::from(target),
                    Some(&BigInt::from(50)),
                    &BigInt::from(hint),
                );
                assert_eq!(capped, Some(BigInt::from(target.min(50))));
            }
        }
        assert_eq!(last_true(|_| false, None, &BigInt::from(9)), None);
    }

    #[test]
    fn component_letters_go_past_z() {
        assert_eq!(component_letters(0), "a");
        assert_eq!(component_letters(25), "z");
        assert_eq!(component_letters(26), "aa");
        assert_eq!(component_letters(27), "ab");
    }
}

#[cfg(test)]
mod g_tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        /// G(v) on one common denominator equals the plain rational
        /// expansion we u − wexe u² + weye u³, u = v + 1/2.
        #[test]
        fn g_matches_the_plain_expansion(
            we in 1i64..10_000_000, wexe in 0i64..100_000, weye in -1000i64..1000,
            d1 in 0u32..9, d2 in 0u32..12, d3 in 0u32..15, v in 0u64..100_000,
        ) {
            let r = |n: i64, e: u32| BigRational::new(BigInt::from(n), BigInt::from(10i64.pow(e)));
            let osc = AnharmonicOscillator {
                we: r(we, d1),
                wexe: r(wexe, d2),
                weye: r(weye, d3),
                morse_de: None,
                v_max: None,
                unit: EnergyUnit::Wavenumber,
            };
            let u = BigRational::from_integer(BigInt::from(v)) + half();
            let plain = &osc.we * &u - &osc.wexe * &u * &u + &osc.weye * &u * &u * &u;
            prop_assert_eq!(osc.g(&BigInt::from(v)), plain);
        }
    }
}
