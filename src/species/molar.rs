//! Standard molar functions of one species at T and p.

use super::Species;
use crate::error::{Error, Result};
use crate::exact::{exact_decimal, rational_string};
use crate::export::Tabular;
use crate::models::diatomic::ParityWeights;
use crate::models::ParticleInBox;
use crate::spectrum::Spectrum;
use crate::sum::{float_to_decimal, thermo, Cached, Temperature};
use crate::units::constants;
use num_rational::BigRational;
use num_traits::{One, Signed};
use rug::Float;
use serde::Serialize;

/// How vibration and rotation are modelled.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum VibModel {
    /// The vibrating rotor: anharmonic G(v), B_v = B_e − α_e(v+½), D_e.
    Rovib,
    /// Rigid rotor (B_0) × harmonic oscillator (the fundamental).
    Rrho,
}

/// How translation is treated.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Translation {
    /// Sackur–Tetrode (the box of the ideal gas is macroscopic).
    SackurTetrode,
    /// The exact sum for a cubic box with this side in metres.
    Box(BigRational),
}

/// Which spin-isomer state of a homonuclear molecule.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Isomer {
    /// Ortho and para in equilibrium at every temperature.
    Equilibrium,
    /// Frozen at the high-temperature ratio (3:1 ortho:para for H2).
    Normal,
    /// Only the ortho modification.
    Ortho,
    /// Only the para modification.
    Para,
    /// Frozen at this ortho fraction.
    Fraction(BigRational),
}

impl Isomer {
    /// Reads `equilibrium`, `normal`, `ortho`, `para` or `fraction=X` (0 ≤ X ≤ 1).
    pub fn parse(text: &str) -> Result<Self> {
        Ok(match text {
            "equilibrium" => Isomer::Equilibrium,
            "normal" => Isomer::Normal,
            "ortho" => Isomer::Ortho,
            "para" => Isomer::Para,
            other => {
                let allowed = "equilibrium, normal, ortho, para or fraction=X with 0 <= X <= 1";
                let x = other
                    .strip_prefix("fraction=")
                    .ok_or_else(|| Error::parse("isomer", other, allowed))?;
                let v = crate::exact::parse_rational(x)
                    .map_err(|_| Error::parse("isomer", other, allowed))?;
                if v.is_negative() || v > BigRational::one() {
                    return Err(Error::invalid(
                        "ortho fraction",
                        x,
                        "a fraction between 0 and 1 inclusive",
                    ));
                }
                Isomer::Fraction(v)
            }
        })
    }

    /// Its name in output.
    pub fn name(&self) -> String {
        match self {
            Isomer::Equilibrium => "equilibrium".into(),
            Isomer::Normal => "normal".into(),
            Isomer::Ortho => "ortho".into(),
            Isomer::Para => "para".into(),
            Isomer::Fraction(x) => format!("fraction={}", exact_decimal(x, 20)),
        }
    }
}

/// Options of a molar computation.
#[derive(Debug, Clone)]
pub struct MolarOptions {
    /// Pressure in Pa (standard: 1 bar = 100000 Pa).
    pub pressure: BigRational,
    /// Vibration–rotation model.
    pub model: VibModel,
    /// Translation.
    pub translation: Translation,
    /// Spin isomers (homonuclear molecules with nuclear spin only); None
    /// means equilibrium.
    pub isomer: Option<Isomer>,
    /// Significant digits of every value.
    pub digits: u32,
}

impl Default for MolarOptions {
    fn default() -> Self {
        MolarOptions {
            pressure: BigRational::from_integer(100_000.into()),
            model: VibModel::Rovib,
            translation: Translation::SackurTetrode,
            isomer: None,
            digits: 10,
        }
    }
}

/// Standard molar functions at one temperature.
#[derive(Debug, Clone, Serialize)]
pub struct MolarPoint {
    /// The species.
    pub species: String,
    /// T in kelvin.
    #[serde(rename = "T")]
    pub t: String,
    /// p in Pa.
    pub p: String,
    /// The spin-isomer state, for species that have one.
    pub isomer: Option<String>,
    /// The ortho fraction, for species with spin isomers.
    pub ortho_fraction: Option<String>,
    /// Conventional entropy (nuclear spin excluded), J/(mol K).
    #[serde(rename = "S")]
    pub s: String,
    /// Entropy including nuclear spin (and isomer mixing), J/(mol K);
    /// equal to S where no nuclear-spin statistics are modelled.
    #[serde(rename = "S_total")]
    pub s_total: String,
    /// Cp, J/(mol K).
    #[serde(rename = "Cp")]
    pub cp: String,
    /// Cv, J/(mol K).
    #[serde(rename = "Cv")]
    pub cv: String,
    /// H(T) − H(0), J/mol.
    #[serde(rename = "H_minus_H0")]
    pub h: String,
    /// −(G(T) − H(0))/T, J/(mol K).
    #[serde(rename = "minus_G_minus_H0_over_T")]
    pub g: String,
    /// Units of every value.
    pub units: Units,
}

/// The units of a molar point.
#[derive(Debug, Clone, Serialize)]
pub struct Units {
    /// Of S.
    #[serde(rename = "S")]
    pub s: &'static str,
    /// Of Cp and Cv.
    #[serde(rename = "Cp")]
    pub cp: &'static str,
    /// Of H − H0.
    #[serde(rename = "H_minus_H0")]
    pub h: &'static str,
    /// Of −(G − H0)/T.
    #[serde(rename = "minus_G_minus_H0_over_T")]
    pub g: &'static str,
    /// Of T.
    #[serde(rename = "T")]
    pub t: &'static str,
    /// Of p.
    pub p: &'static str,
}

const UNITS: Units = Units {
    s: "J/(mol K)",
    cp: "J/(mol K)",
    h: "J/mol",
    g: "J/(mol K)",
    t: "K",
    p: "Pa",
};

/// Per-R values of one contribution.
#[derive(Debug, Clone)]
pub(crate) struct Part {
    /// S/R (absolute, spin included as modelled).
    pub s: Float,
    /// (H − H0)/RT.
    pub h: Float,
    /// Cv/R.
    pub cv: Float,
    /// ln q (absolute).
    pub ln_q: Float,
}

/// Guard digits: the engine's values are certified to this many digits
/// beyond those printed; the molar functions add a few of them without
/// cancellation (every term of S, H and Cp is positive but the spin and
/// mixing corrections, which are small), so the printed digits stand.
const GUARD: u32 = 5;

pub(crate) fn prec(digits: u32) -> u32 {
    ((digits + 12) as f64 * std::f64::consts::LOG2_10).ceil() as u32 + 32
}

pub(crate) fn fl(prec: u32, r: &BigRational) -> Float {
    Float::with_val(prec, crate::sum::to_rug(r))
}

fn parse(prec: u32, s: &str) -> Result<Float> {
    Float::parse(s)
        .map(|v| Float::with_val(prec, v))
        .map_err(|_| Error::invalid("engine output", s, "a decimal number"))
}

/// The internal contribution of `s` at T, energies from `zero` (cm⁻¹).
pub(crate) fn internal_part(
    s: &dyn Spectrum,
    t: &BigRational,
    zero: &BigRational,
    digits: u32,
) -> Result<Part> {
    let p = prec(digits);
    let point = thermo(s, &Temperature::Kelvin(t.clone()), digits + GUARD)?;
    let ln_q = parse(p, &point.ln_q)?;
    let u = parse(p, &point.u_over_kt)?;
    let cv = parse(p, &point.cv_over_k)?;
    // E0/kT with E0 in cm-1: hc/k exact (second radiation constant, in m K) × 100.
    let c2 = constants::second_radiation_constant() * BigRational::from_integer(100.into());
    let e0 = fl(p, &(zero * c2 / t));
    Ok(Part {
        s: Float::with_val(p, &ln_q + &u),
        h: Float::with_val(p, &u - &e0),
        cv,
        ln_q,
    })
}

/// Translation at T and p for mass `m` (kg).
fn translation(m: &BigRational, t: &BigRational, o: &MolarOptions) -> Result<Part> {
    let p = prec(o.digits);
    let k = constants::boltzmann();
    let h = constants::planck();
    let kt = &k * t;
    match &o.translation {
        Translation::SackurTetrode => {
            // ln[(2π m kT/h²)^{3/2} kT/p] + 5/2
            let pi = Float::with_val(p, rug::float::Constant::Pi);
            let a = fl(p, &(m * &kt / (&h * &h))) * Float::with_val(p, &pi * 2u32);
            let ln_q = Float::with_val(p, a.ln()) * 1.5f64 + fl(p, &(&kt / &o.pressure)).ln();
            Ok(Part {
                s: Float::with_val(p, &ln_q + 2.5f64),
                h: Float::with_val(p, 2.5f64),
                cv: Float::with_val(p, 1.5f64),
                ln_q,
            })
        }
        Translation::Box(side) => {
            let b = ParticleInBox::cube(3)?.with_scale(m, side);
            let point = thermo(&b, &Temperature::Kelvin(t.clone()), o.digits + GUARD)?;
            let ln_qb = parse(p, &point.ln_q)?;
            let u = parse(p, &point.u_over_kt)?;
            let cv = parse(p, &point.cv_over_k)?;
            // Ground level 3 box units, measured from.
            let unit_j = crate::units::box_unit_joules(m, side);
            let e0 = fl(p, &(BigRational::from_integer(3.into()) * unit_j / &kt));
            // N = pV/kT per molecule count in the box.
            let v = side * side * side;
            let ln_n = fl(p, &(&o.pressure * v / &kt)).ln();
            let ln_q = Float::with_val(p, &ln_qb - &ln_n);
            Ok(Part {
                s: Float::with_val(p, &ln_q + &u) + 1u32,
                h: Float::with_val(p, &u - &e0) + 1u32,
                cv,
                ln_q,
            })
        }
    }
}

fn xlnx(x: &Float) -> Float {
    if x.is_zero() {
        Float::with_val(x.prec(), 0)
    } else {
        Float::with_val(x.prec(), x.ln_ref()) * x
    }
}

/// The spin isomers' weights `(ortho, para)` of a species.
pub(crate) fn isomer_weights(sp: &Species) -> Result<(ParityWeights, ParityWeights)> {
    let m = sp
        .molecule
        .as_ref()
        .filter(|_| sp.has_spin_isomers())
        .ok_or_else(|| {
            Error::invalid(
            "isomer",
            &sp.name,
            "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para forms",
        )
        })?;
    let o = crate::system::restrict_weights(m.weights.clone(), Some("ortho"))?;
    let pw = crate::system::restrict_weights(m.weights.clone(), Some("para"))?;
    Ok((o, pw))
}

/// Internal parts of the equilibrium mixture and of each isomer, with the
/// common energy zero (the equilibrium ground level).
pub(crate) struct IsomerParts {
    pub eq: Part,
    pub ortho: Part,
    pub para: Part,
    /// Spin weights of the ortho and para parities.
    pub w_ortho: u64,
    pub w_para: u64,
}

/// A species' internal spectra: the whole and, for species with spin
/// isomers, each isomer with its spin weight.
type Owned = Box<dyn Spectrum + Send + Sync>;

pub(crate) struct Spectra {
    full: Owned,
    /// Ortho and para spectra with their spin weights.
    iso: Option<(Owned, Owned, u64, u64)>,
}

impl Spectra {
    pub fn new(sp: &Species, model: VibModel) -> Result<Self> {
        let full = sp.internal(model, None)?;
        let iso = if sp.has_spin_isomers() {
            let (o, pw) = isomer_weights(sp)?;
            let w = |x: &ParityWeights| -> u64 {
                let v = x.weight(0).max(x.weight(1)).clone();
                u64::try_from(v).unwrap_or(u64::MAX)
            };
            let (wo, wp) = (w(&o), w(&pw));
            Some((
                sp.internal(model, Some(o))?,
                sp.internal(model, Some(pw))?,
                wo,
                wp,
            ))
        } else {
            None
        };
        Ok(Spectra { full, iso })
    }

    /// Views that keep level listings across a temperature grid.
    pub fn cached(&self) -> CachedSpectra<'_> {
        CachedSpectra {
            full: Cached::new(self.full.as_ref()),
            iso: self
                .iso
                .as_ref()
                .map(|(o, p, wo, wp)| (Cached::new(o.as_ref()), Cached::new(p.as_ref()), *wo, *wp)),
        }
    }
}

/// [`Spectra`] with level caches.
pub(crate) struct CachedSpectra<'a> {
    full: Cached<'a>,
    iso: Option<(Cached<'a>, Cached<'a>, u64, u64)>,
}

pub(crate) fn isomer_parts(
    sp: &Species,
    c: &CachedSpectra,
    t: &BigRational,
    digits: u32,
) -> Result<IsomerParts> {
    let (o, p, wo, wp) = c.iso.as_ref().ok_or_else(|| {
        Error::invalid(
            "isomer",
            &sp.name,
            "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para forms",
        )
    })?;
    let zero = c.full.ground_energy();
    let ortho = internal_part(o, t, &zero, digits)?;
    let para = internal_part(p, t, &zero, digits)?;
    // The equilibrium mixture from its two isomers (q = q_o + q_p): with
    // x = q_o/q, U and Cv are the mixture's mean and variance of E/kT,
    // Cv = x Cv_o + (1 − x) Cv_p + x(1 − x)(U_o − U_p)², from absolute U/kT.
    let prec = ortho.ln_q.prec();
    let d = Float::with_val(prec, &para.ln_q - &ortho.ln_q);
    let x = (Float::with_val(prec, d.exp_ref()) + 1u32).recip();
    let one_x = Float::with_val(prec, 1u32 - &x);
    let ln_q = Float::with_val(prec, &ortho.ln_q - Float::with_val(prec, x.ln_ref()));
    let (uo, up) = (
        Float::with_val(prec, &ortho.s - &ortho.ln_q),
        Float::with_val(prec, &para.s - &para.ln_q),
    );
    let u = Float::with_val(prec, &x * &uo) + Float::with_val(prec, &one_x * &up);
    let gap = Float::with_val(prec, &uo - &up);
    let cv = Float::with_val(prec, &x * &ortho.cv)
        + Float::with_val(prec, &one_x * &para.cv)
        + Float::with_val(prec, &x * &one_x) * Float::with_val(prec, gap.square_ref());
    let h = Float::with_val(prec, &x * &ortho.h) + Float::with_val(prec, &one_x * &para.h);
    let eq = Part {
        s: Float::with_val(prec, &ln_q + &u),
        h,
        cv,
        ln_q,
    };
    Ok(IsomerParts {
        eq,
        ortho,
        para,
        w_ortho: *wo,
        w_para: *wp,
    })
}

/// The standard molar functions of `species` at `t` (K).
///
/// ```
/// use zsum::species::{molar, Database, MolarOptions};
/// use zsum::exact::parse_rational;
/// let db = Database::builtin()?;
/// let p = molar(db.find("Ar")?, &parse_rational("298.15")?, &MolarOptions::default())?;
/// // CODATA Key Values (1989), S°(Ar, 298.15 K) = 154.846 ± 0.003 J/(mol K) (from memory).
/// assert!((p.s.parse::<f64>().unwrap() - 154.846).abs() < 0.002);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn molar(sp: &Species, t: &BigRational, o: &MolarOptions) -> Result<MolarPoint> {
    let spectra = Spectra::new(sp, o.model)?;
    molar_with(sp, &spectra.cached(), t, o)
}

pub(crate) fn molar_with(
    sp: &Species,
    cached: &CachedSpectra,
    t: &BigRational,
    o: &MolarOptions,
) -> Result<MolarPoint> {
    if !t.is_positive() {
        return Err(Error::invalid(
            "T",
            rational_string(t),
            "it must be greater than zero",
        ));
    }
    if !o.pressure.is_positive() {
        return Err(Error::invalid(
            "p",
            rational_string(&o.pressure),
            "the pressure must be greater than zero (in Pa; 1 bar = 100000)",
        ));
    }
    if !(1..=60).contains(&o.digits) {
        return Err(Error::invalid(
            "digits",
            o.digits,
            "choose between 1 and 60",
        ));
    }
    let p = prec(o.digits);
    let tr = translation(&sp.mass_kg, t, o)?;
    let (int_s, int_s_total, int_h, int_cv, ortho) =
        match (&o.isomer, sp.has_spin_isomers()) {
            (Some(_), false) => return Err(Error::invalid(
                "isomer",
                &sp.name,
                "only homonuclear molecules with nuclear spin (H2, D2, N2) have ortho and para \
                 forms",
            )),
            (None, false) => {
                let s = &cached.full;
                let part = internal_part(s, t, &s.ground_energy(), o.digits)?;
                let g = Float::with_val(p, sp.spin_states()).ln();
                let conv = Float::with_val(p, &part.s - &g);
                (conv, part.s, part.h, part.cv, None)
            }
            (iso, true) => {
                let ip = isomer_parts(sp, cached, t, o.digits)?;
                // Equilibrium ortho fraction q_o/q.
                let d = Float::with_val(p, &ip.para.ln_q - &ip.ortho.ln_q);
                let x_eq = Float::with_val(p, d.exp() + 1u32).recip();
                let (wo, wp) = (ip.w_ortho, ip.w_para);
                let frozen = |x: Float| {
                    let one_x = Float::with_val(p, 1u32 - &x);
                    let mix = Float::with_val(p, xlnx(&x) + xlnx(&one_x));
                    let total = Float::with_val(p, &x * &ip.ortho.s)
                        + Float::with_val(p, &one_x * &ip.para.s)
                        - &mix;
                    let so = Float::with_val(p, &ip.ortho.s - Float::with_val(p, wo).ln());
                    let spp = Float::with_val(p, &ip.para.s - Float::with_val(p, wp).ln());
                    let conv = Float::with_val(p, &x * &so) + Float::with_val(p, &one_x * &spp);
                    let h = Float::with_val(p, &x * &ip.ortho.h)
                        + Float::with_val(p, &one_x * &ip.para.h);
                    let cv = Float::with_val(p, &x * &ip.ortho.cv)
                        + Float::with_val(p, &one_x * &ip.para.cv);
                    (conv, total, h, cv, Some(x))
                };
                match iso.clone().unwrap_or(Isomer::Equilibrium) {
                    Isomer::Equilibrium => {
                        let g = Float::with_val(p, sp.spin_states()).ln();
                        let conv = Float::with_val(p, &ip.eq.s - &g);
                        (
                            conv,
                            ip.eq.s.clone(),
                            ip.eq.h.clone(),
                            ip.eq.cv.clone(),
                            Some(x_eq),
                        )
                    }
                    Isomer::Normal => frozen(Float::with_val(p, wo) / Float::with_val(p, wo + wp)),
                    Isomer::Ortho => frozen(Float::with_val(p, 1u32)),
                    Isomer::Para => frozen(Float::with_val(p, 0u32)),
                    Isomer::Fraction(x) => frozen(fl(p, &x)),
                }
            }
        };
    let s = Float::with_val(p, &tr.s + &int_s);
    let s_total = Float::with_val(p, &tr.s + &int_s_total);
    let h = Float::with_val(p, &tr.h + &int_h);
    let cv = Float::with_val(p, &tr.cv + &int_cv);
    let r = fl(p, &(constants::boltzmann() * constants::avogadro()));
    let rt = Float::with_val(p, &r * fl(p, t));
    let show = |v: Float| float_to_decimal(&v, 0.0, 0.0, o.digits).0;
    let cp = Float::with_val(p, &cv + 1u32);
    let g = Float::with_val(p, &s - &h);
    Ok(MolarPoint {
        species: sp.name.clone(),
        t: exact_decimal(t, 30),
        p: exact_decimal(&o.pressure, 30),
        isomer: sp
            .has_spin_isomers()
            .then(|| o.isomer.clone().unwrap_or(Isomer::Equilibrium).name()),
        ortho_fraction: ortho.as_ref().map(|x| show(x.clone())),
        s: show(Float::with_val(p, &s * &r)),
        s_total: show(Float::with_val(p, &s_total * &r)),
        cp: show(Float::with_val(p, &cp * &r)),
        cv: show(Float::with_val(p, &cv * &r)),
        h: show(Float::with_val(p, &h * &rt)),
        g: show(Float::with_val(p, &g * &r)),
        units: UNITS,
    })
}

/// A property table: one species over a temperature grid.
#[derive(Debug, Clone, Serialize)]
#[serde(transparent)]
pub struct MolarTable {
    /// The rows, in grid order.
    pub rows: Vec<MolarPoint>,
}

impl MolarTable {
    /// Builds the table of `sp` over `grid` (kelvin), listing internal
    /// levels once for the whole grid.
    pub fn build(sp: &Species, grid: &[BigRational], o: &MolarOptions) -> Result<Self> {
        let spectra = Spectra::new(sp, o.model)?;
        let cached = spectra.cached();
        // Hottest first so one listing serves every temperature.
        let mut order: Vec<usize> = (0..grid.len()).collect();
        order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
        let mut rows: Vec<Option<MolarPoint>> = vec![None; grid.len()];
        for i in order {
            rows[i] = Some(molar_with(sp, &cached, &grid[i], o)?);
        }
        Ok(MolarTable {
            rows: rows.into_iter().flatten().collect(),
        })
    }
}

/// Property tables of every species in `species` over one grid, built on
/// all available cores (one species per task).
pub fn tables(
    species: &[&Species],
    grid: &[BigRational],
    o: &MolarOptions,
) -> Result<Vec<MolarTable>> {
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .max(1);
    let next = std::sync::atomic::AtomicUsize::new(0);
    let slots: Vec<std::sync::Mutex<Option<Result<MolarTable>>>> = species
        .iter()
        .map(|_| std::sync::Mutex::new(None))
        .collect();
    std::thread::scope(|scope| {
        for _ in 0..threads.min(species.len()) {
            scope.spawn(|| loop {
                let i = next.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
                if i >= species.len() {
                    break;
                }
                let r = MolarTable::build(species[i], grid, o);
                if let Ok(mut slot) = slots[i].lock() {
                    *slot = Some(r);
                }
            });
        }
    });
    slots
        .into_iter()
        .map(|m| {
            m.into_inner().ok().flatten().unwrap_or_else(|| {
                Err(Error::invalid(
                    "species table",
                    "missing",
                    "a finished task",
                ))
            })
        })
        .collect()
}

impl Tabular for MolarTable {
    fn preamble(&self) -> Vec<String> {
        let first = self.rows.first();
        vec![
            format!(
                "{}: ideal-gas standard molar functions at p = {} Pa from exact sums",
                first.map(|r| r.species.as_str()).unwrap_or(""),
                first.map(|r| r.p.as_str()).unwrap_or("")
            ),
            "S conventional (nuclear spin excluded); S_total with it; energies from the lowest \
             level (H0); S, Cp, Cv, -(G-H0)/T in J/(mol K), H-H0 in J/mol"
                .into(),
            "ideal-gas model values: design decisions follow certified property data, local \
             codes and licensed engineering practice"
                .into(),
        ]
    }

    fn columns(&self) -> Vec<String> {
        let mut c = vec!["T (K)".to_string()];
        if self.rows.iter().any(|r| r.isomer.is_some()) {
            c.push("isomer".into());
            c.push("ortho fraction".into());
        }
        for x in ["S", "S_total", "Cp", "Cv", "H-H0", "-(G-H0)/T"] {
            c.push(x.into());
        }
        c
    }

    fn rows(&self) -> Vec<Vec<String>> {
        let iso = self.rows.iter().any(|r| r.isomer.is_some());
        self.rows
            .iter()
            .map(|r| {
                let mut v = vec![r.t.clone()];
                if iso {
                    v.push(r.isomer.clone().unwrap_or_default());
                    v.push(r.ortho_fraction.clone().unwrap_or_default());
                }
                v.extend([
                    r.s.clone(),
                    r.s_total.clone(),
                    r.cp.clone(),
                    r.cv.clone(),
                    r.h.clone(),
                    r.g.clone(),
                ]);
                v
            })
            .collect()
    }
}
