//! Every storage query against a fresh in-memory database.

use serde_json::json;
use shaftline::storage::accounts::{self, Role};
use shaftline::storage::studies::{self, Item, MoveDirection, StudyDoc};
use shaftline::storage::{StorageError, open_memory};

fn doc() -> StudyDoc {
    StudyDoc {
        name: "S".into(),
        notes: Some("n".into()),
        aircraft: json!({ "motor_count": 2 }),
        installation: Some(json!({ "max_diameter_m": 0.4 })),
        integration: None,
        scoring: None,
        segments: vec![
            json!({ "name": "a" }),
            json!({ "name": "b" }),
            json!({ "name": "c" }),
        ],
        candidates: vec![json!({ "name": "x" })],
    }
}

#[tokio::test]
async fn users_are_inserted_found_listed_and_changed() {
    let db = open_memory().await.unwrap();
    assert_eq!(accounts::count_users(&db).await.unwrap(), 0);
    let id = accounts::insert_user(&db, "ana", "h1", Role::Editor)
        .await
        .unwrap();
    assert!(matches!(
        accounts::insert_user(&db, "ana", "h", Role::Viewer).await,
        Err(StorageError::Invalid(_))
    ));
    let ana = accounts::find_user(&db, "ana").await.unwrap().unwrap();
    assert_eq!((ana.id, ana.role()), (id, Role::Editor));
    accounts::set_role(&db, "ana", Role::Admin).await.unwrap();
    accounts::insert_session(&db, "sess", id, "csrf", 3600)
        .await
        .unwrap();
    accounts::set_password_hash(&db, "ana", "h2").await.unwrap();
    assert!(
        accounts::find_session(&db, "sess").await.unwrap().is_none(),
        "a new password ends sessions"
    );
    let listed = accounts::list_users(&db).await.unwrap();
    assert_eq!(
        (listed[0].role(), listed[0].password_hash.as_str()),
        (Role::Admin, "h2")
    );
    assert!(matches!(
        accounts::set_role(&db, "nobody", Role::Admin).await,
        Err(StorageError::NotFound { .. })
    ));
}

#[tokio::test]
async fn sessions_expire_and_are_deleted() {
    let db = open_memory().await.unwrap();
    let id = accounts::insert_user(&db, "ana", "h", Role::Viewer)
        .await
        .unwrap();
    accounts::insert_session(&db, "live", id, "c1", 3600)
        .await
        .unwrap();
    accounts::insert_session(&db, "dead", id, "c2", -1)
        .await
        .unwrap();
    assert_eq!(
        accounts::find_session(&db, "live")
            .await
            .unwrap()
            .unwrap()
            .csrf_token,
        "c1"
    );
    assert!(accounts::find_session(&db, "dead").await.unwrap().is_none());
    assert_eq!(accounts::delete_expired_sessions(&db).await.unwrap(), 1);
    accounts::delete_session(&db, "live").await.unwrap();
    assert!(accounts::find_session(&db, "live").await.unwrap().is_none());
}

#[tokio::test]
async fn api_tokens_resolve_to_their_user() {
    let db = open_memory().await.unwrap();
    accounts::insert_user(&db, "ana", "h", Role::Editor)
        .await
        .unwrap();
    accounts::insert_api_token(&db, "digest", "ana")
        .await
        .unwrap();
    assert_eq!(
        accounts::find_token_user(&db, "digest")
            .await
            .unwrap()
            .unwrap()
            .username,
        "ana"
    );
    assert!(
        accounts::find_token_user(&db, "other")
            .await
            .unwrap()
            .is_none()
    );
    assert!(
        accounts::insert_api_token(&db, "d2", "nobody")
            .await
            .is_err()
    );
}

#[tokio::test]
async fn a_study_round_trips_and_lists_with_its_candidate_count() {
    let db = open_memory().await.unwrap();
    let id = studies::insert_study(&db, &doc(), "ana").await.unwrap();
    let (row, back) = studies::load_doc(&db, id).await.unwrap();
    assert_eq!(back, doc());
    assert_eq!(row.revision, 1);
    let list = studies::list_studies(&db, None).await.unwrap();
    assert_eq!((list[0].id, list[0].candidates), (id, 1));
    studies::insert_study(&db, &doc(), "ana").await.unwrap();
    assert_eq!(studies::list_studies(&db, Some(1)).await.unwrap().len(), 1);
    assert!(matches!(
        studies::get_study(&db, 999).await,
        Err(StorageError::NotFound { .. })
    ));
}

#[tokio::test]
async fn header_updates_and_full_replace_check_the_revision() {
    let db = open_memory().await.unwrap();
    let id = studies::insert_study(&db, &doc(), "ana").await.unwrap();
    let mut d = doc();
    d.name = "T".into();
    assert_eq!(
        studies::update_study_header(&db, id, 1, &d, "ben")
            .await
            .unwrap(),
        2
    );
    let stale = studies::update_study_header(&db, id, 1, &d, "ben")
        .await
        .unwrap_err();
    assert!(
        stale.to_string().starts_with("changed by ben at"),
        "{stale}"
    );
    d.segments.truncate(1);
    assert_eq!(
        studies::replace_study(&db, id, 2, &d, "ben").await.unwrap(),
        3
    );
    assert!(studies::replace_study(&db, id, 2, &d, "ben").await.is_err());
    assert_eq!(studies::load_doc(&db, id).await.unwrap().1, d);
}

#[tokio::test]
async fn rows_are_inserted_updated_moved_and_deleted_with_revisions() {
    let db = open_memory().await.unwrap();
    let id = studies::insert_study(&db, &doc(), "ana").await.unwrap();
    let new = studies::insert_item(&db, Item::Segment, id, &json!({ "name": "d" }), "ana")
        .await
        .unwrap();
    let order = |rows: Vec<studies::ItemRow>| {
        rows.iter()
            .map(|r| r.json().unwrap()["name"].as_str().unwrap().to_string())
            .collect::<Vec<_>>()
    };
    assert_eq!(
        order(studies::list_items(&db, Item::Segment, id).await.unwrap()),
        ["a", "b", "c", "d"]
    );
    let rev = studies::get_item(&db, Item::Segment, id, new)
        .await
        .unwrap()
        .revision;
    studies::move_item(&db, Item::Segment, id, new, rev, MoveDirection::Up, "ana")
        .await
        .unwrap();
    assert_eq!(
        order(studies::list_items(&db, Item::Segment, id).await.unwrap()),
        ["a", "b", "d", "c"]
    );
    let row = studies::get_item(&db, Item::Segment, id, new)
        .await
        .unwrap();
    let rev = studies::update_item(
        &db,
        Item::Segment,
        id,
        new,
        row.revision,
        &json!({ "name": "e" }),
        "ana",
    )
    .await
    .unwrap();
    assert_eq!(rev, row.revision + 1);
    assert!(
        studies::update_item(&db, Item::Segment, id, new, row.revision, &json!({}), "ana")
            .await
            .is_err()
    );
    assert!(
        studies::delete_item(&db, Item::Segment, id, new, row.revision, "ana")
            .await
            .is_err(),
        "stale delete"
    );
    studies::delete_item(&db, Item::Segment, id, new, rev, "ana")
        .await
        .unwrap();
    assert_eq!(
        order(studies::list_items(&db, Item::Segment, id).await.unwrap()),
        ["a", "b", "c"]
    );
    assert!(
        studies::get_study(&db, id).await.unwrap().revision > 1,
        "row changes bump the study"
    );
}
