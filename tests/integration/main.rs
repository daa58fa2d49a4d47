//! The integration test binary: HTTP through `TestApp`, the real binary, a browser.

mod accounts;
mod api;
mod audit;
mod authz;
mod backup;
mod binary;
mod browser;
mod cli;
mod compare;
mod crash;
mod exports;
mod forms;
mod hardening;
mod helpers;
mod import;
mod load;
mod rows;
mod secrets_log;
mod storage;
mod studies;
