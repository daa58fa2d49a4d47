//! Shaftline: propulsion motor trade studies for electric aircraft.
//! The engine is pure; storage, plots, exports and the web are consumers of its results.

/// The invented demo study shipped with the project.
pub mod demo;
/// The pure computational core: study format, models, mission integration, scoring.
pub mod engine;
