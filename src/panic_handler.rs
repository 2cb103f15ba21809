//! The panic handler of `no_std` builds with the `panic-handler` feature.
//!
//! A C firmware cannot write a Rust panic handler, so the static library
//! carries this one. flatray is panic-free by construction (clippy denies
//! `unwrap`, `expect`, `panic!` and unchecked indexing in library code, and the
//! fuzzers confirm it), so this is never reached; if it ever were, it parks the
//! core rather than returning into undefined state.

#[panic_handler]
fn on_panic(_info: &core::panic::PanicInfo<'_>) -> ! {
    loop {
        core::hint::spin_loop();
    }
}
