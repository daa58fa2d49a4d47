//! Mission segment and candidate rows: create, edit, reorder, delete, and validation
//! errors shown beside the field with the input kept and nothing stored.

use crate::helpers::{TestApp, spawn_app};
use axum::http::StatusCode;
use serde_json::Value;
use shaftline::storage::studies::{Item, ItemRow, list_items};

async fn rows(app: &TestApp, item: Item) -> Vec<ItemRow> {
    list_items(&app.db, item, app.demo_id).await.unwrap()
}

fn names(rows: &[ItemRow]) -> Vec<String> {
    rows.iter()
        .map(|r| r.json().unwrap()["name"].as_str().unwrap().to_string())
        .collect()
}

const LOITER: &[(&str, &str)] = &[
    ("name", "Hold"),
    ("kind", "loiter"),
    ("power.rule", "steady"),
    ("power.tas_m_s", "40"),
    ("power.prop_efficiency", "0.8"),
    ("duration_s", "600"),
    ("altitude_start_m", "300"),
    ("prop_speed_rpm", "1900"),
];

#[tokio::test]
async fn a_new_segment_is_stored_at_the_end_and_shown_in_the_table() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let before = rows(&app, Item::Segment).await.len();
    let resp = app
        .post_new_row(&eve, app.demo_id, "segments", LOITER)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let after = rows(&app, Item::Segment).await;
    assert_eq!(after.len(), before + 1);
    let body = after.last().unwrap().json().unwrap();
    assert_eq!(body["name"], "Hold");
    assert_eq!(body["power"]["tas_m_s"].as_f64(), Some(40.0));
    let page = app.get_study_page(&eve, app.demo_id).await;
    assert!(page.body.contains("<td>Hold</td>"));
}

#[tokio::test]
async fn a_bad_airspeed_is_reported_beside_its_field_with_the_input_kept() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let before = rows(&app, Item::Segment).await.len();
    let mut bad = LOITER.to_vec();
    bad[3] = ("power.tas_m_s", "-5");
    let resp = app.post_new_row(&eve, app.demo_id, "segments", &bad).await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    let at = resp
        .body
        .find("id=\"err-power.tas_m_s\"")
        .expect("error beside the airspeed field");
    assert!(
        resp.body[at..].contains("power.tas_m_s"),
        "message names the field"
    );
    assert!(resp.body.contains("value=\"-5\""), "typed value kept");
    assert!(resp.body.contains("value=\"Hold\""), "other input kept");
    assert_eq!(
        rows(&app, Item::Segment).await.len(),
        before,
        "nothing stored"
    );
}

#[tokio::test]
async fn text_in_a_number_field_is_refused_by_name() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let mut bad = LOITER.to_vec();
    bad[7] = ("prop_speed_rpm", "fast");
    let resp = app.post_new_row(&eve, app.demo_id, "segments", &bad).await;
    assert!(
        resp.body
            .contains("prop_speed_rpm: must be a number (got &#39;fast&#39;)"),
        "{}",
        resp.body
    );
}

#[tokio::test]
async fn a_duplicate_segment_name_is_refused() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let first = names(&rows(&app, Item::Segment).await)[0].clone();
    let mut dup = LOITER.to_vec();
    dup[0] = ("name", &first);
    let before = rows(&app, Item::Segment).await.len();
    let resp = app.post_new_row(&eve, app.demo_id, "segments", &dup).await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(resp.body.contains("class=\"error\"") || resp.body.contains("class=\"notice\""));
    assert_eq!(rows(&app, Item::Segment).await.len(), before);
}

#[tokio::test]
async fn editing_a_segment_keeps_its_place_and_bumps_its_revision() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let seg = rows(&app, Item::Segment).await[1].clone();
    let form = app
        .get_edit_row_form(&eve, app.demo_id, "segments", seg.id)
        .await;
    assert!(
        form.body
            .contains(&format!("name=\"revision\" value=\"{}\"", seg.revision))
    );
    let mut values = LOITER.to_vec();
    let rev = seg.revision.to_string();
    values.push(("revision", &rev));
    let resp = app
        .post_edit_row(&eve, app.demo_id, "segments", seg.id, &values)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let now = rows(&app, Item::Segment).await[1].clone();
    assert_eq!(now.id, seg.id);
    assert_eq!(now.revision, seg.revision + 1);
    assert_eq!(now.json().unwrap()["name"], "Hold");
}

#[tokio::test]
async fn a_stale_edit_is_refused_with_who_changed_it() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let seg = rows(&app, Item::Segment).await[1].clone();
    let mut values = LOITER.to_vec();
    let stale = (seg.revision - 1).to_string();
    values.push(("revision", &stale));
    let resp = app
        .post_edit_row(&eve, app.demo_id, "segments", seg.id, &values)
        .await;
    assert!(resp.body.contains("changed by admin at"), "{}", resp.body);
    assert_eq!(
        rows(&app, Item::Segment).await[1].body,
        seg.body,
        "not overwritten"
    );
}

#[tokio::test]
async fn segments_reorder_up_and_down() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let before = names(&rows(&app, Item::Segment).await);
    let second = rows(&app, Item::Segment).await[1].id;
    app.post_move_row(&eve, app.demo_id, "segments", second, "up")
        .await;
    let moved = names(&rows(&app, Item::Segment).await);
    assert_eq!(moved[0], before[1]);
    assert_eq!(moved[1], before[0]);
    app.post_move_row(&eve, app.demo_id, "segments", second, "down")
        .await;
    assert_eq!(names(&rows(&app, Item::Segment).await), before);
}

#[tokio::test]
async fn deleting_a_candidate_removes_only_that_row() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let list = rows(&app, Item::Candidate).await;
    let gone = list[2].clone();
    let resp = app
        .post_delete_row(&eve, app.demo_id, "candidates", gone.id, gone.revision)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    let after = names(&rows(&app, Item::Candidate).await);
    let mut want = names(&list);
    want.remove(2);
    assert_eq!(after, want);
}

#[tokio::test]
async fn candidate_forms_come_prefilled_for_each_kind() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    for (kind, field) in [
        ("datasheet", "source.mass_kg"),
        ("radial_sizing", "source.bore_diameter_m"),
        ("axial_sizing", "source.outer_radius_m"),
    ] {
        let form = app
            .get_new_row_form(&eve, app.demo_id, "candidates", &format!("?kind={kind}"))
            .await;
        assert_eq!(form.status, StatusCode::OK, "{kind}");
        assert!(
            form.body.contains(&format!("name=\"{field}\"")),
            "{kind} form has {field}"
        );
        assert!(
            form.body.contains("class=\"hint\""),
            "{kind} form shows typical ranges"
        );
    }
    let radial = app
        .get_new_row_form(&eve, app.demo_id, "candidates", "?kind=radial_sizing")
        .await;
    assert!(
        radial
            .body
            .contains("name=\"source.airgap_flux_density_t\" value=\"0.9\""),
        "default pre-filled"
    );
}

#[tokio::test]
async fn a_datasheet_candidate_is_created_edited_and_shown() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let fields = [
        ("candidate_kind", "datasheet"),
        ("name", "DS-9 test motor"),
        ("drive.gear_ratio", "1"),
        ("source.topology", "radial"),
        ("source.mass_kg", "20"),
        ("source.continuous_power_kw", "50"),
        ("source.continuous_speed_rpm", "2400"),
        ("source.peak_power_kw", "100"),
        ("source.peak_duration_s", "120"),
        ("source.max_speed_rpm", "3000"),
        ("source.continuous_efficiency", "0.95"),
    ];
    let resp = app
        .post_new_row(&eve, app.demo_id, "candidates", &fields)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let row = rows(&app, Item::Candidate).await.last().unwrap().clone();
    let body: Value = row.json().unwrap();
    assert_eq!(body["source"]["kind"], "datasheet");
    assert_eq!(body["source"]["mass_kg"].as_f64(), Some(20.0));
    let mut edit = fields.to_vec();
    edit[4] = ("source.mass_kg", "-1");
    let rev = row.revision.to_string();
    edit.push(("revision", &rev));
    let bad = app
        .post_edit_row(&eve, app.demo_id, "candidates", row.id, &edit)
        .await;
    assert!(
        bad.body.contains("id=\"err-source.mass_kg\""),
        "{}",
        bad.body
    );
    assert_eq!(
        rows(&app, Item::Candidate).await.last().unwrap().body,
        row.body,
        "nothing stored"
    );
    let page = app.get_candidate_page(&eve, app.demo_id, row.id).await;
    assert_eq!(page.status, StatusCode::OK);
    assert!(page.body.contains("DS-9 test motor") && page.body.contains("id=\"caution\""));
}
