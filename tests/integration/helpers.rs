//! `TestApp`: the application over a fresh in-memory database with the demo study and
//! one account per role, driven through `oneshot`; one helper per route.

use axum::Router;
use axum::body::Body;
use axum::http::{Request, StatusCode, header};
use shaftline::config::WebConfig;
use shaftline::secrets;
use shaftline::storage::{self, Db, accounts, accounts::Role};
use shaftline::web::{AppState, app};
use tower::ServiceExt;

pub const PASSWORD: &str = "test-password-1";

pub struct TestApp {
    pub router: Router,
    pub db: Db,
    pub demo_id: i64,
}

/// A signed-in browser: its session cookie and the session's anti-forgery token.
#[derive(Clone, Debug, Default)]
pub struct Session {
    pub cookie: String,
    pub csrf: String,
}

pub struct Resp {
    pub status: StatusCode,
    pub headers: axum::http::HeaderMap,
    pub body: String,
}

impl Resp {
    pub fn location(&self) -> &str {
        self.headers
            .get(header::LOCATION)
            .and_then(|v| v.to_str().ok())
            .unwrap_or("")
    }
}

/// The value of the first `name="csrf_token" value="..."` in a page.
pub fn csrf_in(html: &str) -> String {
    let marker = "name=\"csrf_token\" value=\"";
    html.split_once(marker)
        .and_then(|(_, rest)| rest.split_once('"'))
        .map(|(v, _)| v.to_string())
        .unwrap_or_default()
}

fn set_cookie_pair(r: &Resp, name: &str) -> Option<String> {
    r.headers
        .get_all(header::SET_COOKIE)
        .iter()
        .filter_map(|v| v.to_str().ok())
        .find(|v| v.starts_with(&format!("{name}=")))
        .map(|v| v.split(';').next().unwrap_or("").to_string())
}

/// A folder for test artefacts (plots, screenshots) under the target directory.
pub fn artefact_dir(name: &str) -> std::path::PathBuf {
    let target = std::env::var_os("CARGO_TARGET_DIR")
        .map(std::path::PathBuf::from)
        .unwrap_or_else(|| std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("target"));
    let dir = target.join(name);
    std::fs::create_dir_all(&dir).expect("artefact folder");
    dir
}

pub async fn spawn_app() -> TestApp {
    let db = storage::open_memory().await.expect("in-memory database");
    let demo_id = shaftline::setup::seed_demo(&db)
        .await
        .expect("demo study seeds");
    let hash = secrets::hash_password(PASSWORD).unwrap();
    for (name, role) in [
        ("ada", Role::Admin),
        ("eve", Role::Editor),
        ("vic", Role::Viewer),
    ] {
        accounts::insert_user(&db, name, &hash, role).await.unwrap();
    }
    let router = app(AppState::new(db.clone(), WebConfig::default()));
    TestApp {
        router,
        db,
        demo_id,
    }
}

pub fn form_body(pairs: &[(&str, &str)]) -> String {
    serde_urlencoded::to_string(pairs).unwrap()
}

impl TestApp {
    pub async fn send(&self, req: Request<Body>) -> Resp {
        let resp = self
            .router
            .clone()
            .oneshot(req)
            .await
            .expect("request runs");
        let status = resp.status();
        let headers = resp.headers().clone();
        let bytes = axum::body::to_bytes(resp.into_body(), usize::MAX)
            .await
            .unwrap();
        Resp {
            status,
            headers,
            body: String::from_utf8_lossy(&bytes).into_owned(),
        }
    }

    pub async fn get(&self, path: &str, s: Option<&Session>) -> Resp {
        let mut b = Request::get(path);
        if let Some(s) = s {
            b = b.header(header::COOKIE, &s.cookie);
        }
        self.send(b.body(Body::empty()).unwrap()).await
    }

    /// POSTs a form; `csrf` is added as the `csrf_token` field when given.
    pub async fn post(
        &self,
        path: &str,
        s: Option<&Session>,
        csrf: Option<&str>,
        pairs: &[(&str, &str)],
    ) -> Resp {
        let mut all: Vec<(&str, &str)> = pairs.to_vec();
        if let Some(t) = csrf {
            all.push(("csrf_token", t));
        }
        let mut b =
            Request::post(path).header(header::CONTENT_TYPE, "application/x-www-form-urlencoded");
        if let Some(s) = s {
            b = b.header(header::COOKIE, &s.cookie);
        }
        self.send(b.body(Body::from(form_body(&all))).unwrap())
            .await
    }

    /// Posts as the signed-in browser with its own token (the normal case).
    pub async fn submit(&self, path: &str, s: &Session, pairs: &[(&str, &str)]) -> Resp {
        self.post(path, Some(s), Some(&s.csrf), pairs).await
    }

    // ---- accounts ----

    pub async fn get_login(&self) -> Resp {
        self.get("/login", None).await
    }

    /// Signs in through the login form; returns the response and the session if any.
    pub async fn login_as(&self, user: &str, password: &str) -> (Resp, Option<Session>) {
        let page = self.get_login().await;
        let login_cookie =
            set_cookie_pair(&page, "shaftline_login").expect("login page sets its cookie");
        let token = csrf_in(&page.body);
        let body = form_body(&[
            ("username", user),
            ("password", password),
            ("csrf_token", &token),
            ("next", "/"),
        ]);
        let req = Request::post("/login")
            .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
            .header(header::COOKIE, &login_cookie)
            .body(Body::from(body))
            .unwrap();
        let resp = self.send(req).await;
        let Some(cookie) = set_cookie_pair(&resp, "shaftline_session") else {
            return (resp, None);
        };
        let mut s = Session {
            cookie,
            csrf: String::new(),
        };
        s.csrf = csrf_in(&self.get_studies_page(&s).await.body);
        (resp, Some(s))
    }

    pub async fn session(&self, user: &str) -> Session {
        self.login_as(user, PASSWORD)
            .await
            .1
            .expect("test account signs in")
    }

    pub async fn logout(&self, s: &Session) -> Resp {
        self.submit("/logout", s, &[]).await
    }

    pub async fn get_users_page(&self, s: &Session) -> Resp {
        self.get("/admin/users", Some(s)).await
    }

    pub async fn post_new_user(&self, s: &Session, pairs: &[(&str, &str)]) -> Resp {
        self.submit("/admin/users", s, pairs).await
    }

    /// Changes an account's role on its current revision (a fresh users page).
    pub async fn post_set_role(&self, s: &Session, name: &str, role: &str) -> Resp {
        let rev = accounts::find_user(&self.db, name)
            .await
            .unwrap()
            .expect("the account exists")
            .revision;
        self.post_set_role_at(s, name, role, rev).await
    }

    /// Changes an account's role as made on a page showing revision `rev`.
    pub async fn post_set_role_at(&self, s: &Session, name: &str, role: &str, rev: i64) -> Resp {
        let rev = rev.to_string();
        self.submit(
            &format!("/admin/users/{name}/role"),
            s,
            &[("role", role), ("revision", &rev)],
        )
        .await
    }

    // ---- studies ----

    pub async fn get_studies_page(&self, s: &Session) -> Resp {
        self.get("/", Some(s)).await
    }

    pub async fn get_study_page(&self, s: &Session, id: i64) -> Resp {
        self.get(&format!("/studies/{id}"), Some(s)).await
    }

    pub async fn post_study_header(&self, s: &Session, id: i64, pairs: &[(&str, &str)]) -> Resp {
        self.submit(&format!("/studies/{id}"), s, pairs).await
    }

    pub async fn post_new_study(&self, s: &Session, pairs: &[(&str, &str)]) -> Resp {
        self.submit("/studies", s, pairs).await
    }

    pub async fn post_import(&self, s: &Session, json: &str) -> Resp {
        self.submit("/studies/import", s, &[("study_json", json)])
            .await
    }

    pub async fn post_duplicate(&self, s: &Session, id: i64) -> Resp {
        self.submit(&format!("/studies/{id}/duplicate"), s, &[])
            .await
    }

    pub async fn get_export(&self, s: &Session, id: i64) -> Resp {
        self.get_download(s, id, "study.json").await
    }

    /// A study download: `summary.csv`, `segments.csv`, `oei_segments.csv`, `study.json`.
    pub async fn get_download(&self, s: &Session, id: i64, file: &str) -> Resp {
        self.get(&format!("/studies/{id}/{file}"), Some(s)).await
    }

    pub async fn get_candidate_template(&self, s: &Session) -> Resp {
        self.get("/candidate-template.csv", Some(s)).await
    }

    pub async fn post_import_candidates(&self, s: &Session, id: i64, csv: &str) -> Resp {
        let revision = storage::studies::get_study(&self.db, id)
            .await
            .unwrap()
            .revision;
        self.post_import_candidates_at(s, id, revision, csv).await
    }

    /// A CSV import as made on an import page showing the study at revision `rev`.
    pub async fn post_import_candidates_at(
        &self,
        s: &Session,
        id: i64,
        rev: i64,
        csv: &str,
    ) -> Resp {
        let revision = rev.to_string();
        let path = format!("/studies/{id}/candidates/import");
        self.submit(
            &path,
            s,
            &[("revision", &revision), ("candidates_csv", csv)],
        )
        .await
    }

    /// The compare page; `query` such as `?c=1&c=2&base=2`.
    pub async fn get_compare(&self, s: &Session, id: i64, query: &str) -> Resp {
        self.get(&format!("/studies/{id}/compare{query}"), Some(s))
            .await
    }

    /// The trade page; `query` such as `?x=motor_mass_kg&y=mission_energy_kwh`.
    pub async fn get_trade(&self, s: &Session, id: i64, query: &str) -> Resp {
        self.get(&format!("/studies/{id}/trade{query}"), Some(s))
            .await
    }

    /// Saves trade weights (`weight.<objective>` pairs) on the study at `revision`.
    pub async fn post_weights(
        &self,
        s: &Session,
        id: i64,
        revision: i64,
        pairs: &[(&str, &str)],
    ) -> Resp {
        let rev = revision.to_string();
        let mut all = vec![("revision", rev.as_str())];
        all.extend_from_slice(pairs);
        self.submit(&format!("/studies/{id}/trade/weights"), s, &all)
            .await
    }

    /// A study's change history: the page, or `csv = true` for `history.csv`.
    pub async fn get_history(&self, s: &Session, id: i64, csv: bool) -> Resp {
        let suffix = if csv { ".csv" } else { "" };
        self.get(&format!("/studies/{id}/history{suffix}"), Some(s))
            .await
    }

    // ---- rows ("segments" or "candidates") ----

    pub async fn get_new_row_form(&self, s: &Session, id: i64, list: &str, query: &str) -> Resp {
        self.get(&format!("/studies/{id}/{list}/new{query}"), Some(s))
            .await
    }

    pub async fn post_new_row(
        &self,
        s: &Session,
        id: i64,
        list: &str,
        pairs: &[(&str, &str)],
    ) -> Resp {
        self.submit(&format!("/studies/{id}/{list}"), s, pairs)
            .await
    }

    pub async fn get_edit_row_form(&self, s: &Session, id: i64, list: &str, row: i64) -> Resp {
        self.get(&format!("/studies/{id}/{list}/{row}/edit"), Some(s))
            .await
    }

    pub async fn post_edit_row(
        &self,
        s: &Session,
        id: i64,
        list: &str,
        row: i64,
        pairs: &[(&str, &str)],
    ) -> Resp {
        self.submit(&format!("/studies/{id}/{list}/{row}"), s, pairs)
            .await
    }

    /// Moves a row "up" or "down" on its current revision (a fresh study page).
    pub async fn post_move_row(
        &self,
        s: &Session,
        id: i64,
        list: &str,
        row: i64,
        dir: &str,
    ) -> Resp {
        let item = if list == "segments" {
            storage::studies::Item::Segment
        } else {
            storage::studies::Item::Candidate
        };
        let rev = storage::studies::get_item(&self.db, item, id, row)
            .await
            .unwrap()
            .revision;
        self.post_move_row_at(s, id, list, row, dir, rev).await
    }

    /// Moves a row as done from a study page showing the row at revision `rev`.
    pub async fn post_move_row_at(
        &self,
        s: &Session,
        id: i64,
        list: &str,
        row: i64,
        dir: &str,
        rev: i64,
    ) -> Resp {
        let rev = rev.to_string();
        self.submit(
            &format!("/studies/{id}/{list}/{row}/move"),
            s,
            &[("direction", dir), ("revision", &rev)],
        )
        .await
    }

    pub async fn post_delete_row(
        &self,
        s: &Session,
        id: i64,
        list: &str,
        row: i64,
        rev: i64,
    ) -> Resp {
        let rev = rev.to_string();
        self.submit(
            &format!("/studies/{id}/{list}/{row}/delete"),
            s,
            &[("revision", &rev)],
        )
        .await
    }

    pub async fn get_candidate_page(&self, s: &Session, id: i64, row: i64) -> Resp {
        self.get(&format!("/studies/{id}/candidates/{row}"), Some(s))
            .await
    }

    // ---- API ----

    pub async fn api(
        &self,
        method: &str,
        path: &str,
        token: Option<&str>,
        extra: &[(&str, &str)],
        body: Option<String>,
    ) -> Resp {
        let mut b = Request::builder().method(method).uri(path);
        if let Some(t) = token {
            b = b.header(header::AUTHORIZATION, format!("Bearer {t}"));
        }
        for (k, v) in extra {
            b = b.header(*k, *v);
        }
        let body = body.map(Body::from).unwrap_or_else(Body::empty);
        self.send(
            b.header(header::CONTENT_TYPE, "application/json")
                .body(body)
                .unwrap(),
        )
        .await
    }

    /// Creates an API token for `user` the way `shaftline token create` does.
    pub async fn token_for(&self, user: &str) -> String {
        let token = secrets::random_token(43);
        accounts::insert_api_token(&self.db, &secrets::token_digest(&token), user)
            .await
            .unwrap();
        token
    }

    pub async fn health(&self) -> Resp {
        self.get("/health", None).await
    }
}
