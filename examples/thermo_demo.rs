//! Certified partition functions for a few models (demo values).
//!
//! Run with `cargo run --release --example thermo_demo`.

use zsum::exact::parse_rational;
use zsum::models::oscillator::HarmonicModes;
use zsum::models::rotor::LinearRotor;
use zsum::models::ParticleInBox;
use zsum::sum::{thermo, Temperature};
use zsum::units::EnergyUnit;

fn main() -> Result<(), zsum::Error> {
    let r = |s: &str| parse_rational(s).unwrap();
    let rot = LinearRotor::rigid(r("1"), EnergyUnit::Kelvin)?;
    for t in ["0.1", "1", "10", "10000"] {
        let p = zsum::report::ThermoPoint::of(&thermo(&rot, &Temperature::Kelvin(r(t)), 30)?);
        println!(
            "rotor B=1 K, T={t} K: q={} Cv/k={} certified={}",
            p.q, p.cv_over_k, p.certified
        );
    }
    let ho = HarmonicModes::one_d(r("1"), false, EnergyUnit::Kelvin)?;
    let p = zsum::report::ThermoPoint::of(&thermo(&ho, &Temperature::Kelvin(r("2")), 30)?);
    println!(
        "oscillator 1 K at 2 K: q={} U/kT={} Cv/k={}",
        p.q, p.u_over_kt, p.cv_over_k
    );
    let cube = ParticleInBox::cube(3)?;
    for kt in ["1000", "1e16"] {
        let p =
            zsum::report::ThermoPoint::of(&thermo(&cube, &Temperature::ThermalEnergy(r(kt)), 30)?);
        println!(
            "cube kT={kt}: ln q={} U/kT={} Cv/k={}",
            p.ln_q, p.u_over_kt, p.cv_over_k
        );
    }
    Ok(())
}
