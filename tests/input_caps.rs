//! Files zsum reads are capped: `/dev/zero`, a 2 GiB sparse file and a
//! 200 MB one-line file given to every file-reading option are refused
//! with exit status 2, nothing on standard output, a message under 500
//! characters naming the file, and a peak resident memory under 100 MB
//! (the process's own high-water mark, `ZSUM_PEAK_MEMORY`).

use std::path::{Path, PathBuf};
use std::process::Command;

/// Peak memory and the error line of a refused run.
fn refused_small(args: &[&str]) -> (u64, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_zsum"))
        .args(args)
        .env("ZSUM_PEAK_MEMORY", "1")
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr).to_string();
    assert_eq!(out.status.code(), Some(2), "{args:?}: {err}");
    assert!(out.stdout.is_empty(), "{args:?} wrote to stdout");
    let error = err
        .lines()
        .find(|l| l.starts_with("zsum: error:"))
        .unwrap_or_else(|| panic!("{args:?}: no error line: {err}"))
        .to_string();
    assert!(
        error.chars().count() < 500,
        "{args:?}: {} characters: {error}",
        error.len()
    );
    let peak: u64 = err
        .lines()
        .find_map(|l| l.strip_prefix("zsum: peak memory: "))
        .and_then(|l| l.split(" KiB").next())
        .and_then(|n| n.parse().ok())
        .expect("a peak memory line");
    assert!(peak < 100 * 1024, "{args:?}: peak {peak} KiB");
    (peak, error)
}

/// The three hostile inputs: an endless device, a huge sparse file and a
/// 200 MB file of one line, each under the extension `ext`.
fn hostile(dir: &Path, ext: &str) -> Vec<PathBuf> {
    let sparse = dir.join(format!("sparse.{ext}"));
    std::fs::File::create(&sparse)
        .unwrap()
        .set_len(2 << 30)
        .unwrap();
    let line = dir.join(format!("oneline.{ext}"));
    if !line.exists() {
        std::fs::write(&line, "7".repeat(200_000_000)).unwrap();
    }
    vec![PathBuf::from("/dev/zero"), sparse, line]
}

#[test]
fn system_files_are_capped_for_every_command() {
    let dir = tempfile::tempdir().unwrap();
    for f in hostile(dir.path(), "toml") {
        let f = f.to_str().unwrap();
        for args in [
            vec!["levels", "--system", f, "--up-to", "3"],
            vec!["sum", "--system", f, "--T", "300"],
            vec!["thermo", "--system", f, "--T", "300"],
            vec!["crossover", "--system", f],
            vec!["compare", "--system", f, "--T", "300"],
            vec![
                "microstates",
                "--system",
                f,
                "--particles",
                "2",
                "--stats",
                "bose",
                "--up-to",
                "3",
            ],
            vec![
                "ensemble",
                "--system",
                f,
                "--particles",
                "2",
                "--stats",
                "bose",
                "--T",
                "1",
            ],
            vec![
                "census",
                "--modes",
                "100",
                "--up-to",
                "300",
                "--convolve",
                f,
            ],
        ] {
            let (_, e) = refused_small(&args);
            // census reads a path not ending in .toml (/dev/zero) as a level file.
            let kind = if f.ends_with(".toml") {
                "system file"
            } else {
                "file"
            };
            assert!(e.contains(kind) && e.contains("MiB"), "{args:?}: {e}");
        }
    }
}

#[test]
fn level_and_species_files_are_capped() {
    let dir = tempfile::tempdir().unwrap();
    for f in hostile(dir.path(), "levels") {
        let f = f.to_str().unwrap();
        for args in [
            vec!["levels", "file", f, "--up-to", "3"],
            vec!["sum", "file", f, "--T", "300"],
            vec!["thermo", "file", f, "--T", "300"],
            vec![
                "census",
                "--modes",
                "100",
                "--up-to",
                "300",
                "--convolve",
                f,
            ],
        ] {
            let (_, e) = refused_small(&args);
            assert!(
                e.contains("level file") && e.contains("MiB"),
                "{args:?}: {e}"
            );
        }
    }
    for f in hostile(dir.path(), "toml") {
        let f = f.to_str().unwrap();
        for args in [
            vec!["thermo", "N2", "--T", "300", "--species-file", f],
            vec!["species", "list", "--species-file", f],
            vec!["species", "show", "N2", "--species-file", f],
        ] {
            let (_, e) = refused_small(&args);
            assert!(
                e.contains("species file") && e.contains("MiB"),
                "{args:?}: {e}"
            );
        }
    }
}

/// A file under the cap whose one line is 10 MB long: the parse error
/// quotes an excerpt of the line, not the line.
#[test]
fn a_long_bad_line_is_quoted_as_an_excerpt() {
    let dir = tempfile::tempdir().unwrap();
    let toml = dir.path().join("long.toml");
    std::fs::write(&toml, "x".repeat(10_000_000)).unwrap();
    let (_, e) = refused_small(&["levels", "--system", toml.to_str().unwrap(), "--up-to", "3"]);
    assert!(
        e.contains("line 1") && e.contains("10000000 characters"),
        "{e}"
    );
    let levels = dir.path().join("long.levels");
    std::fs::write(&levels, format!("0 cm-1 1 {}\n", "y".repeat(10_000_000))).unwrap();
    refused_small(&["levels", "file", levels.to_str().unwrap(), "--up-to", "3"]);
    let species = dir.path().join("long_species.toml");
    std::fs::write(
        &species,
        format!("[[species]]\nname = \"{}\"\n", "z".repeat(3_000_000)),
    )
    .unwrap();
    refused_small(&[
        "species",
        "list",
        "--species-file",
        species.to_str().unwrap(),
    ]);
}
