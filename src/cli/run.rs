//! Validates raw arguments into library objects, runs the library, renders.

use super::args::{
    AssignCommand, BasisArg, BoxCount, BoxLevels, BoxPhysical, BoxShape, CensusArgs,
    ClassicalModel, Cli, Command, CompareArgs, CountModel, CrossoverArgs, DiatomicLevels,
    DiatomicModel, EnsembleArgs, FileLevels, FileModel, FormatArg, HydrogenArgs, LevelsModel,
    ListArgs, MicrostatesArgs, OnlyArg, OscillatorLevels, OscillatorModel, Output, PerArg,
    RotorLevels, RotorModel, SpeciesCommand, SpeciesThermo, SpinArgs, SpinIsomerArgs, SystemLevels,
    SystemThermo, TempArgs, ThermoModel, TopLevels, TopModel, ZeemanLevels, ZeemanModel,
};
use num_rational::BigRational;
use zsum::budget::Meter;
use zsum::classical::{parse_tolerance, Classical, Quantity, SearchRange};
use zsum::error::{Error, Result};
use zsum::exact::parse_rational;
use zsum::export::{render, write_atomic, Format};
use zsum::models::level_file::LevelFile;
use zsum::models::spec::{
    AnharmonicSpec, AsymmetricTopSpec, BoxSpec, DiatomicSpec, LevelsSpec, ModelSpec, MorseSpec,
    OscillatorSpec, RotorSpec, Selection, SpecError, SphericalTopSpec, Text, TopSpec, ZeemanSpec,
};
use zsum::models::ParticleInBox;
use zsum::report::{check_digits, BoxScale, CountReport, LevelsReport, ListOptions};
use zsum::report::{HydrogenTable, MolarTable, ThermoReport};
use zsum::report::{SpeciesCard, SpeciesList};
use zsum::species::hydrogen::HydrogenGrid;
use zsum::species::{Basis, Database, Isomer, MolarGrid, MolarOptions, Translation, VibModel};
use zsum::spectrum::Budget;
use zsum::spectrum::Spectrum;
use zsum::system::{parse_energy, System};
use zsum::thermo::{parse_grid, Per};
use zsum::units::{parse_length_m, parse_mass_kg, parse_pressure, EnergyUnit};

/// Runs a parsed command line; returns text for standard output (`None` when
/// the output went to a file).
pub fn run(cli: Cli) -> Result<Option<String>> {
    match cli.command {
        Command::Levels { model, system } => match model {
            Some(LevelsModel::Box(a)) => levels_box(a),
            Some(LevelsModel::Rotor(a)) => levels_rotor(a),
            Some(LevelsModel::Top(a)) => levels_top(a),
            Some(LevelsModel::Oscillator(a)) => levels_oscillator(a),
            Some(LevelsModel::Diatomic(a)) => levels_diatomic(a),
            Some(LevelsModel::File(a)) => levels_file(a),
            Some(LevelsModel::Zeeman(a)) => levels_zeeman(a),
            None => levels_system(system),
        },
        Command::Sum { model, system } => run_thermo(model, system, false),
        Command::Thermo { model, system } => run_thermo(model, system, true),
        Command::Count {
            model: CountModel::Box(a),
        } => count_box(a),
        Command::Crossover { model, opts } => crossover(model, opts),
        Command::Species { command } => species(command),
        Command::Hydrogen(a) => hydrogen(a),
        Command::Spin(a) => spin(a),
        Command::Assign { command } => assign(command),
        Command::Census(a) => census(a),
        Command::Microstates(a) => microstates_cmd(a),
        Command::Ensemble(a) => ensemble_cmd(a),
        Command::Report { out } => report(&out),
        Command::Compare { model, opts } => compare(model, opts),
    }
}

/// The box the shape options describe (with a physical scale if `mass`
/// and `side` are given).
fn box_spec(shape: &BoxShape, mass: &Option<String>, side: &Option<String>) -> BoxSpec {
    BoxSpec {
        mass: mass.as_deref().map(Text::from),
        side: side.as_deref().map(Text::from),
        sides: shape.sides.as_deref().map(Text::from),
        dims: shape.dims.map(i64::from),
    }
}

/// The box in its own unit h²/(8 m L²).
fn box_model(shape: &BoxShape) -> Result<ParticleInBox> {
    built("box", box_spec(shape, &None, &None).build())
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
        FormatArg::Markdown => Format::Markdown,
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
    let budget = budgets(&a.memory_budget, &a.time_budget)?;
    let scale = match (&a.mass, &a.side) {
        (Some(m), Some(s)) => Some(BoxScale {
            mass_text: m.clone(),
            mass_kg: parse_mass_kg(m)?,
            side_text: s.clone(),
            side_m: parse_length_m(s)?,
            unit: EnergyUnit::parse(a.also.as_deref().unwrap_or("K"))?,
            digits: check_digits(a.digits.unwrap_or(zsum::report::DEFAULT_DIGITS))?,
        }),
        _ => None,
    };
    let report = LevelsReport::for_box(&model, &cut, a.states, scale.as_ref(), &budget)?;
    emit(render(&report, format(a.out.format))?, &a.out)
}

fn count_box(a: BoxCount) -> Result<Option<String>> {
    let model = box_model(&a.shape)?;
    let cut = cutoff(&a.up_to)?;
    let report = CountReport::for_box(&model, &cut, &time_budget(&a.time_budget)?)?;
    emit(render(&report, format(a.out.format))?, &a.out)
}

fn number(flag: &str, text: &str) -> Result<BigRational> {
    parse_rational(text).map_err(|_| {
        Error::parse(
            flag,
            text,
            "an exact number such as 1.99824, 5.76e-6 or 27/4",
        )
    })
}

/// A constant typed as a bare number, in `unit` (the unit --unit sets).
fn constant(flag: &str, text: &str, unit: &EnergyUnit) -> Result<Text> {
    Ok(Text::energy(&number(flag, text)?, unit))
}

fn opt_constant(flag: &str, text: &Option<String>, unit: &EnergyUnit) -> Result<Option<Text>> {
    text.as_deref().map(|t| constant(flag, t, unit)).transpose()
}

/// A cutoff in the model's unit, or with its own unit (converted exactly).
fn cutoff_in(text: &str, unit: &EnergyUnit) -> Result<BigRational> {
    if let Ok(v) = parse_rational(text) {
        return Ok(v);
    }
    let (v, u) = parse_energy(text).map_err(|_| {
        Error::parse(
            "--up-to",
            text,
            &format!(
                "an energy: a number in {unit}, or a number with a unit such as 2000cm-1 or 300K"
            ),
        )
    })?;
    u.convert(&v, unit)
}

fn list_options(l: &ListArgs) -> Result<ListOptions> {
    Ok(ListOptions {
        with_states: l.states,
        convert_to: l.also.as_deref().map(EnergyUnit::parse).transpose()?,
        digits: check_digits(l.digits)?,
        budget: budgets(&l.memory_budget, &l.time_budget)?,
    })
}

fn list_generic(model: &str, s: &dyn Spectrum, l: &ListArgs) -> Result<Option<String>> {
    let cut = cutoff_in(&l.up_to, &s.unit())?;
    let opts = list_options(l)?;
    let report = LevelsReport::build(model, s, &cut, &opts)?;
    for w in report.warnings.iter().flatten() {
        eprintln!("zsum: warning: {w}");
    }
    emit(render(&report, format(l.out.format))?, &l.out)
}

/// The option that sets a description's field, where one does.
fn option_of(kind: &str, field: &str) -> Option<String> {
    match (kind, field) {
        (_, "levels" | "file") => None,
        ("spherical_top", "D") => Some("--DJ".into()),
        (_, f) => Some(format!("--{}", f.replace('_', "-"))),
    }
}

/// A built model; an error about one field ends with the option that set
/// it.
fn built<T>(kind: &str, r: std::result::Result<T, SpecError>) -> Result<T> {
    r.map_err(|e| {
        let error = e.error();
        match e.field().and_then(|f| option_of(kind, f)) {
            Some(option) => Error::new(error.kind(), format!("{} (see {option})", error.message())),
            None => error.clone(),
        }
    })
}

type Model = Box<dyn Spectrum + Send + Sync>;

fn build(spec: &ModelSpec) -> Result<Model> {
    built(spec.kind(), spec.build())
}

/// The nuclear-spin fields: (spin, swap_parity, weights, only).
fn spin_fields(s: &SpinArgs) -> (Option<Text>, bool, Option<Text>, Option<Selection>) {
    (
        s.spin.as_deref().map(Text::from),
        s.swap_parity,
        s.weights.as_deref().map(Text::from),
        s.only.map(|o| match o {
            OnlyArg::Even => Selection::Even,
            OnlyArg::Odd => Selection::Odd,
            OnlyArg::Ortho => Selection::Ortho,
            OnlyArg::Para => Selection::Para,
        }),
    )
}

fn rotor(a: &RotorModel) -> Result<ModelSpec> {
    let unit = EnergyUnit::parse(&a.unit)?;
    let (spin, swap_parity, weights, only) = spin_fields(&a.spin);
    Ok(ModelSpec::Rotor(RotorSpec {
        b: constant("--B", &a.b, &unit)?,
        d: opt_constant("--D", &a.d, &unit)?,
        h: opt_constant("--H", &a.h, &unit)?,
        spin,
        swap_parity,
        weights,
        only,
    }))
}

fn top(a: &TopModel) -> Result<ModelSpec> {
    let unit = EnergyUnit::parse(&a.unit)?;
    let b = constant("--B", &a.b, &unit)?;
    if a.spherical {
        if a.djk.is_some() || a.dk.is_some() {
            return Err(Error::invalid(
                "--DJK/--DK",
                "given",
                "a spherical top takes only --B and --DJ",
            ));
        }
        return Ok(ModelSpec::SphericalTop(SphericalTopSpec {
            b,
            d: opt_constant("--DJ", &a.dj, &unit)?,
            tetrahedral_spin: a.tetrahedral_spin.as_ref().map(|v| Text::new(v.clone())),
        }));
    }
    let asymmetric_only = [&a.small_dj, &a.small_dk, &a.weights, &a.pair_spin]
        .iter()
        .any(|x| x.is_some());
    if let (Some(big_a), Some(c)) = (&a.a, &a.c) {
        let text = |s: &Option<String>| s.as_ref().map(|v| Text::new(v.clone()));
        return Ok(ModelSpec::AsymmetricTop(AsymmetricTopSpec {
            a: constant("--A", big_a, &unit)?,
            b,
            c: constant("--C", c, &unit)?,
            dj: opt_constant("--DJ", &a.dj, &unit)?,
            djk: opt_constant("--DJK", &a.djk, &unit)?,
            dk: opt_constant("--DK", &a.dk, &unit)?,
            small_dj: opt_constant("--dJ", &a.small_dj, &unit)?,
            small_dk: opt_constant("--dK", &a.small_dk, &unit)?,
            weights: text(&a.weights),
            pair_spin: text(&a.pair_spin),
            pair_axis: text(&a.pair_axis),
        }));
    }
    if asymmetric_only {
        return Err(Error::invalid(
            "--dJ/--dK/--weights/--pair-spin",
            "given",
            "they describe an asymmetric top: give both --A and --C with --B",
        ));
    }
    if a.a.is_none() && a.c.is_none() {
        return Err(Error::invalid(
            "top",
            "without --A, --C or --spherical",
            "give --A (prolate), --C (oblate) or --spherical",
        ));
    }
    Ok(ModelSpec::Top(TopSpec {
        b,
        a: opt_constant("--A", &a.a, &unit)?,
        c: opt_constant("--C", &a.c, &unit)?,
        dj: opt_constant("--DJ", &a.dj, &unit)?,
        djk: opt_constant("--DJK", &a.djk, &unit)?,
        dk: opt_constant("--DK", &a.dk, &unit)?,
        three_fold_spin: a.three_fold_spin.as_ref().map(|v| Text::new(v.clone())),
        inversion: opt_constant("--inversion", &a.inversion, &unit)?,
    }))
}

/// `--freq 1000,1500x2`: each frequency a bare number in `unit`, with its
/// degeneracy after an x (read by the description).
fn modes(text: &str, unit: &EnergyUnit) -> Result<Vec<Text>> {
    text.split(',')
        .map(|item| match item.split_once(['x', 'X']) {
            Some((f, d)) => Ok(Text::new(format!(
                "{} x{}",
                constant("--freq", f.trim(), unit)?,
                d.trim()
            ))),
            None => constant("--freq", item.trim(), unit),
        })
        .collect()
}

fn oscillator(a: &OscillatorModel) -> Result<ModelSpec> {
    let unit = EnergyUnit::parse(&a.unit)?;
    match (&a.freq, &a.we) {
        (Some(f), _) => Ok(ModelSpec::Oscillator(OscillatorSpec {
            freq: modes(f, &unit)?,
            zero_point: a.zero_point,
        })),
        (None, Some(we)) => {
            let we = constant("--we", we, &unit)?;
            match (&a.wexe, &a.dissociation) {
                (Some(x), None) => Ok(ModelSpec::Anharmonic(AnharmonicSpec {
                    we,
                    wexe: constant("--wexe", x, &unit)?,
                    weye: opt_constant("--weye", &a.weye, &unit)?,
                })),
                (None, Some(d)) => Ok(ModelSpec::Morse(MorseSpec {
                    we,
                    dissociation: constant("--dissociation", d, &unit)?,
                })),
                _ => Err(Error::invalid(
                    "--we",
                    "without --wexe or --dissociation",
                    "give --wexe (anharmonic) or --dissociation (Morse)",
                )),
            }
        }
        (None, None) => Err(Error::invalid(
            "oscillator",
            "without --freq or --we",
            "give --freq for harmonic modes or --we for a diatomic vibration",
        )),
    }
}

fn diatomic(a: &DiatomicModel) -> Result<ModelSpec> {
    let unit = EnergyUnit::parse(&a.unit)?;
    let (spin, swap_parity, weights, only) = spin_fields(&a.spin);
    Ok(ModelSpec::Diatomic(DiatomicSpec {
        we: constant("--we", &a.we, &unit)?,
        wexe: constant("--wexe", &a.wexe, &unit)?,
        weye: opt_constant("--weye", &a.weye, &unit)?,
        be: constant("--Be", &a.be, &unit)?,
        alpha: opt_constant("--alpha", &a.alpha, &unit)?,
        de: opt_constant("--De", &a.de, &unit)?,
        spin,
        swap_parity,
        weights,
        only,
    }))
}

fn file(a: &FileModel) -> ModelSpec {
    ModelSpec::Levels(LevelsSpec {
        levels: None,
        file: Some(a.path.clone()),
    })
}

fn zeeman(a: &ZeemanModel) -> ModelSpec {
    ModelSpec::Zeeman(ZeemanSpec {
        j: Text::from(a.j.as_str()),
        g: Text::from(a.g.as_str()),
        field: Text::from(a.field.as_str()),
    })
}

fn levels_rotor(a: RotorLevels) -> Result<Option<String>> {
    list_generic("rotor", build(&rotor(&a.model)?)?.as_ref(), &a.list)
}

fn levels_top(a: TopLevels) -> Result<Option<String>> {
    let m = build(&top(&a.model)?)?;
    let id = if a.model.spherical {
        "spherical_top"
    } else if a.model.a.is_some() && a.model.c.is_some() {
        "asymmetric_top"
    } else {
        "top"
    };
    list_generic(id, m.as_ref(), &a.list)
}

fn levels_oscillator(a: OscillatorLevels) -> Result<Option<String>> {
    let m = build(&oscillator(&a.model)?)?;
    list_generic("oscillator", m.as_ref(), &a.list)
}

fn levels_diatomic(a: DiatomicLevels) -> Result<Option<String>> {
    list_generic("diatomic", build(&diatomic(&a.model)?)?.as_ref(), &a.list)
}

fn levels_file(a: FileLevels) -> Result<Option<String>> {
    list_generic("file", build(&file(&a.model))?.as_ref(), &a.list)
}

fn levels_zeeman(a: ZeemanLevels) -> Result<Option<String>> {
    list_generic("zeeman", build(&zeeman(&a.model))?.as_ref(), &a.list)
}

/// A model for sum/thermo, with its identifier and temperature options.
fn thermo_model(m: ThermoModel) -> Result<(&'static str, Model, TempArgs)> {
    let (id, spec, temp) = match m {
        ThermoModel::Box(a) => (
            "box",
            ModelSpec::Box(box_spec(&a.shape, &a.mass, &a.side)),
            a.temp,
        ),
        ThermoModel::Rotor(a) => ("rotor", rotor(&a.model)?, a.temp),
        ThermoModel::Top(a) => ("top", top(&a.model)?, a.temp),
        ThermoModel::Oscillator(a) => ("oscillator", oscillator(&a.model)?, a.temp),
        ThermoModel::Diatomic(a) => ("diatomic", diatomic(&a.model)?, a.temp),
        ThermoModel::File(a) => ("file", file(&a.model), a.temp),
        ThermoModel::Zeeman(a) => ("zeeman", zeeman(&a.model), a.temp),
        ThermoModel::Species(_) => {
            return Err(Error::invalid(
                "sum",
                "with a species name",
                "species give standard molar functions: use zsum thermo NAME --T ...",
            ))
        }
    };
    Ok((id, build(&spec)?, temp))
}

fn run_thermo(
    model: Option<ThermoModel>,
    system: SystemThermo,
    with_functions: bool,
) -> Result<Option<String>> {
    if let (Some(ThermoModel::Species(args)), true) = (&model, with_functions) {
        return species_thermo(args);
    }
    let (id, spectrum, temp) = match model {
        Some(m) => thermo_model(m)?,
        None => {
            let path = system.system.ok_or_else(|| {
                Error::invalid(
                    "sum/thermo",
                    "without a model",
                    "name a model (box, rotor, top, oscillator, diatomic, file, zeeman) or give \
                     --system FILE",
                )
            })?;
            let sys = System::read(&path)?;
            let temp = TempArgs {
                t: Some(system.t.ok_or_else(|| {
                    Error::invalid("--system", path.display(), "it needs --T as well")
                })?),
                kt: None,
                digits: system.digits,
                max_bits: system.max_bits,
                per: system.per,
                time_budget: system.time_budget,
                out: Output {
                    format: system.format,
                    output: system.output,
                },
            };
            ("system", Box::new(sys.product) as Model, temp)
        }
    };
    let (grid, kelvin) = match (&temp.t, &temp.kt) {
        (Some(t), None) => (parse_grid("--T", t)?, true),
        (None, Some(k)) => (parse_grid("--kT", k)?, false),
        _ => {
            return Err(Error::invalid(
                "temperature",
                "missing",
                "give --T (kelvin) or --kT (in the model's unit)",
            ))
        }
    };
    let per = temp.per.map(|p| match p {
        PerArg::Mole => Per::Mole,
        PerArg::Particle => Per::Particle,
    });
    let progress = Progress::new("temperatures");
    let observe = |d, t| progress.observe(d, t);
    let budget = time_budget(&temp.time_budget)?;
    let meter = Meter::new("the sums over this grid", grid.len(), &budget).observed(&observe);
    let report = ThermoReport::build(
        id,
        spectrum.as_ref(),
        &grid,
        kelvin,
        temp.digits,
        temp.max_bits,
        per,
        with_functions,
        &meter,
    )?;
    emit(render(&report, format(temp.out.format))?, &temp.out)
}

/// A progress bar on a terminal for work that runs more than a moment;
/// nothing when standard error is not a terminal. It appears once the work
/// has run a second and a half, and vanishes when the work ends.
struct Progress {
    what: &'static str,
    start: std::time::Instant,
    terminal: bool,
    bar: std::sync::OnceLock<indicatif::ProgressBar>,
}

impl Progress {
    fn new(what: &'static str) -> Self {
        use std::io::IsTerminal;
        Progress {
            what,
            start: std::time::Instant::now(),
            terminal: std::io::stderr().is_terminal(),
            bar: std::sync::OnceLock::new(),
        }
    }

    /// Tells the bar that `done` of `total` steps are done.
    fn observe(&self, done: f64, total: f64) {
        if !self.terminal || self.start.elapsed().as_secs_f64() < 1.5 {
            return;
        }
        let bar = self.bar.get_or_init(|| {
            let b = indicatif::ProgressBar::new((total * 100.0) as u64);
            b.set_style(
                indicatif::ProgressStyle::with_template(&format!(
                    "{{bar:40}} {{percent}}% of {} {} {{eta}}",
                    total, self.what
                ))
                .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
            );
            b
        });
        bar.set_position((done * 100.0) as u64);
    }
}

impl Drop for Progress {
    fn drop(&mut self) {
        if let Some(b) = self.bar.get() {
            b.finish_and_clear();
        }
    }
}

/// Reads a time budget: seconds, or a number with s, min or h.
fn parse_time(text: &str) -> Result<f64> {
    let t = text.trim();
    let (num, mult) = [("min", 60.0), ("ms", 0.001), ("s", 1.0), ("h", 3600.0)]
        .iter()
        .find_map(|(u, m)| t.strip_suffix(u).map(|n| (n.trim(), *m)))
        .unwrap_or((t, 1.0));
    let v = parse_rational(num)
        .ok()
        .and_then(|v| num_traits::ToPrimitive::to_f64(&v))
        .filter(|v| *v > 0.0 && v.is_finite())
        .ok_or_else(|| {
            Error::parse(
                "--time-budget",
                text,
                "a positive duration such as 30s, 5min or 2h (a plain number is seconds)",
            )
        })?;
    Ok(v * mult)
}

/// The memory and time budgets of a command.
fn budgets(memory: &str, time: &str) -> Result<Budget> {
    Ok(parse_budget(memory)?.with_seconds(parse_time(time)?))
}

/// A time budget alone (the memory budget at its default).
fn time_budget(time: &str) -> Result<Budget> {
    Ok(Budget::default().with_seconds(parse_time(time)?))
}

fn levels_system(a: SystemLevels) -> Result<Option<String>> {
    let path = a.system.ok_or_else(|| {
        Error::invalid(
            "levels",
            "without a model",
            "name a model (box, rotor, top, oscillator, diatomic, file, zeeman) or give --system FILE",
        )
    })?;
    let up_to = a
        .up_to
        .ok_or_else(|| Error::invalid("--system", path.display(), "it needs --up-to E as well"))?;
    let sys = System::read(&path)?;
    let list = ListArgs {
        up_to,
        states: a.states,
        also: a.also,
        digits: a.digits,
        memory_budget: a.memory_budget,
        time_budget: a.time_budget,
        out: Output {
            format: a.format,
            output: a.output,
        },
    };
    list_generic("system", &sys.product, &list)
}

fn classical_model(
    model: Option<ClassicalModel>,
    system: &Option<std::path::PathBuf>,
    what: &str,
) -> Result<Model> {
    let spec = match model {
        Some(ClassicalModel::Box(BoxPhysical { shape, mass, side })) => {
            ModelSpec::Box(box_spec(&shape, &mass, &side))
        }
        Some(ClassicalModel::Rotor(a)) => rotor(&a)?,
        Some(ClassicalModel::Top(a)) => top(&a)?,
        Some(ClassicalModel::Oscillator(a)) => oscillator(&a)?,
        Some(ClassicalModel::Diatomic(a)) => diatomic(&a)?,
        None => {
            let path = system.as_ref().ok_or_else(|| {
                Error::invalid(
                    what,
                    "without a model",
                    "name a model (box, rotor, top, oscillator, diatomic) or give --system FILE",
                )
            })?;
            return Ok(Box::new(System::read(path)?.product));
        }
    };
    build(&spec)
}

fn crossover(model: Option<ClassicalModel>, a: CrossoverArgs) -> Result<Option<String>> {
    let quantity = Quantity::parse(&a.quantity)?;
    let tol = parse_tolerance(&a.tol)?;
    let range = SearchRange::parse(&a.range)?;
    let spectrum = classical_model(model, &a.system, "crossover")?;
    let c = Classical::new(spectrum.as_ref())?;
    let index = c.find(&a.approx)?;
    let report = zsum::report::CrossoverReport::build(&c, index, quantity, &tol, &range, a.digits)?;
    emit(
        render(&report, format(a.format))?,
        &Output {
            format: a.format,
            output: a.output,
        },
    )
}

fn compare(model: Option<ClassicalModel>, a: CompareArgs) -> Result<Option<String>> {
    let quantity = Quantity::parse(&a.quantity)?;
    let tol = parse_tolerance(&a.tol)?;
    if let Some(p) = &a.plot {
        check_plot_path(p)?;
    }
    let spectrum = classical_model(model, &a.system, "compare")?;
    let c = Classical::new(spectrum.as_ref())?;
    let indices: Vec<usize> = match &a.approx {
        None => (0..c.approximations().len()).collect(),
        Some(list) => list
            .split(',')
            .map(|n| c.find(n.trim()))
            .collect::<Result<_>>()?,
    };
    let (grid, kelvin) = match (&a.t, &a.kt, &a.reduced) {
        (Some(t), None, None) => (parse_grid("--T", t)?, true),
        (None, Some(k), None) => (parse_grid("--kT", k)?, false),
        (None, None, Some(x)) => (c.thermal_energies(&parse_grid("--reduced", x)?), false),
        _ => {
            return Err(Error::invalid(
                "temperature",
                "missing or given twice",
                "give one of --T (kelvin), --kT (in the model's unit) or --reduced (T/θ)",
            ))
        }
    };
    let progress = Progress::new("temperatures");
    let observe = |d, t| progress.observe(d, t);
    let budget = time_budget(&a.time_budget)?;
    let meter = Meter::new("the error map over this grid", grid.len(), &budget).observed(&observe);
    let report = zsum::report::CompareReport::build(&c, &indices, &grid, kelvin, a.digits, &meter)?;
    let text = render(&report, format(a.format))?;
    if let Some(p) = &a.plot {
        let tol_f = num_traits::ToPrimitive::to_f64(&tol).unwrap_or(0.01);
        write_plot(&report, quantity, tol_f, p)?;
    }
    emit(
        text,
        &Output {
            format: a.format,
            output: a.output,
        },
    )
}

/// `zsum report`: writes the report into `out`.
#[cfg(feature = "plot")]
fn report(out: &std::path::Path) -> Result<Option<String>> {
    let s = zsum::report::liquefier::write_report(out)?;
    Ok(Some(s.lines.join("\n") + "\n"))
}

/// `zsum report` in a binary built without plotting: refused.
#[cfg(not(feature = "plot"))]
fn report(_out: &std::path::Path) -> Result<Option<String>> {
    Err(Error::invalid(
        "command",
        "report",
        "this zsum was built without plotting (the cargo feature `plot`), which draws the \
         report's figures; build zsum with its default features to write the report",
    ))
}

/// The error for `--plot` in a binary built without plotting.
#[cfg(not(feature = "plot"))]
fn without_plotting(p: &std::path::Path) -> Error {
    Error::invalid(
        "--plot",
        p.display(),
        "this zsum was built without plotting (the cargo feature `plot`); leave out --plot, \
         or build zsum with its default features",
    )
}

/// Writes the error map's figure of `quantity` to `p`.
#[cfg(feature = "plot")]
fn write_plot(
    report: &zsum::report::CompareReport,
    quantity: Quantity,
    tol: f64,
    p: &std::path::Path,
) -> Result<()> {
    zsum::report::figure::write(report, quantity, tol, p)
}

/// Refused: this binary draws no figures ([`check_plot_path`] refuses
/// `--plot` before any work, so this is not reached).
#[cfg(not(feature = "plot"))]
fn write_plot(
    _report: &zsum::report::CompareReport,
    _quantity: Quantity,
    _tol: f64,
    p: &std::path::Path,
) -> Result<()> {
    Err(without_plotting(p))
}

/// Refuses `--plot` in a binary built without plotting, before any work.
#[cfg(not(feature = "plot"))]
fn check_plot_path(p: &std::path::Path) -> Result<()> {
    Err(without_plotting(p))
}

/// Refuses a plot path that cannot be written, before any work is done.
#[cfg(feature = "plot")]
fn check_plot_path(p: &std::path::Path) -> Result<()> {
    zsum::report::figure::plot_kind(p)?;
    let dir = match p.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    if !dir.is_dir() {
        return Err(Error::invalid(
            "--plot",
            p.display(),
            "its folder does not exist; create it or choose another path",
        ));
    }
    if p.is_dir() {
        return Err(Error::invalid(
            "--plot",
            p.display(),
            "it is a folder; give a file name ending in .svg or .png",
        ));
    }
    Ok(())
}

fn database(extra: &Option<std::path::PathBuf>) -> Result<Database> {
    let mut db = Database::builtin()?;
    if let Some(f) = extra {
        db.add_file(f)?;
    }
    Ok(db)
}

fn vib_model(text: &str) -> Result<VibModel> {
    match text {
        "rovib" => Ok(VibModel::Rovib),
        "rrho" => Ok(VibModel::Rrho),
        other => Err(Error::parse("--model", other, "rovib or rrho")),
    }
}

fn species_thermo(args: &[String]) -> Result<Option<String>> {
    use clap::{CommandFactory, FromArgMatches};
    let parsed = super::values_as_written(SpeciesThermo::command())
        .try_get_matches_from(args)
        .and_then(|m| SpeciesThermo::from_arg_matches(&m));
    let a = match parsed {
        Ok(a) => a,
        Err(e) if !e.use_stderr() => return Ok(Some(e.to_string())),
        Err(e) => {
            return Err(Error::new(
                zsum::ErrorKind::Parse,
                format!(
                    "thermo SPECIES: {}",
                    e.render().to_string().trim_start_matches("error: ").trim()
                ),
            ))
        }
    };
    let db = database(&a.species_file)?;
    let sp = db.find(&a.species)?;
    let options = MolarOptions {
        pressure: parse_pressure(&a.p)?,
        model: vib_model(&a.model)?,
        translation: match &a.box_side {
            None => Translation::SackurTetrode,
            Some(s) => Translation::Box(parse_length_m(s)?),
        },
        isomer: a.isomer.as_deref().map(Isomer::parse).transpose()?,
        digits: a.digits,
        basis: match a.per {
            BasisArg::Mole => Basis::Mole,
            BasisArg::Kg => Basis::Kilogram,
            BasisArg::Particle => Basis::Particle,
        },
    };
    let grid = parse_grid("--T", &a.t)?;
    let progress = Progress::new("temperatures");
    let observe = |d, t| progress.observe(d, t);
    let budget = time_budget(&a.time_budget)?;
    let meter = Meter::new(
        format!("the {} table over this grid", sp.name),
        grid.len(),
        &budget,
    )
    .observed(&observe);
    let table = MolarTable::new(&MolarGrid::compute_metered(sp, &grid, &options, &meter)?);
    // JSON keeps one shape, a list of rows, whatever the grid's length.
    let out = emit(render(&table, format(a.out.format))?, &a.out)?;
    for w in table.warnings() {
        eprintln!("zsum: warning: {w}");
    }
    Ok(out)
}

fn species(c: SpeciesCommand) -> Result<Option<String>> {
    match c {
        SpeciesCommand::List { species_file, out } => {
            let db = database(&species_file)?;
            emit(render(&SpeciesList::new(&db), format(out.format))?, &out)
        }
        SpeciesCommand::Show {
            name,
            species_file,
            out,
        } => {
            let db = database(&species_file)?;
            let card = SpeciesCard::new(db.find(&name)?)?;
            emit(render(&card, format(out.format))?, &out)
        }
    }
}

fn assign(command: AssignCommand) -> Result<Option<String>> {
    match command {
        AssignCommand::Check { file, model, opts } => {
            let a = zsum::assign::Assignments::read(&file)?;
            let threshold: f64 = opts
                .threshold
                .trim()
                .parse()
                .ok()
                .filter(|t: &f64| t.is_finite() && *t > 0.0)
                .ok_or_else(|| {
                    Error::invalid(
                        "--threshold",
                        &opts.threshold,
                        "give a positive number of standard deviations, e.g. 3",
                    )
                })?;
            let up_to = match &opts.up_to {
                Some(text) => {
                    let (v, u) = zsum::units::parse_energy(text)?;
                    Some(u.convert(&v, &a.unit)?)
                }
                None => None,
            };
            let spectrum = classical_model(model, &opts.system, "assign check")?;
            let c = zsum::assign::check(
                &a,
                spectrum.as_ref(),
                &zsum::assign::CheckOptions {
                    threshold,
                    up_to,
                    ..Default::default()
                },
            )?;
            emit(
                render(
                    &zsum::report::CheckReport::new(&c, &file.display().to_string()),
                    format(opts.out.format),
                )?,
                &opts.out,
            )
        }
    }
}

fn spin(a: SpinIsomerArgs) -> Result<Option<String>> {
    use zsum::species::spin::{relaxation_grid, spin_temperature, Composition};
    let db = Database::builtin()?;
    let sp = db.find(&a.species)?;
    let text = match (&a.measured, &a.t) {
        (Some(m), _) => {
            let st = spin_temperature(sp, &Composition::parse(m)?, a.digits)?;
            render(
                &zsum::report::SpinTemperatureReport::new(&st),
                format(a.out.format),
            )?
        }
        (None, Some(t)) => {
            let from = Isomer::parse(&a.from)?;
            let grid = parse_grid("--T", t)?;
            let o = MolarOptions {
                digits: a.digits,
                ..MolarOptions::default()
            };
            let points = relaxation_grid(sp, &from, &grid, &o)?;
            render(
                &zsum::report::RelaxationTable::new(&sp.name, &a.from, &points, a.digits),
                format(a.out.format),
            )?
        }
        (None, None) => {
            return Err(Error::invalid(
                "spin",
                "without --measured or --T",
                "give a measured composition (--measured ortho/para=2.5) or temperatures (--T)",
            ))
        }
    };
    emit(text, &a.out)
}

fn hydrogen(a: HydrogenArgs) -> Result<Option<String>> {
    let db = Database::builtin()?;
    let sp = db.find(&a.species)?;
    let isomer = Isomer::parse(&a.isomer)?;
    let grid = parse_grid("--T", &a.t)?;
    let options = MolarOptions {
        model: vib_model(&a.model)?,
        digits: a.digits,
        ..MolarOptions::default()
    };
    let progress = Progress::new("temperatures");
    let observe = |d, t| progress.observe(d, t);
    let budget = time_budget(&a.time_budget)?;
    let meter = Meter::new(
        format!("the {} isomer table over this grid", sp.name),
        grid.len(),
        &budget,
    )
    .observed(&observe);
    let table = HydrogenTable::new(&HydrogenGrid::compute_metered(
        sp, &grid, &isomer, &options, &meter,
    )?);
    let out = emit(render(&table, format(a.out.format))?, &a.out)?;
    for w in table.warnings() {
        eprintln!("zsum: warning: {w}");
    }
    Ok(out)
}

fn microstates_cmd(a: MicrostatesArgs) -> Result<Option<String>> {
    use zsum::microstates::{einstein_unit, microstates, Statistics};
    use zsum::report::{EinsteinReport, MicroReport};
    let digits = check_digits(a.digits)?;
    let budget = budgets(&a.memory_budget, &a.time_budget)?;
    let (path, stats) = match (&a.system, &a.stats) {
        (Some(path), Some(stats)) if !a.einstein => (path, Statistics::parse(stats)?),
        _ => {
            let up_to = cutoff_in(&a.up_to, &einstein_unit())?;
            let report = EinsteinReport::build(u64::from(a.particles), &up_to, digits, &budget)?;
            return emit(render(&report, format(a.out.format))?, &a.out);
        }
    };
    let spectrum = System::read(path)?.product;
    let unit = spectrum.unit();
    let up_to = cutoff_in(&a.up_to, &unit)?;
    let step = a
        .grid
        .as_deref()
        .map(|g| cutoff_in(g, &unit).map_err(|_| Error::parse("--grid", g, "an energy step")))
        .transpose()?;
    let omega = microstates(
        &spectrum,
        u64::from(a.particles),
        stats,
        &up_to,
        step.as_ref(),
        &budget,
    )?;
    let cached = zsum::sum::Cached::new(&spectrum);
    let report = MicroReport::build(&cached, omega, &up_to, a.compare as usize, digits)?;
    emit(render(&report, format(a.out.format))?, &a.out)
}

fn ensemble_cmd(a: EnsembleArgs) -> Result<Option<String>> {
    use zsum::microstates::{check_particles, Statistics};
    use zsum::report::EnsembleReport;
    let stats = Statistics::parse(&a.stats)?;
    check_particles(u64::from(a.particles))?;
    let (grid, kelvin) = match (&a.t, &a.kt) {
        (Some(t), _) => (parse_grid("--T", t)?, true),
        (None, Some(k)) => (parse_grid("--kT", k)?, false),
        (None, None) => return Err(Error::invalid("--T", "missing", "give --T or --kT")),
    };
    if !(1..=60).contains(&a.digits) {
        return Err(Error::invalid(
            "--digits",
            a.digits,
            "choose between 1 and 60 significant digits",
        ));
    }
    let tol = parse_tolerance(&a.tolerance)?;
    let sys = System::read(&a.system)?;
    let progress = Progress::new("temperatures");
    let observe = |d, t| progress.observe(d, t);
    let budget = time_budget(&a.time_budget)?;
    let meter = Meter::new(
        format!("Q_N of {} particles over this grid", a.particles),
        grid.len(),
        &budget,
    )
    .observed(&observe);
    let report = EnsembleReport::build_metered(
        &sys.product,
        u64::from(a.particles),
        stats,
        &grid,
        kelvin,
        a.digits,
        &tol,
        &meter,
    )?;
    emit(render(&report, format(a.out.format))?, &a.out)
}

fn census(a: CensusArgs) -> Result<Option<String>> {
    use zsum::microstates::{census, parse_modes};
    use zsum::report::{CensusErrorMap, CensusReport};
    let unit = EnergyUnit::parse(&a.unit)?;
    let budget = budgets(&a.memory_budget, &a.time_budget)?;
    // Every file is read and checked before any counting.
    let mut extras: Vec<Box<dyn Spectrum>> = Vec::new();
    for path in &a.convolve {
        extras.push(if path.extension().is_some_and(|e| e == "toml") {
            Box::new(System::read(path)?.product)
        } else {
            Box::new(LevelFile::read(path)?)
        });
    }
    let extras: Vec<&dyn Spectrum> = extras.iter().map(|s| &**s).collect();
    let modes = parse_modes(&a.modes)?;
    let step = number("--step", &a.step)?;
    let up_to = number("--up-to", &a.up_to)?;
    if let Some(points) = a.error_map {
        let report = CensusErrorMap::build(
            &modes,
            &step,
            &up_to,
            &a.unit,
            points as usize,
            a.digits,
            &budget,
        )?;
        return emit(render(&report, format(a.out.format))?, &a.out);
    }
    let counts = census(&modes, &step, &up_to, &unit, &extras, &budget)?;
    let report = CensusReport::new(&counts, &a.unit, &extras);
    emit(render(&report, format(a.out.format))?, &a.out)
}

/// A binary built without plotting refuses the commands and options that
/// draw, before any work, naming what was asked and why
/// (`cargo test --no-default-features --features cli --bin zsum`).
#[cfg(all(test, not(feature = "plot")))]
mod without_plotting {
    use clap::FromArgMatches;
    use zsum::ErrorKind;

    fn refused(args: &[&str]) -> zsum::Error {
        let m = super::super::command()
            .try_get_matches_from(std::iter::once("zsum").chain(args.iter().copied()))
            .unwrap();
        let cli = super::Cli::from_arg_matches(&m).unwrap();
        super::run(cli).unwrap_err()
    }

    #[test]
    fn figures_are_refused_with_a_typed_error() {
        let dir = tempfile::tempdir().unwrap();
        let png = dir.path().join("map.png");
        let e = refused(&[
            "compare",
            "rotor",
            "--B",
            "1",
            "--unit",
            "K",
            "--T",
            "1:3:1",
            "--plot",
            png.to_str().unwrap(),
        ]);
        assert_eq!(e.kind(), ErrorKind::InvalidParameter);
        assert!(e.message().starts_with("--plot "), "{e}");
        assert!(e.message().contains("map.png"), "{e}");
        assert!(e.message().contains("built without plotting"), "{e}");
        let rep = dir.path().join("rep");
        let e = refused(&["report", "--out", rep.to_str().unwrap()]);
        assert_eq!(e.kind(), ErrorKind::InvalidParameter);
        assert_eq!(
            e.message(),
            "command report is not allowed: this zsum was built without plotting (the cargo \
             feature `plot`), which draws the report's figures; build zsum with its default \
             features to write the report"
        );
        // Nothing was written.
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
    }
}
