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
mod rows;
mod storage;
mod studies;
mod trade;
