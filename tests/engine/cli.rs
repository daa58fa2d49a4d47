//! `shaftline score` from the command line.

use std::process::Command;

fn shaftline() -> Command {
    Command::new(env!("CARGO_BIN_EXE_shaftline"))
}

fn demo_path() -> String {
    format!(
        "{}/static/demo/te2-trainer.study.json",
        env!("CARGO_MANIFEST_DIR")
    )
}

#[test]
fn scoring_the_demo_prints_result_json_and_exits_zero() {
    let out = shaftline().args(["score", &demo_path()]).output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["format"], "shaftline-results/1");
    assert_eq!(v["candidates"].as_array().unwrap().len(), 7);
    assert_eq!(v["engine_version"], shaftline::engine::ENGINE_VERSION);
}

#[test]
fn a_bad_file_exits_two_with_the_json_path_on_stderr() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bad.json");
    let mut v: serde_json::Value = serde_json::from_str(shaftline::demo::DEMO_STUDY_JSON).unwrap();
    v["segments"][2]["power"]["tas_m_s"] = serde_json::json!(-5);
    std::fs::write(&path, v.to_string()).unwrap();
    let out = shaftline()
        .args(["score", path.to_str().unwrap()])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.starts_with("error: segments[2].power.tas_m_s: must be > 0"),
        "{err}"
    );
    assert!(out.stdout.is_empty());
}

#[test]
fn csv_output_has_one_row_per_candidate_under_metric_named_columns() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("summary.csv");
    let out = shaftline()
        .args([
            "score",
            &demo_path(),
            "--format",
            "csv",
            "--out",
            out_path.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let mut reader = csv::Reader::from_path(&out_path).unwrap();
    let header: Vec<String> = reader.headers().unwrap().iter().map(String::from).collect();
    for col in [
        "name",
        "feasible",
        "motor_mass_kg",
        "propulsion_mass_kg",
        "mission_energy_kwh",
        "takeoff_mass_kg",
        "peak_winding_temp_c",
    ] {
        assert!(header.contains(&col.to_string()), "missing column {col}");
    }
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 7);
    let mass = header.iter().position(|h| h == "motor_mass_kg").unwrap();
    for r in &rows {
        let m: f64 = r[mass].parse().unwrap();
        assert!(m > 0.0);
    }
}

#[test]
fn sweep_prints_one_row_per_design_in_grid_order() {
    let out = shaftline()
        .args([
            "sweep",
            &demo_path(),
            "--candidate",
            "A1 axial double rotor, direct oil",
        ])
        .args([
            "--vary",
            "outer_radius_m=0.10:0.20:3",
            "--vary",
            "inner_outer_ratio=0.5:0.7:2",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(
        String::from_utf8_lossy(&out.stderr).contains("100 %"),
        "progress on stderr"
    );
    let mut reader = csv::Reader::from_reader(&out.stdout[..]);
    let header: Vec<String> = reader.headers().unwrap().iter().map(String::from).collect();
    assert_eq!(
        &header[..4],
        ["design", "outer_radius_m", "inner_outer_ratio", "feasible"]
    );
    assert!(header.contains(&"propulsion_mass_kg".to_string()));
    let rows: Vec<csv::StringRecord> = reader.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 6);
    let grid: Vec<(f64, f64)> = rows
        .iter()
        .map(|r| (r[1].parse().unwrap(), r[2].parse().unwrap()))
        .collect();
    let want = [
        (0.1, 0.5),
        (0.1, 0.7),
        (0.15, 0.5),
        (0.15, 0.7),
        (0.2, 0.5),
        (0.2, 0.7),
    ];
    for (g, w) in grid.iter().zip(want) {
        assert!(
            (g.0 - w.0).abs() < 1e-12 && (g.1 - w.1).abs() < 1e-12,
            "{grid:?}"
        );
    }
}

#[test]
fn a_bad_sweep_field_exits_two_naming_it() {
    let out = shaftline()
        .args([
            "sweep",
            &demo_path(),
            "--candidate",
            "A1 axial double rotor, direct oil",
            "--vary",
            "outer_radius_m=0.3:0.1:4",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).starts_with("error: vary.outer_radius_m: "));
}

#[test]
fn robustness_with_a_seed_is_reproducible() {
    let run = |seed: &str| {
        shaftline()
            .args(["robustness", &demo_path(), "--samples", "8", "--seed", seed])
            .output()
            .unwrap()
    };
    let (a, b) = (run("5"), run("5"));
    assert!(a.status.success());
    assert_eq!(a.stdout, b.stdout);
    let mut reader = csv::Reader::from_reader(&a.stdout[..]);
    assert_eq!(reader.records().count(), 7);
}
