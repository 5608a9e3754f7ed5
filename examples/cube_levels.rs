//! The cubic box's lowest levels with their states, and where each
//! degeneracy comes from.
//!
//! Run with `cargo run --example cube_levels`.

use zsum::exact::parse_rational;
use zsum::models::ParticleInBox;
use zsum::spectrum::Budget;

fn main() -> Result<(), zsum::Error> {
    let cube = ParticleInBox::cube(3)?;
    let cutoff = parse_rational("41")?;
    for (level, states) in cube.levels_with_states(&cutoff, &Budget::default())? {
        let list: Vec<String> = states.iter().map(|s| format!("{:?}", s.0)).collect();
        println!(
            "E = {:>3}  g = {:>2}  {:<11}  {}",
            level.level.energy.to_string(),
            level.level.degeneracy.to_string(),
            level.origin().as_str(),
            list.join(" ")
        );
    }
    // Counting without listing: the cube's states up to E = 10^8.
    let n = cube.count_up_to(&parse_rational("1e8")?)?;
    println!("states with E <= 1e8: {n}");
    Ok(())
}
