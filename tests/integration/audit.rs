//! The audit trail: every change of studies, rows, weights and accounts recorded with
//! who, when, before and after, in the change's own transaction; append-only; shown
//! on the study's history page and in `history.csv`.

use axum::http::StatusCode;
use serde_json::Value;
use shaftline::storage::audit::{self, AuditRow};
use shaftline::storage::studies::{self, Item};

use crate::helpers::{TestApp, spawn_app};

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

async fn history(app: &TestApp) -> Vec<AuditRow> {
    audit::study_history(&app.db, app.demo_id).await.unwrap()
}

fn json(text: &Option<String>) -> Value {
    serde_json::from_str(text.as_deref().expect("a value")).unwrap()
}

#[tokio::test]
async fn a_segment_edit_is_recorded_with_who_and_both_values() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let seg = studies::list_items(&app.db, Item::Segment, app.demo_id)
        .await
        .unwrap()[1]
        .clone();
    let before_count = history(&app).await.len();
    let rev = seg.revision.to_string();
    let mut values = LOITER.to_vec();
    values.push(("revision", &rev));
    let resp = app
        .post_edit_row(&eve, app.demo_id, "segments", seg.id, &values)
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let rows = history(&app).await;
    assert_eq!(rows.len(), before_count + 1, "exactly one record");
    let last = rows.last().unwrap();
    assert_eq!(
        (last.actor.as_str(), last.action.as_str()),
        ("eve", "update")
    );
    assert_eq!(
        (last.entity_kind.as_str(), last.entity_id),
        ("segment", seg.id)
    );
    assert_eq!(json(&last.before), seg.json().unwrap());
    assert_eq!(json(&last.after)["name"], "Hold");
}

#[tokio::test]
async fn a_refused_stale_edit_records_nothing() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let seg = studies::list_items(&app.db, Item::Segment, app.demo_id)
        .await
        .unwrap()[1]
        .clone();
    let before = history(&app).await;
    let stale = (seg.revision - 1).to_string();
    let mut values = LOITER.to_vec();
    values.push(("revision", &stale));
    let resp = app
        .post_edit_row(&eve, app.demo_id, "segments", seg.id, &values)
        .await;
    assert_eq!(resp.status, StatusCode::CONFLICT);
    assert_eq!(history(&app).await, before);
}

#[tokio::test]
async fn row_creation_move_and_deletion_are_each_recorded() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let created = app
        .post_new_row(&eve, app.demo_id, "segments", LOITER)
        .await;
    assert_eq!(created.status, StatusCode::SEE_OTHER, "{}", created.body);
    let segs = studies::list_items(&app.db, Item::Segment, app.demo_id)
        .await
        .unwrap();
    let new = segs.last().unwrap().clone();
    app.post_move_row(&eve, app.demo_id, "segments", new.id, "up")
        .await;
    let moved = studies::get_item(&app.db, Item::Segment, app.demo_id, new.id)
        .await
        .unwrap();
    app.post_delete_row(&eve, app.demo_id, "segments", new.id, moved.revision)
        .await;
    let actions: Vec<(String, i64)> = history(&app)
        .await
        .into_iter()
        .filter(|r| r.entity_kind == "segment")
        .map(|r| (r.action, r.entity_id))
        .collect();
    let want: Vec<(String, i64)> = ["create", "move", "delete"]
        .iter()
        .map(|a| (a.to_string(), new.id))
        .collect();
    assert_eq!(actions, want);
}

#[tokio::test]
async fn a_full_replace_with_new_weights_records_the_study_and_the_weights() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let path = format!("/api/studies/{}", app.demo_id);
    let got = app.api("GET", &path, Some(&token), &[], None).await;
    let etag = got.headers["etag"].to_str().unwrap().to_string();
    let mut file: Value = serde_json::from_str(&got.body).unwrap();
    let old_scoring = file["scoring"].clone();
    file["scoring"]["weights"]["propulsion_mass_kg"] = Value::from(0.7);
    file["scoring"]["weights"]["mission_energy_kwh"] = Value::from(0.3);
    let put = app
        .api(
            "PUT",
            &path,
            Some(&token),
            &[("if-match", &etag)],
            Some(file.to_string()),
        )
        .await;
    assert_eq!(put.status, StatusCode::OK, "{}", put.body);
    let rows = history(&app).await;
    let weights = rows
        .iter()
        .find(|r| r.entity_kind == "weights")
        .expect("a weights record");
    assert_eq!(weights.actor, "eve");
    assert_eq!(json(&weights.before), old_scoring);
    assert_eq!(json(&weights.after)["weights"]["propulsion_mass_kg"], 0.7);
    assert!(
        rows.iter()
            .any(|r| r.entity_kind == "study" && r.action == "replace")
    );
}

#[tokio::test]
async fn account_changes_are_recorded_without_the_password_hash() {
    let app = spawn_app().await;
    let ada = app.session("ada").await;
    let made = app
        .post_new_user(
            &ada,
            &[
                ("username", "nora"),
                ("password", "nora's long password"),
                ("role", "viewer"),
            ],
        )
        .await;
    assert_eq!(made.status, StatusCode::SEE_OTHER, "{}", made.body);
    let role = app.post_set_role(&ada, "nora", "editor").await;
    assert_eq!(role.status, StatusCode::SEE_OTHER, "{}", role.body);
    let rows = audit::account_history(&app.db).await.unwrap();
    let by_ada: Vec<&AuditRow> = rows.iter().filter(|r| r.actor == "ada").collect();
    assert_eq!(by_ada.len(), 2, "{rows:?}");
    assert_eq!(json(&by_ada[0].after)["username"], "nora");
    assert_eq!(json(&by_ada[1].before)["role"], "viewer");
    assert_eq!(json(&by_ada[1].after)["role"], "editor");
    let hash = shaftline::storage::accounts::find_user(&app.db, "nora")
        .await
        .unwrap()
        .unwrap()
        .password_hash;
    for r in &rows {
        let text = format!("{:?}{:?}", r.before, r.after);
        assert!(
            !text.contains(&hash) && !text.contains("argon2"),
            "no hash in {text}"
        );
    }
}

#[tokio::test]
async fn the_trail_refuses_updates_and_deletes() {
    let app = spawn_app().await;
    assert!(
        !history(&app).await.is_empty(),
        "the seeded demo is recorded"
    );
    for sql in [
        "UPDATE audit_log SET actor = 'someone else'",
        "DELETE FROM audit_log",
    ] {
        let err = sqlx::query(sql).execute(&app.db).await.expect_err(sql);
        assert!(err.to_string().contains("append-only"), "{sql}: {err}");
    }
}

#[tokio::test]
async fn the_history_page_and_csv_list_the_changes() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let page = app.get_history(&vic, app.demo_id, false).await;
    assert_eq!(page.status, StatusCode::OK);
    assert!(page.body.contains("id=\"history\""), "{}", page.body);
    assert!(page.body.contains("<td>create</td>"));
    let csv = app.get_history(&vic, app.demo_id, true).await;
    assert_eq!(csv.status, StatusCode::OK);
    let mut reader = csv::Reader::from_reader(csv.body.as_bytes());
    let header: Vec<String> = reader.headers().unwrap().iter().map(String::from).collect();
    assert_eq!(header, shaftline::web::routes::history::HISTORY_COLUMNS);
    let records: Vec<csv::StringRecord> = reader.records().map(Result::unwrap).collect();
    assert_eq!(records.len(), history(&app).await.len());
    assert_eq!(&records[0][4], "create");
}
