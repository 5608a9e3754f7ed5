//! Every command line in the README's `sh` blocks runs as written with the
//! built binary and exits 0, so a recipe cannot rot. The two set-up lines
//! (`bash .ci/setup && cargo ...`) are what CI itself runs and are skipped
//! here; every `zsum` line runs in a scratch folder that sees the
//! repository's `examples/`.

use std::path::Path;
use std::process::Command;

/// The command lines of every ```sh block (comments and blanks dropped).
fn recipes(readme: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut inside = false;
    for line in readme.lines() {
        let t = line.trim();
        if t.starts_with("```") {
            inside = !inside && t == "```sh";
            continue;
        }
        if inside && !t.is_empty() && !t.starts_with('#') {
            out.push(t.to_string());
        }
    }
    out
}

#[test]
fn every_readme_recipe_runs_as_written() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    let lines = recipes(&readme);
    let bin = Path::new(env!("CARGO_BIN_EXE_zsum"));
    let scratch = tempfile::tempdir().unwrap();
    std::os::unix::fs::symlink(root.join("examples"), scratch.path().join("examples")).unwrap();
    let path = format!(
        "{}:{}",
        bin.parent().unwrap().display(),
        std::env::var("PATH").unwrap_or_default()
    );
    let mut ran = 0;
    for line in &lines {
        if line.starts_with("bash .ci/setup") {
            continue;
        }
        assert!(
            line.starts_with("zsum "),
            "a README recipe that is not a zsum command: {line}"
        );
        // bash with pipefail, so a documentation-style `a|b` alternative
        // list cannot pass as a pipeline.
        let out = Command::new("bash")
            .args(["-o", "pipefail", "-c", line])
            .current_dir(scratch.path())
            .env("PATH", &path)
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "README recipe failed (status {:?}): {line}\n{}",
            out.status.code(),
            String::from_utf8_lossy(&out.stderr)
        );
        ran += 1;
    }
    // The README carries dozens of recipes; make sure they were found.
    assert!(ran >= 30, "only {ran} recipes found");
}
