//! Engine tests against published check values (each names its source), physical
//! identities, the demo study, bad input, random studies and the `score` command line.

/// `assert_close!(got, want, rel = 1e-6)`: relative tolerance against |want|.
macro_rules! assert_close {
    ($got:expr, $want:expr, rel = $rel:expr) => {{
        let (got, want): (f64, f64) = ($got, $want);
        let err = (got - want).abs() / want.abs().max(1e-300);
        assert!(
            err <= $rel,
            "{} = {got}, want {want} (relative error {err:e} > {})",
            stringify!($got),
            $rel
        );
    }};
    ($got:expr, $want:expr, abs = $abs:expr) => {{
        let (got, want): (f64, f64) = ($got, $want);
        assert!(
            (got - want).abs() <= $abs,
            "{} = {got}, want {want} ± {}",
            stringify!($got),
            $abs
        );
    }};
}

mod atmosphere;
mod bad_input;
mod cli;
mod demo;
mod fixtures;
mod flight;
mod machines;
mod materials;
mod properties;
mod sweeps;
mod thermal;
