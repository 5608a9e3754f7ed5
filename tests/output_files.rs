//! `-o FILE` onto things that are not plain files: a symbolic link is
//! followed (the link stays a link), a device is written through and never
//! replaced, and a full device is an error with exit status 2.

mod common;

use common::run;
use std::os::unix::fs::FileTypeExt;
use std::process::Command;

const ARGS: [&str; 6] = ["sum", "rotor", "--B", "2", "--T", "300"];

#[test]
fn a_symlink_is_followed_and_stays_a_link() {
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("real.txt");
    std::fs::write(&target, "old").unwrap();
    let link = dir.path().join("link.txt");
    std::os::unix::fs::symlink(&target, &link).unwrap();
    let mut args = ARGS.to_vec();
    args.extend(["-o", link.to_str().unwrap()]);
    let out = run(&args);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(std::fs::symlink_metadata(&link)
        .unwrap()
        .file_type()
        .is_symlink());
    let text = std::fs::read_to_string(&target).unwrap();
    assert!(text.contains("rigid linear rotor"), "{text}");
}

#[test]
fn a_full_device_is_an_error_and_is_not_replaced() {
    // A node of the "full" character device (1, 7) made in a temporary
    // folder: every write to it fails with "no space left on device".
    let dir = tempfile::tempdir().unwrap();
    let node = dir.path().join("full");
    let made = Command::new("mknod")
        .args([node.to_str().unwrap(), "c", "1", "7"])
        .status()
        .map(|s| s.success())
        .unwrap_or(false);
    if !made {
        // Without the right to make device nodes, a FIFO with no reader
        // cannot stand in (opening it would block); say so and stop.
        eprintln!("mknod is not allowed here: the full-device case is not exercised");
        return;
    }
    let mut args = ARGS.to_vec();
    args.extend(["-o", node.to_str().unwrap()]);
    let out = run(&args);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("cannot write"), "{err}");
    let kind = std::fs::symlink_metadata(&node).unwrap().file_type();
    assert!(kind.is_char_device(), "the device node was replaced");
}

#[test]
fn a_directory_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let mut args = ARGS.to_vec();
    args.extend(["-o", dir.path().to_str().unwrap()]);
    let out = run(&args);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("is a directory"));
}

/// `-o` over a private (mode 600) file replaces its contents and keeps it
/// private: the permission bits survive the atomic rename.
#[cfg(unix)]
#[test]
fn overwriting_a_private_file_keeps_its_permission_bits() {
    use std::os::unix::fs::PermissionsExt;
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("private.csv");
    std::fs::write(&target, "old\n").unwrap();
    std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o600)).unwrap();
    let out = run(&[
        "levels",
        "rotor",
        "--B",
        "2",
        "--up-to",
        "10",
        "--format",
        "csv",
        "-o",
        target.to_str().unwrap(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let mode = std::fs::metadata(&target).unwrap().permissions().mode() & 0o777;
    assert_eq!(mode, 0o600, "mode {mode:o}");
    assert!(std::fs::read_to_string(&target)
        .unwrap()
        .starts_with("E (cm-1)"));
}
