//! One thermodynamic state point as printed: every value of a
//! [`Thermo`] written to the requested digits, each digit proved.

use crate::sum::{format, Thermo};
use serde::Serialize;

/// One thermodynamic state point, per particle, with every value written to
/// the requested digits.
#[derive(Debug, Clone, Serialize)]
pub struct ThermoPoint {
    /// The temperature as given (kelvin, or kT in the spectrum's unit).
    #[serde(rename = "T")]
    pub t: String,
    /// The partition function q.
    pub q: String,
    /// ln q.
    pub ln_q: String,
    /// Bound on the relative error of q (tail plus rounding).
    pub rel_bound: String,
    /// U/(kT).
    #[serde(rename = "U_over_kT")]
    pub u_over_kt: String,
    /// Cv/k.
    #[serde(rename = "Cv_over_k")]
    pub cv_over_k: String,
    /// S/k.
    #[serde(rename = "S_over_k")]
    pub s_over_k: String,
    /// F/(kT).
    #[serde(rename = "F_over_kT")]
    pub f_over_kt: String,
    /// Significant digits of every value.
    pub digits: u32,
    /// Working precision used, in bits.
    pub precision_bits: u32,
    /// Whether every value was proved correctly rounded. False only when
    /// the effort limit [`ThermoPoint::max_bits`] was reached first; then
    /// [`ThermoPoint::certified_digits`] says how many digits are proved.
    pub certified: bool,
    /// The number of leading significant digits proved for every value
    /// (equal to `digits` when certified).
    pub certified_digits: u32,
    /// The effort limit: the most working bits the engine was allowed.
    pub max_bits: u32,
}

impl ThermoPoint {
    /// The values of `p` at temperature `t` (as text) written to `digits`
    /// significant digits (at most those `p` was computed for), each
    /// certified afresh from its radius.
    ///
    /// ```
    /// use zsum::models::rotor::LinearRotor;
    /// use zsum::report::ThermoPoint;
    /// use zsum::sum::{thermo, Temperature};
    /// use zsum::units::EnergyUnit;
    /// use zsum::exact::parse_rational;
    /// let rotor = LinearRotor::rigid(parse_rational("2")?, EnergyUnit::Kelvin)?;
    /// let p = thermo(&rotor, &Temperature::Kelvin(parse_rational("300")?), 12)?;
    /// let text = ThermoPoint::new(&p, "300", 12);
    /// assert!(text.certified && text.cv_over_k.starts_with("1.000"));
    /// # Ok::<(), zsum::Error>(())
    /// ```
    pub fn new(p: &Thermo, t: &str, digits: u32) -> ThermoPoint {
        let all = [
            &p.ln_q,
            &p.u_over_kt,
            &p.cv_over_k,
            &p.s_over_k,
            &p.f_over_kt,
        ];
        let (q, _) = p.ln_q.exp_decimal(digits);
        let texts: Vec<(String, bool)> = all.iter().map(|c| c.decimal_marked(digits)).collect();
        let certified = p.settles(digits);
        let certified_digits = if certified {
            digits
        } else {
            p.proved_digits(digits)
        };
        let mut it = texts.into_iter().map(|t| t.0);
        let mut next = || it.next().unwrap_or_default();
        ThermoPoint {
            t: t.to_string(),
            q,
            ln_q: next(),
            rel_bound: format::radius_text(&p.q_relative_bound()),
            u_over_kt: next(),
            cv_over_k: next(),
            s_over_k: next(),
            f_over_kt: next(),
            digits,
            precision_bits: p.precision_bits,
            certified,
            certified_digits,
            max_bits: p.max_bits,
        }
    }

    /// The values of `p` at the digits it was computed for (no temperature
    /// text).
    pub fn of(p: &Thermo) -> ThermoPoint {
        ThermoPoint::new(p, "", p.digits)
    }

    /// Why the point is not certified, or `None` when it is: e.g.
    /// "digits beyond the 12th need more than 16384 bits; raise --max-bits".
    pub fn shortfall(&self) -> Option<String> {
        (!self.certified).then(|| crate::sum::shortfall_text(self.certified_digits, self.max_bits))
    }
}
