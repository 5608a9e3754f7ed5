//! Command-line front end. Two stages: clap reads raw values ([`args`]),
//! then [`run`] validates them into library objects and calls the library.
//! No physics lives here.

mod args;
mod run;

use clap::{CommandFactory, FromArgMatches};
use std::io::Write;

/// Every option that takes a value takes it as written, even when it
/// starts with `-` (`--dims -1`, `--tol -1%`): the value is then refused by
/// validation that names the option and what is allowed, not by the parser
/// as an unknown argument.
pub fn values_as_written(c: clap::Command) -> clap::Command {
    let c = c.mut_args(|a| {
        if a.get_action().takes_values() && !a.is_positional() {
            a.allow_hyphen_values(true)
        } else {
            a
        }
    });
    let names: Vec<String> = c
        .get_subcommands()
        .map(|s| s.get_name().to_string())
        .collect();
    names
        .iter()
        .fold(c, |c, n| c.mut_subcommand(n, values_as_written))
}

/// The whole command line, with `thermo --help` ending in the options of
/// `thermo SPECIES` (a species name is taken as an external subcommand,
/// which clap's help would not show).
pub fn command() -> clap::Command {
    let species = values_as_written(args::SpeciesThermo::command())
        .override_usage("zsum thermo SPECIES --T <T> [OPTIONS]")
        .render_long_help()
        .to_string();
    values_as_written(args::Cli::command()).mut_subcommand("thermo", |t| {
        t.after_help(
            "A built-in species instead of a model: zsum thermo SPECIES --T <T> [--p P] \
             [--per mole|kg|particle] [--isomer STATE] [--model rovib|rrho] [--digits N] \
             (zsum species list names them; --help lists every option)",
        )
        .after_long_help(format!(
            "A built-in species instead of a model (zsum species list names them):\n\n{species}"
        ))
    })
}

/// Runs the command line and returns the process exit status. With the
/// environment variable `ZSUM_PEAK_MEMORY` set, the process's own
/// high-water mark of resident memory (Linux `VmHWM`) is written last to
/// standard error with the largest memory estimate any stage was checked
/// against, as `zsum: peak memory: N KiB; largest estimate: M KiB`; the
/// budget tests measure with it.
pub fn main() -> i32 {
    let status = run_command_line();
    if std::env::var_os("ZSUM_PEAK_MEMORY").is_some() {
        if let Some(kib) = peak_kib() {
            eprintln!(
                "zsum: peak memory: {kib} KiB; largest estimate: {} KiB",
                zsum::budget::largest_estimate() / 1024
            );
        }
    }
    status
}

/// The process's peak resident memory in KiB, where the system says.
fn peak_kib() -> Option<u64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    line.split_whitespace().nth(1)?.parse().ok()
}

fn run_command_line() -> i32 {
    let parsed = command()
        .try_get_matches()
        .and_then(|m| args::Cli::from_arg_matches(&m));
    let cli = match parsed {
        Ok(cli) => cli,
        Err(e) if !e.use_stderr() => {
            // --help and --version: print and succeed.
            let _ = e.print();
            return 0;
        }
        Err(e) => {
            // Usage errors: clap's message (which starts "error: ") after our
            // prefix, status 2 like every other bad input.
            eprint!("zsum: {}", e.render());
            return 2;
        }
    };
    match run::run(cli) {
        Ok(output) => {
            if let Some(text) = output {
                let mut out = std::io::stdout().lock();
                if let Err(e) = out.write_all(text.as_bytes()).and_then(|_| out.flush()) {
                    if e.kind() != std::io::ErrorKind::BrokenPipe {
                        eprintln!("zsum: error: cannot write output: {e}");
                        return 2;
                    }
                }
            }
            0
        }
        Err(e) => {
            eprintln!("zsum: error: {}", with_options(&e.to_string()));
            2
        }
    }
}

/// The library names quantities, not command-line options; the command
/// line ends a message with the options that set the quantities it names,
/// so it says what to change.
const OPTION_OF: &[(&str, &str)] = &[
    ("effort limit (max bits)", "--max-bits"),
    ("memory budget", "--memory-budget"),
    ("time budget", "--time-budget"),
    ("search range", "--range"),
    ("particle number", "--particles"),
    ("number of quanta", "--up-to"),
    ("cutoff", "--up-to"),
    ("grid step", "--grid"),
    ("energy step", "--step"),
    ("error-map points", "--error-map"),
    ("physical units", "--per"),
    ("species file", "--species-file"),
    ("pressure", "--p"),
];

/// `message` followed by the options of the quantities it names (whole
/// words only), each once.
fn with_options(message: &str) -> String {
    let mut options: Vec<&str> = Vec::new();
    for (name, option) in OPTION_OF {
        let named = message.match_indices(name).any(|(i, _)| {
            let after = message[i + name.len()..].chars().next();
            let before = message[..i].chars().next_back();
            !after.is_some_and(char::is_alphanumeric) && !before.is_some_and(char::is_alphanumeric)
        });
        if named && !options.contains(option) && !message.contains(option) {
            options.push(option);
        }
    }
    if options.is_empty() {
        message.to_string()
    } else {
        format!("{message} (see {})", options.join(", "))
    }
}

#[cfg(test)]
mod tests {
    use super::command;
    use std::path::PathBuf;

    /// Every command path (`["thermo", "rotor"]`) with its command, the
    /// top level first.
    fn every_command() -> Vec<(Vec<String>, clap::Command)> {
        fn walk(path: Vec<String>, c: &clap::Command, out: &mut Vec<(Vec<String>, clap::Command)>) {
            out.push((path.clone(), c.clone()));
            for sub in c.get_subcommands() {
                if sub.get_name() == "help" {
                    continue;
                }
                let mut p = path.clone();
                p.push(sub.get_name().to_string());
                walk(p, sub, out);
            }
        }
        let mut root = command().term_width(100);
        root.build();
        let mut out = Vec::new();
        walk(Vec::new(), &root, &mut out);
        out
    }

    #[test]
    fn messages_gain_the_options_of_the_quantities_they_name() {
        assert_eq!(
            super::with_options("effort limit (max bits) 64 is not allowed"),
            "effort limit (max bits) 64 is not allowed (see --max-bits)"
        );
        // Each option once; whole words only ("grid steps" is not "grid step").
        assert_eq!(
            super::with_options("the cutoff is low; raise the cutoff, or the memory budget"),
            "the cutoff is low; raise the cutoff, or the memory budget (see --memory-budget, \
             --up-to)"
        );
        assert_eq!(super::with_options("whole grid steps"), "whole grid steps");
    }

    /// The parser's own consistency check, on the command as `main` runs it.
    #[test]
    fn parser_definition_is_consistent() {
        command().debug_assert();
    }

    /// Every option that has a default says it in its subcommand's help.
    #[test]
    fn every_default_is_stated_in_the_help() {
        for (path, mut c) in every_command() {
            let help = c.render_long_help().to_string();
            for a in c.get_arguments() {
                let defaults: Vec<String> = a
                    .get_default_values()
                    .iter()
                    .map(|v| v.to_string_lossy().to_string())
                    .collect();
                if defaults.is_empty()
                    || a.is_hide_default_value_set()
                    || !a.get_action().takes_values()
                {
                    continue;
                }
                let stated = format!("[default: {}]", defaults.join(", "));
                assert!(
                    help.contains(&stated),
                    "zsum {} --help does not state {stated} for --{}",
                    path.join(" "),
                    a.get_id()
                );
            }
        }
    }

    /// The help of every command, pinned: a change of an option's name,
    /// default or meaning shows here and is re-recorded on purpose
    /// (`ZSUM_BLESS=1 cargo test --release help_texts`).
    #[test]
    fn help_texts_match_the_golden_files() {
        let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/golden/help");
        let bless = std::env::var_os("ZSUM_BLESS").is_some();
        let mut names = Vec::new();
        for (path, mut c) in every_command() {
            let name = if path.is_empty() {
                "zsum.txt".to_string()
            } else {
                format!("zsum-{}.txt", path.join("-"))
            };
            let help = c.render_long_help().to_string();
            let file = dir.join(&name);
            if bless {
                std::fs::create_dir_all(&dir).unwrap();
                std::fs::write(&file, &help).unwrap();
            } else {
                let want = std::fs::read_to_string(&file).unwrap_or_else(|e| {
                    panic!("{}: {e}; record it with ZSUM_BLESS=1", file.display())
                });
                assert_eq!(help, want, "zsum {} --help changed", path.join(" "));
            }
            names.push(name);
        }
        // No stale golden file for a command that is gone.
        let mut on_disk: Vec<String> = std::fs::read_dir(&dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().to_string())
            .collect();
        on_disk.sort();
        names.sort();
        assert_eq!(on_disk, names, "golden help files and commands differ");
    }
}
