//! The engine: pure computation, no I/O, no async, no clock, no randomness of its own.

/// Version of the engine's models; part of every result and of the result cache key.
pub const ENGINE_VERSION: &str = env!("CARGO_PKG_VERSION");
