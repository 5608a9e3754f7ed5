//! Thermodynamic functions over temperature grids, per particle and in
//! physical units, from the certified sums of [`crate::sum`].
//!
//! Physical values are the dimensionless ones times exact constants:
//! U = (U/kT)·kT, Cv = (Cv/k)·k, S = (S/k)·k, F = (F/kT)·kT, with k and
//! R = k N_A exact (SI 2019). Every value is printed to the requested digits
//! and flagged unless both ends of its error interval round alike.

use crate::budget::Meter;
use crate::error::{Error, Result};
use crate::exact::parse_rational;
use crate::spectrum::Spectrum;
use crate::sum::{thermo_metered, Certified, Path, Temperature};
use crate::units::constants;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};

/// The most temperatures one grid may hold.
pub const MAX_GRID: usize = 100_000;

/// Reads a temperature grid: `298.15`, `10:300:5` (start:stop:step,
/// exact decimals, stop included when on the grid), `log:1:1000:50`
/// (COUNT points spaced evenly in ln T, each rounded to 12 significant
/// digits so that it is an exact decimal), or a comma list of any of these
/// (`20.28,77,300` or `1:5:1,77`), kept in the order given.
///
/// ```
/// use zsum::thermo::parse_grid;
/// assert_eq!(parse_grid("--T", "10:30:10").unwrap().len(), 3);
/// assert_eq!(parse_grid("--T", "log:1:1000:4").unwrap()[1].to_string(), "10");
/// assert!(parse_grid("--T", "10:30:0").is_err());
/// let list = parse_grid("--T", "20.28,77,300").unwrap();
/// assert_eq!(list.len(), 3);
/// assert_eq!(list[0].to_string(), "507/25");
/// assert!(parse_grid("--T", "20,,30").is_err());
/// ```
pub fn parse_grid(flag: &str, text: &str) -> Result<Vec<BigRational>> {
    if text.contains(',') {
        let mut all = Vec::new();
        for part in text.split(',') {
            if part.trim().is_empty() {
                return Err(Error::parse(
                    flag,
                    text,
                    "a comma list of temperatures or grids with nothing empty between the \
                     commas (20.28,77,300)",
                ));
            }
            all.extend(parse_grid(flag, part.trim())?);
            if all.len() > MAX_GRID {
                return Err(Error::invalid(
                    flag,
                    text,
                    &format!("a grid may hold at most {MAX_GRID} temperatures"),
                ));
            }
        }
        return Ok(all);
    }
    let num = |s: &str| {
        parse_rational(s).map_err(|_| {
            Error::parse(
                flag,
                text,
                "a temperature (298.15), a grid START:STOP:STEP (10:300:5) or log:START:STOP:COUNT",
            )
        })
    };
    let positive = |t: &BigRational| -> Result<()> {
        if t.is_positive() {
            Ok(())
        } else {
            Err(Error::invalid(
                flag,
                text,
                "temperatures must be greater than zero",
            ))
        }
    };
    let parts: Vec<&str> = text.split(':').collect();
    let out = match parts.as_slice() {
        [one] => {
            let t = num(one)?;
            positive(&t)?;
            vec![t]
        }
        ["log", a, b, n] => {
            let (a, b) = (num(a)?, num(b)?);
            positive(&a)?;
            positive(&b)?;
            let n: usize = n
                .trim()
                .parse()
                .ok()
                .filter(|&n| (2..=MAX_GRID).contains(&n))
                .ok_or_else(|| {
                    Error::invalid(
                        flag,
                        text,
                        &format!("a log grid needs a COUNT from 2 to {MAX_GRID}"),
                    )
                })?;
            if a >= b {
                return Err(Error::invalid(flag, text, "a log grid needs START < STOP"));
            }
            let (la, lb) = (
                a.to_f64().unwrap_or(0.0).ln(),
                b.to_f64().unwrap_or(0.0).ln(),
            );
            (0..n)
                .map(|i| {
                    if i == 0 {
                        return Ok(a.clone());
                    }
                    if i == n - 1 {
                        return Ok(b.clone());
                    }
                    let t = (la + (lb - la) * i as f64 / (n - 1) as f64).exp();
                    num(&format!("{t:.11e}"))
                })
                .collect::<Result<Vec<_>>>()?
        }
        [a, b, step] => {
            let (a, b, st) = (num(a)?, num(b)?, num(step)?);
            positive(&a)?;
            positive(&b)?;
            if st.is_zero() || (b > a && st.is_negative()) || (b < a && st.is_positive()) {
                return Err(Error::invalid(
                    flag,
                    text,
                    "the step must be non-zero and point from START towards STOP",
                ));
            }
            let count = ((&b - &a) / &st)
                .floor()
                .to_integer()
                .to_usize()
                .unwrap_or(usize::MAX);
            if count >= MAX_GRID {
                return Err(Error::invalid(
                    flag,
                    text,
                    &format!("a grid may hold at most {MAX_GRID} temperatures; use a larger step"),
                ));
            }
            (0..=count)
                .map(|i| &a + &st * BigRational::from_integer(BigInt::from(i)))
                .collect()
        }
        _ => {
            return Err(Error::parse(
                flag,
                text,
                "a temperature (298.15), a grid START:STOP:STEP (10:300:5) or log:START:STOP:COUNT",
            ))
        }
    };
    Ok(out)
}

/// Physical units for thermodynamic functions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Per {
    /// Per mole (J/mol, J/(mol K)).
    Mole,
    /// Per particle (J, J/K).
    Particle,
}

/// The physical values of one state point, certified: U and F in J/mol or
/// J, Cv and S in J/(mol K) or J/K.
#[derive(Debug, Clone)]
pub struct Physical {
    /// Internal energy above the ground level.
    pub u: Certified,
    /// Heat capacity at constant volume.
    pub cv: Certified,
    /// Entropy.
    pub s: Certified,
    /// Helmholtz energy above the ground level.
    pub f: Certified,
}

/// One state point of a grid: its temperature and its certified values.
#[derive(Debug, Clone)]
pub struct Properties {
    /// The temperature, exactly as on the grid (kelvin, or kT in the
    /// spectrum's unit).
    pub t: BigRational,
    /// The dimensionless values per particle.
    pub thermo: crate::sum::Thermo,
    /// The values in physical units, when asked for.
    pub physical: Option<Physical>,
}

impl Properties {
    /// Whether every value, the physical ones included, is proved to
    /// `digits` significant digits.
    pub fn settles(&self, digits: u32) -> bool {
        self.thermo.settles(digits)
            && self
                .physical
                .as_ref()
                .is_none_or(|p| [&p.u, &p.cv, &p.s, &p.f].iter().all(|c| c.settles(digits)))
    }
}

/// Extra digits asked of the engine when a physical value straddles a
/// rounding boundary at the requested digits.
const EXTRA: u32 = 4;

/// Checks the digits a grid may ask for.
pub fn check_grid_digits(digits: u32) -> Result<()> {
    let max = crate::sum::MAX_DIGITS - EXTRA;
    if (1..=max).contains(&digits) {
        Ok(())
    } else {
        Err(Error::invalid(
            "digits",
            digits,
            &format!("choose between 1 and {max} significant digits"),
        ))
    }
}

/// Evaluates `spectrum` at every temperature of `grid` (kelvin when
/// `kelvin`, else kT in the spectrum's unit) so that every value is proved
/// to `digits` significant digits (or as many as the effort limit
/// `max_bits` allows; see [`crate::sum::thermo_limited`]); `per` adds the
/// values in physical units (kelvin only), each the engine's ball times
/// exact constants. Where one of those straddles a rounding boundary, the
/// point is recomputed with more digits (tighter balls). `meter` times the
/// grid (hottest, costliest, first; parts of a product count as fractions
/// of a step), tells its observer how far it is, and refuses the rest once
/// the projected time exceeds its budget. Rows come back in grid order.
///
/// ```
/// use zsum::budget::Meter;
/// use zsum::exact::parse_rational;
/// use zsum::models::rotor::LinearRotor;
/// use zsum::thermo::{properties, Per};
/// use zsum::units::EnergyUnit;
/// let rotor = LinearRotor::rigid(parse_rational("2")?, EnergyUnit::Kelvin)?;
/// let grid = [parse_rational("300")?];
/// let meter = Meter::unlimited();
/// let rows = properties(&rotor, &grid, true, 12, 4096, Some(Per::Mole), &meter)?;
/// // Cv of a linear rotor at T = 150 θ: close to R = 8.314 J/(mol K).
/// let cv = rows[0].physical.as_ref().unwrap().cv.to_f64();
/// assert!((cv - 8.314462618).abs() < 1e-3);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn properties(
    spectrum: &(dyn Spectrum + Sync),
    grid: &[BigRational],
    kelvin: bool,
    digits: u32,
    max_bits: u32,
    per: Option<Per>,
    meter: &Meter,
) -> Result<Vec<Properties>> {
    if per.is_some() && !kelvin {
        return Err(Error::invalid(
            "physical units",
            "with thermal-energy temperatures",
            "physical units need temperatures in kelvin",
        ));
    }
    check_grid_digits(digits)?;
    let k = constants::boltzmann();
    let scale = match per {
        Some(Per::Mole) => Some(&k * constants::avogadro()),
        Some(Per::Particle) => Some(k.clone()),
        None => None,
    };
    // Sweep from the hottest temperature down over every core
    // (budget::sweep): each core keeps its own level cache, whose first
    // listing covers every later point.
    let mut order: Vec<usize> = (0..grid.len()).collect();
    order.sort_by(|&a, &b| grid[b].cmp(&grid[a]));
    let point_at = |cached: &crate::sum::Cached,
                    i: usize,
                    progress: Option<(&Meter, f64)>|
     -> Result<Properties> {
        let t = &grid[i];
        let temp = if kelvin {
            Temperature::Kelvin(t.clone())
        } else {
            Temperature::ThermalEnergy(t.clone())
        };
        let mut extra = 0;
        loop {
            let wide = thermo_metered(
                cached,
                &temp,
                digits + extra,
                Path::Auto,
                max_bits,
                progress,
            )?;
            let physical = scale.as_ref().map(|c| {
                let ct = c * t;
                Physical {
                    u: wide.u_over_kt.scale(&ct),
                    cv: wide.cv_over_k.scale(c),
                    s: wide.s_over_k.scale(c),
                    f: wide.f_over_kt.scale(&ct),
                }
            });
            let point = Properties {
                t: t.clone(),
                thermo: wide,
                physical,
            };
            let ok = point.settles(digits);
            let room = crate::sum::precision_for(digits + extra + EXTRA) <= max_bits;
            if ok || !room || extra >= 2 * EXTRA || point.thermo.precision_bits >= max_bits {
                return Ok(point);
            }
            extra += EXTRA;
        }
    };
    let mut done: Vec<Option<Properties>> = vec![None; grid.len()];
    let cached = || crate::sum::Cached::new(spectrum);
    for (i, p) in crate::budget::sweep(&order, cached, point_at, meter)? {
        done[i] = Some(p);
    }
    Ok(done.into_iter().flatten().collect())
}
