//! The invented demo study (a fictional twin-motor electric trainer) shipped with Shaftline
//! and seeded on first start; the same file is served under `/static/demo/`.

/// The demo study file, `shaftline-study/1`.
pub const DEMO_STUDY_JSON: &str = include_str!("../static/demo/te2-trainer.study.json");
