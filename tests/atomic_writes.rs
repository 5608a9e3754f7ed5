//! Every file zsum writes goes through one atomic write: a failed or
//! interrupted write leaves the file that was there whole (and a failed one
//! leaves no temporary behind), and a replaced file keeps its permission
//! bits, whether it is text, an SVG or PNG figure, or a report file.

use std::path::Path;
use zsum::export::{write_atomic, write_atomic_bytes};
use zsum::ErrorKind;

/// The names in `dir`, sorted.
fn entries(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().to_string())
        .collect();
    v.sort();
    v
}

#[cfg(unix)]
fn mode(path: &Path) -> u32 {
    use std::os::unix::fs::PermissionsExt;
    std::fs::metadata(path).unwrap().permissions().mode() & 0o777
}

#[cfg(unix)]
fn set_mode(path: &Path, mode: u32) {
    use std::os::unix::fs::PermissionsExt;
    std::fs::set_permissions(path, std::fs::Permissions::from_mode(mode)).unwrap();
}

#[test]
fn bytes_are_written_whole_and_nothing_else_is_left() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("raw.bin");
    let bytes: Vec<u8> = (0..=255u8).cycle().take(70_000).collect();
    write_atomic_bytes(&path, &bytes).unwrap();
    assert_eq!(std::fs::read(&path).unwrap(), bytes);
    // Replaced by shorter contents: no tail of the old file survives.
    write_atomic_bytes(&path, b"\x00\xffshort").unwrap();
    assert_eq!(std::fs::read(&path).unwrap(), b"\x00\xffshort");
    write_atomic(&path, "text\n").unwrap();
    assert_eq!(std::fs::read_to_string(&path).unwrap(), "text\n");
    assert_eq!(entries(dir.path()), ["raw.bin"]);
}

/// The temporary file's name is longer than the target's, so a target
/// name of 250 bytes (allowed) leaves no room for it (at most 255): the
/// write fails before anything is written. The old file is untouched and
/// nothing else appears.
#[test]
fn a_failed_write_leaves_the_old_file_whole_and_no_temporary() {
    let dir = tempfile::tempdir().unwrap();
    let name = format!("{}.csv", "n".repeat(246));
    let path = dir.path().join(&name);
    std::fs::write(&path, "old contents\n").unwrap();
    let e = write_atomic_bytes(&path, &[b'x'; 10_000]).unwrap_err();
    assert_eq!(e.kind(), ErrorKind::Io);
    assert!(e.message().contains("cannot write"), "{e}");
    assert!(e.message().contains(&name), "{e}");
    assert_eq!(std::fs::read_to_string(&path).unwrap(), "old contents\n");
    assert_eq!(entries(dir.path()), [name]);
    // A folder that does not exist: an error naming the path, nothing made.
    let nowhere = dir.path().join("missing").join("out.png");
    let e = write_atomic_bytes(&nowhere, b"png").unwrap_err();
    assert_eq!(e.kind(), ErrorKind::Io);
    assert!(e.message().contains("out.png"), "{e}");
    assert!(!dir.path().join("missing").exists());
    // A folder in the way is refused, not replaced.
    let sub = dir.path().join("sub");
    std::fs::create_dir(&sub).unwrap();
    let e = write_atomic_bytes(&sub, b"png").unwrap_err();
    assert!(e.message().contains("is a directory"), "{e}");
    assert!(sub.is_dir());
}

#[cfg(unix)]
#[test]
fn a_replaced_file_keeps_its_mode() {
    let dir = tempfile::tempdir().unwrap();
    for (name, m) in [
        ("private.txt", 0o600),
        ("group.txt", 0o640),
        ("exec.sh", 0o751),
    ] {
        let path = dir.path().join(name);
        std::fs::write(&path, "old").unwrap();
        set_mode(&path, m);
        write_atomic_bytes(&path, b"new contents").unwrap();
        assert_eq!(mode(&path), m, "{name}: mode {:o}", mode(&path));
        assert_eq!(std::fs::read(&path).unwrap(), b"new contents");
    }
    assert_eq!(entries(dir.path()).len(), 3);
}

#[cfg(all(unix, feature = "plot"))]
mod figures {
    use super::*;
    use zsum::classical::{Classical, Quantity};
    use zsum::plot::{png_bytes, render_png, render_svg, write_svg, Panel, Series};
    use zsum::report::figure::{self, PANEL_HEIGHT, WIDTH};
    use zsum::report::CompareReport;

    fn panel() -> Vec<Panel> {
        vec![Panel {
            title: "a parabola".into(),
            x_label: "x".into(),
            y_label: "x²".into(),
            series: vec![Series {
                name: "x²".into(),
                points: (0..50).map(|i| (i as f64, (i * i) as f64)).collect(),
                ..Series::default()
            }],
            ..Panel::default()
        }]
    }

    fn rotor_map() -> CompareReport {
        let one = zsum::exact::parse_rational("1").unwrap();
        let rotor =
            zsum::models::rotor::LinearRotor::rigid(one, zsum::units::EnergyUnit::Kelvin).unwrap();
        let c = Classical::new(&rotor).unwrap();
        let grid = zsum::thermo::parse_grid("--T", "log:0.1:100:9").unwrap();
        CompareReport::build(
            &c,
            &[0, 1],
            &grid,
            true,
            6,
            &zsum::budget::Meter::unlimited(),
        )
        .unwrap()
    }

    #[test]
    fn figures_replace_a_file_keeping_its_mode() {
        let dir = tempfile::tempdir().unwrap();
        let svg = dir.path().join("f.svg");
        let png = dir.path().join("f.png");
        for p in [&svg, &png] {
            std::fs::write(p, "old").unwrap();
            set_mode(p, 0o600);
        }
        write_svg(&panel(), 640, 300, &svg).unwrap();
        render_png(&panel(), 640, 300, &png).unwrap();
        assert_eq!((mode(&svg), mode(&png)), (0o600, 0o600));
        assert_eq!(
            std::fs::read_to_string(&svg).unwrap(),
            render_svg(&panel(), 640, 300).unwrap()
        );
        // The PNG written is exactly the one encoded in memory.
        let bytes = std::fs::read(&png).unwrap();
        assert_eq!(bytes, png_bytes(&panel(), 640, 300).unwrap());
        assert_eq!(&bytes[bytes.len() - 8..bytes.len() - 4], b"IEND");

        // The error map's figure, as `zsum compare --plot` writes it.
        let report = rotor_map();
        let map_png = dir.path().join("map.png");
        std::fs::write(&map_png, "old").unwrap();
        set_mode(&map_png, 0o640);
        figure::write(&report, Quantity::Cv, 0.01, &map_png).unwrap();
        assert_eq!(mode(&map_png), 0o640);
        let bytes = std::fs::read(&map_png).unwrap();
        assert_eq!(
            bytes,
            png_bytes(
                &figure::panels(&report, Quantity::Cv, 0.01),
                WIDTH,
                PANEL_HEIGHT
            )
            .unwrap()
        );
        assert_eq!(entries(dir.path()), ["f.png", "f.svg", "map.png"]);
    }

    #[test]
    fn a_failed_figure_write_leaves_the_old_file() {
        let dir = tempfile::tempdir().unwrap();
        let name = format!("{}.png", "p".repeat(246));
        let path = dir.path().join(&name);
        std::fs::write(&path, "old").unwrap();
        let e = figure::write(&rotor_map(), Quantity::Cv, 0.01, &path).unwrap_err();
        assert_eq!(e.kind(), ErrorKind::Io);
        let e = render_png(&panel(), 640, 300, &path).unwrap_err();
        assert_eq!(e.kind(), ErrorKind::Io);
        assert_eq!(std::fs::read_to_string(&path).unwrap(), "old");
        assert_eq!(entries(dir.path()), [name]);
    }

    #[test]
    fn report_files_replace_old_ones_keeping_their_mode() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("rep");
        std::fs::create_dir(&out).unwrap();
        let index = out.join("index.html");
        std::fs::write(&index, "old").unwrap();
        set_mode(&index, 0o600);
        let summary = zsum::report::liquefier::write_report(&out).unwrap();
        assert_eq!(summary.files.len(), 4);
        assert_eq!(mode(&index), 0o600);
        let html = std::fs::read_to_string(&index).unwrap();
        assert!(html.starts_with("<!DOCTYPE html>"));
        assert!(html.trim_end().ends_with("</html>"));
        assert_eq!(
            entries(&out),
            [
                "hydrogen.csv",
                "index.html",
                "species_298K.csv",
                "summary.txt"
            ]
        );
    }
}

/// The binary, its file size limited to a few KiB (`ulimit -f`) so that a write
/// is cut off part way: the process is stopped by the signal for an
/// oversized file, or its write fails. Either way the file that was at the
/// target is still whole; a failed write (the process not killed) also
/// leaves no temporary file.
#[cfg(all(unix, feature = "cli", feature = "plot"))]
mod interrupted {
    use super::*;
    use std::os::unix::process::ExitStatusExt;

    /// Runs zsum with at most `blocks` blocks of the shell's `ulimit -f`
    /// (512 bytes or 1 KiB) per written file, and no core file.
    fn limited(blocks: u32, args: &[&str]) -> std::process::ExitStatus {
        std::process::Command::new("sh")
            .arg("-c")
            .arg(format!(
                "ulimit -c 0; ulimit -f {blocks}; exec \"$0\" \"$@\""
            ))
            .arg(env!("CARGO_BIN_EXE_zsum"))
            .args(args)
            .output()
            .expect("sh runs")
            .status
    }

    fn check(dir: &Path, target: &str, args: &[&str]) {
        let path = dir.join(target);
        std::fs::write(&path, "old\n").unwrap();
        let status = limited(4, args);
        assert!(!status.success(), "{args:?} finished under a 4-block limit");
        assert_eq!(
            std::fs::read_to_string(&path).unwrap(),
            "old\n",
            "{args:?} left a partial {target}"
        );
        let others: Vec<String> = entries(dir).into_iter().filter(|n| n != target).collect();
        if status.signal().is_some() {
            // Killed mid-write: at most its own temporary file remains.
            assert!(
                others
                    .iter()
                    .all(|n| n.starts_with(&format!(".{target}.zsum-tmp-"))),
                "{others:?}"
            );
        } else {
            assert_eq!(status.code(), Some(2), "{args:?}");
            assert!(others.is_empty(), "{others:?}");
        }
        for n in others {
            std::fs::remove_file(dir.join(n)).unwrap();
        }
    }

    #[test]
    fn an_interrupted_write_leaves_the_old_file_whole() {
        let dir = tempfile::tempdir().unwrap();
        let folder = |name: &str| {
            let d = dir.path().join(name);
            std::fs::create_dir(&d).unwrap();
            d
        };
        // A PNG figure (bytes), an `-o` table (text), the report's page.
        let fig = folder("fig");
        let png = fig.join("fig.png");
        check(
            &fig,
            "fig.png",
            &[
                "compare",
                "rotor",
                "--B",
                "1",
                "--unit",
                "K",
                "--T",
                "log:0.1:100:9",
                "--plot",
                png.to_str().unwrap(),
            ],
        );
        let out = folder("out");
        let table = out.join("levels.txt");
        check(
            &out,
            "levels.txt",
            &[
                "levels",
                "box",
                "--up-to",
                "3000",
                "-o",
                table.to_str().unwrap(),
            ],
        );
        let rep = folder("rep");
        check(
            &rep,
            "index.html",
            &["report", "--out", rep.to_str().unwrap()],
        );
    }
}
