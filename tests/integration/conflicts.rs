//! Edit conflicts: every edit carries the revision it was made on. A stale one answers
//! 409 naming who changed the row and when, shows what is stored now, and changes
//! nothing; the same edit on the current revision goes through.

use axum::http::StatusCode;
use shaftline::storage::accounts;
use shaftline::storage::studies::{self, Item, ItemRow};
use shaftline::web::fields::STUDY_HEADER;
use shaftline::web::forms;

use crate::helpers::{Session, TestApp, spawn_app};

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

const CSV: &str = "name,gear_ratio,topology,mass_kg,continuous_power_kw,continuous_speed_rpm,\
peak_power_kw,peak_duration_s,max_speed_rpm,continuous_efficiency\n\
M9 imported,1,radial,20,50,2400,100,120,3000,0.95\n";

async fn segments(app: &TestApp) -> Vec<ItemRow> {
    studies::list_items(&app.db, Item::Segment, app.demo_id)
        .await
        .unwrap()
}

fn ids(rows: &[ItemRow]) -> Vec<i64> {
    rows.iter().map(|r| r.id).collect()
}

/// The header form as the study page fills it in now, with `name` replaced.
async fn header_form(app: &TestApp, name: &str) -> Vec<(&'static str, String)> {
    let (_, doc) = studies::load_doc(&app.db, app.demo_id).await.unwrap();
    let shown = forms::values_from_json(STUDY_HEADER, &doc.to_file_json());
    STUDY_HEADER
        .iter()
        .filter_map(|f| shown.get(f.name).map(|v| (f.name, v.clone())))
        .map(|(k, v)| {
            if k == "name" {
                (k, name.to_string())
            } else {
                (k, v)
            }
        })
        .collect()
}

async fn post_header(app: &TestApp, s: &Session, name: &str, rev: i64) -> crate::helpers::Resp {
    let mut pairs = header_form(app, name).await;
    pairs.push(("revision", rev.to_string()));
    let pairs: Vec<(&str, &str)> = pairs.iter().map(|(k, v)| (*k, v.as_str())).collect();
    app.post_study_header(s, app.demo_id, &pairs).await
}

async fn study_revision(app: &TestApp) -> i64 {
    studies::get_study(&app.db, app.demo_id)
        .await
        .unwrap()
        .revision
}

#[tokio::test]
async fn a_stale_header_edit_is_refused_with_who_when_and_the_stored_values() {
    let app = spawn_app().await;
    let (ada, eve) = (app.session("ada").await, app.session("eve").await);
    let seen = study_revision(&app).await;
    let first = post_header(&app, &ada, "Variant by Ada", seen).await;
    assert_eq!(first.status, StatusCode::SEE_OTHER, "{}", first.body);
    let after_ada = studies::get_study(&app.db, app.demo_id).await.unwrap();

    let stale = post_header(&app, &eve, "Variant by Eve", seen).await;
    assert_eq!(stale.status, StatusCode::CONFLICT, "{}", stale.body);
    assert!(
        stale
            .body
            .contains(&format!("changed by ada at {}", after_ada.updated_at)),
        "names who and when: {}",
        stale.body
    );
    let stored = stale
        .body
        .split("id=\"stored-now\"")
        .nth(1)
        .expect("the page shows the study as stored now");
    assert!(stored.contains("Variant by Ada"), "stored values: {stored}");
    assert!(
        stored.contains("max_takeoff_mass_kg"),
        "stored values: {stored}"
    );
    assert!(stale.body.contains("Variant by Eve"), "the input is kept");
    let now = studies::get_study(&app.db, app.demo_id).await.unwrap();
    assert_eq!(now.name, "Variant by Ada", "nothing overwritten");
    assert_eq!(now.revision, after_ada.revision, "nothing written");
    assert!(
        stale
            .body
            .contains(&format!("name=\"revision\" value=\"{}\"", now.revision)),
        "the re-shown form carries the current revision"
    );

    let fresh = post_header(&app, &eve, "Variant by Eve", now.revision).await;
    assert_eq!(fresh.status, StatusCode::SEE_OTHER, "{}", fresh.body);
    let done = studies::get_study(&app.db, app.demo_id).await.unwrap();
    assert_eq!(done.name, "Variant by Eve");
}

#[tokio::test]
async fn a_stale_segment_edit_shows_the_row_as_stored_now() {
    let app = spawn_app().await;
    let (ada, eve) = (app.session("ada").await, app.session("eve").await);
    let seg = segments(&app).await[1].clone();
    let rev = seg.revision.to_string();
    let mut by_ada = LOITER.to_vec();
    by_ada.push(("revision", &rev));
    let first = app
        .post_edit_row(&ada, app.demo_id, "segments", seg.id, &by_ada)
        .await;
    assert_eq!(first.status, StatusCode::SEE_OTHER, "{}", first.body);

    let mut by_eve: Vec<(&str, &str)> = LOITER
        .iter()
        .map(|&(k, v)| {
            if k == "name" {
                (k, "Eve's hold")
            } else {
                (k, v)
            }
        })
        .collect();
    by_eve.push(("revision", &rev));
    let stale = app
        .post_edit_row(&eve, app.demo_id, "segments", seg.id, &by_eve)
        .await;
    assert_eq!(stale.status, StatusCode::CONFLICT, "{}", stale.body);
    assert!(stale.body.contains("changed by ada at"), "{}", stale.body);
    let stored = stale
        .body
        .split("id=\"stored-now\"")
        .nth(1)
        .expect("the page shows the row as stored now");
    assert!(
        stored.contains("Hold") && stored.contains("loiter"),
        "{stored}"
    );
    let now = segments(&app).await[1].clone();
    assert_eq!(now.json().unwrap()["name"], "Hold", "nothing overwritten");
    assert!(
        stale
            .body
            .contains(&format!("name=\"revision\" value=\"{}\"", now.revision)),
        "the re-shown form carries the current revision"
    );
}

#[tokio::test]
async fn a_stale_csv_import_is_refused_and_imports_nothing() {
    let app = spawn_app().await;
    let (ada, eve) = (app.session("ada").await, app.session("eve").await);
    let seen = study_revision(&app).await;
    let count = studies::list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap()
        .len();
    let edit = post_header(&app, &ada, "Variant by Ada", seen).await;
    assert_eq!(edit.status, StatusCode::SEE_OTHER, "{}", edit.body);

    let stale = app
        .post_import_candidates_at(&eve, app.demo_id, seen, CSV)
        .await;
    assert_eq!(stale.status, StatusCode::CONFLICT, "{}", stale.body);
    assert!(stale.body.contains("changed by ada at"), "{}", stale.body);
    let after = studies::list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap();
    assert_eq!(after.len(), count, "nothing imported");

    let fresh = app.post_import_candidates(&eve, app.demo_id, CSV).await;
    assert_eq!(fresh.status, StatusCode::SEE_OTHER, "{}", fresh.body);
    let after = studies::list_items(&app.db, Item::Candidate, app.demo_id)
        .await
        .unwrap();
    assert_eq!(after.len(), count + 1);
    assert_eq!(after.last().unwrap().json().unwrap()["name"], "M9 imported");
}

#[tokio::test]
async fn a_stale_move_is_refused_and_the_order_is_unchanged() {
    let app = spawn_app().await;
    let (ada, eve) = (app.session("ada").await, app.session("eve").await);
    let before = segments(&app).await;
    let second = before[1].clone();
    let first = app
        .post_move_row_at(
            &ada,
            app.demo_id,
            "segments",
            second.id,
            "up",
            second.revision,
        )
        .await;
    assert_eq!(first.status, StatusCode::SEE_OTHER, "{}", first.body);
    let moved = ids(&segments(&app).await);
    assert_eq!(moved[0], second.id, "the fresh move went through");

    // The same click on the page Eve loaded before Ada's move.
    let stale = app
        .post_move_row_at(
            &eve,
            app.demo_id,
            "segments",
            second.id,
            "up",
            second.revision,
        )
        .await;
    assert_eq!(stale.status, StatusCode::CONFLICT, "{}", stale.body);
    assert!(stale.body.contains("changed by ada at"), "{}", stale.body);
    assert!(stale.body.contains("Nothing was moved"), "{}", stale.body);
    assert_eq!(ids(&segments(&app).await), moved, "order unchanged");

    // A stale move at the top of the list, where it would change nothing, is still
    // refused rather than taken as done.
    let top = segments(&app).await[0].clone();
    let up = app
        .post_move_row_at(
            &eve,
            app.demo_id,
            "segments",
            top.id,
            "up",
            top.revision - 1,
        )
        .await;
    assert_eq!(up.status, StatusCode::CONFLICT, "{}", up.body);
    assert_eq!(ids(&segments(&app).await), moved, "order unchanged");

    let fresh = app
        .post_move_row(&eve, app.demo_id, "segments", second.id, "down")
        .await;
    assert_eq!(fresh.status, StatusCode::SEE_OTHER, "{}", fresh.body);
    assert_eq!(ids(&segments(&app).await), ids(&before), "moved back");
}

#[tokio::test]
async fn a_stale_role_change_is_refused_and_the_role_is_unchanged() {
    let app = spawn_app().await;
    let ada = app.session("ada").await;
    let users = app.get_users_page(&ada).await;
    let seen = accounts::find_user(&app.db, "vic").await.unwrap().unwrap();
    assert!(
        users
            .body
            .contains(&format!("name=\"revision\" value=\"{}\"", seen.revision)),
        "the role form carries the account's revision"
    );
    let first = app
        .post_set_role_at(&ada, "vic", "editor", seen.revision)
        .await;
    assert_eq!(first.status, StatusCode::SEE_OTHER, "{}", first.body);
    let changed = accounts::find_user(&app.db, "vic").await.unwrap().unwrap();
    assert_eq!(changed.role, "editor");
    assert_eq!(changed.updated_by, "ada");

    // A second tab still showing the old revision.
    let stale = app
        .post_set_role_at(&ada, "vic", "admin", seen.revision)
        .await;
    assert_eq!(stale.status, StatusCode::CONFLICT, "{}", stale.body);
    assert!(
        stale
            .body
            .contains(&format!("changed by ada at {}", changed.updated_at)),
        "{}",
        stale.body
    );
    assert!(stale.body.contains("role is now editor"), "{}", stale.body);
    let now = accounts::find_user(&app.db, "vic").await.unwrap().unwrap();
    assert_eq!(now.role, "editor", "role unchanged");
    assert_eq!(now.revision, changed.revision, "nothing written");

    let fresh = app.post_set_role(&ada, "vic", "viewer").await;
    assert_eq!(fresh.status, StatusCode::SEE_OTHER, "{}", fresh.body);
    let back = accounts::find_user(&app.db, "vic").await.unwrap().unwrap();
    assert_eq!(back.role, "viewer");
}
