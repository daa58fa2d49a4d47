//! The authorisation matrix: every route the application registers × (anonymous,
//! viewer, editor, admin) → the expected status. The rules live in one table keyed by
//! method and path pattern; a route without a rule, or a rule without a route, fails.

use axum::body::Body;
use axum::http::{Method, Request, StatusCode, header};
use shaftline::storage::studies::{self, Item};

use crate::helpers::{Resp, TestApp, csrf_in, form_body, spawn_app};

/// Who a route admits.
#[derive(Clone, Copy, Debug)]
enum Access {
    /// Anyone, signed in or not.
    Public,
    /// A page for a signed-in user of at least this role (0 viewer, 1 editor, 2 admin).
    Page(u8),
    /// The JSON API for a caller of at least this role.
    Api(u8),
    /// A review action for its presenter only (the editor `eve`, who starts the review):
    /// other signed-in callers get 403 whatever their role.
    Presenter,
}

use Access::{Api, Page, Presenter, Public};

/// (method, path pattern, who may, the status an admitted caller gets from a bare request).
const RULES: &[(&str, &str, Access, u16)] = &[
    ("GET", "/health", Public, 200),
    ("GET", "/static/app.css", Public, 200),
    ("GET", "/login", Public, 200),
    ("POST", "/login", Public, 200),
    ("POST", "/logout", Page(0), 303),
    ("GET", "/admin/users", Page(2), 200),
    ("POST", "/admin/users", Page(2), 422),
    ("POST", "/admin/users/{name}/role", Page(2), 422),
    ("GET", "/", Page(0), 200),
    ("POST", "/studies", Page(1), 422),
    ("POST", "/studies/import", Page(1), 422),
    ("POST", "/studies/{id}/duplicate", Page(1), 303),
    ("GET", "/studies/{id}", Page(0), 200),
    ("POST", "/studies/{id}", Page(1), 400),
    ("GET", "/studies/{id}/segments/new", Page(1), 200),
    ("POST", "/studies/{id}/segments", Page(1), 422),
    ("GET", "/studies/{id}/segments/{row}/edit", Page(1), 200),
    ("POST", "/studies/{id}/segments/{row}", Page(1), 400),
    ("POST", "/studies/{id}/segments/{row}/move", Page(1), 422),
    ("POST", "/studies/{id}/segments/{row}/delete", Page(1), 400),
    ("GET", "/studies/{id}/candidates/new", Page(1), 400),
    ("POST", "/studies/{id}/candidates", Page(1), 400),
    ("GET", "/studies/{id}/candidates/{row}/edit", Page(1), 200),
    ("GET", "/studies/{id}/candidates/{row}", Page(0), 200),
    ("POST", "/studies/{id}/candidates/{row}", Page(1), 400),
    ("POST", "/studies/{id}/candidates/{row}/move", Page(1), 422),
    (
        "POST",
        "/studies/{id}/candidates/{row}/delete",
        Page(1),
        400,
    ),
    ("GET", "/studies/{id}/summary.csv", Page(0), 200),
    ("GET", "/studies/{id}/segments.csv", Page(0), 200),
    ("GET", "/studies/{id}/oei_segments.csv", Page(0), 200),
    ("GET", "/studies/{id}/study.json", Page(0), 200),
    ("GET", "/studies/{id}/export", Page(0), 200),
    ("GET", "/candidate-template.csv", Page(0), 200),
    ("GET", "/studies/{id}/candidates/import", Page(1), 200),
    ("POST", "/studies/{id}/candidates/import", Page(1), 422),
    ("GET", "/studies/{id}/compare", Page(0), 200),
    ("GET", "/studies/{id}/history", Page(0), 200),
    ("GET", "/studies/{id}/history.csv", Page(0), 200),
    ("GET", "/api/studies", Api(0), 200),
    ("POST", "/api/studies", Api(1), 400),
    ("GET", "/api/studies/{id}", Api(0), 200),
    ("PUT", "/api/studies/{id}", Api(1), 428),
    ("GET", "/api/studies/{id}/results", Api(0), 200),
    ("GET", "/studies/{id}/trade", Page(0), 200),
    ("POST", "/studies/{id}/trade/weights", Page(1), 400),
    ("GET", "/studies/{id}/reviews", Page(0), 200),
    ("POST", "/studies/{id}/reviews", Page(1), 400),
    ("GET", "/reviews/{id}", Page(0), 200),
    ("GET", "/reviews/{id}/compare", Page(0), 200),
    ("GET", "/reviews/{id}/trade", Page(0), 200),
    ("GET", "/reviews/{id}/candidates/{n}", Page(0), 200),
    ("GET", "/reviews/{id}/segments/{n}", Page(0), 200),
    ("POST", "/reviews/{id}/view", Presenter, 303),
    ("POST", "/reviews/{id}/presenter", Page(1), 400),
    ("POST", "/reviews/{id}/comments", Page(0), 400),
    ("POST", "/reviews/{id}/decisions", Page(1), 400),
    ("POST", "/reviews/{id}/close", Page(1), 303),
    ("GET", "/reviews/{id}/events", Page(0), 200),
    ("GET", "/reviews/{id}/minutes.csv", Page(0), 200),
    ("GET", "/reviews/{id}/minutes.md", Page(0), 200),
    ("GET", "/reviews/{id}/diff", Page(0), 200),
    ("POST", "/api/studies/{id}/reviews", Api(1), 422),
    ("GET", "/api/reviews/{id}", Api(0), 200),
    ("GET", "/api/reviews/{id}/diff", Api(0), 200),
    ("GET", "/static/review.js", Public, 200),
    ("GET", "/static/sweep.js", Public, 200),
    ("GET", "/studies/{id}/candidates/{cid}/sweep", Page(0), 200),
    ("POST", "/studies/{id}/candidates/{cid}/sweep", Page(1), 400),
    ("GET", "/sweeps/{job}", Page(0), 404),
    ("GET", "/sweeps/{job}/events", Page(0), 404),
    ("POST", "/sweeps/{job}/cancel", Page(1), 404),
    ("GET", "/sweeps/{job}/rows.csv", Page(0), 404),
    ("POST", "/sweeps/{job}/promote", Page(1), 404),
    ("GET", "/studies/{id}/robustness", Page(0), 200),
    ("GET", "/studies/{id}/robustness.csv", Page(0), 200),
];

const METHODS: [Method; 5] = [
    Method::GET,
    Method::POST,
    Method::PUT,
    Method::DELETE,
    Method::PATCH,
];
const CALLERS: [Option<&str>; 4] = [None, Some("vic"), Some("eve"), Some("ada")];

/// What `caller` (index into `CALLERS`: 0 anonymous … 3 admin) must get.
fn expected(method: &str, access: Access, ok: u16, caller: usize) -> u16 {
    let write = method != "GET";
    match access {
        Public => ok,
        _ if caller == 0 && write => 403, // no session, so no anti-forgery token
        Page(_) if caller == 0 => 303,    // sent to the login page
        Api(_) if caller == 0 => 401,
        Page(need) | Api(need) if (caller as u8) - 1 < need => 403,
        Presenter if CALLERS[caller] != Some("eve") => 403,
        _ => ok,
    }
}

struct Ids {
    review: i64,
    study: i64,
    segment: i64,
    candidate: i64,
}

fn concrete(pattern: &str, ids: &Ids) -> String {
    let row = if pattern.contains("/segments/") {
        ids.segment
    } else {
        ids.candidate
    };
    let id = if pattern.contains("/reviews/")
        && !pattern.starts_with("/studies/")
        && !pattern.starts_with("/api/studies/")
    {
        ids.review
    } else {
        ids.study
    };
    pattern
        .replace("{id}", &id.to_string())
        .replace("{n}", "0")
        .replace("{cid}", &ids.candidate.to_string())
        .replace("{job}", "no-such-job")
        .replace("{row}", &row.to_string())
        .replace("{name}", "vic")
}

/// The methods the router really serves at `path` (anything but 405).
async fn routed_methods(app: &TestApp, path: &str, token: &str) -> Vec<Method> {
    let mut found = Vec::new();
    for m in METHODS {
        let req = Request::builder()
            .method(m.clone())
            .uri(path)
            .header(header::AUTHORIZATION, format!("Bearer {token}"))
            .body(Body::empty())
            .unwrap();
        if app.send(req).await.status != StatusCode::METHOD_NOT_ALLOWED {
            found.push(m);
        }
    }
    found
}

/// One bare request as `caller`: a fresh session (or token for the API) each time,
/// since some routes (sign-out) end the session they are called with.
async fn call(app: &TestApp, method: &str, path: &str, access: Access, caller: usize) -> Resp {
    if method == "POST" && path == "/login" {
        return wrong_login(app).await;
    }
    // Closing is done once per review: each caller tries a review of its own.
    let fresh;
    let path = if path.ends_with("/close") {
        let review = app
            .start_demo_review(&app.token_for("eve").await, "Closing check")
            .await;
        fresh = format!("/reviews/{review}/close");
        fresh.as_str()
    } else {
        path
    };
    let mut b = Request::builder().method(method).uri(path);
    let mut body = String::new();
    if let Some(user) = CALLERS[caller] {
        if let Api(_) = access {
            b = b.header(
                header::AUTHORIZATION,
                format!("Bearer {}", app.token_for(user).await),
            );
        } else {
            let s = app.session(user).await;
            b = b.header(header::COOKIE, &s.cookie);
            body = form_body(&[("csrf_token", &s.csrf)]);
        }
    }
    let ct = match access {
        Api(_) => "application/json",
        _ => "application/x-www-form-urlencoded",
    };
    let req = b
        .header(header::CONTENT_TYPE, ct)
        .body(Body::from(body))
        .unwrap();
    if path.ends_with("/events") {
        return head_only(app, req).await;
    }
    app.send(req).await
}

/// The status and headers of a streaming response (server-sent events never end).
async fn head_only(app: &TestApp, req: Request<Body>) -> Resp {
    use tower::ServiceExt;
    let resp = app.router.clone().oneshot(req).await.expect("request runs");
    Resp {
        status: resp.status(),
        headers: resp.headers().clone(),
        body: String::new(),
    }
}

/// A sign-in attempt with a wrong password, carrying the login page's token.
async fn wrong_login(app: &TestApp) -> Resp {
    let page = app.get_login().await;
    let cookie = page
        .headers
        .get(header::SET_COOKIE)
        .and_then(|v| v.to_str().ok())
        .and_then(|v| v.split(';').next())
        .unwrap_or("")
        .to_string();
    let body = form_body(&[
        ("username", "vic"),
        ("password", "not the password"),
        ("csrf_token", &csrf_in(&page.body)),
    ]);
    let req = Request::post("/login")
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
        .header(header::COOKIE, cookie)
        .body(Body::from(body))
        .unwrap();
    app.send(req).await
}

async fn first_row(app: &TestApp, item: Item) -> i64 {
    studies::list_items(&app.db, item, app.demo_id)
        .await
        .unwrap()[0]
        .id
}

#[tokio::test]
async fn every_route_admits_exactly_the_roles_its_rule_names() {
    let app = spawn_app().await;
    let eve = app.token_for("eve").await;
    let ids = Ids {
        review: app.start_demo_review(&eve, "Access check").await,
        study: app.demo_id,
        segment: first_row(&app, Item::Segment).await,
        candidate: first_row(&app, Item::Candidate).await,
    };
    let probe = app.token_for("ada").await;
    let (mut missing, mut wrong, mut used) = (Vec::new(), Vec::new(), Vec::new());
    for pattern in shaftline::web::route_paths() {
        let mut path = concrete(pattern, &ids);
        if pattern.contains("/robustness") {
            path.push_str("?samples=2"); // a small sample keeps the matrix quick
        }
        for m in routed_methods(&app, &path, &probe).await {
            let rule = RULES.iter().find(|r| r.0 == m.as_str() && r.1 == pattern);
            let Some(&(method, _, access, ok)) = rule else {
                missing.push(format!("{m} {pattern}"));
                continue;
            };
            used.push((method, pattern));
            for (caller, who) in CALLERS.iter().enumerate() {
                let got = call(&app, method, &path, access, caller).await;
                let want = expected(method, access, ok, caller);
                let to_login = want != 303
                    || access_is_public(access)
                    || caller > 0
                    || got.location().starts_with("/login?next=");
                if got.status.as_u16() != want || !to_login {
                    wrong.push(format!(
                        "{method} {pattern} as {:?}: got {} (→ {}), want {want}",
                        who,
                        got.status,
                        got.location()
                    ));
                }
            }
        }
    }
    let stale: Vec<_> = RULES
        .iter()
        .filter(|r| !used.contains(&(r.0, r.1)))
        .map(|r| format!("{} {}", r.0, r.1))
        .collect();
    assert!(missing.is_empty(), "routes without a rule: {missing:#?}");
    assert!(stale.is_empty(), "rules without a route: {stale:#?}");
    assert!(wrong.is_empty(), "unexpected statuses: {wrong:#?}");
    assert!(used.len() >= RULES.len(), "every rule was exercised");
}

fn access_is_public(a: Access) -> bool {
    matches!(a, Public)
}
