//! CSV exports: the demo's summary against its golden file, every result field in a
//! column, and the downloads read back through a CSV parser to the engine's numbers.

use std::collections::BTreeSet;

use axum::http::{StatusCode, header};
use serde_json::Value;
use shaftline::engine::results::StudyResults;
use shaftline::engine::{score_study, study::parse_study_str};
use shaftline::export::{SEGMENT_COLUMNS, summary_columns, write_summary_csv};

use crate::helpers::spawn_app;

const GOLDEN: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/demo-summary.csv");
/// Relative tolerance of the golden comparison of numeric cells: far below any change
/// of a model, above the last-digit noise of floating-point maths between platforms.
const GOLDEN_REL_TOL: f64 = 1e-9;

fn demo_results() -> StudyResults {
    score_study(&parse_study_str(shaftline::demo::DEMO_STUDY_JSON).unwrap())
}

fn records(text: &str) -> (Vec<String>, Vec<Vec<String>>) {
    let mut r = csv::Reader::from_reader(text.as_bytes());
    let header = r.headers().unwrap().iter().map(String::from).collect();
    let rows = r
        .records()
        .map(|rec| rec.unwrap().iter().map(String::from).collect())
        .collect();
    (header, rows)
}

fn same_cell(got: &str, want: &str) -> bool {
    match (got.parse::<f64>(), want.parse::<f64>()) {
        (Ok(g), Ok(w)) => (g - w).abs() <= GOLDEN_REL_TOL * w.abs().max(1e-12),
        _ => got == want,
    }
}

#[test]
fn the_demo_summary_matches_its_golden_file() {
    let mut out = Vec::new();
    write_summary_csv(&demo_results(), &mut out).unwrap();
    let text = String::from_utf8(out).unwrap();
    if std::env::var("SHAFTLINE_UPDATE_GOLDEN").is_ok_and(|v| v == "1") {
        std::fs::write(GOLDEN, &text).unwrap();
        panic!(
            "{GOLDEN} rewritten: review its diff, then run the test again without SHAFTLINE_UPDATE_GOLDEN"
        );
    }
    let golden = std::fs::read_to_string(GOLDEN).expect("golden file present");
    let (got_head, got) = records(&text);
    let (want_head, want) = records(&golden);
    assert_eq!(got_head, want_head, "header row");
    assert_eq!(got.len(), want.len(), "one row per candidate");
    for (g, w) in got.iter().zip(&want) {
        for ((col, gc), wc) in got_head.iter().zip(g).zip(w) {
            assert!(
                same_cell(gc, wc),
                "{} / {col}: got '{gc}', golden '{wc}'",
                w[0]
            );
        }
    }
}

fn scalar_keys(v: &Value) -> BTreeSet<String> {
    v.as_object()
        .unwrap()
        .iter()
        .filter(|(_, x)| !x.is_object() && !x.is_array())
        .map(|(k, _)| k.clone())
        .collect()
}

#[test]
fn every_scalar_result_field_has_a_column() {
    let json = serde_json::to_value(demo_results()).unwrap();
    let cand = &json["candidates"][0];
    let columns: BTreeSet<String> = summary_columns().iter().map(|s| s.to_string()).collect();
    let missing: Vec<_> = scalar_keys(cand).difference(&columns).cloned().collect();
    assert!(missing.is_empty(), "summary.csv lacks {missing:?}");
    let seg_columns: BTreeSet<String> = SEGMENT_COLUMNS.iter().map(|s| s.to_string()).collect();
    assert_eq!(
        scalar_keys(&cand["segments"][0]),
        seg_columns,
        "segments.csv has exactly the segment-row fields"
    );
}

#[tokio::test]
async fn summary_csv_reads_back_to_the_engine_numbers() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let resp = app.get_download(&vic, app.demo_id, "summary.csv").await;
    assert_eq!(resp.status, StatusCode::OK);
    assert_eq!(
        resp.headers[header::CONTENT_TYPE],
        "text/csv; charset=utf-8"
    );
    assert!(
        !resp.body.lines().any(|l| l.starts_with('#')),
        "no comment lines"
    );
    assert!(resp.body.contains("\r\n"), "RFC 4180 line ends");
    let (head, rows) = records(&resp.body);
    assert_eq!(head, summary_columns());
    let want = demo_results();
    assert_eq!(rows.len(), want.candidates.len());
    let col = |name: &str| head.iter().position(|h| h == name).unwrap();
    for (row, c) in rows.iter().zip(&want.candidates) {
        assert_eq!(
            row[col("name")],
            c.name,
            "names with commas survive quoting"
        );
        let mass: f64 = row[col("motor_mass_kg")].parse().unwrap();
        assert_eq!(mass, c.motor_mass_kg, "{}: exact number", c.name);
        let energy = &row[col("energy_margin_kwh")];
        assert_eq!(
            energy.is_empty(),
            c.energy_margin_kwh.is_none(),
            "null is blank"
        );
        let msgs: Vec<_> = c.violations.iter().map(|v| v.message.clone()).collect();
        assert_eq!(row[col("violations")], msgs.join("; "));
        assert_eq!(row[col("feasible")], c.feasible.to_string());
    }
}

#[tokio::test]
async fn segment_csvs_hold_one_row_per_candidate_and_segment() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let want = demo_results();
    for (file, oei) in [("segments.csv", false), ("oei_segments.csv", true)] {
        let resp = app.get_download(&vic, app.demo_id, file).await;
        assert_eq!(resp.status, StatusCode::OK, "{file}");
        let (head, rows) = records(&resp.body);
        assert_eq!(
            &head[..3],
            ["candidate", "segment", "segment_kind"],
            "{file}"
        );
        let expected: Vec<(String, String, f64)> = want
            .candidates
            .iter()
            .flat_map(|c| {
                let segs = if oei { &c.oei_segments } else { &c.segments };
                segs.iter()
                    .map(|s| (c.name.clone(), s.name.clone(), s.motor_torque_nm))
            })
            .collect();
        assert!(!expected.is_empty(), "{file}: the demo has rows");
        let torque = head.iter().position(|h| h == "motor_torque_nm").unwrap();
        let got: Vec<(String, String, f64)> = rows
            .iter()
            .map(|r| (r[0].clone(), r[1].clone(), r[torque].parse().unwrap()))
            .collect();
        assert_eq!(got, expected, "{file}");
    }
}

#[tokio::test]
async fn downloads_need_a_signed_in_user() {
    let app = spawn_app().await;
    let resp = app
        .get(&format!("/studies/{}/summary.csv", app.demo_id), None)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    assert!(resp.location().starts_with("/login"));
}
