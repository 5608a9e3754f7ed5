//! Open-shell diatomic rotation: the ²Π doublet (nitric oxide, hydroxyl)
//! in Hund's case (a) or in intermediate coupling, and the ³Σ⁻ triplet
//! (molecular oxygen) with spin–spin and spin–rotation coupling.
//!
//! Every energy is one of the exact numbers `p + s·½√r` (p, r rational,
//! s = −1, 0 or +1): the eigenvalues of a 2×2 block. Where r is not a
//! rational square the level is listed as a certified enclosure, narrowed
//! from exact integer square roots to any number of bits, as the asymmetric
//! top's eigenvalues are (see [`crate::level`]).
//!
//! # ²Π (Λ = 1, S = 1/2): [`PiDoublet`]
//! With x = J + ½ and the spin–orbit constant A (A > 0 regular, A < 0
//! inverted):
//!
//! ```text
//! case (a):      E(Ω, J) = A·Σ + B u − D u²,   u = J(J+1) − Ω²,  Σ = Ω − 1 = ∓½,
//!                Ω = ½ (J ≥ ½) and Ω = 3/2 (J ≥ 3/2)
//! intermediate:  F1,2(J) = B u ∓ ½√(4B²x² + A(A − 4B)) − D u²,   u = x² − 1
//! ```
//!
//! The intermediate form is the exact pair of eigenvalues of the 2×2 block
//! of each J in the case (a) basis (the standard Hill–Van Vleck result,
//! from memory; `tests/crosscheck/open_shell_oracle.py` re-derives it
//! numerically):
//!
//! ```text
//! ⟨²Π½|H|²Π½⟩ = −A/2 + B x²,   ⟨²Π3/2|H|²Π3/2⟩ = A/2 + B (x² − 2),   ⟨²Π½|H|²Π3/2⟩ = −B √(x² − 1)
//! ```
//!
//! F1 is the lower root, F2 the upper. J = ½ has only the Ω = ½ state: one
//! level, exactly B − A/2, which is the F1 root when A ≥ 2B and the F2
//! root otherwise (the radicand is then (A − 2B)²). The centrifugal term
//! −D u² is this module's choice (not a published form): the trace part
//! B u of the block's mean rotational energy, squared, applied to both
//! roots alike; it vanishes at J = ½ and with D = 0 the roots are exact.
//! Each (ladder, J) level holds 2(2J+1) states: the two Λ-doubling
//! components, left unsplit, times M.
//!
//! # ³Σ⁻ (S = 1): [`SigmaTriplet`]
//! With x = J(J+1), h = B − λ − γ/2 and energies measured from the
//! F2 convention (F2 = B N(N+1)):
//!
//! ```text
//! F2 (N = J):             B x
//! F1 (N = J−1), F3 (N = J+1):  B x + h ∓ √(h² + (2B − γ)² x),   J ≥ 1
//! J = 0 (N = 1, F3):      2h = 2B − 2λ − γ
//! ```
//!
//! the exact eigenvalues of the spin–spin (2/3)λ(3S_z² − S²) and
//! spin–rotation γ N·S Hamiltonian's 2×2 block of each J (derived here in
//! the case (a) basis; the oracle diagonalises the 3×3 case (a) matrix
//! numerically). With γ = 0 these are Schlapp's formulas (from memory);
//! Schlapp's spin–rotation terms, γ(N+1) for F1 and −γN for F3, are their
//! first order in γ only at λ = 0, and otherwise differ from the exact
//! roots by a fraction of γ (a sixth of it for oxygen's N = 2). For N = 1, J = 0 the
//! block has a single row and the energy is 2B − 2λ − γ for every λ
//! (Schlapp's square root, taken positive, would give −γ when λ > B).
//! Each level holds 2J+1 states; for oxygen-16 only odd N occur.
//!
//! # Energy origin
//! The lowest level's energy is irrational in general (hydroxyl's F1,
//! J = 3/2; oxygen with every N, J = 1), and the summation engine needs an
//! exact ground level. So both models measure every energy **from their
//! lowest level**, which lies at exactly zero; [`PiDoublet::lowest_term`]
//! and [`SigmaTriplet::lowest_term`] give that level on the formulas'
//! scale, as an enclosure.
//!
//! # Where the energy stops increasing
//! A positive D makes each ²Π ladder turn over. A ladder's levels are
//! listed from its first J while its rise to the next J is proved by a
//! rational bound: exactly B − D(2u + 2x + 1) > 0 in case (a) and for F2,
//! B(x − 1)/x − D(2u + 2x + 1) > 0 for F1 (the root rises by at most
//! B(2x + 1)/x from J to J + 1), and B − 9D (F1) or 3B − 9D (F2) from
//! J = ½ to 3/2. Each bound is positive on one run of J from the ladder's
//! start, so the last listed J is found by bisection.

use crate::error::{Error, Result};
use crate::exact::{exact_decimal, format_sig, sqrt_upper};
use crate::level::{Enclosure, Level, LevelList};
use crate::spectrum::{check_cutoff, Budget, Spectrum, State, Structure};
use crate::units::EnergyUnit;
use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use std::cmp::Ordering;

/// Working bits of a listing made without a stated precision (enough for
/// 30 printed digits).
const DEFAULT_BITS: u32 = 128;

/// Estimated bytes per listed level (enclosure ends and bookkeeping).
const LEVEL_BYTES: f64 = 400.0;

/// Elementary operations per listed level at 128 bits: one integer square
/// root, a few shifts and three cheaply reduced rationals (measured: 1534
/// levels in 5 ms, about 650 operations each at the reference speed, and
/// twice that at 256 bits; counted with room).
const WORK_PER_LEVEL: f64 = 1500.0;

/// Extra bits a level whose enclosure straddles a cutoff may be refined by.
const STRADDLE_BITS: u32 = 256;

/// Bits beyond which two candidates for the lowest level are taken as
/// equal (they then share the ground: either serves as the origin).
const COMPARE_BITS: u32 = 2048;

fn rat(n: i64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

fn int(n: u64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

fn half() -> BigRational {
    BigRational::new(BigInt::one(), BigInt::from(2))
}

/// The exact number `(p + s·√r)/m`, s ∈ {−1, 0, +1}, over its model's
/// denominator m > 0 (p, r integers, r ≥ 0). Every energy of one model
/// shares m, so levels subtract and compare as integers.
#[derive(Debug, Clone, PartialEq, Eq)]
struct Surd {
    p: BigInt,
    s: i8,
    r: BigInt,
    m: BigInt,
}

impl Surd {
    fn rational(p: BigInt, m: &BigInt) -> Surd {
        Surd {
            p,
            s: 0,
            r: BigInt::zero(),
            m: m.clone(),
        }
    }

    /// Integer bounds on value·m·2^k, at most one apart, equal where the
    /// value is rational (r·4^k is a square exactly when r is).
    fn scaled(&self, k: u32) -> (BigInt, BigInt) {
        let base: BigInt = &self.p << k as usize;
        if self.s == 0 || self.r.is_zero() {
            return (base.clone(), base);
        }
        let sq: BigInt = &self.r << (2 * k as usize);
        let f = sq.sqrt();
        let up = if &f * &f == sq { f.clone() } else { &f + 1u32 };
        if self.s > 0 {
            (&base + f, base + up)
        } else {
            (&base - up, base - f)
        }
    }

    /// The denominator of [`Surd::scaled`]: m·2^k.
    fn den(&self, k: u32) -> BigInt {
        &self.m << k as usize
    }

    /// Rational bounds within 2^−k/m of the value.
    fn bounds(&self, k: u32) -> (BigRational, BigRational) {
        let (lo, hi) = self.scaled(k);
        (ratio(lo, &self.m, k), ratio(hi, &self.m, k))
    }

    /// The value as an enclosure at k bits (exact where it is rational).
    fn enclosure(&self, k: u32) -> Enclosure {
        let (lo, hi) = self.bounds(k);
        Enclosure { lo, hi }
    }

    /// A rational at or above the value.
    fn upper(&self) -> BigRational {
        self.bounds(64).1
    }
}

/// `num/(m·2^k)` in lowest terms, reduced without a general gcd: the
/// common factor is a power of two times gcd(num, odd part of m), and m
/// (a model's denominator) is small. (A big-integer gcd per level cost
/// more than the rest of a listing.)
fn ratio(num: BigInt, m: &BigInt, k: u32) -> BigRational {
    let den: BigInt = m << k as usize;
    let (Some(tz_num), Some(tz_m)) = (num.trailing_zeros(), m.trailing_zeros()) else {
        return BigRational::zero(); // num = 0 (m > 0)
    };
    let Some(m_odd) = (m >> tz_m as usize).to_u64() else {
        return BigRational::new(num, den);
    };
    let twos = tz_num.min(u64::from(k) + tz_m) as usize;
    let rest = (num.magnitude() % m_odd).to_u64().unwrap_or(0);
    let g = num_integer::gcd(m_odd, rest).max(1);
    BigRational::new_raw((num >> twos) / g, (den >> twos) / g)
}

/// A level of `states` states enclosed by `[lo, hi]/(m·2^k)` (exact when
/// lo = hi), its midpoint formed on the same integers.
fn scaled_level(lo: BigInt, hi: BigInt, m: &BigInt, k: u32, states: BigUint) -> Level {
    if lo == hi {
        return Level::new(ratio(lo, m, k), states);
    }
    let mid = ratio(&lo + &hi, m, k + 1);
    Level {
        energy: mid,
        degeneracy: states,
        enclosure: Some(Box::new(Enclosure {
            lo: ratio(lo, m, k),
            hi: ratio(hi, m, k),
        })),
    }
}

/// Whether integer bounds `[lo, hi]` on an excitation have half-width at
/// most 2^−bits of lo: (hi − lo)·2^bits ≤ 2·lo.
fn narrow(lo: &BigInt, hi: &BigInt, bits: u32) -> bool {
    lo.is_positive() && ((hi - lo) << bits as usize) <= lo * 2u32 || lo == hi && !lo.is_negative()
}

/// `level − ground`, certified: bounds whose half-width is at most 2^−bits
/// of the lower end (or as narrow as [`COMPARE_BITS`] extra bits make it).
fn relative(level: &Surd, ground: &Surd, bits: u32) -> (BigRational, BigRational) {
    if level == ground {
        return (BigRational::zero(), BigRational::zero());
    }
    let mut k = bits + 8;
    loop {
        let (l_lo, l_hi) = level.scaled(k);
        let (g_lo, g_hi) = ground.scaled(k);
        let (lo, hi) = (l_lo - g_hi, l_hi - g_lo);
        if narrow(&lo, &hi, bits) || k >= bits + COMPARE_BITS {
            return (ratio(lo, &level.m, k), ratio(hi, &level.m, k));
        }
        // Bits still missing: about log2((hi − lo)·2^bits/lo).
        let need = if lo.is_positive() {
            ((hi - &lo).bits() + u64::from(bits) + 2).saturating_sub(lo.bits()) as u32
        } else {
            64
        };
        k = (k + need.max(8)).min(bits + COMPARE_BITS);
    }
}

/// The order of two surds of one model, by refinement; `Equal` when
/// [`COMPARE_BITS`] bits do not separate them.
fn compare(a: &Surd, b: &Surd) -> Ordering {
    if a == b {
        return Ordering::Equal;
    }
    let mut k = 64;
    while k <= COMPARE_BITS {
        let (a_lo, a_hi) = a.scaled(k);
        let (b_lo, b_hi) = b.scaled(k);
        if a_hi < b_lo {
            return Ordering::Less;
        }
        if b_hi < a_lo {
            return Ordering::Greater;
        }
        if a_lo == a_hi && b_lo == b_hi {
            return a_lo.cmp(&b_lo);
        }
        k *= 2;
    }
    Ordering::Equal
}

/// The lowest of `candidates` (non-empty), with its index.
fn lowest(candidates: &[Surd]) -> usize {
    let mut best = 0;
    for i in 1..candidates.len() {
        if compare(&candidates[i], &candidates[best]) == Ordering::Less {
            best = i;
        }
    }
    best
}

/// The common denominator of `values` and each value's numerator over it.
fn on_common_denominator<const N: usize>(values: [&BigRational; N]) -> (BigInt, [BigInt; N]) {
    let den = values
        .iter()
        .fold(BigInt::one(), |acc, v| acc.lcm(v.denom()));
    let nums = values.map(|v| v.numer() * (&den / v.denom()));
    (den, nums)
}

/// The quadratic bound α n² − β n − γ (α > 0) of a model, fixed when the
/// model is made, with its coefficients as integers over one denominator
/// so that [`Quadratic::last`] compares integers instead of reducing
/// rationals (a sweep asks for it at every temperature).
#[derive(Debug, Clone, PartialEq, Eq)]
struct Quadratic {
    coefficients: [BigRational; 3],
    den: BigInt,
    nums: [BigInt; 3],
}

impl Quadratic {
    fn new(alpha: BigRational, beta: BigRational, gamma: BigRational) -> Self {
        let (den, nums) = on_common_denominator([&alpha, &beta, &gamma]);
        Quadratic {
            coefficients: [alpha, beta, gamma],
            den,
            nums,
        }
    }

    /// As [`quadratic_last`] (without its rounding slack): the largest
    /// integer n with n at most the larger root, `None` when that is
    /// negative. An `f64` estimate is corrected by exact integer steps
    /// (n ≤ root ⇔ 2αn ≤ β or α n² − β n − γ ≤ q, monotone in n); far
    /// from `f64` range, the rational root is taken instead.
    fn last(&self, q: &BigRational) -> Option<BigUint> {
        let [a, b, g] = &self.nums;
        let below_root = |n: &BigInt| -> bool {
            if (a * n) * 2 <= *b {
                return true;
            }
            let f = (a * n - b) * n - g;
            f * q.denom() <= &self.den * q.numer()
        };
        let f = |v: &BigInt| v.to_f64().unwrap_or(f64::NAN);
        let d = f(&self.den);
        let (af, bf, gf) = (f(a) / d, f(b) / d, f(g) / d);
        let qf = q.to_f64().unwrap_or(f64::NAN);
        let root = (bf + (bf * bf + 4.0 * af * (gf + qf)).sqrt()) / (2.0 * af);
        if root.is_finite() && root.abs() < 1e15 {
            let mut n = BigInt::from(root.floor() as i64);
            for _ in 0..8 {
                let up = &n + 1;
                if below_root(&up) {
                    n = up;
                } else if !below_root(&n) {
                    n -= 1;
                } else {
                    return n.to_biguint();
                }
            }
        }
        let [alpha, beta, gamma] = &self.coefficients;
        quadratic_last(alpha, beta, gamma, q)
    }
}

/// The largest integer n ≥ 0 with α n² − β n − γ ≤ q (α > 0), or `None`
/// when no n ≥ 0 qualifies: the larger root of the quadratic, rounded up
/// through a rational square root above it, then floored.
fn quadratic_last(
    alpha: &BigRational,
    beta: &BigRational,
    gamma: &BigRational,
    q: &BigRational,
) -> Option<BigUint> {
    let disc = beta * beta + rat(4) * alpha * (gamma + q);
    if disc.is_negative() {
        return None;
    }
    let root = (beta + sqrt_upper(&disc, 64)) / (rat(2) * alpha);
    if root.is_negative() {
        return None;
    }
    root.floor().to_integer().to_biguint()
}

fn positive(what: &str, v: &BigRational) -> Result<()> {
    if v.is_positive() {
        Ok(())
    } else {
        Err(Error::invalid(
            what,
            exact_decimal(v, 30),
            "it must be greater than zero",
        ))
    }
}

/// The coupling of a ²Π state's spin to its rotation.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Coupling {
    /// Hund's case (a): two Ω ladders split by A, exact rational energies.
    CaseA,
    /// The exact eigenvalues of each J's 2×2 block (Hill–Van Vleck): F1
    /// and F2 ladders.
    Intermediate,
}

/// One level of a listing: its ladder (²Π: 0 or 1; ³Σ: F = 1, 2, 3), x =
/// J + ½ (²Π) or J (³Σ), and the listed level.
#[derive(Debug, Clone)]
struct Listed {
    ladder: usize,
    index: u64,
    level: Level,
}

/// Lists levels measured from one ground up to one cutoff at `bits`: the
/// ground and the cutoff are scaled to integers once, at 16 guard bits,
/// and each level costs one integer square root; a level too near the
/// ground for that precision, or straddling the cutoff, is refined alone.
struct Lister<'a> {
    ground: &'a Surd,
    cutoff: &'a BigRational,
    bits: u32,
    /// Whether a level straddling the cutoff (or too near the ground for
    /// the guard bits) is refined; without, every level is enclosed at the
    /// same k, so that the enclosures of a listing at the default bits can
    /// be found again by their midpoints (finer bounds nest inside).
    refine: bool,
    k: u32,
    g: (BigInt, BigInt),
    /// ⌊cutoff·m·2^k⌋.
    cut: BigInt,
}

impl<'a> Lister<'a> {
    fn new(ground: &'a Surd, cutoff: &'a BigRational, bits: u32, refine: bool) -> Self {
        let k = bits + 16;
        let den = ground.den(k);
        let cut = (cutoff * BigRational::from_integer(den))
            .floor()
            .to_integer();
        Lister {
            ground,
            cutoff,
            bits,
            refine,
            k,
            g: ground.scaled(k),
            cut,
        }
    }

    /// The level `surd − ground` of `states` states, or `None` when it lies
    /// above the cutoff.
    fn level(&self, surd: &Surd, states: BigUint) -> Option<Level> {
        if surd == self.ground {
            return Some(Level::new(BigRational::zero(), states));
        }
        let (l_lo, l_hi) = surd.scaled(self.k);
        let (lo, hi) = (l_lo - &self.g.1, l_hi - &self.g.0);
        // lo, hi are integers: lo > c ⇔ lo > ⌊c⌋ and hi ≤ c ⇔ hi ≤ ⌊c⌋.
        if lo > self.cut {
            return None;
        }
        if !self.refine || hi <= self.cut && narrow(&lo, &hi, self.bits) {
            return Some(scaled_level(lo, hi, &self.ground.m, self.k, states));
        }
        self.refined(surd, states)
    }

    /// As [`Lister::level`], refining until the level lies on one side of
    /// the cutoff (or [`STRADDLE_BITS`] more bits do not decide).
    fn refined(&self, surd: &Surd, states: BigUint) -> Option<Level> {
        let mut b = self.bits;
        loop {
            let (lo, hi) = relative(surd, self.ground, b);
            if &lo > self.cutoff {
                return None;
            }
            if &hi <= self.cutoff || b >= self.bits + STRADDLE_BITS {
                return Some(Level::enclosed(lo, hi, states));
            }
            b += 64;
        }
    }
}

/// Whether the level `l` (its enclosure, or its exact energy) holds
/// `energy`.
fn holds(l: &Level, energy: &BigRational) -> bool {
    l.lowest() <= energy && energy <= l.highest()
}

/// Checks the listing's size and work against the budget before it starts.
fn check_listing(
    what: &str,
    levels: f64,
    bits: u32,
    cutoff: &BigRational,
    budget: &Budget,
) -> Result<()> {
    budget.check_levels(
        format_args!("listing the {what} levels up to {}", format_sig(cutoff, 6)),
        levels,
        LEVEL_BYTES,
        "give a lower cutoff",
    )?;
    let per_bit = (f64::from(bits) / 128.0).max(1.0);
    budget.check_work(
        format_args!(
            "certifying the {what} levels up to {} ({levels:.3e} levels)",
            format_sig(cutoff, 6)
        ),
        levels * WORK_PER_LEVEL * per_bit,
        "give a lower cutoff, a lower temperature or fewer digits",
    )
}

/// A ²Π diatomic rotor: B, optional D, spin–orbit A, in one of two
/// couplings; energies measured from the lowest level.
///
/// ```
/// use zsum::exact::parse_rational;
/// use zsum::models::open_shell::{Coupling, PiDoublet};
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // Nitric-oxide-like constants in cm⁻¹ (from memory): A = 123.16, B = 1.6961.
/// let no = PiDoublet::new(Coupling::Intermediate, r("123.16"), r("1.6961"), r("0"),
///     EnergyUnit::Wavenumber)?;
/// // The lowest level is J = 1/2 of F1, exactly B − A/2, so the origin is rational.
/// assert_eq!(no.lowest_term(128).lo, r("1.6961") - r("61.58"));
/// let levels = no.levels_up_to(&r("20"))?;
/// // F1 J = 1/2, 3/2, 5/2 lie below 20 cm⁻¹ (J = 7/2 near 25): 2 + 4 + 6 states,
/// // each doubled by the unsplit Λ-doubling.
/// assert_eq!(levels.total_states(), 24u32.into());
/// let first = &levels.levels()[1]; // F1, J = 3/2: irrational, enclosed
/// let e = first.enclosure.as_ref().unwrap();
/// assert!(r("5.0162") < e.lo && e.hi < r("5.0163"));
/// assert!(&e.hi - &e.lo < r("1e-30"));
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PiDoublet {
    coupling: Coupling,
    a: BigRational,
    b: BigRational,
    d: BigRational,
    unit: EnergyUnit,
    /// x = J + ½ of each ladder's first level.
    start: [u64; 2],
    /// x of each ladder's last level (its turnover); `None` when D = 0.
    last: [Option<u64>; 2],
    /// The lowest level on the formulas' scale.
    ground: Surd,
    /// A, B, D as integers over `den`; energies share the denominator m.
    ints: [BigInt; 3],
    m: BigInt,
    /// `ground`'s upper end, and the quadratic below every level: both
    /// fixed once the model is made.
    ground_upper: BigRational,
    lower: Option<Quadratic>,
}

impl PiDoublet {
    /// A ²Π rotor with spin–orbit constant `a` (any sign), rotational
    /// constant `b` > 0 and centrifugal constant `d` ≥ 0, all in `unit`.
    /// Refuses a D so large that a ladder does not provably rise from its
    /// first level to its second.
    pub fn new(
        coupling: Coupling,
        a: BigRational,
        b: BigRational,
        d: BigRational,
        unit: EnergyUnit,
    ) -> Result<Self> {
        positive("rotational constant B", &b)?;
        if d.is_negative() {
            return Err(Error::invalid(
                "centrifugal constant D",
                exact_decimal(&d, 30),
                "it must be zero or positive",
            ));
        }
        let lower_has_half = match coupling {
            Coupling::CaseA => true,
            Coupling::Intermediate => a >= &b * rat(2),
        };
        let start = if lower_has_half { [1, 2] } else { [2, 1] };
        let (den, ints) = on_common_denominator([&a, &b, &d]);
        // Case (a): (16AΣ + 4B·4u − D(4u)²)/16 over den; intermediate:
        // (2(Bu − Du²) ± √R)/2 over den (module docs).
        let scale = match coupling {
            Coupling::CaseA => 16,
            Coupling::Intermediate => 2,
        };
        let em = den * scale;
        let mut m = PiDoublet {
            coupling,
            a,
            b,
            d,
            unit,
            start,
            last: [None, None],
            ground: Surd::rational(BigInt::zero(), &em),
            ints,
            m: em,
            ground_upper: BigRational::zero(),
            lower: None,
        };
        for ladder in 0..2 {
            if !m.rises(ladder, m.start[ladder]) {
                return Err(Error::invalid(
                    "centrifugal constant D",
                    exact_decimal(&m.d, 30),
                    &format!(
                        "it is so large that the {} ladder does not provably rise from J = {} \
                         to the next J (B = {}); give a smaller D",
                        m.ladder_name(ladder),
                        half_integer(2 * m.start[ladder] - 1),
                        exact_decimal(&m.b, 30)
                    ),
                ));
            }
            if m.d.is_positive() {
                m.last[ladder] = Some(m.turnover(ladder));
            }
        }
        let candidates = [m.surd(0, m.start[0]), m.surd(1, m.start[1])];
        m.ground = candidates[lowest(&candidates)].clone();
        m.ground_upper = m.ground.upper();
        m.lower = m.lower_quadratic();
        Ok(m)
    }

    /// The coupling.
    pub fn coupling(&self) -> Coupling {
        self.coupling
    }

    /// The constants A, B, D.
    pub fn constants(&self) -> [&BigRational; 3] {
        [&self.a, &self.b, &self.d]
    }

    /// The name of ladder 0 or 1: `Omega=1/2`, `Omega=3/2` (case (a)) or
    /// `F1`, `F2` (intermediate).
    pub fn ladder_name(&self, ladder: usize) -> &'static str {
        match (self.coupling, ladder) {
            (Coupling::CaseA, 0) => "Omega=1/2",
            (Coupling::CaseA, _) => "Omega=3/2",
            (Coupling::Intermediate, 0) => "F1",
            (Coupling::Intermediate, _) => "F2",
        }
    }

    /// The energy of ladder `ladder` (0 or 1, see
    /// [`PiDoublet::ladder_name`]) at J = `twice_j`/2 on the formulas'
    /// scale (not from the lowest level), enclosed within 2^−bits; `None`
    /// where the ladder has no such level (J below its start, J not a
    /// half-integer, or past its turnover).
    pub fn term(&self, ladder: usize, twice_j: u64, bits: u32) -> Option<Enclosure> {
        if ladder > 1 || twice_j % 2 == 0 {
            return None;
        }
        let x = twice_j.div_ceil(2);
        if x < self.start[ladder] || self.last[ladder].is_some_and(|l| x > l) {
            return None;
        }
        Some(self.surd(ladder, x).enclosure(bits))
    }

    /// The lowest level on the formulas' scale (the origin of every listed
    /// energy), enclosed within 2^−bits; exact where it is rational.
    pub fn lowest_term(&self, bits: u32) -> Enclosure {
        self.ground.enclosure(bits)
    }

    /// The last J (doubled) of each ladder before D turns it over; `None`
    /// for a rigid rotor.
    pub fn last_twice_j(&self) -> [Option<u64>; 2] {
        self.last.map(|l| l.map(|x| 2 * x - 1))
    }

    /// The energy of ladder `ladder` at x = J + ½, exactly.
    fn surd(&self, ladder: usize, x: u64) -> Surd {
        let [a, b, d] = &self.ints;
        let x = BigInt::from(x);
        let x2 = &x * &x;
        match self.coupling {
            Coupling::CaseA => {
                // Ω = ½ (16AΣ = −8A) or 3/2 (+8A); 4u = 4J(J+1) − 4Ω² =
                // 4x² − 2 or 4x² − 10.
                let (sa, u4) = if ladder == 0 {
                    (-(a * 8u32), &x2 * 4u32 - 2u32)
                } else {
                    (a * 8u32, &x2 * 4u32 - 10u32)
                };
                Surd::rational(sa + b * &u4 * 4 - d * &u4 * &u4, &self.m)
            }
            Coupling::Intermediate => {
                let u = &x2 - 1;
                let r = b * b * &x2 * 4 + a * (a - b * 4);
                Surd {
                    p: (b * &u - d * &u * &u) * 2,
                    s: if ladder == 0 { -1 } else { 1 },
                    r,
                    m: self.m.clone(),
                }
            }
        }
    }

    /// Whether the rise of ladder `ladder` from x to x + 1 is proved
    /// positive by the rational bounds of the module docs.
    fn rises(&self, ladder: usize, x: u64) -> bool {
        let (b, d) = (&self.b, &self.d);
        if d.is_zero() {
            return true;
        }
        let xr = int(x);
        match self.coupling {
            Coupling::CaseA => {
                let omega2 = if ladder == 0 {
                    BigRational::new(1.into(), 4.into())
                } else {
                    BigRational::new(9.into(), 4.into())
                };
                let u = &xr * &xr - BigRational::new(1.into(), 4.into()) - omega2;
                (b - d * (rat(2) * &u + rat(2) * &xr + rat(1))).is_positive()
            }
            Coupling::Intermediate => {
                if x == 1 {
                    let bound = if ladder == 0 { b.clone() } else { b * rat(3) };
                    return (bound - d * rat(9)).is_positive();
                }
                let u = &xr * &xr - rat(1);
                let centrifugal = d * (rat(2) * &u + rat(2) * &xr + rat(1));
                let rotational = if ladder == 0 {
                    b * (&xr - rat(1)) / &xr
                } else {
                    b.clone()
                };
                (rotational - centrifugal).is_positive()
            }
        }
    }

    /// The first x at or after the start whose rise is not proved (the
    /// ladder's last level): the proved rises form one run from the start
    /// (the bounds are concave in x), so exponential search, then
    /// bisection.
    fn turnover(&self, ladder: usize) -> u64 {
        let start = self.start[ladder];
        let mut good = start; // rise proved at `good`
        let mut step = 1u64;
        let bad = loop {
            let probe = good.saturating_add(step);
            if !self.rises(ladder, probe) || probe == u64::MAX {
                break probe;
            }
            good = probe;
            step = step.saturating_mul(2);
        };
        let (mut lo, mut hi) = (good, bad);
        while hi - lo > 1 {
            let mid = lo + (hi - lo) / 2;
            if self.rises(ladder, mid) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        hi
    }

    /// A rational lower bound α x² − β x − γ on every level of x (both
    /// ladders), on the formulas' scale: `(α, β, γ)`, or `None` when D
    /// leaves no positive α (the turnover then bounds the count).
    fn lower_quadratic(&self) -> Option<Quadratic> {
        let (a, b, d) = (&self.a, &self.b, &self.d);
        // Every listed level has x ≤ x_t, so D u² ≤ D u·x_t² for 0 ≤ u ≤ x_t².
        let b_eff = match self.last.iter().flatten().max() {
            Some(&xt) => b - d * int(xt) * int(xt),
            None => b.clone(),
        };
        if !b_eff.is_positive() {
            return None;
        }
        match self.coupling {
            // E ≥ −|A|/2 + B*·u and u = J(J+1) − Ω² ≥ x² − 5/2 > 0.
            Coupling::CaseA => Some(Quadratic::new(
                b_eff.clone(),
                BigRational::zero(),
                b_eff * BigRational::new(5.into(), 2.into()) + a.abs() * half(),
            )),
            // E ≥ B*·u − ½√R, √R ≤ 2Bx + √max(A(A − 4B), 0), u = x² − 1.
            Coupling::Intermediate => {
                let c = a * (a - rat(4) * b);
                let c0 = if c.is_positive() {
                    sqrt_upper(&c, 64) * half()
                } else {
                    BigRational::zero()
                };
                Some(Quadratic::new(b_eff.clone(), b.clone(), b_eff + c0))
            }
        }
    }

    /// The last x that may hold a level at or below `energy` (measured from
    /// the lowest level); `None` when none can.
    fn x_last(&self, energy: &BigRational) -> Option<u64> {
        let cap = self.last.iter().flatten().max().copied();
        let q = energy + &self.ground_upper;
        let x = match &self.lower {
            Some(quadratic) => quadratic.last(&q)?.to_u64().unwrap_or(u64::MAX),
            None => cap.unwrap_or(u64::MAX),
        };
        let x = cap.map_or(x, |c| x.min(c));
        (x >= 1).then_some(x)
    }

    /// Every level up to `cutoff` at `bits`, ladder by ladder.
    fn listing(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
        refine: bool,
    ) -> Result<Vec<Listed>> {
        check_cutoff(self, cutoff)?;
        let Some(x_last) = self.x_last(cutoff) else {
            return Ok(Vec::new());
        };
        check_listing("2Pi", 2.0 * x_last as f64, bits, cutoff, budget)?;
        let mut out = Vec::new();
        let lister = Lister::new(&self.ground, cutoff, bits, refine);
        for ladder in 0..2 {
            let end = self.last[ladder].map_or(x_last, |l| l.min(x_last));
            for x in self.start[ladder]..=end {
                let states = BigUint::from(4 * x); // 2(2J+1), 2J+1 = 2x
                match lister.level(&self.surd(ladder, x), states) {
                    Some(level) => out.push(Listed {
                        ladder,
                        index: x,
                        level,
                    }),
                    // The ladder rises: nothing further lies below.
                    None => break,
                }
            }
        }
        Ok(out)
    }

    fn levels_at(&self, energy: &BigRational) -> Result<Vec<Listed>> {
        if energy.is_negative() {
            return Ok(Vec::new());
        }
        Ok(self
            .listing(energy, &Budget::default(), DEFAULT_BITS, false)?
            .into_iter()
            .filter(|l| holds(&l.level, energy))
            .collect())
    }
}

/// `n/2` written as a half-integer or integer.
fn half_integer(twice: u64) -> String {
    if twice % 2 == 0 {
        (twice / 2).to_string()
    } else {
        format!("{twice}/2")
    }
}

impl Spectrum for PiDoublet {
    fn describe(&self) -> String {
        let coupling = match self.coupling {
            Coupling::CaseA => "Hund's case (a)",
            Coupling::Intermediate => "intermediate coupling",
        };
        let mut s = format!(
            "2Pi diatomic rotor ({coupling}), A = {}, B = {}",
            exact_decimal(&self.a, 30),
            exact_decimal(&self.b, 30)
        );
        if self.d.is_positive() {
            s += &format!(", D = {}", exact_decimal(&self.d, 30));
        }
        s + &format!(" {}, energies from the lowest level", self.unit)
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        let first = match self.coupling {
            Coupling::CaseA => "Omega",
            Coupling::Intermediate => "F",
        };
        [first, "J", "p", "M"].map(String::from).to_vec()
    }

    /// Ω (case (a)), J and M are stored doubled; F is 1 or 2 and the
    /// Λ-doubling index p is ±1.
    fn doubled_numbers(&self) -> Vec<bool> {
        vec![self.coupling == Coupling::CaseA, true, false, true]
    }

    fn ground_energy(&self) -> BigRational {
        BigRational::zero()
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        self.levels_within_bits(cutoff, budget, DEFAULT_BITS)
    }

    fn levels_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
    ) -> Result<LevelList> {
        let levels = self
            .listing(cutoff, budget, bits.max(DEFAULT_BITS), true)?
            .into_iter()
            .map(|l| l.level)
            .collect();
        Ok(LevelList::new(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let mut out = Vec::new();
        for l in self.levels_at(energy)? {
            let first = match self.coupling {
                Coupling::CaseA => 2 * l.ladder as i64 + 1, // 2Ω
                Coupling::Intermediate => l.ladder as i64 + 1,
            };
            let tj = 2 * l.index as i64 - 1;
            for p in [-1, 1] {
                for m in (-tj..=tj).step_by(2) {
                    out.push(State(vec![first, tj, p, m]));
                }
            }
        }
        out.sort();
        Ok(out)
    }

    fn labels_at(&self, energy: &BigRational) -> Vec<String> {
        self.levels_at(energy)
            .unwrap_or_default()
            .iter()
            .map(|l| {
                format!(
                    "{} J={}",
                    self.ladder_name(l.ladder),
                    half_integer(2 * l.index - 1)
                )
            })
            .collect()
    }

    /// `F` (1 or 2) or `2Omega` (1 or 3), and `2J`: J is a half-integer,
    /// so the term carries it doubled.
    fn term_numbers(&self) -> Vec<String> {
        let first = match self.coupling {
            Coupling::CaseA => "2Omega",
            Coupling::Intermediate => "F",
        };
        vec![first.into(), "2J".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        Ok(self
            .listing(cutoff, budget, DEFAULT_BITS, true)?
            .into_iter()
            .map(|l| {
                let first = match self.coupling {
                    Coupling::CaseA => 2 * l.ladder as i64 + 1,
                    Coupling::Intermediate => l.ladder as i64 + 1,
                };
                (l.level.energy, vec![first, 2 * l.index as i64 - 1])
            })
            .collect())
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Every level of x (both ladders) lies at or above the quadratic
        // lower bound, and x carries at most 2 ladders × 2(2J+1) = 8x
        // states: Σ_{x=1}^{X} 8x = 4X(X+1).
        if energy.is_negative() {
            return BigUint::zero();
        }
        match self.x_last(energy) {
            Some(x) => {
                let x = BigUint::from(x);
                &x * (&x + 1u32) * 4u32
            }
            None => BigUint::zero(),
        }
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.0)
    }

    fn highest_energy(&self) -> Option<BigRational> {
        // With D > 0 both ladders end at their turnover: the higher of the
        // two last levels (its enclosure's upper end) is the top.
        let mut top: Option<BigRational> = None;
        for ladder in 0..2 {
            let x = self.last[ladder]?;
            let (_, hi) = relative(&self.surd(ladder, x), &self.ground, DEFAULT_BITS);
            if top.as_ref().is_none_or(|t| &hi > t) {
                top = Some(hi);
            }
        }
        top
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Opaque
    }

    fn warnings(&self, cutoff: &BigRational) -> Vec<String> {
        let Some(x_last) = self.x_last(cutoff) else {
            return Vec::new();
        };
        (0..2)
            .filter_map(|ladder| {
                let l = self.last[ladder]?;
                let (lo, _) = relative(&self.surd(ladder, l), &self.ground, 64);
                (l <= x_last && &lo <= cutoff).then(|| {
                    format!(
                        "2Pi rotor: the {} ladder's rise is not proved beyond J = {} because of \
                         the centrifugal term; no levels of it are listed beyond",
                        self.ladder_name(ladder),
                        half_integer(2 * l - 1)
                    )
                })
            })
            .collect()
    }
}

/// Which rotational levels N a ³Σ⁻ molecule has: all, or only odd N (a
/// homonuclear molecule of spin-0 nuclei, such as ¹⁶O₂).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NParity {
    /// Every N.
    All,
    /// Only odd N.
    OddOnly,
}

/// A ³Σ⁻ diatomic rotor: B, spin–spin λ and spin–rotation γ (both any
/// sign), energies measured from the lowest level.
///
/// ```
/// use zsum::exact::parse_rational;
/// use zsum::models::open_shell::{NParity, SigmaTriplet};
/// use zsum::spectrum::Spectrum;
/// use zsum::units::EnergyUnit;
/// let r = |s: &str| parse_rational(s).unwrap();
/// // Oxygen-like constants in cm⁻¹ (from memory): B = 1.4377, λ = 1.9848, γ = −0.0084.
/// let o2 = SigmaTriplet::new(r("1.4377"), r("1.9848"), r("-0.0084"), NParity::OddOnly,
///     EnergyUnit::Wavenumber)?;
/// // The lowest level is N = 1, J = 0 at 2B − 2λ − γ (rational); N = 1, J = 2
/// // (irrational) lies near 2.08 cm⁻¹ and N = 1, J = 1 exactly 2λ + γ above J = 0.
/// assert_eq!(o2.lowest_term(64).lo, r("-1.0858"));
/// let levels = o2.levels_up_to(&r("4"))?;
/// let g: Vec<u32> = levels.iter().map(|l| l.degeneracy.to_u32_digits()[0]).collect();
/// assert_eq!(g, [1, 5, 3]);
/// assert!(!levels.levels()[1].is_exact());
/// assert_eq!(levels.levels()[2].energy, r("3.9612"));
/// # Ok::<(), zsum::Error>(())
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SigmaTriplet {
    b: BigRational,
    lambda: BigRational,
    gamma: BigRational,
    parity: NParity,
    unit: EnergyUnit,
    ground: Surd,
    /// B, λ, γ as integers over `den`; energies share the denominator m.
    ints: [BigInt; 3],
    m: BigInt,
}

impl SigmaTriplet {
    /// A ³Σ⁻ rotor with rotational constant `b` > 0, spin–spin constant
    /// `lambda` and spin–rotation constant `gamma`, all in `unit`.
    pub fn new(
        b: BigRational,
        lambda: BigRational,
        gamma: BigRational,
        parity: NParity,
        unit: EnergyUnit,
    ) -> Result<Self> {
        positive("rotational constant B", &b)?;
        let (den, ints) = on_common_denominator([&b, &lambda, &gamma]);
        // Energies (P ± √R)/(2·den) (see `levels_of_j`).
        let em = den * 2;
        let mut m = SigmaTriplet {
            b,
            lambda,
            gamma,
            parity,
            unit,
            ground: Surd::rational(BigInt::zero(), &em),
            ints,
            m: em,
        };
        // The lowest level lies at or below the lowest of J ≤ 2's; every
        // level of larger J lies above the quadratic bound, so the J up
        // to where it passes that candidate hold the ground.
        let small: Vec<Surd> = (0..=2)
            .flat_map(|j| m.levels_of_j(j))
            .map(|(_, s)| s)
            .collect();
        let best = small[lowest(&small)].upper();
        let j_max = m.j_last_absolute(&best).unwrap_or(2).max(2);
        let all: Vec<Surd> = (0..=j_max)
            .flat_map(|j| m.levels_of_j(j))
            .map(|(_, s)| s)
            .collect();
        m.ground = all[lowest(&all)].clone();
        Ok(m)
    }

    /// The constants B, λ, γ.
    pub fn constants(&self) -> [&BigRational; 3] {
        [&self.b, &self.lambda, &self.gamma]
    }

    /// Which N occur.
    pub fn parity(&self) -> NParity {
        self.parity
    }

    /// The energy of component `f` (1: N = J − 1, 2: N = J, 3: N = J + 1)
    /// at J on the formulas' scale (F2 = B N(N+1)), enclosed within
    /// 2^−bits; `None` where there is no such level (N < 0, or an even N
    /// when only odd N occur).
    pub fn term(&self, f: u8, j: u64, bits: u32) -> Option<Enclosure> {
        self.levels_of_j(j)
            .into_iter()
            .find(|(ff, _)| *ff == f)
            .map(|(_, s)| s.enclosure(bits))
    }

    /// The lowest level on the formulas' scale (the origin of every listed
    /// energy), enclosed within 2^−bits; exact where it is rational.
    pub fn lowest_term(&self, bits: u32) -> Enclosure {
        self.ground.enclosure(bits)
    }

    fn allowed(&self, n: u64) -> bool {
        self.parity == NParity::All || n % 2 == 1
    }

    /// The allowed levels of J: `(F, energy)`.
    fn levels_of_j(&self, j: u64) -> Vec<(u8, Surd)> {
        // Over 2·den with H = 2h·den = 2B − 2λ − γ and K = (2B − γ)·den:
        // B x + h ± √(h² + (2B − γ)² x) = (2Bx + H ± √(H² + 4K²x))/(2·den).
        let [b, l, g] = &self.ints;
        let h: BigInt = b * 2 - l * 2 - g;
        let m = &self.m;
        let mut out = Vec::with_capacity(3);
        if j == 0 {
            if self.allowed(1) {
                out.push((3, Surd::rational(&h * 2, m)));
            }
            return out;
        }
        let x = BigInt::from(j) * BigInt::from(j + 1);
        let k: BigInt = b * 2 - g;
        let r: BigInt = &h * &h + &k * &k * &x * 4u32;
        let bx: BigInt = b * &x * 2;
        let p = &bx + &h;
        if self.allowed(j - 1) {
            out.push((
                1,
                Surd {
                    p: p.clone(),
                    s: -1,
                    r: r.clone(),
                    m: m.clone(),
                },
            ));
        }
        if self.allowed(j) {
            out.push((2, Surd::rational(bx, m)));
        }
        if self.allowed(j + 1) {
            out.push((
                3,
                Surd {
                    p,
                    s: 1,
                    r,
                    m: m.clone(),
                },
            ));
        }
        out
    }

    /// The largest J that may hold a level at or below `q` on the formulas'
    /// scale. Every level of J lies at or above
    /// B J² + (B − |2B − γ|) J − |2B − γ|/2 + h − |h|
    /// (the lower root with √x ≤ J + ½; F2 and F3 lie higher).
    fn j_last_absolute(&self, q: &BigRational) -> Option<u64> {
        let (b, l, g) = (&self.b, &self.lambda, &self.gamma);
        let h = b - l - g * half();
        let k = (b * rat(2) - g).abs();
        let beta = &k - b;
        let gamma = &k * half() - &h + h.abs();
        quadratic_last(b, &beta, &gamma, q).map(|j| j.to_u64().unwrap_or(u64::MAX))
    }

    fn listing(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
        refine: bool,
    ) -> Result<Vec<Listed>> {
        check_cutoff(self, cutoff)?;
        let Some(j_last) = self.j_last_absolute(&(cutoff + self.ground.upper())) else {
            return Ok(Vec::new());
        };
        check_listing("3Sigma", 3.0 * (j_last as f64 + 1.0), bits, cutoff, budget)?;
        let mut out = Vec::new();
        let lister = Lister::new(&self.ground, cutoff, bits, refine);
        for j in 0..=j_last {
            for (f, s) in self.levels_of_j(j) {
                let states = BigUint::from(2 * j + 1);
                if let Some(level) = lister.level(&s, states) {
                    out.push(Listed {
                        ladder: usize::from(f),
                        index: j,
                        level,
                    });
                }
            }
        }
        Ok(out)
    }

    fn levels_at(&self, energy: &BigRational) -> Result<Vec<Listed>> {
        if energy.is_negative() {
            return Ok(Vec::new());
        }
        Ok(self
            .listing(energy, &Budget::default(), DEFAULT_BITS, false)?
            .into_iter()
            .filter(|l| holds(&l.level, energy))
            .collect())
    }

    /// N of component `f` at J.
    fn n_of(f: usize, j: u64) -> u64 {
        (j + f as u64).saturating_sub(2)
    }
}

impl Spectrum for SigmaTriplet {
    fn describe(&self) -> String {
        format!(
            "3Sigma- diatomic rotor, B = {}, lambda = {}, gamma = {} {}{}, energies from the \
             lowest level",
            exact_decimal(&self.b, 30),
            exact_decimal(&self.lambda, 30),
            exact_decimal(&self.gamma, 30),
            self.unit,
            if self.parity == NParity::OddOnly {
                ", odd N only"
            } else {
                ""
            }
        )
    }

    fn unit(&self) -> EnergyUnit {
        self.unit.clone()
    }

    fn quantum_numbers(&self) -> Vec<String> {
        ["N", "J", "M"].map(String::from).to_vec()
    }

    fn ground_energy(&self) -> BigRational {
        BigRational::zero()
    }

    fn levels_within(&self, cutoff: &BigRational, budget: &Budget) -> Result<LevelList> {
        self.levels_within_bits(cutoff, budget, DEFAULT_BITS)
    }

    fn levels_within_bits(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
        bits: u32,
    ) -> Result<LevelList> {
        let levels = self
            .listing(cutoff, budget, bits.max(DEFAULT_BITS), true)?
            .into_iter()
            .map(|l| l.level)
            .collect();
        Ok(LevelList::new(self.unit.clone(), levels))
    }

    fn states_at(&self, energy: &BigRational) -> Result<Vec<State>> {
        let mut out = Vec::new();
        for l in self.levels_at(energy)? {
            let j = l.index as i64;
            let n = Self::n_of(l.ladder, l.index) as i64;
            for m in -j..=j {
                out.push(State(vec![n, j, m]));
            }
        }
        out.sort();
        Ok(out)
    }

    fn labels_at(&self, energy: &BigRational) -> Vec<String> {
        self.levels_at(energy)
            .unwrap_or_default()
            .iter()
            .map(|l| {
                format!(
                    "F{} N={} J={}",
                    l.ladder,
                    Self::n_of(l.ladder, l.index),
                    l.index
                )
            })
            .collect()
    }

    fn term_numbers(&self) -> Vec<String> {
        vec!["F".into(), "N".into(), "J".into()]
    }

    fn terms_within(
        &self,
        cutoff: &BigRational,
        budget: &Budget,
    ) -> Result<Vec<(BigRational, Vec<i64>)>> {
        Ok(self
            .listing(cutoff, budget, DEFAULT_BITS, true)?
            .into_iter()
            .map(|l| {
                let n = Self::n_of(l.ladder, l.index) as i64;
                (l.level.energy, vec![l.ladder as i64, n, l.index as i64])
            })
            .collect())
    }

    fn count_bound(&self, energy: &BigRational) -> BigUint {
        // Every level of J lies at or above the quadratic lower bound, and
        // J holds at most 3 levels of 2J+1 states: Σ_{J=0}^{m−1} 3(2J+1) = 3m².
        if energy.is_negative() {
            return BigUint::zero();
        }
        match self.j_last_absolute(&(energy + self.ground.upper())) {
            Some(j) => {
                let m = BigUint::from(j) + 1u32;
                &m * &m * 3u32
            }
            None => BigUint::zero(),
        }
    }

    fn growth_exponent(&self) -> Option<f64> {
        Some(1.0)
    }

    fn structure(&self) -> Structure<'_> {
        Structure::Opaque
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn surd_bounds_are_exact_on_squares_and_tight_elsewhere() {
        let m = BigInt::from(2);
        // (1 + √9)/2 = 2 exactly; (0 + √2)/2 within 2^−40/2.
        let three = Surd {
            p: BigInt::one(),
            s: 1,
            r: BigInt::from(9),
            m: m.clone(),
        };
        assert_eq!(three.bounds(40), (rat(2), rat(2)));
        let (lo, hi) = Surd {
            p: BigInt::zero(),
            s: 1,
            r: BigInt::from(2),
            m,
        }
        .bounds(40);
        assert!(&lo * &lo * rat(4) < rat(2) && &hi * &hi * rat(4) > rat(2));
        assert_eq!(hi - lo, BigRational::new(1.into(), BigInt::one() << 41));
    }

    #[test]
    fn quadratic_on_integers_agrees_with_the_rational_root() {
        // Integer roots (n² − n − 6 = q at n = 3 + k), negative roots,
        // no roots, and a spread of rational coefficients and levels q.
        let r = |n: i64, d: i64| BigRational::new(n.into(), d.into());
        let q = Quadratic::new(rat(1), rat(1), rat(6));
        for k in 0..50i64 {
            let at = rat((3 + k) * (3 + k) - (3 + k) - 6);
            assert_eq!(q.last(&at), Some(BigUint::from((3 + k) as u64)));
            let below = &at - r(1, 1_000_000_007);
            assert_eq!(q.last(&below), Some(BigUint::from((2 + k) as u64)));
        }
        assert_eq!(q.last(&rat(-7)), None);
        let shifted = Quadratic::new(rat(1), rat(-5), rat(-6));
        assert_eq!(shifted.last(&rat(0)), None);
        assert_eq!(shifted.last(&rat(7)), Some(BigUint::from(0u32)));
        let mut seed = 12345u64;
        let mut next = |m: i64| {
            seed = seed
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            ((seed >> 33) as i64 % m) + 1
        };
        for _ in 0..2000 {
            let alpha = r(next(1000), next(97));
            let beta = r(next(2000) - 1000, next(89));
            let gamma = r(next(2000) - 1000, next(83));
            let level = r(next(1_000_000), next(7));
            let fast = Quadratic::new(alpha.clone(), beta.clone(), gamma.clone()).last(&level);
            assert_eq!(
                fast,
                quadratic_last(&alpha, &beta, &gamma, &level),
                "{alpha} {beta} {gamma} {level}"
            );
        }
    }

    #[test]
    fn quadratic_last_is_the_floor_of_the_larger_root() {
        // n² − n − 6 ≤ 0 ⇔ n ≤ 3.
        let last = quadratic_last(&rat(1), &rat(1), &rat(6), &rat(0));
        assert_eq!(last, Some(BigUint::from(3u32)));
        // n² + 1 ≤ 0 has no solution.
        assert_eq!(quadratic_last(&rat(1), &rat(0), &rat(-1), &rat(0)), None);
    }
}
