//! Error maps: the exact values and every chosen approximation over a
//! temperature grid, with relative errors, as numbers (the printed map is
//! made from them in the report layer).

use super::{Approximation, Classical, Quantity, Values, PREC};
use crate::error::Result;
use crate::sum::{Cached, Temperature};
use num_rational::BigRational;
use rug::Float;

/// One approximation's values at one temperature, with its relative errors
/// (approximate/exact − 1) of q, U, Cv and S.
#[derive(Debug, Clone)]
pub struct Approximate {
    /// The approximation's values.
    pub values: Values,
    /// Relative errors of q, U, Cv, S, in the order of [`Quantity::ALL`].
    pub rel_error: [Float; 4],
}

/// One temperature of an error map.
#[derive(Debug, Clone)]
pub struct MapPoint {
    /// The temperature, exactly as on the grid (kelvin, or kT in the
    /// model's unit).
    pub t: BigRational,
    /// T/θ, exactly.
    pub reduced: BigRational,
    /// The exact values.
    pub exact: Values,
    /// Each approximation's values; `None` where it is not defined (its q
    /// not positive).
    pub approximations: Vec<Option<Approximate>>,
}

/// An error map: the approximations compared and one point per temperature.
#[derive(Debug, Clone)]
pub struct ErrorMap {
    /// Whether the temperatures are in kelvin (else kT in the model's unit).
    pub kelvin: bool,
    /// The approximations compared, in the order of each point's list.
    pub approximations: Vec<Approximation>,
    /// One point per temperature, in grid order.
    pub points: Vec<MapPoint>,
}

impl ErrorMap {
    /// `(T, value)` of `quantity` for the exact sum (`None`) or
    /// approximation number `k` of the map, in grid order; T in kelvin or
    /// kT as the grid was given. Undefined points are left out.
    pub fn series(&self, quantity: Quantity, k: Option<usize>) -> Vec<(f64, f64)> {
        self.points
            .iter()
            .filter_map(|p| {
                let t = num_traits::ToPrimitive::to_f64(&p.t).unwrap_or(f64::NAN);
                let v = match k {
                    None => &p.exact,
                    Some(k) => &p.approximations.get(k)?.as_ref()?.values,
                };
                let y = v.get(quantity);
                Some((t, Float::with_val(PREC, y).to_f64()))
            })
            .collect()
    }

    /// `(T, |relative error|)` of `quantity` for approximation number `k`.
    pub fn error_series(&self, quantity: Quantity, k: usize) -> Vec<(f64, f64)> {
        let qi = Quantity::ALL
            .iter()
            .position(|q| *q == quantity)
            .unwrap_or(0);
        self.points
            .iter()
            .filter_map(|p| {
                let t = num_traits::ToPrimitive::to_f64(&p.t).unwrap_or(f64::NAN);
                let e = p.approximations.get(k)?.as_ref()?.rel_error[qi].to_f64();
                Some((t, e.abs()))
            })
            .collect()
    }

    /// T/θ of every point, in grid order.
    pub fn reduced(&self) -> Vec<f64> {
        self.points
            .iter()
            .map(|p| num_traits::ToPrimitive::to_f64(&p.reduced).unwrap_or(f64::NAN))
            .collect()
    }
}

/// Computes the error map of the approximations `indices` over `grid` (T in
/// kelvin when `kelvin`, else kT in the model's unit), hottest first so one
/// listing serves the whole grid; `meter` times it.
///
/// ```
/// use zsum::budget::Meter;
/// use zsum::classical::{error_map, Classical, Quantity};
/// use zsum::exact::parse_rational;
/// use zsum::models::rotor::LinearRotor;
/// use zsum::units::EnergyUnit;
/// let rotor = LinearRotor::rigid(parse_rational("2")?, EnergyUnit::Kelvin)?;
/// let c = Classical::new(&rotor)?;
/// let grid = [parse_rational("20")?, parse_rational("2000")?];
/// let meter = Meter::unlimited();
/// let map = error_map(&c, &[0], &grid, true, &meter)?;
/// // The first (classical) form's error in q shrinks as T/θ grows.
/// let errors = map.error_series(Quantity::Q, 0);
/// assert!(errors[1].1 < errors[0].1);
/// # Ok::<(), zsum::Error>(())
/// ```
pub fn error_map(
    c: &Classical,
    indices: &[usize],
    grid: &[BigRational],
    kelvin: bool,
    meter: &crate::budget::Meter,
) -> Result<ErrorMap> {
    let all = c.approximations();
    for &i in indices {
        if i >= all.len() {
            return Err(crate::error::Error::invalid(
                "approximation index",
                i,
                "an index the model offers",
            ));
        }
    }
    let cached = Cached::new(c.spectrum());
    let cc = Classical {
        spectrum: &cached,
        form: c.form().clone(),
    };
    let mut order: Vec<usize> = (0..grid.len()).collect();
    order.sort_by(|a, b| grid[*b].cmp(&grid[*a]));
    let mut points: Vec<Option<MapPoint>> = vec![None; grid.len()];
    for (done, &g) in order.iter().enumerate() {
        let temp = if kelvin {
            Temperature::Kelvin(grid[g].clone())
        } else {
            Temperature::ThermalEnergy(grid[g].clone())
        };
        let exact = cc.exact(&temp)?;
        let reduced = cc.reduced(&temp)?;
        let mut approximations = Vec::new();
        for &i in indices {
            approximations.push(cc.approximate(i, &temp)?.map(|values| Approximate {
                rel_error: Quantity::ALL.map(|q| values.rel_error(&exact, q)),
                values,
            }));
        }
        points[g] = Some(MapPoint {
            t: grid[g].clone(),
            reduced,
            exact,
            approximations,
        });
        meter.at(done as f64 + 1.0)?;
    }
    Ok(ErrorMap {
        kelvin,
        approximations: indices.iter().map(|&i| all[i].clone()).collect(),
        points: points.into_iter().flatten().collect(),
    })
}
