//! The `juncture` command line: a thin clap layer over the library.

mod cli;

fn main() {
    std::process::exit(cli::run());
}
