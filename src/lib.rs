//! Shaftline: propulsion motor trade studies for electric aircraft.
//! The engine is pure; storage, plots, exports and the web are consumers of its results.

/// The invented demo study shipped with the project.
pub mod demo;
/// The pure computational core: study format, models, mission integration, scoring.
pub mod engine;

/// The engine benchmark behind `shaftline bench`.
pub mod bench;
/// Command-line subcommands of the binary.
pub mod cli;
/// Engine subcommands of the binary: `score` and `bench`.
pub mod cli_engine;
/// Engine subcommands over design families and uncertainty: `sweep`, `robustness`.
pub mod cli_study;
/// Typed settings from flags and environment.
pub mod config;
/// CSV exports of results over any writer (pure; used by the web and the CLI).
pub mod export;
/// A bounded load test against a running server on loopback.
pub mod loadtest;
/// Plots of results as SVG strings (pure; used by the pages).
pub mod plots;
/// Password hashing and random tokens.
pub mod secrets;
/// First start: the admin account and the demo study.
pub mod setup;
/// SQLite storage of accounts and studies.
pub mod storage;
/// The web application: pages, forms and the JSON API.
pub mod web;
