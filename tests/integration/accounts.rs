//! Sign-in and sign-out, role enforcement, and the anti-forgery token.

use crate::helpers::{PASSWORD, spawn_app};
use axum::http::StatusCode;

#[tokio::test]
async fn login_form_has_the_three_named_fields() {
    let app = spawn_app().await;
    let page = app.get_login().await;
    assert_eq!(page.status, StatusCode::OK);
    for name in [
        "name=\"username\"",
        "name=\"password\"",
        "name=\"csrf_token\"",
    ] {
        assert!(page.body.contains(name), "login form lacks {name}");
    }
}

#[tokio::test]
async fn login_redirects_home_with_a_protected_session_cookie_and_logout_ends_it() {
    let app = spawn_app().await;
    let (resp, session) = app.login_as("eve", PASSWORD).await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    assert_eq!(resp.location(), "/");
    let cookie = resp
        .headers
        .get_all("set-cookie")
        .iter()
        .map(|v| v.to_str().unwrap().to_string())
        .find(|c| c.starts_with("shaftline_session="))
        .unwrap();
    for attr in ["HttpOnly", "SameSite=Lax", "Max-Age="] {
        assert!(
            cookie.contains(attr),
            "session cookie lacks {attr}: {cookie}"
        );
    }
    let s = session.unwrap();
    assert_eq!(app.get_studies_page(&s).await.status, StatusCode::OK);
    let out = app.logout(&s).await;
    assert_eq!(out.status, StatusCode::SEE_OTHER);
    let after = app.get_studies_page(&s).await;
    assert_eq!(
        after.status,
        StatusCode::SEE_OTHER,
        "the old cookie no longer signs in"
    );
    assert!(after.location().starts_with("/login"));
}

#[tokio::test]
async fn a_wrong_password_reshows_the_form_with_a_message_and_no_session() {
    let app = spawn_app().await;
    let (resp, session) = app.login_as("eve", "not-the-password").await;
    assert!(session.is_none());
    assert_eq!(resp.status, StatusCode::OK);
    assert!(resp.body.contains("wrong password"), "{}", resp.body);
    assert!(resp.body.contains("value=\"eve\""), "the username is kept");
}

#[tokio::test]
async fn anonymous_visitors_are_sent_to_login_and_back_afterwards() {
    let app = spawn_app().await;
    let path = format!("/studies/{}", app.demo_id);
    let resp = app.get(&path, None).await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    assert_eq!(
        resp.location(),
        format!("/login?next=%2Fstudies%2F{}", app.demo_id)
    );
    let form = app.get(resp.location(), None).await;
    assert!(
        form.body
            .contains(&format!("name=\"next\" value=\"{path}\"")),
        "next is carried in the form"
    );
}

#[tokio::test]
async fn a_viewer_can_read_but_not_edit() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    assert_eq!(
        app.get_study_page(&vic, app.demo_id).await.status,
        StatusCode::OK
    );
    let before = app.get_study_page(&vic, app.demo_id).await.body;
    let resp = app
        .post_new_row(&vic, app.demo_id, "segments", &[("name", "Extra")])
        .await;
    assert_eq!(resp.status, StatusCode::FORBIDDEN);
    assert_eq!(
        app.post_duplicate(&vic, app.demo_id).await.status,
        StatusCode::FORBIDDEN
    );
    assert_eq!(app.get_users_page(&vic).await.status, StatusCode::FORBIDDEN);
    assert!(
        !before.contains("Add a segment"),
        "viewers are not offered edit links"
    );
    let list = shaftline::storage::studies::list_studies(&app.db, None)
        .await
        .unwrap();
    assert_eq!(list.len(), 1, "nothing was created");
}

#[tokio::test]
async fn an_editor_cannot_manage_accounts_but_an_admin_can() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    assert_eq!(app.get_users_page(&eve).await.status, StatusCode::FORBIDDEN);
    let ada = app.session("ada").await;
    let resp = app
        .post_new_user(
            &ada,
            &[
                ("username", "new.person"),
                ("password", "long enough pw"),
                ("role", "editor"),
            ],
        )
        .await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    let page = app.get_users_page(&ada).await;
    assert!(page.body.contains("new.person"));
    assert!(
        app.login_as("new.person", "long enough pw")
            .await
            .1
            .is_some()
    );
}

#[tokio::test]
async fn adding_an_account_with_a_short_password_shows_the_error_and_stores_nothing() {
    let app = spawn_app().await;
    let ada = app.session("ada").await;
    let resp = app
        .post_new_user(
            &ada,
            &[
                ("username", "shorty"),
                ("password", "abc"),
                ("role", "viewer"),
            ],
        )
        .await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        resp.body.contains("at least 8 characters (got 3)"),
        "{}",
        resp.body
    );
    assert!(resp.body.contains("value=\"shorty\""), "input kept");
    assert!(
        shaftline::storage::accounts::find_user(&app.db, "shorty")
            .await
            .unwrap()
            .is_none()
    );
}

#[tokio::test]
async fn missing_or_wrong_csrf_tokens_are_refused_and_nothing_is_stored() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let path = format!("/studies/{}/duplicate", app.demo_id);
    for (case, token) in [
        ("missing", None),
        ("wrong", Some("not-the-token")),
        ("empty", Some("")),
    ] {
        let resp = app.post(&path, Some(&eve), token, &[]).await;
        assert_eq!(resp.status, StatusCode::FORBIDDEN, "{case} token");
    }
    let list = shaftline::storage::studies::list_studies(&app.db, None)
        .await
        .unwrap();
    assert_eq!(list.len(), 1, "no duplicate was stored");
    let ok = app.post_duplicate(&eve, app.demo_id).await;
    assert_eq!(ok.status, StatusCode::SEE_OTHER, "the right token works");
}

#[tokio::test]
async fn login_without_the_form_token_is_refused() {
    let app = spawn_app().await;
    let resp = app
        .post(
            "/login",
            None,
            None,
            &[("username", "eve"), ("password", PASSWORD)],
        )
        .await;
    assert_eq!(resp.status, StatusCode::FORBIDDEN);
    assert!(resp.headers.get("set-cookie").is_none());
}

#[tokio::test]
async fn every_page_carries_the_security_headers() {
    let app = spawn_app().await;
    let page = app.get_login().await;
    let csp = page
        .headers
        .get("content-security-policy")
        .unwrap()
        .to_str()
        .unwrap();
    assert!(
        csp.contains("script-src 'self'") && csp.contains("frame-ancestors 'none'"),
        "{csp}"
    );
    assert_eq!(
        page.headers.get("x-content-type-options").unwrap(),
        "nosniff"
    );
    assert_eq!(page.headers.get("x-frame-options").unwrap(), "DENY");
}
