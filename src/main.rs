//! The `juncture` command line: a thin clap layer over the library.

mod cli;

/// The analysis makes many small, short-lived allocations (lattice nodes and
/// edges, rendered parts); mimalloc serves them faster than the system
/// allocator (see DEVELOPERS.md).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() {
    std::process::exit(cli::run());
}
