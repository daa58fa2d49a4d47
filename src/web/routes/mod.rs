//! One router per feature, each built as a `Routes` registry; `web::app` merges them.

pub mod accounts;
pub mod api;
pub mod candidate;
pub mod common;
pub mod compare;
pub mod exports;
pub mod history;
pub mod import;
pub mod items;
pub mod registry;
pub mod reviews;
pub mod robustness;
pub mod studies;
pub mod study;
pub mod sweeps;
pub mod system;
pub mod trade;

pub use registry::Routes;
