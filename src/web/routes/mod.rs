//! One router per feature; `web::app` merges them.

pub mod accounts;
pub mod api;
pub mod candidate;
pub mod common;
pub mod compare;
pub mod exports;
pub mod import;
pub mod items;
pub mod reviews;
pub mod robustness;
pub mod studies;
pub mod study;
pub mod sweeps;
pub mod system;
pub mod trade;
