//! The `zsum` command: parse, run, print; every error exits with status 2.

#![forbid(unsafe_code)]

mod cli;

fn main() {
    std::process::exit(cli::main());
}
