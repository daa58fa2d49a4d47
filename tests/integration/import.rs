//! Importing datasheet candidates from CSV: the template imports as it stands, and one
//! bad row means nothing is imported and every bad row is listed by line and column.

use axum::http::StatusCode;
use shaftline::storage::studies::{Item, list_items};

use crate::helpers::{TestApp, spawn_app};

const HEADER: &str = "name,gear_ratio,topology,mass_kg,continuous_power_kw,continuous_speed_rpm,\
peak_power_kw,peak_duration_s,max_speed_rpm,continuous_efficiency";

async fn candidate_count(app: &TestApp) -> usize {
    list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap()
        .len()
}

#[tokio::test]
async fn the_downloaded_template_imports_as_one_candidate() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let template = app.get_candidate_template(&eve).await;
    assert_eq!(template.status, StatusCode::OK);
    assert!(
        template
            .body
            .starts_with("name,gear_ratio,topology,mass_kg")
    );
    let before = candidate_count(&app).await;
    let resp = app
        .post_import_candidates(&eve, app.demo_id, &template.body)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let rows = list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap();
    assert_eq!(rows.len(), before + 1);
    let body = rows.last().unwrap().json().unwrap();
    assert_eq!(body["source"]["kind"], "datasheet");
    assert_eq!(body["source"]["mass_kg"].as_f64(), Some(20.0));
    assert_eq!(body["drive"]["gear_ratio"].as_f64(), Some(1.0));
}

#[tokio::test]
async fn one_bad_row_imports_nothing_and_every_bad_row_is_listed() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let csv = format!(
        "{HEADER}\n\
         \"M1, good\",1,radial,20,50,2400,100,120,3000,0.95\n\
         M2 negative mass,1,axial,-3,50,2400,100,120,3000,0.95\n\
         M3 good,1,axial,18,55,2400,105,90,3200,0.955\n\
         M4 words,1,radial,heavy,50,2400,100,120,3000,0.95\n"
    );
    let before = candidate_count(&app).await;
    let resp = app.post_import_candidates(&eve, app.demo_id, &csv).await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(candidate_count(&app).await, before, "nothing imported");
    assert!(resp.body.contains("Nothing was imported"));
    let table = &resp.body[resp.body.find("id=\"import-errors\"").expect("error table")..];
    assert!(
        table.contains("<td class=\"num\">3</td><td>mass_kg</td>")
            && table.contains("source.mass_kg: must be &#62; 0"),
        "line 3, its column and the range: {table}"
    );
    assert!(
        table.contains("<td class=\"num\">5</td><td>mass_kg</td>")
            && table.contains("must be a number (got &#39;heavy&#39;)"),
        "line 5 listed too: {table}"
    );
    assert!(
        resp.body.contains("M2 negative mass"),
        "the pasted text is kept"
    );
}

#[tokio::test]
async fn a_name_already_in_the_study_imports_nothing() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let taken = "R1 radial, forced air, direct drive";
    let csv = format!("{HEADER}\n\"{taken}\",1,radial,20,50,2400,100,120,3000,0.95\n");
    let before = candidate_count(&app).await;
    let resp = app.post_import_candidates(&eve, app.demo_id, &csv).await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        resp.body.contains("id=\"import-problem\"") && resp.body.contains("line 2"),
        "{}",
        resp.body
    );
    assert_eq!(candidate_count(&app).await, before);
}

#[tokio::test]
async fn a_viewer_cannot_import() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let csv = format!("{HEADER}\nM9,1,radial,20,50,2400,100,120,3000,0.95\n");
    let before = candidate_count(&app).await;
    let resp = app.post_import_candidates(&vic, app.demo_id, &csv).await;
    assert_eq!(resp.status, StatusCode::FORBIDDEN);
    assert_eq!(candidate_count(&app).await, before);
}
