//! The compare page: every metric with its unit, the best value marked by the metric's
//! direction among feasible candidates, differences from the chosen baseline.

use axum::http::StatusCode;
use shaftline::engine::results::METRICS;
use shaftline::engine::{score_study, study::parse_study_str};
use shaftline::storage::studies::{Item, list_items};

use crate::helpers::spawn_app;

/// The text of the table row of `metric` in a compare page.
fn metric_row<'a>(body: &'a str, metric: &str) -> &'a str {
    let at = body
        .find(&format!("<tr id=\"m-{metric}\">"))
        .unwrap_or_else(|| panic!("row for {metric}"));
    let rest = &body[at..];
    &rest[..rest.find("</tr>").unwrap()]
}

#[tokio::test]
async fn compare_marks_the_lightest_feasible_candidate_and_shows_deltas() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let ids: Vec<i64> = list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap()
        .iter()
        .map(|r| r.id)
        .collect();
    let (a, b, c) = (ids[0], ids[1], ids[2]);
    let resp = app
        .get_compare(&vic, app.demo_id, &format!("?c={a}&c={b}&c={c}&base={b}"))
        .await;
    assert_eq!(resp.status, StatusCode::OK);
    for (name, unit) in METRICS {
        let row = metric_row(&resp.body, name);
        assert!(
            row.contains(&format!("<td>{unit}</td>")),
            "{name} has its unit"
        );
    }
    let results = score_study(&parse_study_str(shaftline::demo::DEMO_STUDY_JSON).unwrap());
    let three = &results.candidates[..3];
    let lightest = three
        .iter()
        .filter(|c| c.feasible)
        .min_by(|x, y| x.propulsion_mass_kg.total_cmp(&y.propulsion_mass_kg))
        .expect("a feasible candidate among the first three");
    let row = metric_row(&resp.body, "propulsion_mass_kg");
    let cells: Vec<&str> = row.split("<td class=\"num").skip(1).collect();
    let best: Vec<usize> = (0..3).filter(|i| cells[*i].starts_with(" best")).collect();
    let want = three.iter().position(|c| c.name == lightest.name).unwrap();
    assert_eq!(
        best,
        vec![want],
        "exactly the lightest feasible one is marked"
    );
    let delta = three[0].propulsion_mass_kg - three[1].propulsion_mass_kg;
    let shown = shaftline::web::routes::compare::fmt_value(delta);
    assert!(
        cells[0].contains(&format!(
            "class=\"delta\">{}{shown}<",
            if delta >= 0.0 { "+" } else { "" }
        )),
        "difference from the baseline: {}",
        cells[0]
    );
    assert!(
        !cells[1].contains("class=\"delta\""),
        "no difference on the baseline itself"
    );
    assert!(resp.body.contains("id=\"caution\"") && resp.body.contains("Engine version"));
}

#[tokio::test]
async fn one_candidate_is_not_a_comparison() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let id = list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap()[0]
        .id;
    let resp = app
        .get_compare(&vic, app.demo_id, &format!("?c={id}"))
        .await;
    assert_eq!(resp.status, StatusCode::OK);
    assert!(
        resp.body
            .contains("Choose 2 to 6 candidates to compare (1 chosen).")
    );
    assert!(!resp.body.contains("id=\"compare\""));
    let bad = app.get_compare(&vic, app.demo_id, "?c=x&c=2").await;
    assert_eq!(bad.status, StatusCode::BAD_REQUEST);
    assert!(bad.body.contains("c: must be a candidate id"));
}
