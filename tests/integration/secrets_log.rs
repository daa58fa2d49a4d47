//! Secrets never reach the log: the real server at the most verbose log level, a
//! sign-in, a page view with the session, an API call with a bearer token; the
//! captured log output contains none of the password, the session id or the token.

use std::process::Stdio;

use crate::binary::{self, client};

fn cookie_value(resp: &reqwest::Response, name: &str) -> Option<String> {
    resp.headers()
        .get_all("set-cookie")
        .iter()
        .filter_map(|v| v.to_str().ok())
        .find_map(|v| v.strip_prefix(&format!("{name}=")))
        .map(|v| v.split(';').next().unwrap_or("").to_string())
}

/// Signs in through the form; returns the session id from the cookie.
async fn sign_in(url: &str, user: &str, password: &str) -> String {
    let page = client().get(format!("{url}/login")).send().await.unwrap();
    let login = cookie_value(&page, "shaftline_login").expect("login cookie");
    let csrf = crate::helpers::csrf_in(&page.text().await.unwrap());
    let resp = client()
        .post(format!("{url}/login"))
        .header("cookie", format!("shaftline_login={login}"))
        .header("content-type", "application/x-www-form-urlencoded")
        .body(crate::helpers::form_body(&[
            ("username", user),
            ("password", password),
            ("csrf_token", &csrf),
        ]))
        .send()
        .await
        .unwrap();
    assert_eq!(resp.status(), 303, "signed in");
    cookie_value(&resp, "shaftline_session").expect("session cookie")
}

#[tokio::test]
async fn passwords_tokens_and_session_ids_never_reach_the_log() {
    let dir = tempfile::tempdir().unwrap();
    let (db, log) = (dir.path().join("l.db"), dir.path().join("server.log"));
    let password = "correct horse battery";
    let file = std::fs::File::create(&log).unwrap();
    let server = binary::start_with(&db, Stdio::from(file), &[("RUST_LOG", "trace")]);
    let admin_password = server.admin_password().expect("first start");
    let added = binary::run(
        &["user", "add", "rita", "--role", "editor"],
        &db,
        &format!("{password}\n"),
    );
    assert!(added.status.success());
    let token = binary::token(&db, "rita");
    let session = sign_in(&server.url, "rita", password).await;
    let page = client()
        .get(format!("{}/", server.url))
        .header("cookie", format!("shaftline_session={session}"))
        .send()
        .await
        .unwrap();
    assert_eq!(page.status(), 200, "the session works");
    let api = client()
        .get(format!("{}/api/studies", server.url))
        .bearer_auth(&token)
        .send()
        .await
        .unwrap();
    assert_eq!(api.status(), 200, "the token works");
    assert!(server.stop().success());
    let text = std::fs::read_to_string(&log).unwrap();
    assert!(
        text.contains("/api/studies"),
        "the log did record the requests: {} bytes",
        text.len()
    );
    for (what, secret) in [
        ("password", password),
        ("admin password", admin_password.as_str()),
        ("session id", session.as_str()),
        ("API token", token.as_str()),
    ] {
        assert!(!text.contains(secret), "the {what} appears in the log");
    }
}
