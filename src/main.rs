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
    no_transparent_huge_pages();
    std::process::exit(cli::run());
}

/// Turns transparent huge pages off for this process. mimalloc asks for
/// them on the memory it reserves at start-up (before `main`, so its own
/// option comes too late), and then every first touch of that memory
/// zeroes a 2 MiB page: one word cost 43 MB and 90 ms instead of 24 MB and
/// 10 ms, a stream of a million tokens 99 MB instead of 76 MB, at the same
/// speed.
fn no_transparent_huge_pages() {
    #[cfg(target_os = "linux")]
    // SAFETY: PR_SET_THP_DISABLE takes one integer argument and changes
    // only how the kernel backs this process's future page faults; a
    // kernel without it returns an error, which changes nothing.
    unsafe {
        libc::prctl(libc::PR_SET_THP_DISABLE, 1, 0, 0, 0);
    }
}
