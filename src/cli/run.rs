//! Validates raw arguments into library objects, runs the library, renders.

use super::args::{
    BoxCount, BoxLevels, BoxShape, Cli, Command, CountModel, FormatArg, LevelsModel, Output,
};
use num_rational::BigRational;
use zsum::error::{Error, Result};
use zsum::exact::parse_rational;
use zsum::export::{render, write_atomic, Format};
use zsum::models::ParticleInBox;
use zsum::report::{check_digits, BoxScale, CountReport, LevelsReport};
use zsum::spectrum::Budget;
use zsum::units::{parse_length_m, parse_mass_kg, EnergyUnit};

/// Runs a parsed command line; returns text for standard output (`None` when
/// the output went to a file).
pub fn run(cli: Cli) -> Result<Option<String>> {
    match cli.command {
        Command::Levels {
            model: LevelsModel::Box(a),
        } => levels_box(a),
        Command::Count {
            model: CountModel::Box(a),
        } => count_box(a),
    }
}

fn box_model(shape: &BoxShape) -> Result<ParticleInBox> {
    let sides: Option<Vec<BigRational>> = shape
        .sides
        .as_deref()
        .map(|text| {
            text.split([',', ':'])
                .map(|s| {
                    parse_rational(s).map_err(|_| {
                        Error::parse(
                            "side ratio",
                            s.trim(),
                            "positive numbers separated by commas, e.g. 1,1,2 or 2:3:5",
                        )
                    })
                })
                .collect()
        })
        .transpose()?;
    let dims = match (shape.dims, &sides) {
        (Some(d), _) if !(1..=3).contains(&d) => {
            return Err(Error::invalid(
                "--dims",
                d,
                "a box has 1, 2 or 3 dimensions",
            ))
        }
        (Some(d), Some(s)) if s.len() != d as usize => {
            return Err(Error::invalid(
                "--sides",
                shape.sides.as_deref().unwrap_or_default(),
                &format!("--dims {d} needs exactly {d} side ratios, got {}", s.len()),
            ))
        }
        (Some(d), _) => d as usize,
        (None, Some(s)) => s.len(),
        (None, None) => 3,
    };
    match sides {
        Some(s) => ParticleInBox::new(s),
        None => ParticleInBox::cube(dims),
    }
}

fn cutoff(text: &str) -> Result<BigRational> {
    parse_rational(text).map_err(|_| {
        Error::parse(
            "--up-to",
            text,
            "an energy in box units: a decimal such as 60 or 1e4, or a fraction such as 27/4",
        )
    })
}

fn parse_budget(text: &str) -> Result<Budget> {
    let t = text.trim();
    let (num, mult) = [
        ("KiB", 1u64 << 10),
        ("MiB", 1 << 20),
        ("GiB", 1 << 30),
        ("TiB", 1 << 40),
        ("B", 1),
    ]
    .iter()
    .find_map(|(suffix, m)| t.strip_suffix(suffix).map(|n| (n, *m)))
    .unwrap_or((t, 1));
    let bad = || {
        Error::parse(
            "--memory-budget",
            text,
            "a size such as 512MiB, 4GiB or 1e9",
        )
    };
    let v = parse_rational(num).map_err(|_| bad())?;
    let bytes = zsum::exact::floor_to_u128(&(v * BigRational::from_integer(mult.into())))
        .filter(|&b| b > 0 && b <= u64::MAX as u128)
        .ok_or_else(bad)?;
    Ok(Budget::bytes(bytes as u64))
}

fn format(f: FormatArg) -> Format {
    match f {
        FormatArg::Table => Format::Table,
        FormatArg::Json => Format::Json,
        FormatArg::Csv => Format::Csv,
    }
}

fn emit(text: String, out: &Output) -> Result<Option<String>> {
    match &out.output {
        Some(path) => {
            write_atomic(path, &text)?;
            Ok(None)
        }
        None => Ok(Some(text)),
    }
}

fn levels_box(a: BoxLevels) -> Result<Option<String>> {
    let model = box_model(&a.shape)?;
    let cut = cutoff(&a.up_to)?;
    let budget = parse_budget(&a.memory_budget)?;
    let scale = match (&a.mass, &a.side) {
        (Some(m), Some(s)) => Some(BoxScale {
            mass_text: m.clone(),
            mass_kg: parse_mass_kg(m)?,
            side_text: s.clone(),
            side_m: parse_length_m(s)?,
            unit: EnergyUnit::parse(a.unit.as_deref().unwrap_or("K"))?,
            digits: check_digits(a.digits.unwrap_or(10))?,
        }),
        _ => None,
    };
    let report = LevelsReport::for_box(&model, &cut, a.states, scale.as_ref(), &budget)?;
    emit(render(&report, format(a.out.format))?, &a.out)
}

fn count_box(a: BoxCount) -> Result<Option<String>> {
    let model = box_model(&a.shape)?;
    let cut = cutoff(&a.up_to)?;
    let report = CountReport::for_box(&model, &cut)?;
    emit(render(&report, format(a.out.format))?, &a.out)
}
