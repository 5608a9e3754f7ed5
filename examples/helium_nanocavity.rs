//! A demo scenario (invented): helium-4 atoms trapped in the 5 nm cubic
//! cavities of a fictional sorbent, "cage C5". How far apart are the lowest
//! translational levels in kelvin, and how many states lie below 1 K?
//!
//! Run with `cargo run --example helium_nanocavity`.

use num_rational::BigRational;
use zsum::exact::{format_sig, parse_rational};
use zsum::models::ParticleInBox;
use zsum::spectrum::Spectrum;
use zsum::units::{box_unit_joules, parse_length_m, parse_mass_kg, EnergyUnit};

fn main() -> Result<(), zsum::Error> {
    let mass = parse_mass_kg("4.0026u")?;
    let side = parse_length_m("5nm")?;
    let unit = EnergyUnit::Natural {
        symbol: "h^2/(8 m L^2)".into(),
        joules: Some(box_unit_joules(&mass, &side)),
    };
    let to_kelvin = unit.factor_to(&EnergyUnit::Kelvin)?;
    println!(
        "cage C5, He-4: 1 h^2/(8 m L^2) = {} K",
        format_sig(&to_kelvin, 8)
    );
    let cube = ParticleInBox::cube(3)?;
    let levels = cube.levels_up_to(&parse_rational("30")?)?;
    for l in levels.iter().take(6) {
        println!(
            "  E = {:>2} units = {} K, {} states",
            l.energy.to_string(),
            format_sig(&(&l.energy * &to_kelvin), 6),
            l.degeneracy
        );
    }
    // States below 1 K: the cutoff in box units is 1 K / (size of the unit in K).
    let cutoff: BigRational = BigRational::from_integer(1.into()) / &to_kelvin;
    let n = cube.count_up_to(&cutoff)?;
    println!(
        "states below 1 K: {n} (Weyl's law with the wall correction: {:.0})",
        cube.weyl_estimate(num_traits::ToPrimitive::to_f64(&cutoff).unwrap())
    );
    Ok(())
}
