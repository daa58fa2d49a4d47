//! Hardening over HTTP: security headers on every kind of answer, sign-in limits per
//! account and per address, session expiry, body limits with a JSON 413, timeouts.

use std::net::SocketAddr;
use std::time::Duration;

use tokio::io::{AsyncReadExt, AsyncWriteExt};

use axum::body::Body;
use axum::extract::ConnectInfo;
use axum::http::{Request, StatusCode, header};
use shaftline::config::WebConfig;
use shaftline::storage::studies;
use shaftline::web::{AppState, app};

use crate::helpers::{PASSWORD, Resp, TestApp, csrf_in, form_body, spawn_app};

fn with_config(t: &TestApp, config: WebConfig) -> TestApp {
    TestApp {
        router: app(AppState::new(t.db.clone(), config)),
        db: t.db.clone(),
        demo_id: t.demo_id,
    }
}

#[tokio::test]
async fn pages_api_answers_and_errors_all_carry_the_security_headers() {
    let app = spawn_app().await;
    let token = app.token_for("vic").await;
    let answers = [
        ("login page", app.get_login().await),
        (
            "api list",
            app.api("GET", "/api/studies", Some(&token), &[], None)
                .await,
        ),
        (
            "api 401",
            app.api("GET", "/api/studies", None, &[], None).await,
        ),
        ("missing page", app.get("/no/such/page", None).await),
    ];
    for (what, r) in &answers {
        let h = |n: &str| r.headers.get(n).and_then(|v| v.to_str().ok()).unwrap_or("");
        let csp = h("content-security-policy");
        assert!(csp.contains("script-src 'self'"), "{what}: {csp}");
        assert!(
            !csp.contains("unsafe-inline"),
            "{what}: no inline script: {csp}"
        );
        assert!(csp.contains("frame-ancestors 'none'"), "{what}: {csp}");
        assert_eq!(h("x-content-type-options"), "nosniff", "{what}");
        assert_eq!(h("referrer-policy"), "same-origin", "{what}");
    }
}

/// A sign-in attempt from `addr` through the login form.
async fn login_from(app: &TestApp, user: &str, password: &str, addr: &str) -> Resp {
    let page = app.get_login().await;
    let cookie = page.headers[header::SET_COOKIE].to_str().unwrap();
    let body = form_body(&[
        ("username", user),
        ("password", password),
        ("csrf_token", &csrf_in(&page.body)),
    ]);
    let mut req = Request::post("/login")
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
        .header(header::COOKIE, cookie.split(';').next().unwrap())
        .body(Body::from(body))
        .unwrap();
    let addr: SocketAddr = addr.parse().unwrap();
    req.extensions_mut().insert(ConnectInfo(addr));
    app.send(req).await
}

#[tokio::test]
async fn an_account_is_locked_after_ten_failures_even_for_the_right_password() {
    let app = spawn_app().await;
    for i in 0..shaftline::web::limiter::MAX_FAILURES {
        let r = login_from(
            &app,
            "eve",
            "wrong password",
            &format!("127.0.0.{}:1", i + 1),
        )
        .await;
        assert_eq!(r.status, StatusCode::OK, "attempt {i} re-shows the form");
    }
    let r = login_from(&app, "eve", PASSWORD, "127.0.1.1:1").await;
    assert_eq!(r.status, StatusCode::TOO_MANY_REQUESTS);
    assert!(r.body.contains("for this username"), "{}", r.body);
    assert!(
        r.headers
            .get(header::SET_COOKIE)
            .is_none_or(|c| { !c.to_str().unwrap().starts_with("shaftline_session=") })
    );
    let other = login_from(&app, "vic", PASSWORD, "127.0.1.1:1").await;
    assert_eq!(
        other.status,
        StatusCode::SEE_OTHER,
        "other accounts still sign in"
    );
}

#[tokio::test]
async fn an_address_is_locked_after_failures_across_usernames() {
    let app = spawn_app().await;
    for i in 0..shaftline::web::limiter::MAX_ADDRESS_FAILURES {
        login_from(&app, &format!("guess{i}"), "wrong password", "127.0.0.7:5").await;
    }
    let r = login_from(&app, "vic", PASSWORD, "127.0.0.7:6").await;
    assert_eq!(r.status, StatusCode::TOO_MANY_REQUESTS);
    assert!(r.body.contains("from this computer"), "{}", r.body);
    let elsewhere = login_from(&app, "vic", PASSWORD, "127.0.0.8:6").await;
    assert_eq!(elsewhere.status, StatusCode::SEE_OTHER);
}

#[tokio::test]
async fn an_expired_session_no_longer_signs_in() {
    let base = spawn_app().await;
    let config = WebConfig {
        session_lifetime_s: -1,
        ..WebConfig::default()
    };
    let app = with_config(&base, config);
    let (resp, s) = app.login_as("eve", PASSWORD).await;
    assert_eq!(
        resp.status,
        StatusCode::SEE_OTHER,
        "the sign-in itself succeeds"
    );
    let page = app.get_studies_page(&s.expect("a cookie was set")).await;
    assert_eq!(page.status, StatusCode::SEE_OTHER);
    assert!(
        page.location().starts_with("/login?next="),
        "{}",
        page.location()
    );
}

#[tokio::test]
async fn an_oversized_study_upload_gets_a_json_413_and_changes_nothing() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let before = studies::get_study(&app.db, app.demo_id).await.unwrap();
    let big = format!("{{\"name\": \"{}\"}}", "x".repeat(2 * 1024 * 1024));
    let path = format!("/api/studies/{}", app.demo_id);
    let etag = format!("\"{}\"", before.revision);
    let put = app
        .api(
            "PUT",
            &path,
            Some(&token),
            &[("if-match", &etag)],
            Some(big.clone()),
        )
        .await;
    let post = app
        .api("POST", "/api/studies", Some(&token), &[], Some(big))
        .await;
    for (what, r) in [("PUT", put), ("POST", post)] {
        assert_eq!(
            r.status,
            StatusCode::PAYLOAD_TOO_LARGE,
            "{what}: {}",
            r.body
        );
        let v: serde_json::Value = serde_json::from_str(&r.body).expect("a JSON error");
        assert_eq!(v["error"]["path"], "body", "{what}");
        assert!(
            v["error"]["message"].as_str().unwrap().contains("2 MiB"),
            "{what}"
        );
    }
    let after = studies::get_study(&app.db, app.demo_id).await.unwrap();
    assert_eq!(after.revision, before.revision);
    assert_eq!(studies::list_studies(&app.db, None).await.unwrap().len(), 1);
}

#[tokio::test]
async fn a_request_whose_body_never_arrives_times_out_with_408() {
    let base = spawn_app().await;
    let config = WebConfig {
        request_timeout: Duration::from_millis(300),
        ..WebConfig::default()
    };
    let router = app(AppState::new(base.db.clone(), config));
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let addr = listener.local_addr().unwrap();
    let server = tokio::spawn(async move { axum::serve(listener, router).await });
    let token = base.token_for("eve").await;
    let mut conn = tokio::net::TcpStream::connect(addr).await.unwrap();
    let head = format!(
        "POST /api/studies HTTP/1.1\r\nHost: {addr}\r\nAuthorization: Bearer {token}\r\n\
         Content-Type: application/json\r\nContent-Length: 100\r\n\r\n{{\"na"
    );
    conn.write_all(head.as_bytes()).await.unwrap();
    let mut answer = vec![0u8; 512];
    let n = tokio::time::timeout(Duration::from_secs(10), conn.read(&mut answer))
        .await
        .expect("the server answers by itself")
        .unwrap();
    let text = String::from_utf8_lossy(&answer[..n]);
    assert!(text.starts_with("HTTP/1.1 408"), "{text}");
    server.abort();
}
