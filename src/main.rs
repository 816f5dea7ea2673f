//! The `juncture` command line: a thin clap layer over the library.

mod cli;

/// The analysis makes many small, short-lived allocations (lattice nodes and
/// edges, rendered parts); mimalloc serves them faster than the system
/// allocator (see DEVELOPERS.md).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

/// mimalloc's `purge_delay` option (`mi_option_purge_delay` in mimalloc.h;
/// the Rust bindings have no name for it).
const MI_OPTION_PURGE_DELAY: libmimalloc_sys::mi_option_t = 15;

fn main() {
    // Keep freed memory instead of handing it back to the system after a
    // few milliseconds: a batch frees and reallocates the same lattice and
    // search tables for every input, and handing pages back made the
    // kernel zero them again each time (an eighth of a batch's time).
    // Peak memory is unchanged: the pages are reused, not added.
    // SAFETY: sets a global option of the allocator; any value is valid.
    unsafe { libmimalloc_sys::mi_option_set(MI_OPTION_PURGE_DELAY, -1) };
    std::process::exit(cli::run());
}
