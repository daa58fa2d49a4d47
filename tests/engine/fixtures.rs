//! Shared fixtures: the demo study and small builders.

use shaftline::engine::study::{self, Study};

pub fn demo_value() -> serde_json::Value {
    serde_json::from_str(shaftline::demo::DEMO_STUDY_JSON).expect("demo JSON")
}

pub fn demo() -> Study {
    study::parse_study_str(shaftline::demo::DEMO_STUDY_JSON).expect("the demo study is valid")
}

pub fn parse(v: &serde_json::Value) -> Study {
    study::parse_study(v).unwrap_or_else(|e| panic!("study should parse: {e}"))
}
