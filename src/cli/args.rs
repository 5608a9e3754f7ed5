//! Raw command-line arguments, as clap reads them. Values stay text here;
//! [`super::run`] turns them into exact numbers and models.

use clap::{Args, Parser, Subcommand, ValueEnum};
use std::path::PathBuf;

/// Exact quantum state counts, level lists and degeneracies.
#[derive(Debug, Parser)]
#[command(name = "zsum", version, about, long_about = None, propagate_version = true)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// List a model's energy levels up to a cutoff, with exact degeneracies,
    /// the origin of each degeneracy, and optionally every state.
    Levels {
        /// The model.
        #[command(subcommand)]
        model: LevelsModel,
    },
    /// Count a model's states up to an energy exactly, without listing them.
    Count {
        /// The model.
        #[command(subcommand)]
        model: CountModel,
    },
}

/// Models for `levels`.
#[derive(Debug, Subcommand)]
pub enum LevelsModel {
    /// Particle in a box with impenetrable walls (1, 2 or 3 dimensions).
    /// Energies in units of h^2/(8 m L^2); quantum numbers n_i >= 1.
    Box(BoxLevels),
}

/// Models for `count`.
#[derive(Debug, Subcommand)]
pub enum CountModel {
    /// Particle in a box with impenetrable walls (1, 2 or 3 dimensions).
    Box(BoxCount),
}

/// The box's shape.
#[derive(Debug, Args)]
pub struct BoxShape {
    /// Number of dimensions, 1 to 3. Default: the number of --sides, or 3.
    #[arg(long, value_name = "N")]
    pub dims: Option<u8>,

    /// Side lengths as ratios to the reference length L, one per dimension,
    /// separated by commas or colons: exact decimals or fractions, e.g.
    /// 1,1,2 or 2:3:5 or 1,1/2. Default: all sides equal to L (a cube).
    #[arg(long, value_name = "RATIOS", allow_hyphen_values = true)]
    pub sides: Option<String>,
}

/// Output options shared by every command.
#[derive(Debug, Args)]
pub struct Output {
    /// Output format: an aligned table for people, JSON (exact numbers as
    /// strings) or CSV for programs.
    #[arg(long, value_enum, default_value_t = FormatArg::Table)]
    pub format: FormatArg,

    /// Write to this file instead of standard output. The file appears
    /// complete or not at all (written beside it, then renamed).
    #[arg(long, short = 'o', value_name = "FILE")]
    pub output: Option<PathBuf>,
}

/// Output formats.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum FormatArg {
    /// Aligned table with a header naming the units.
    Table,
    /// JSON; energies as exact rational strings, counts as decimal strings.
    Json,
    /// CSV with a header row.
    Csv,
}

/// `zsum levels box`.
#[derive(Debug, Args)]
pub struct BoxLevels {
    /// Box shape.
    #[command(flatten)]
    pub shape: BoxShape,

    /// Highest energy to list, in units of h^2/(8 m L^2): an exact decimal
    /// or fraction (60, 1e4, 27/4).
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub up_to: String,

    /// Also list every state (its quantum numbers) in each level.
    #[arg(long)]
    pub states: bool,

    /// Particle mass with unit (u, Da, kg, g), e.g. 4.0026u. With --side,
    /// adds each level's energy in a physical unit.
    #[arg(
        long,
        value_name = "MASS",
        requires = "side",
        allow_hyphen_values = true
    )]
    pub mass: Option<String>,

    /// Reference side length L with unit (m, cm, mm, um, nm, pm, A), e.g.
    /// 10nm. Needs --mass.
    #[arg(
        long,
        value_name = "LENGTH",
        requires = "mass",
        allow_hyphen_values = true
    )]
    pub side: Option<String>,

    /// Unit of the physical energies: K, cm-1, meV, eV, J or kJ/mol.
    /// Needs --mass and --side. [default: K]
    #[arg(long, value_name = "UNIT", requires = "mass")]
    pub unit: Option<String>,

    /// Significant digits of the physical energies (correctly rounded).
    /// Needs --mass and --side. [default: 10]
    #[arg(long, value_name = "N", requires = "mass")]
    pub digits: Option<u32>,

    /// Refuse listings estimated to need more memory than this, e.g. 512MiB,
    /// 4GiB.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,

    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

/// `zsum count box`.
#[derive(Debug, Args)]
pub struct BoxCount {
    /// Box shape.
    #[command(flatten)]
    pub shape: BoxShape,

    /// Count states with energy at most this, in units of h^2/(8 m L^2):
    /// an exact decimal or fraction (1e10, 27/4).
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub up_to: String,

    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    // clap's own consistency check of the argument definitions.
    #[test]
    fn parser_definition_is_consistent() {
        Cli::command().debug_assert();
    }
}
