//! The engine: pure computation, no I/O, no async, no clock, no randomness of its own.
//! Given a study it returns results; everything else in Shaftline is a view of them.

mod assume;
pub mod atmosphere;
pub mod axial;
pub mod bound;
pub mod checks;
pub mod closure;
pub mod datasheet;
pub mod error;
pub mod evaluate;
pub mod fly;
pub mod inspect;
pub mod materials;
pub mod mission;
pub mod motor;
pub mod nnls;
pub mod objectives;
pub mod pareto;
mod parse;
mod parse_datasheet;
pub mod radial;
pub mod reader;
mod report;
pub mod results;
pub mod robust;
pub mod score;
mod search;
mod simd;
pub mod sized;
pub mod sizing;
pub mod steel;
pub mod study;
pub mod sweep;
pub mod thermal;
mod validate;

pub use score::{objectives as study_objectives, score_study};

/// Version of the engine's models; part of every result and of the result cache key.
pub const ENGINE_VERSION: &str = env!("CARGO_PKG_VERSION");
