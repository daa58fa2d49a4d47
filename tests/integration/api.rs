//! The JSON API with a bearer token: list, create, read, replace with If-Match, results.

use crate::helpers::spawn_app;
use axum::http::StatusCode;
use serde_json::Value;

fn json(body: &str) -> Value {
    serde_json::from_str(body).unwrap_or_else(|e| panic!("not JSON ({e}): {body}"))
}

#[tokio::test]
async fn health_answers_without_signing_in() {
    let app = spawn_app().await;
    assert_eq!(app.health().await.status, StatusCode::OK);
}

#[tokio::test]
async fn the_api_refuses_callers_without_a_valid_token() {
    let app = spawn_app().await;
    for token in [None, Some("no-such-token")] {
        let resp = app.api("GET", "/api/studies", token, &[], None).await;
        assert_eq!(resp.status, StatusCode::UNAUTHORIZED);
        assert!(json(&resp.body)["error"]["message"].is_string());
    }
}

#[tokio::test]
async fn a_token_lists_studies_and_reads_one_with_its_etag() {
    let app = spawn_app().await;
    let token = app.token_for("vic").await;
    let list = app
        .api("GET", "/api/studies", Some(&token), &[], None)
        .await;
    assert_eq!(list.status, StatusCode::OK);
    let list = json(&list.body);
    let first = &list[0];
    for key in ["id", "name", "revision", "updated_at", "candidates"] {
        assert!(first.get(key).is_some(), "list entry lacks {key}");
    }
    let id = first["id"].as_str().unwrap();
    let study = app
        .api(
            "GET",
            &format!("/api/studies/{id}"),
            Some(&token),
            &[],
            None,
        )
        .await;
    assert_eq!(study.status, StatusCode::OK);
    assert_eq!(
        study.headers.get("etag").unwrap().to_str().unwrap(),
        format!("\"{}\"", first["revision"])
    );
    assert_eq!(json(&study.body)["format"], "shaftline-study/1");
}

#[tokio::test]
async fn a_viewer_token_cannot_write() {
    let app = spawn_app().await;
    let token = app.token_for("vic").await;
    let file = app
        .api(
            "GET",
            &format!("/api/studies/{}", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await;
    let resp = app
        .api("POST", "/api/studies", Some(&token), &[], Some(file.body))
        .await;
    assert_eq!(resp.status, StatusCode::FORBIDDEN);
}

#[tokio::test]
async fn post_then_put_with_if_match_and_the_conflict_rules() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let file = app
        .api(
            "GET",
            &format!("/api/studies/{}", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await
        .body;
    let created = app
        .api(
            "POST",
            "/api/studies",
            Some(&token),
            &[],
            Some(file.clone()),
        )
        .await;
    assert_eq!(created.status, StatusCode::CREATED, "{}", created.body);
    let id = json(&created.body)["id"].as_str().unwrap().to_string();
    let path = format!("/api/studies/{id}");
    let etag = created
        .headers
        .get("etag")
        .unwrap()
        .to_str()
        .unwrap()
        .to_string();

    let mut changed = json(&file);
    changed["name"] = Value::from("Renamed by a script");
    let body = changed.to_string();
    let missing = app
        .api("PUT", &path, Some(&token), &[], Some(body.clone()))
        .await;
    assert_eq!(missing.status, StatusCode::PRECONDITION_REQUIRED);
    let ok = app
        .api(
            "PUT",
            &path,
            Some(&token),
            &[("if-match", &etag)],
            Some(body.clone()),
        )
        .await;
    assert_eq!(ok.status, StatusCode::OK, "{}", ok.body);
    assert_ne!(ok.headers.get("etag").unwrap().to_str().unwrap(), etag);
    let stale = app
        .api(
            "PUT",
            &path,
            Some(&token),
            &[("if-match", &etag)],
            Some(body),
        )
        .await;
    assert_eq!(stale.status, StatusCode::CONFLICT);
    assert!(
        json(&stale.body)["error"]["message"]
            .as_str()
            .unwrap()
            .contains("changed by eve")
    );
    let current: i64 = ok.headers["etag"]
        .to_str()
        .unwrap()
        .trim_matches('"')
        .parse()
        .unwrap();
    assert_eq!(
        json(&stale.body)["error"]["revision"],
        current,
        "the 409 names the current revision"
    );
    assert_eq!(
        json(&stale.body)["error"]["current"]["name"],
        "Renamed by a script",
        "the 409 carries the values stored now"
    );
    let now = app.api("GET", &path, Some(&token), &[], None).await;
    assert_eq!(json(&now.body)["name"], "Renamed by a script");
}

#[tokio::test]
async fn an_invalid_study_body_answers_with_the_json_path() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let file = app
        .api(
            "GET",
            &format!("/api/studies/{}", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await
        .body;
    let mut bad = json(&file);
    bad["aircraft"]["motor_count"] = Value::from(0);
    let resp = app
        .api(
            "POST",
            "/api/studies",
            Some(&token),
            &[],
            Some(bad.to_string()),
        )
        .await;
    assert!(resp.status.is_client_error());
    assert_eq!(json(&resp.body)["error"]["path"], "aircraft.motor_count");
    let not_json = app
        .api("POST", "/api/studies", Some(&token), &[], Some("{".into()))
        .await;
    assert_eq!(not_json.status, StatusCode::BAD_REQUEST);
    assert!(json(&not_json.body)["error"]["message"].is_string());
}

#[tokio::test]
async fn results_are_the_engine_results_of_the_stored_study() {
    let app = spawn_app().await;
    let token = app.token_for("vic").await;
    let file = app
        .api(
            "GET",
            &format!("/api/studies/{}", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await
        .body;
    let resp = app
        .api(
            "GET",
            &format!("/api/studies/{}/results", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await;
    assert_eq!(resp.status, StatusCode::OK);
    let study = shaftline::engine::study::parse_study_str(&file).unwrap();
    let want = serde_json::to_value(shaftline::engine::score_study(&study)).unwrap();
    assert_eq!(json(&resp.body), want);
    let missing = app
        .api("GET", "/api/studies/999/results", Some(&token), &[], None)
        .await;
    assert_eq!(missing.status, StatusCode::NOT_FOUND);
    assert_eq!(json(&missing.body)["error"]["path"], "id");
}
