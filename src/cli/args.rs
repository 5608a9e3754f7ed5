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
#[allow(clippy::large_enum_variant)] // parsed once; boxing buys nothing
pub enum Command {
    /// List a model's energy levels up to a cutoff, with exact degeneracies
    /// and optionally every state. Give a model, or --system FILE.
    #[command(args_conflicts_with_subcommands = true, subcommand_negates_reqs = true)]
    Levels {
        /// The model.
        #[command(subcommand)]
        model: Option<LevelsModel>,

        /// A system file (TOML) describing one species as a product of parts.
        #[command(flatten)]
        system: SystemLevels,
    },
    /// Partition function q and ln q at one temperature (or a grid), every
    /// digit certified, with the error bound. Give a model, or --system FILE.
    #[command(args_conflicts_with_subcommands = true, subcommand_negates_reqs = true)]
    Sum {
        /// The model.
        #[command(subcommand)]
        model: Option<ThermoModel>,
        /// A system file instead of a model.
        #[command(flatten)]
        system: SystemThermo,
    },
    /// Thermodynamic functions U/kT, Cv/k, S/k, F/kT (and in J/mol with
    /// --per mole) over a temperature grid, every digit certified.
    #[command(args_conflicts_with_subcommands = true, subcommand_negates_reqs = true)]
    Thermo {
        /// The model.
        #[command(subcommand)]
        model: Option<ThermoModel>,
        /// A system file instead of a model.
        #[command(flatten)]
        system: SystemThermo,
    },
    /// Where a classical approximation breaks down: every temperature in a
    /// range of T/θ at which its relative error in q, U, Cv or S crosses a
    /// tolerance. Give a model, or --system FILE; options may come before or
    /// after the model.
    Crossover {
        /// The model.
        #[command(subcommand)]
        model: Option<ClassicalModel>,
        /// Search options.
        #[command(flatten)]
        opts: CrossoverArgs,
    },
    /// Error map: exact values and classical approximations side by side
    /// over a temperature grid, with relative errors, optionally plotted to
    /// SVG or PNG. Give a model, or --system FILE.
    Compare {
        /// The model.
        #[command(subcommand)]
        model: Option<ClassicalModel>,
        /// Grid, approximations and output.
        #[command(flatten)]
        opts: CompareArgs,
    },
    /// A census of the vibrational states of harmonic modes: the exact sum
    /// and density of states at every energy up to a cutoff
    /// (Beyer–Swinehart), other degrees of freedom convolved in, or the
    /// error map of the Whitten–Rabinovitch approximation.
    Census(CensusArgs),
    /// Exact microstate counts Ω(E, N) of N particles (labelled, bosons or
    /// fermions) in one spectrum for every total energy up to a cutoff, with
    /// S = k ln Ω, the microcanonical temperature and the canonical
    /// comparison. Give --system FILE, or --einstein for an Einstein solid.
    Microstates(MicrostatesArgs),
    /// Canonical N-particle partition functions Q_N of ideal bosons or
    /// fermions over a temperature grid, exactly, against q^N/N! and q^N,
    /// with where q^N/N! fails.
    Ensemble(EnsembleArgs),
    /// Built-in species: list them, or show one's constants with sources.
    Species {
        /// What to do.
        #[command(subcommand)]
        command: SpeciesCommand,
    },
    /// The worked scenario: a self-contained HTML report with inline plots
    /// and tables, CSV files and a short summary.
    Report {
        /// The folder to write (created if missing).
        #[arg(long, value_name = "DIR", default_value = "zsum-report")]
        out: PathBuf,
    },
    /// Hydrogen's spin isomers over a temperature grid: ortho fraction, Cp
    /// of normal, equilibrium and para, and the ortho–para conversion heat.
    Hydrogen(HydrogenArgs),
    /// Spin isomers of any species: the spin temperature of a measured
    /// composition (--measured), or the equilibrium fractions and the heat
    /// a frozen composition releases relaxing at each T (--T).
    Spin(SpinIsomerArgs),
    /// Measured levels with assigned quantum numbers: check them against a
    /// model (allowed numbers, nuclear-spin statistics, degeneracies,
    /// duplicates, residuals, missing levels).
    Assign {
        /// What to do with the assignments.
        #[command(subcommand)]
        command: AssignCommand,
    },
    /// Count a model's states up to an energy exactly, without listing them.
    Count {
        /// The model.
        #[command(subcommand)]
        model: CountModel,
    },
}

/// `zsum assign` commands.
#[derive(Debug, Subcommand)]
pub enum AssignCommand {
    /// Check every row against a model: are its quantum numbers a level of
    /// the model (ranges, nuclear-spin statistics), does a given degeneracy
    /// match, which rows repeat a level, which residuals exceed the
    /// threshold, and which allowed levels have no row. Give the options,
    /// then a model (rotor, top, oscillator, diatomic) or --system FILE.
    Check {
        /// The assignments file (format in the README).
        file: PathBuf,
        /// The model.
        #[command(subcommand)]
        model: Option<ClassicalModel>,
        /// Check options.
        #[command(flatten)]
        opts: AssignCheckArgs,
    },
}

/// Options of `zsum assign check`.
#[derive(Debug, Args)]
pub struct AssignCheckArgs {
    /// A system file (TOML) instead of a model: its one part that labels
    /// its levels is checked against.
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,
    /// Flag rows whose |o-c|/sigma exceeds this (and duplicates this far
    /// apart).
    #[arg(long, value_name = "SIGMAS", default_value = "3")]
    pub threshold: String,
    /// Judge completeness up to this term value (with unit, e.g. "500
    /// cm-1"); default the highest measured one.
    #[arg(long, value_name = "E")]
    pub up_to: Option<String>,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

/// Models for `levels`.
#[derive(Debug, Subcommand)]
pub enum LevelsModel {
    /// Particle in a box with impenetrable walls (1, 2 or 3 dimensions).
    /// Energies in units of h^2/(8 m L^2); quantum numbers n_i >= 1.
    Box(BoxLevels),
    /// Linear rotor: E = B J(J+1) - D [J(J+1)]^2 + H [J(J+1)]^3, 2J+1
    /// states per J, with optional nuclear-spin statistics.
    Rotor(RotorLevels),
    /// Symmetric top (prolate with --A, oblate with --C) or spherical top
    /// (--spherical).
    Top(TopLevels),
    /// Harmonic modes (--freq) or an anharmonic/Morse diatomic vibration
    /// (--we with --wexe or --dissociation).
    Oscillator(OscillatorLevels),
    /// Vibrating rotor: G(v) + B_v J(J+1) - D_e [J(J+1)]^2 with
    /// B_v = B_e - alpha_e (v+1/2).
    Diatomic(DiatomicLevels),
    /// Levels read from a file: one `<energy> <unit> <degeneracy> [label]`
    /// per line.
    File(FileLevels),
    /// Spin multiplet in a magnetic field: E = g_J m_J mu_B B.
    Zeeman(ZeemanLevels),
}

/// Options shared by every generic listing.
#[derive(Debug, Args)]
pub struct ListArgs {
    /// Highest energy to list: a number in the model's unit (--unit), or a
    /// number with its own unit, e.g. 2000 or 2000cm-1 or 300K.
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub up_to: String,

    /// Also list every state (its named quantum numbers) in each level.
    #[arg(long)]
    pub states: bool,

    /// Also show each energy in this unit: K, cm-1, meV, eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT")]
    pub also: Option<String>,

    /// Significant digits of the --also energies, correctly rounded, so
    /// every digit is right (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS, requires = "also")]
    pub digits: u32,

    /// Refuse listings estimated to need more memory than this.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,

    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

/// `zsum levels --system FILE`.
#[derive(Debug, Args)]
pub struct SystemLevels {
    /// The system file.
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,

    /// Highest energy to list, in the system's unit or with a unit.
    #[arg(
        long,
        value_name = "E",
        allow_hyphen_values = true,
        requires = "system"
    )]
    pub up_to: Option<String>,

    /// Also list every state in each level.
    #[arg(long, requires = "system")]
    pub states: bool,

    /// Also show each energy in this unit: K, cm-1, meV, eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT", requires = "system")]
    pub also: Option<String>,

    /// Significant digits of the --also energies, correctly rounded, so
    /// every digit is right (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS, requires = "also")]
    pub digits: u32,

    /// Refuse listings estimated to need more memory than this.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,

    /// Output format.
    #[arg(long, value_enum, default_value_t = FormatArg::Table)]
    pub format: FormatArg,

    /// Write to this file instead of standard output (atomically).
    #[arg(long, short = 'o', value_name = "FILE")]
    pub output: Option<PathBuf>,
}

/// Nuclear-spin statistics for homonuclear diatomics.
#[derive(Debug, Args)]
pub struct SpinArgs {
    /// Nuclear spin I of each of two identical nuclei (0, 1/2, 1, 3/2, ...):
    /// integer I are bosons, half-integer I fermions. Sets the weights of
    /// even and odd J.
    #[arg(long, value_name = "I", conflicts_with = "weights")]
    pub spin: Option<String>,

    /// With --spin: the electronic state swaps which parity takes the
    /// symmetric spin states (e.g. the 3Sigma_g- ground state of O2).
    #[arg(long, requires = "spin")]
    pub swap_parity: bool,

    /// Weights of even and odd J set by hand, EVEN:ODD, e.g. 1:3.
    #[arg(long, value_name = "EVEN:ODD")]
    pub weights: Option<String>,

    /// Keep only one parity of J: even, odd, ortho (the larger weight) or
    /// para (the smaller).
    #[arg(long, value_enum)]
    pub only: Option<OnlyArg>,
}

/// Which rotational levels to keep.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum OnlyArg {
    /// Even J.
    Even,
    /// Odd J.
    Odd,
    /// The parity with the larger nuclear-spin weight.
    Ortho,
    /// The parity with the smaller nuclear-spin weight.
    Para,
}

/// The rotor model's parameters.
#[derive(Debug, Args)]
pub struct RotorModel {
    /// Rotational constant B (in --unit).
    #[arg(long = "B", value_name = "B", allow_hyphen_values = true)]
    pub b: String,
    /// Centrifugal distortion constant D (in --unit). Default 0.
    #[arg(long = "D", value_name = "D", allow_hyphen_values = true)]
    pub d: Option<String>,
    /// Sextic distortion constant H (in --unit). Default 0.
    #[arg(long = "H", value_name = "H", allow_hyphen_values = true)]
    pub h: Option<String>,
    /// Unit of the typed constants, and so of the energies: cm-1, K, meV,
    /// eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub unit: String,
    /// Nuclear-spin statistics.
    #[command(flatten)]
    pub spin: SpinArgs,
}

/// `zsum levels rotor`.
#[derive(Debug, Args)]
pub struct RotorLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: RotorModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo rotor`.
#[derive(Debug, Args)]
pub struct RotorThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: RotorModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// The top model's parameters.
#[derive(Debug, Args)]
pub struct TopModel {
    /// Rotational constant B (in --unit).
    #[arg(long = "B", value_name = "B", allow_hyphen_values = true)]
    pub b: String,
    /// Prolate top: constant A > B. With --C as well: an asymmetric top,
    /// A ≥ B ≥ C.
    #[arg(
        long = "A",
        value_name = "A",
        allow_hyphen_values = true,
        conflicts_with = "spherical"
    )]
    pub a: Option<String>,
    /// Oblate top: constant C < B. With --A as well: an asymmetric top.
    #[arg(
        long = "C",
        value_name = "C",
        allow_hyphen_values = true,
        conflicts_with = "spherical"
    )]
    pub c: Option<String>,
    /// Spherical top: (2J+1)^2 states per J; only --B (and --DJ).
    #[arg(long)]
    pub spherical: bool,
    /// Distortion constant D_J. Default 0.
    #[arg(long = "DJ", value_name = "D_J", allow_hyphen_values = true)]
    pub dj: Option<String>,
    /// Distortion constant D_JK. Default 0.
    #[arg(long = "DJK", value_name = "D_JK", allow_hyphen_values = true)]
    pub djk: Option<String>,
    /// Distortion constant D_K. Default 0.
    #[arg(long = "DK", value_name = "D_K", allow_hyphen_values = true)]
    pub dk: Option<String>,
    /// Asymmetric top: quartic constant δ_J (Watson's A reduction, whose
    /// Δ_J, Δ_JK, Δ_K are --DJ, --DJK, --DK). Default 0.
    #[arg(long = "dJ", value_name = "d_J", allow_hyphen_values = true)]
    pub small_dj: Option<String>,
    /// Asymmetric top: quartic constant δ_K. Default 0.
    #[arg(long = "dK", value_name = "d_K", allow_hyphen_values = true)]
    pub small_dk: Option<String>,
    /// Asymmetric top: spin weights of the symmetry classes EE:EO:OE:OO
    /// (parities of Ka and Kc), e.g. 1:3:3:1.
    #[arg(long, value_name = "EE:EO:OE:OO", conflicts_with_all = ["pair_spin", "pair_axis"])]
    pub weights: Option<String>,
    /// Asymmetric top: nuclear spin I of a pair of equivalent nuclei
    /// (e.g. 1/2 for two protons); with --pair-axis.
    #[arg(long, value_name = "I", requires = "pair_axis")]
    pub pair_spin: Option<String>,
    /// Asymmetric top: the principal axis (a, b or c) whose two-fold
    /// rotation exchanges the pair (b for water).
    #[arg(long, value_name = "AXIS", requires = "pair_spin")]
    pub pair_axis: Option<String>,
    /// Symmetric top: nuclear spin I of three equivalent nuclei on the
    /// three-fold axis (1/2 for ammonia's protons): weights by K mod 3
    /// and, for K = 0, by J parity.
    #[arg(long, value_name = "I")]
    pub three_fold_spin: Option<String>,
    /// Symmetric top with --three-fold-spin: the inversion splitting of
    /// each level into its s and a components (e.g. 0.79; default none).
    #[arg(long, value_name = "ENERGY", requires = "three_fold_spin")]
    pub inversion: Option<String>,
    /// Spherical top: nuclear spin I of four equivalent nuclei on a
    /// tetrahedron (1/2 for methane's protons): A, E, F weights.
    #[arg(long, value_name = "I", requires = "spherical")]
    pub tetrahedral_spin: Option<String>,
    /// Unit of the typed constants, and so of the energies: cm-1, K, meV,
    /// eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub unit: String,
}

/// `zsum levels top`.
#[derive(Debug, Args)]
pub struct TopLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: TopModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo top`.
#[derive(Debug, Args)]
pub struct TopThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: TopModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// The oscillator model's parameters.
#[derive(Debug, Args)]
pub struct OscillatorModel {
    /// Harmonic mode frequencies, comma-separated, each optionally with a
    /// mode degeneracy as xN: e.g. 1000,1500x2,3000 (a doubly degenerate
    /// mode at 1500). One mode 100x3 is the isotropic 3D oscillator.
    #[arg(long, value_name = "LIST", conflicts_with = "we")]
    pub freq: Option<String>,
    /// Include the zero-point energy (half a quantum per mode component).
    #[arg(long)]
    pub zero_point: bool,
    /// Anharmonic diatomic: harmonic constant omega_e.
    #[arg(long, value_name = "WE", allow_hyphen_values = true)]
    pub we: Option<String>,
    /// Anharmonicity constant omega_e x_e.
    #[arg(
        long,
        value_name = "WEXE",
        allow_hyphen_values = true,
        requires = "we",
        conflicts_with = "dissociation"
    )]
    pub wexe: Option<String>,
    /// Second anharmonicity constant omega_e y_e. Default 0.
    #[arg(
        long,
        value_name = "WEYE",
        allow_hyphen_values = true,
        requires = "wexe"
    )]
    pub weye: Option<String>,
    /// Morse oscillator: dissociation energy D_e (with --we).
    #[arg(long, value_name = "DE", allow_hyphen_values = true, requires = "we")]
    pub dissociation: Option<String>,
    /// Unit of the typed constants, and so of the energies: cm-1, K, meV,
    /// eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub unit: String,
}

/// `zsum levels oscillator`.
#[derive(Debug, Args)]
pub struct OscillatorLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: OscillatorModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo oscillator`.
#[derive(Debug, Args)]
pub struct OscillatorThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: OscillatorModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// The diatomic model's parameters.
#[derive(Debug, Args)]
pub struct DiatomicModel {
    /// Harmonic constant omega_e.
    #[arg(long, value_name = "WE", allow_hyphen_values = true)]
    pub we: String,
    /// Anharmonicity constant omega_e x_e.
    #[arg(long, value_name = "WEXE", allow_hyphen_values = true)]
    pub wexe: String,
    /// Second anharmonicity constant omega_e y_e. Default 0.
    #[arg(long, value_name = "WEYE", allow_hyphen_values = true)]
    pub weye: Option<String>,
    /// Equilibrium rotational constant B_e.
    #[arg(long = "Be", value_name = "BE", allow_hyphen_values = true)]
    pub be: String,
    /// Vibration-rotation constant alpha_e. Default 0.
    #[arg(long, value_name = "ALPHA", allow_hyphen_values = true)]
    pub alpha: Option<String>,
    /// Centrifugal distortion constant D_e. Default 0.
    #[arg(long = "De", value_name = "DE", allow_hyphen_values = true)]
    pub de: Option<String>,
    /// Unit of the typed constants, and so of the energies: cm-1, K, meV,
    /// eV, J or kJ/mol.
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub unit: String,
    /// Nuclear-spin statistics.
    #[command(flatten)]
    pub spin: SpinArgs,
}

/// `zsum levels diatomic`.
#[derive(Debug, Args)]
pub struct DiatomicLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: DiatomicModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo diatomic`.
#[derive(Debug, Args)]
pub struct DiatomicThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: DiatomicModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// The file model's parameters.
#[derive(Debug, Args)]
pub struct FileModel {
    /// The level file.
    #[arg(value_name = "PATH")]
    pub path: PathBuf,
}

/// `zsum levels file`.
#[derive(Debug, Args)]
pub struct FileLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: FileModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo file`.
#[derive(Debug, Args)]
pub struct FileThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: FileModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// The zeeman model's parameters.
#[derive(Debug, Args)]
pub struct ZeemanModel {
    /// Total angular momentum J: 0, 1/2, 1, 3/2, ... (e.g. 7/2).
    #[arg(long = "J", value_name = "J")]
    pub j: String,
    /// Landé factor g_J.
    #[arg(long = "g", value_name = "G", allow_hyphen_values = true)]
    pub g: String,
    /// Magnetic flux density with unit T or mT, e.g. 1T.
    #[arg(long, value_name = "B", allow_hyphen_values = true)]
    pub field: String,
}

/// `zsum levels zeeman`.
#[derive(Debug, Args)]
pub struct ZeemanLevels {
    /// Model parameters.
    #[command(flatten)]
    pub model: ZeemanModel,
    /// Listing options.
    #[command(flatten)]
    pub list: ListArgs,
}

/// `zsum sum|thermo zeeman`.
#[derive(Debug, Args)]
pub struct ZeemanThermo {
    /// Model parameters.
    #[command(flatten)]
    pub model: ZeemanModel,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// Models for `sum` and `thermo`.
#[derive(Debug, Subcommand)]
pub enum ThermoModel {
    /// Particle in a box (kT in box units with --kT, or T in kelvin with
    /// --mass and --side).
    Box(BoxThermo),
    /// Linear rotor.
    Rotor(RotorThermo),
    /// Symmetric or spherical top.
    Top(TopThermo),
    /// Harmonic, anharmonic or Morse oscillator.
    Oscillator(OscillatorThermo),
    /// Vibrating rotor.
    Diatomic(DiatomicThermo),
    /// Levels from a file.
    File(FileThermo),
    /// Zeeman multiplet.
    Zeeman(ZeemanThermo),
    /// A built-in species by name (e.g. `zsum thermo N2 --T 298.15`):
    /// ideal-gas functions per mole, kg or particle; its options are listed
    /// at the end of `zsum thermo --help`.
    #[command(external_subcommand)]
    Species(Vec<String>),
}

/// `zsum thermo SPECIES ...`: standard molar functions of a species.
#[derive(Debug, Parser)]
#[command(name = "zsum thermo SPECIES", no_binary_name = true)]
pub struct SpeciesThermo {
    /// The species (zsum species list).
    pub species: String,
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(long = "T", value_name = "T", allow_hyphen_values = true)]
    pub t: String,
    /// Pressure: a number in Pa, or with a unit (Pa, kPa, MPa, bar, atm).
    #[arg(
        long,
        value_name = "P",
        default_value = "1bar",
        allow_hyphen_values = true
    )]
    pub p: String,
    /// The amount the functions are given for: per mole (J/(mol K), J/mol),
    /// per kg (J/(kg K), J/kg) or per particle (J/K, J).
    #[arg(long, value_enum, default_value_t = BasisArg::Mole)]
    pub per: BasisArg,
    /// Spin-isomer state of H2, D2, N2: normal (frozen at the
    /// high-temperature ortho fraction, as in a cylinder at room
    /// temperature), equilibrium, ortho, para or fraction=X (ortho
    /// fraction). For a frozen state H0 is each isomer's own lowest level.
    /// Species without spin isomers refuse it. [default: normal]
    #[arg(long, value_name = "STATE")]
    pub isomer: Option<String>,
    /// rovib (vibrating rotor, default) or rrho (rigid rotor, harmonic oscillator).
    #[arg(long, value_name = "MODEL", default_value = "rovib")]
    pub model: String,
    /// Translation by the exact sum in a cubic box of this side (e.g. 10nm)
    /// instead of Sackur–Tetrode.
    #[arg(long, value_name = "LENGTH")]
    pub box_side: Option<String>,
    /// More species from a file in zsum's species format.
    #[arg(long, value_name = "FILE")]
    pub species_file: Option<PathBuf>,
    /// Significant digits of every printed value, each certified (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// The amount a species' functions are given for.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum BasisArg {
    /// Per mole: J/(mol K) and J/mol.
    Mole,
    /// Per kilogram: J/(kg K) and J/kg.
    Kg,
    /// Per molecule or atom: J/K and J.
    Particle,
}

/// `zsum species`.
#[derive(Debug, Subcommand)]
pub enum SpeciesCommand {
    /// Every species with its kind and mass.
    List {
        /// More species from a file.
        #[arg(long, value_name = "FILE")]
        species_file: Option<PathBuf>,
        /// Output options.
        #[command(flatten)]
        out: Output,
    },
    /// One species: every constant with its unit and source.
    Show {
        /// The species.
        name: String,
        /// More species from a file.
        #[arg(long, value_name = "FILE")]
        species_file: Option<PathBuf>,
        /// Output options.
        #[command(flatten)]
        out: Output,
    },
}

/// `zsum hydrogen`.
#[derive(Debug, Args)]
pub struct HydrogenArgs {
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(long = "T", value_name = "T", allow_hyphen_values = true)]
    pub t: String,
    /// The state whose Cp, S and H are shown: normal (frozen at the
    /// high-temperature ortho fraction), equilibrium, ortho, para or
    /// fraction=X (ortho fraction), as in `thermo SPECIES`. For a frozen
    /// state H0 is each isomer's own lowest level.
    #[arg(long, value_name = "STATE", default_value = "normal")]
    pub isomer: String,
    /// The species: H2 (default) or D2 (or N2).
    #[arg(long, value_name = "NAME", default_value = "H2")]
    pub species: String,
    /// rovib (default) or rrho.
    #[arg(long, value_name = "MODEL", default_value = "rovib")]
    pub model: String,
    /// Significant digits of every printed value, each certified (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// `zsum spin`.
#[derive(Debug, Args)]
pub struct SpinIsomerArgs {
    /// A built-in species with nuclear-spin isomers (H2, D2, N2, H2O, NH3,
    /// CH4).
    pub species: String,
    /// A measured composition: A/B=X, the ratio of two isomers
    /// (ortho/para=2.5), or A=X, one isomer's fraction (para=0.998).
    #[arg(
        long,
        value_name = "A/B=X",
        conflicts_with = "t",
        required_unless_present = "t"
    )]
    pub measured: Option<String>,
    /// Temperature(s) in kelvin for the relaxation table: a value, a grid
    /// START:STOP:STEP, log:START:STOP:COUNT or a comma list.
    #[arg(long = "T", value_name = "T", allow_hyphen_values = true)]
    pub t: Option<String>,
    /// With --T: the frozen composition that relaxes: normal (default), an
    /// isomer's name, or fraction=X (ortho fraction).
    #[arg(long, value_name = "STATE", default_value = "normal", requires = "t")]
    pub from: String,
    /// Significant digits of every printed value, each certified (1 to 30).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=30), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

/// Temperatures, precision and output for `sum` and `thermo`.
#[derive(Debug, Args)]
pub struct TempArgs {
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(
        long = "T",
        value_name = "T",
        allow_hyphen_values = true,
        conflicts_with = "kt"
    )]
    pub t: Option<String>,

    /// Instead of --T: kT in the model's own energy unit (the forms of --T),
    /// e.g. for a box without mass and side.
    #[arg(long = "kT", value_name = "KT", allow_hyphen_values = true)]
    pub kt: Option<String>,

    /// Significant digits of every printed value, each certified (1 to 996).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=996), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,

    /// Effort limit: the most working bits spent on one temperature before
    /// a value is printed marked * (with the reason). Precision starts at
    /// what the digits need and doubles until every digit is certified.
    #[arg(long = "max-bits", value_name = "BITS", default_value_t = zsum::sum::DEFAULT_MAX_BITS)]
    pub max_bits: u32,

    /// Also give U, Cv, S, F in J/mol (per mole) or J (per particle).
    #[arg(long, value_enum)]
    pub per: Option<PerArg>,

    /// Output options.
    #[command(flatten)]
    pub out: Output,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// Physical units for thermodynamic functions.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum PerArg {
    /// Per mole: J/mol and J/(mol K).
    Mole,
    /// Per particle: J and J/K.
    Particle,
}

/// `zsum sum|thermo box`.
#[derive(Debug, Args)]
pub struct BoxThermo {
    /// Box shape.
    #[command(flatten)]
    pub shape: BoxShape,
    /// Particle mass with unit (for --T in kelvin).
    #[arg(long, value_name = "MASS", requires = "side")]
    pub mass: Option<String>,
    /// Reference side with unit (for --T in kelvin).
    #[arg(long, value_name = "LENGTH", requires = "mass")]
    pub side: Option<String>,
    /// Temperature and output options.
    #[command(flatten)]
    pub temp: TempArgs,
}

/// `zsum levels --system` and friends for sum/thermo.
#[derive(Debug, Args)]
pub struct SystemThermo {
    /// A system file (TOML).
    #[arg(long, value_name = "FILE")]
    pub system: Option<PathBuf>,
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(
        long = "T",
        value_name = "T",
        allow_hyphen_values = true,
        requires = "system"
    )]
    pub t: Option<String>,
    /// Significant digits of every printed value, each certified (1 to 996).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=996), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Effort limit: the most working bits spent on one temperature before
    /// a value is printed marked * (with the reason).
    #[arg(long = "max-bits", value_name = "BITS", default_value_t = zsum::sum::DEFAULT_MAX_BITS)]
    pub max_bits: u32,
    /// Also give U, Cv, S, F in J/mol (per mole) or J (per particle).
    #[arg(long, value_enum)]
    pub per: Option<PerArg>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = FormatArg::Table)]
    pub format: FormatArg,
    /// Write to this file instead of standard output (atomically).
    #[arg(long, short = 'o', value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// Models with classical limits, for `crossover` and `compare`.
#[derive(Debug, Subcommand)]
pub enum ClassicalModel {
    /// Particle in a box (T/θ with θ = h^2/(8 m L^2 k); T in kelvin with
    /// --mass and --side).
    Box(BoxPhysical),
    /// Linear rotor (the approximations are rigid; D and H are what the
    /// exact sum adds).
    Rotor(RotorModel),
    /// Symmetric or spherical top.
    Top(TopModel),
    /// Harmonic modes.
    Oscillator(OscillatorModel),
    /// Vibrating rotor, against rigid rotor times harmonic vibration.
    Diatomic(DiatomicModel),
}

/// A box with optional physical size.
#[derive(Debug, Args)]
pub struct BoxPhysical {
    /// Box shape.
    #[command(flatten)]
    pub shape: BoxShape,
    /// Particle mass with unit (for temperatures in kelvin).
    #[arg(long, value_name = "MASS", requires = "side")]
    pub mass: Option<String>,
    /// Reference side with unit (for temperatures in kelvin).
    #[arg(long, value_name = "LENGTH", requires = "mass")]
    pub side: Option<String>,
}

/// Options of `zsum crossover`.
#[derive(Debug, Args)]
pub struct CrossoverArgs {
    /// A system file (TOML) instead of a model.
    #[arg(long, value_name = "FILE", global = true)]
    pub system: Option<PathBuf>,
    /// The quantity judged: q, U, Cv or S.
    #[arg(long, value_name = "Q", default_value = "Cv", global = true)]
    pub quantity: String,
    /// The approximation (the model lists its own; `classical` always).
    #[arg(long, value_name = "NAME", default_value = "classical", global = true)]
    pub approx: String,
    /// Tolerance on the |relative error|: a fraction (0.01) or percentage (1%).
    #[arg(long, value_name = "TOL", default_value = "1%", global = true)]
    pub tol: String,
    /// Range of T/θ to search, A:B.
    #[arg(
        long,
        value_name = "A:B",
        default_value = "0.01:100",
        global = true,
        allow_hyphen_values = true
    )]
    pub range: String,
    /// Significant digits of each crossing, each certified (1 to 12).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=12), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS, global = true)]
    pub digits: u32,
    /// Output format.
    #[arg(long, value_enum, default_value_t = FormatArg::Table, global = true)]
    pub format: FormatArg,
    /// Write to this file instead of standard output (atomically).
    #[arg(long, short = 'o', value_name = "FILE", global = true)]
    pub output: Option<PathBuf>,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min", global = true)]
    pub time_budget: String,
}

/// Options of `zsum compare`.
#[derive(Debug, Args)]
pub struct CompareArgs {
    /// A system file (TOML) instead of a model.
    #[arg(long, value_name = "FILE", global = true)]
    pub system: Option<PathBuf>,
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(
        long = "T",
        value_name = "T",
        allow_hyphen_values = true,
        global = true
    )]
    pub t: Option<String>,
    /// Instead of --T: kT in the model's own energy unit (the forms of --T),
    /// e.g. for a box without mass and side.
    #[arg(
        long = "kT",
        value_name = "KT",
        allow_hyphen_values = true,
        global = true
    )]
    pub kt: Option<String>,
    /// Instead of --T: T/θ, with θ the model's own scale (the forms of --T).
    #[arg(
        long = "reduced",
        value_name = "X",
        allow_hyphen_values = true,
        global = true
    )]
    pub reduced: Option<String>,
    /// Approximations to compare, comma-separated. Default: all the model has.
    #[arg(long, value_name = "NAMES", global = true)]
    pub approx: Option<String>,
    /// Significant digits of the exact values and the approximations' values,
    /// each certified (1 to 30); relative errors print to 4 digits.
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=30), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS, global = true)]
    pub digits: u32,
    /// Also plot this quantity against T and its relative errors, to SVG or
    /// PNG by the file's extension.
    #[arg(long, value_name = "FILE.svg|FILE.png", global = true)]
    pub plot: Option<PathBuf>,
    /// The quantity plotted: q, U, Cv or S.
    #[arg(long, value_name = "Q", default_value = "Cv", global = true)]
    pub quantity: String,
    /// Tolerance line on the error plot: a fraction or percentage.
    #[arg(long, value_name = "TOL", default_value = "1%", global = true)]
    pub tol: String,
    /// Output format.
    #[arg(long, value_enum, default_value_t = FormatArg::Table, global = true)]
    pub format: FormatArg,
    /// Write to this file instead of standard output (atomically).
    #[arg(long, short = 'o', value_name = "FILE", global = true)]
    pub output: Option<PathBuf>,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min", global = true)]
    pub time_budget: String,
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
    #[arg(long, value_parser = clap::value_parser!(u8).range(1..=3), value_name = "N")]
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
    /// Markdown table (for reports and notes).
    Markdown,
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

    /// Also show each energy in this physical unit: K, cm-1, meV, eV, J or
    /// kJ/mol (as `--also` in the other listings; `--unit` is always the
    /// unit of typed constants). Needs --mass and --side. [default: K]
    #[arg(long, value_name = "UNIT", requires = "mass")]
    pub also: Option<String>,

    /// Significant digits of the physical energies, correctly rounded, so
    /// every digit is right (1 to 60). Needs --mass and --side.
    /// [default: 10]
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", requires = "mass")]
    pub digits: Option<u32>,

    /// Refuse listings estimated to need more memory than this, e.g. 512MiB,
    /// 4GiB.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,

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
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// `zsum microstates`.
#[derive(Debug, Args)]
pub struct MicrostatesArgs {
    /// A system file (TOML) giving the single-particle spectrum.
    #[arg(long, value_name = "FILE", required_unless_present = "einstein")]
    pub system: Option<PathBuf>,
    /// An Einstein solid instead: N labelled oscillators (--particles)
    /// sharing q = 0 up to --up-to quanta ħω, with the temperature from the
    /// exact derivative of ln Ω and the canonical comparison on every row.
    #[arg(long, conflicts_with_all = ["system", "stats", "grid", "compare"])]
    pub einstein: bool,
    /// Number of particles (1 to 1000).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=1000), value_name = "N")]
    pub particles: u32,
    /// Statistics: bose, fermi or distinct (labelled).
    #[arg(long, value_name = "STATS", required_unless_present = "einstein")]
    pub stats: Option<String>,
    /// Highest total energy counted, in the system's unit or with a unit.
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub up_to: String,
    /// The energy grid step (every level above the ground must be a whole
    /// number of steps); default: the levels' common divisor.
    #[arg(long, value_name = "STEP", allow_hyphen_values = true)]
    pub grid: Option<String>,
    /// Number of energies at which to compare with the canonical ensemble
    /// (--einstein compares on every row).
    #[arg(long, value_name = "K", default_value_t = 8, value_parser = clap::value_parser!(u32).range(0..=10000))]
    pub compare: u32,
    /// Significant digits of S/k, kT and the canonical values, each
    /// certified (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Refuse tables estimated to need more memory than this.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
}

/// `zsum ensemble`.
#[derive(Debug, Args)]
pub struct EnsembleArgs {
    /// A system file (TOML) giving the single-particle spectrum.
    #[arg(long, value_name = "FILE")]
    pub system: PathBuf,
    /// Number of particles (1 to 1000).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=1000), value_name = "N")]
    pub particles: u32,
    /// Statistics: bose, fermi or distinct (labelled).
    #[arg(long, value_name = "STATS")]
    pub stats: String,
    /// Temperature(s) in kelvin: a value (298.15), a grid START:STOP:STEP
    /// (10:300:5) or log:START:STOP:COUNT (log:1:1000:50), or a comma list
    /// of these (20.28,77,300); exact decimals.
    #[arg(
        long = "T",
        value_name = "T",
        conflicts_with = "kt",
        required_unless_present = "kt",
        allow_hyphen_values = true
    )]
    pub t: Option<String>,
    /// Instead of --T: kT in the model's own energy unit (the forms of --T),
    /// e.g. for a box without mass and side.
    #[arg(long = "kT", value_name = "KT", allow_hyphen_values = true)]
    pub kt: Option<String>,
    /// Significant digits of every exact value, each certified (1 to 60).
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=60), value_name = "N", default_value_t = zsum::report::DEFAULT_DIGITS)]
    pub digits: u32,
    /// Tolerance on the relative error of q^N/N! in Q for the breakdown
    /// search, e.g. 1% or 0.01 (`--tol`, as in crossover and compare;
    /// `--tolerance` is kept as an alias).
    #[arg(
        long = "tol",
        alias = "tolerance",
        value_name = "TOL",
        default_value = "1%"
    )]
    pub tolerance: String,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
}

/// `zsum census`.
#[derive(Debug, Args)]
pub struct CensusArgs {
    /// Frequencies, comma-separated, each optionally xN for N degenerate
    /// modes, e.g. 1000,1500x2,3000.
    #[arg(long, value_name = "LIST")]
    pub modes: String,
    /// Unit of the frequencies, the step and the cutoff (a name for the
    /// output).
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub unit: String,
    /// The energy step of the census: every frequency (and every level
    /// given with --convolve) is rounded to a whole number of steps, and the
    /// rounded values are reported.
    #[arg(
        long,
        value_name = "STEP",
        default_value = "1",
        allow_hyphen_values = true
    )]
    pub step: String,
    /// Highest energy counted, in --unit.
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub up_to: String,
    /// Another degree of freedom (free or hindered internal rotor, low
    /// electronic levels) as a level file or a system file (.toml),
    /// convolved in by Stein–Rabinovitch; repeat for more.
    #[arg(long, value_name = "FILE")]
    pub convolve: Vec<PathBuf>,
    /// Instead of the census, the error map of the Whitten–Rabinovitch
    /// approximation against the exact count of the modes, at this many
    /// energies spread up to the cutoff.
    #[arg(long, value_name = "POINTS", conflicts_with = "convolve", value_parser = clap::value_parser!(u32).range(1..=100000))]
    pub error_map: Option<u32>,
    /// With --error-map: significant digits of the approximation's values
    /// and of the exact density (1 to 12). The approximation's values are
    /// floating-point evaluations, not certified.
    #[arg(long, value_parser = clap::value_parser!(u32).range(1..=12), value_name = "N", default_value_t = zsum::report::APPROX_DIGITS, requires = "error_map")]
    pub digits: u32,
    /// Refuse grids estimated to need more memory than this.
    #[arg(long, value_name = "SIZE", default_value = "2GiB")]
    pub memory_budget: String,
    /// Refuse work estimated to take longer than this (e.g. 30s, 5min, 2h);
    /// accepted work that runs more than a moment shows a progress bar on a
    /// terminal.
    #[arg(long, value_name = "TIME", default_value = "5min")]
    pub time_budget: String,
    /// Output options.
    #[command(flatten)]
    pub out: Output,
}
