//! The integration test binary: HTTP through `TestApp`, the real binary, a browser.

mod accounts;
mod api;
mod browser;
mod cli;
mod compare;
mod exports;
mod forms;
mod helpers;
mod import;
mod plots;
mod review_helpers;
mod reviews;
mod reviews_browser;
mod reviews_diff;
mod reviews_live;
mod robustness;
mod rows;
mod storage;
mod studies;
mod sweep_helpers;
mod sweeps;
mod trade;
