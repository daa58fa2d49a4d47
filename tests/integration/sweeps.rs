//! Design sweeps through the web: rows equal scoring each design alone, the progress
//! stream reaches 100 %, cancel stops the work, promote yields a candidate with the
//! row's results, and only editors with the session's token start, cancel or promote.

use std::time::Duration;

use shaftline::engine::evaluate::{StudyContext, evaluate};
use shaftline::engine::score_study;
use shaftline::engine::sweep::{Sweep, parse_axis};

use crate::helpers::{Session, TestApp, spawn_app};

/// A1 over 4 outer radii × 3 current densities: 12 designs, some feasible, some not.
const SMALL: [(&str, &str); 8] = [
    ("vary1", "outer_radius_m"),
    ("from1", "0.165"),
    ("to1", "0.18"),
    ("count1", "4"),
    ("vary2", "current_density_a_per_mm2"),
    ("from2", "3"),
    ("to2", "7"),
    ("count2", "3"),
];

/// One row of the job's CSV.
struct Row {
    values: Vec<f64>,
    feasible: bool,
    mass: f64,
    energy: f64,
}

fn rows_of(csv_text: &str, axes: usize) -> Vec<Row> {
    let mut r = csv::Reader::from_reader(csv_text.as_bytes());
    let head = r.headers().unwrap().clone();
    assert_eq!(
        head.len(),
        axes + 5,
        "one column per varied field: {head:?}"
    );
    r.records()
        .map(|rec| {
            let rec = rec.expect("CSV row parses");
            let num = |k: usize| rec[k].parse::<f64>().expect("number");
            Row {
                values: (1..=axes).map(num).collect(),
                feasible: rec[axes + 1].parse().expect("true/false"),
                mass: num(axes + 2),
                energy: num(axes + 3),
            }
        })
        .collect()
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(b.abs()).max(1.0)
}

async fn a1(app: &TestApp) -> (i64, i64) {
    (app.demo_id, app.candidate_row(app.demo_id, "A1").await)
}

async fn small_sweep(app: &TestApp, eve: &Session) -> (String, Vec<Row>) {
    let job = app.start_sweep(eve, a1(app).await, &SMALL).await;
    app.wait_for_sweep(eve, &job).await;
    let csv = app.get_sweep_rows(eve, &job).await;
    assert_eq!(csv.status, 200, "{}", csv.body);
    (job.clone(), rows_of(&csv.body, 2))
}

#[tokio::test]
async fn sweep_rows_equal_scoring_each_design_alone() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let (job, rows) = small_sweep(&app, &eve).await;
    let study = app.engine_study(app.demo_id).await;
    let base = study
        .candidates
        .iter()
        .find(|c| c.name.starts_with("A1"))
        .unwrap()
        .clone();
    let axes = vec![
        parse_axis("outer_radius_m=0.165:0.18:4").unwrap(),
        parse_axis("current_density_a_per_mm2=3:7:3").unwrap(),
    ];
    let sweep = Sweep::new(&study, &base.name, axes).unwrap();
    assert_eq!(rows.len(), 12, "every design of the grid has its row");
    let ctx = StudyContext::new(&study);
    for (i, row) in rows.iter().enumerate() {
        assert_eq!(row.values, sweep.values(i), "design #{} values", i + 1);
        let alone = evaluate(&ctx, &sweep.design(&base, i).unwrap());
        assert_eq!(
            row.feasible,
            alone.feasible,
            "design #{} feasibility",
            i + 1
        );
        assert!(
            close(row.mass, alone.propulsion_mass_kg),
            "design #{} mass {} vs {}",
            i + 1,
            row.mass,
            alone.propulsion_mass_kg
        );
        assert!(
            close(row.energy, alone.mission_energy_kwh),
            "design #{} energy {} vs {}",
            i + 1,
            row.energy,
            alone.mission_energy_kwh
        );
    }
    let page = app.get_sweep_page(&eve, &job).await;
    assert!(
        page.body.contains("id=\"plot-family\""),
        "family scatter on the page"
    );
    assert!(page.body.contains("Not for certification") && page.body.contains("Engine version"));
    assert!(
        page.body.contains("12 of 12 designs scored"),
        "counts shown"
    );
}

/// Reads server-sent events until `end`; returns the last progress data and the end data.
async fn follow(resp: &mut reqwest::Response) -> (serde_json::Value, serde_json::Value) {
    let (mut buf, mut last) = (String::new(), serde_json::Value::Null);
    loop {
        while let Some(at) = buf.find("\n\n") {
            let block: String = buf.drain(..at + 2).collect();
            let data = block
                .lines()
                .find_map(|l| l.strip_prefix("data: "))
                .unwrap_or("null");
            let data: serde_json::Value = serde_json::from_str(data).unwrap();
            if block.contains("event: progress") {
                last = data;
            } else if block.contains("event: end") {
                return (last, data);
            }
        }
        let chunk = resp
            .chunk()
            .await
            .expect("stream reads")
            .expect("stream stays open until end");
        buf.push_str(&String::from_utf8_lossy(&chunk));
    }
}

#[tokio::test]
async fn the_progress_stream_reaches_100_percent() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let job = app.start_sweep(&eve, a1(&app).await, &SMALL).await;
    let base = app.serve().await;
    let mut stream = reqwest::Client::new()
        .get(format!("{base}/sweeps/{job}/events"))
        .header("cookie", &eve.cookie)
        .send()
        .await
        .unwrap();
    assert_eq!(stream.status(), 200);
    let (last, end) = tokio::time::timeout(Duration::from_secs(120), follow(&mut stream))
        .await
        .expect("the stream ends within the bounded wait");
    assert_eq!(last["percent"], 100, "last progress: {last}");
    assert_eq!(
        (last["done"].as_u64(), last["total"].as_u64()),
        (Some(12), Some(12))
    );
    assert_eq!(end["state"], "finished");
}

#[tokio::test]
async fn cancel_stops_a_large_sweep_early() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let large = [
        ("vary1", "outer_radius_m"),
        ("from1", "0.10"),
        ("to1", "0.20"),
        ("count1", "200"),
        ("vary2", "inner_outer_ratio"),
        ("from2", "0.5"),
        ("to2", "0.7"),
        ("count2", "100"),
    ];
    let job = app.start_sweep(&eve, a1(&app).await, &large).await;
    let r = app.post_cancel_sweep(&eve, Some(&eve.csrf), &job).await;
    assert_eq!(r.status, 303, "{}", r.body);
    let page = app.wait_for_sweep(&eve, &job).await;
    assert!(
        page.body.contains("data-state=\"cancelled\""),
        "the job reports cancelled"
    );
    let rows = rows_of(&app.get_sweep_rows(&eve, &job).await.body, 2);
    assert!(
        rows.len() < 20_000,
        "cancelled early: {} of 20000 rows",
        rows.len()
    );
}

fn hidden(html: &str, name: &str) -> String {
    let marker = format!("name=\"{name}\" value=\"");
    let (_, rest) = html.split_once(&marker).expect("hidden field on the page");
    rest.split_once('"').unwrap().0.to_string()
}

#[tokio::test]
async fn a_promoted_design_scores_as_its_sweep_row() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let (job, rows) = small_sweep(&app, &eve).await;
    let page = app.get_sweep_page(&eve, &job).await.body;
    let (design, revision) = (hidden(&page, "design"), hidden(&page, "revision"));
    let form = [("design", design.as_str()), ("revision", revision.as_str())];
    let r = app.post_promote(&eve, Some(&eve.csrf), &job, &form).await;
    assert_eq!(r.status, 303, "{}", r.body);
    assert!(
        r.location()
            .starts_with(&format!("/studies/{}/candidates/", app.demo_id))
    );
    let n: usize = design.parse().unwrap();
    let scored = score_study(&app.engine_study(app.demo_id).await);
    let promoted = scored
        .candidates
        .iter()
        .find(|c| c.name.ends_with(&format!(" sweep #{n}")))
        .expect("promoted candidate stored");
    let stored = app.get(r.location(), Some(&eve)).await;
    assert!(
        stored.body.contains(&format!(" sweep #{n}")),
        "the candidate page opens"
    );
    let (_, doc) = shaftline::storage::studies::load_doc(&app.db, app.demo_id)
        .await
        .unwrap();
    let body = doc.candidates.last().unwrap();
    assert_eq!(
        body["source"]["mode"], "geometry",
        "a varied size promotes in geometry mode"
    );
    let row = &rows[n - 1];
    assert_eq!(promoted.feasible, row.feasible);
    assert!(
        close(promoted.propulsion_mass_kg, row.mass),
        "{} vs {}",
        promoted.propulsion_mass_kg,
        row.mass
    );
    assert!(
        close(promoted.mission_energy_kwh, row.energy),
        "{} vs {}",
        promoted.mission_energy_kwh,
        row.energy
    );

    let before = app.engine_study(app.demo_id).await.candidates.len();
    let again = app.post_promote(&eve, Some(&eve.csrf), &job, &form).await;
    assert_eq!(
        again.status, 400,
        "a design is promoted once: {}",
        again.body
    );
    assert!(again.body.contains("is used twice"), "{}", again.body);
    let other = if n == 1 { "2" } else { "1" };
    let old_page = [("design", other), ("revision", revision.as_str())];
    let stale = app
        .post_promote(&eve, Some(&eve.csrf), &job, &old_page)
        .await;
    assert_eq!(
        stale.status, 409,
        "a stale revision is refused: {}",
        stale.body
    );
    let out_of_range = [("design", "13"), ("revision", revision.as_str())];
    let bad = app
        .post_promote(&eve, Some(&eve.csrf), &job, &out_of_range)
        .await;
    assert_eq!(bad.status, 400);
    assert!(
        bad.body
            .contains("design: must be a whole number from 1 to 12"),
        "{}",
        bad.body
    );
    assert_eq!(
        app.engine_study(app.demo_id).await.candidates.len(),
        before,
        "nothing more stored"
    );
}

#[tokio::test]
async fn only_editors_with_the_token_start_cancel_or_promote() {
    let app = spawn_app().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    let at = a1(&app).await;
    let viewer = app
        .post_start_sweep(&vic, Some(&vic.csrf), at, &SMALL)
        .await;
    assert_eq!(viewer.status, 403, "a viewer cannot start a sweep");
    let forged = app.post_start_sweep(&eve, None, at, &SMALL).await;
    assert_eq!(forged.status, 403, "no token, no sweep");
    let (job, _) = small_sweep(&app, &eve).await;
    let watch = app.get_sweep_page(&vic, &job).await;
    assert_eq!(watch.status, 200, "a viewer watches");
    assert!(
        !watch.body.contains("/promote"),
        "no promote button for a viewer"
    );
    for (who, csrf, what) in [
        (&vic, Some(vic.csrf.as_str()), "viewer"),
        (&eve, None, "no token"),
    ] {
        assert_eq!(
            app.post_cancel_sweep(who, csrf, &job).await.status,
            403,
            "cancel: {what}"
        );
        let form = [("design", "1"), ("revision", "1")];
        assert_eq!(
            app.post_promote(who, csrf, &job, &form).await.status,
            403,
            "promote: {what}"
        );
    }
    let form = app.get_sweep_form(&vic, at.0, at.1).await;
    assert!(
        form.status == 200 && !form.body.contains("id=\"sweep-form\""),
        "viewers see no start form"
    );
}

/// Where a sweep is started, its form rows, and what the refusal must say.
type Case<'a> = ((i64, i64), [(&'a str, &'a str); 4], &'a str);

#[tokio::test]
async fn bad_sweep_input_is_refused_naming_the_field() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let at = a1(&app).await;
    let ds = (app.demo_id, app.candidate_row(app.demo_id, "DS-1").await);
    let cases: [Case; 4] = [
        (
            at,
            [
                ("vary1", "outer_radius_m"),
                ("from1", "0.1"),
                ("to1", "0.2"),
                ("count1", "0"),
            ],
            "vary.outer_radius_m",
        ),
        (
            at,
            [
                ("vary1", "outer_radius_m"),
                ("from1", "9"),
                ("to1", "10"),
                ("count1", "3"),
            ],
            "FROM and TO must lie from",
        ),
        (
            at,
            [
                ("vary1", "bore_diameter_m"),
                ("from1", "0.1"),
                ("to1", "0.2"),
                ("count1", "3"),
            ],
            "does not apply",
        ),
        (
            ds,
            [
                ("vary1", "pole_pairs"),
                ("from1", "4"),
                ("to1", "8"),
                ("count1", "3"),
            ],
            "sweeps need a radial_sizing or axial_sizing candidate",
        ),
    ];
    for (target, pairs, want) in cases {
        let r = app
            .post_start_sweep(&eve, Some(&eve.csrf), target, &pairs)
            .await;
        assert_eq!(r.status, 400, "{pairs:?}");
        assert!(
            r.body.contains(want),
            "{pairs:?}: wants '{want}' in {}",
            r.body
        );
        assert!(r.body.contains("Nothing was started"), "{pairs:?}");
    }
}
