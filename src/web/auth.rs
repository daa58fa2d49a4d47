//! Who is asking: session cookies, bearer tokens, role extractors, and the anti-forgery
//! guard that every state-changing request passes before any handler runs.

use axum::body::{Body, to_bytes};
use axum::extract::{FromRequestParts, Request, State};
use axum::http::{HeaderMap, Method, StatusCode, header, request::Parts};
use axum::middleware::Next;
use axum::response::{IntoResponse, Redirect, Response};

use super::AppState;
use super::error::{ApiError, plain_page};
use crate::secrets::token_digest;
use crate::storage::accounts::{self, Role};

pub const SESSION_COOKIE: &str = "shaftline_session";
pub const LOGIN_COOKIE: &str = "shaftline_login";
/// Largest form body the guard will read to find the token.
pub const MAX_FORM_BYTES: usize = 2 * 1024 * 1024;

/// A signed-in user, read fresh from the database on every request.
#[derive(Debug, Clone)]
pub struct CurrentUser {
    pub id: i64,
    pub username: String,
    pub role: Role,
    pub csrf_token: String,
}

/// The value of cookie `name`, if the request carries it.
pub fn cookie(headers: &HeaderMap, name: &str) -> Option<String> {
    headers
        .get_all(header::COOKIE)
        .iter()
        .filter_map(|v| v.to_str().ok())
        .flat_map(|v| v.split(';'))
        .filter_map(|pair| pair.trim().split_once('='))
        .find(|(k, _)| *k == name)
        .map(|(_, v)| v.to_string())
}

/// A `Set-Cookie` value: HttpOnly, SameSite=Lax, path `/`, and Secure when configured.
pub fn set_cookie(state: &AppState, name: &str, value: &str, max_age_s: i64) -> String {
    let secure = if state.config.secure_cookies {
        "; Secure"
    } else {
        ""
    };
    format!("{name}={value}; Path=/; HttpOnly; SameSite=Lax; Max-Age={max_age_s}{secure}")
}

pub async fn session_user(state: &AppState, headers: &HeaderMap) -> Option<CurrentUser> {
    let token = cookie(headers, SESSION_COOKIE)?;
    let s = accounts::find_session(&state.db, &token_digest(&token))
        .await
        .ok()??;
    Some(CurrentUser {
        id: s.user_id,
        role: s.role.parse().unwrap_or(Role::Viewer),
        username: s.username,
        csrf_token: s.csrf_token,
    })
}

fn bearer(headers: &HeaderMap) -> Option<&str> {
    headers
        .get(header::AUTHORIZATION)?
        .to_str()
        .ok()?
        .strip_prefix("Bearer ")
        .map(str::trim)
}

async fn token_user(state: &AppState, token: &str) -> Option<CurrentUser> {
    let u = accounts::find_token_user(&state.db, &token_digest(token))
        .await
        .ok()??;
    Some(CurrentUser {
        id: u.id,
        role: u.role(),
        username: u.username,
        csrf_token: String::new(),
    })
}

/// Percent-encodes a path for the `next` query parameter of the login page.
pub fn encode_next(path: &str) -> String {
    percent_encoding::utf8_percent_encode(path, percent_encoding::NON_ALPHANUMERIC).to_string()
}

async fn page_user(parts: &Parts, state: &AppState, need: Role) -> Result<CurrentUser, Response> {
    let Some(user) = session_user(state, &parts.headers).await else {
        let here = parts
            .uri
            .path_and_query()
            .map(|p| p.as_str())
            .unwrap_or("/");
        let target = format!("/login?next={}", encode_next(here));
        return Err(Redirect::to(&target).into_response());
    };
    if user.role < need {
        let msg = format!(
            "This needs the {need} role; you are signed in as a {}.",
            user.role
        );
        return Err(plain_page(StatusCode::FORBIDDEN, &msg));
    }
    Ok(user)
}

async fn api_user(parts: &Parts, state: &AppState, need: Role) -> Result<CurrentUser, Response> {
    let user = match bearer(&parts.headers) {
        Some(t) => token_user(state, t).await,
        None => session_user(state, &parts.headers).await,
    };
    let Some(user) = user else {
        let e = ApiError::new(
            StatusCode::UNAUTHORIZED,
            "authorization",
            "sign in or send a valid bearer token",
        );
        return Err(e.into_response());
    };
    if user.role < need {
        let msg = format!("needs the {need} role (this account is {})", user.role);
        return Err(ApiError::new(StatusCode::FORBIDDEN, "authorization", msg).into_response());
    }
    Ok(user)
}

macro_rules! role_extractor {
    ($name:ident, $role:expr, $check:ident, $doc:literal) => {
        #[doc = $doc]
        pub struct $name(pub CurrentUser);

        impl FromRequestParts<AppState> for $name {
            type Rejection = Response;
            async fn from_request_parts(
                parts: &mut Parts,
                state: &AppState,
            ) -> Result<Self, Response> {
                $check(parts, state, $role).await.map($name)
            }
        }
    };
}

role_extractor!(
    Viewer,
    Role::Viewer,
    page_user,
    "A signed-in page user (anonymous: sent to login)."
);
role_extractor!(
    Editor,
    Role::Editor,
    page_user,
    "A page user who may edit studies."
);
role_extractor!(
    Admin,
    Role::Admin,
    page_user,
    "A page user who may manage accounts."
);
role_extractor!(
    ApiViewer,
    Role::Viewer,
    api_user,
    "An API caller who may read."
);
role_extractor!(
    ApiEditor,
    Role::Editor,
    api_user,
    "An API caller who may edit."
);

fn same(a: &str, b: &str) -> bool {
    a.len() == b.len()
        && a.bytes()
            .zip(b.bytes())
            .fold(0u8, |acc, (x, y)| acc | (x ^ y))
            == 0
}

fn is_form(headers: &HeaderMap) -> bool {
    headers
        .get(header::CONTENT_TYPE)
        .and_then(|v| v.to_str().ok())
        .is_some_and(|v| v.starts_with("application/x-www-form-urlencoded"))
}

fn form_token(body: &[u8]) -> Option<String> {
    let pairs: Vec<(String, String)> = serde_urlencoded::from_bytes(body).ok()?;
    pairs
        .into_iter()
        .find(|(k, _)| k == "csrf_token")
        .map(|(_, v)| v)
}

/// The 413 answer: JSON under `/api/`, a plain page elsewhere.
pub fn too_large(path: &str) -> Response {
    let msg = format!(
        "request body too large: the limit is {} MiB",
        MAX_FORM_BYTES / (1024 * 1024)
    );
    if path.starts_with("/api/") {
        ApiError::new(StatusCode::PAYLOAD_TOO_LARGE, "body", msg).into_response()
    } else {
        plain_page(StatusCode::PAYLOAD_TOO_LARGE, &msg)
    }
}

fn forbidden(path: &str) -> Response {
    let msg = "missing or wrong anti-forgery token (csrf_token); reload the page and try again";
    if path.starts_with("/api/") {
        ApiError::new(StatusCode::FORBIDDEN, "csrf_token", msg).into_response()
    } else {
        plain_page(StatusCode::FORBIDDEN, msg)
    }
}

/// Refuses every state-changing request whose anti-forgery token does not match: the
/// form field `csrf_token` or the `X-CSRF-Token` header against the session's token
/// (or, for the login form, against the pre-login cookie). Bearer-token API calls carry
/// no ambient credential and are exempt.
pub async fn csrf_guard(State(state): State<AppState>, req: Request, next: Next) -> Response {
    let safe = matches!(*req.method(), Method::GET | Method::HEAD | Method::OPTIONS);
    if safe || bearer(req.headers()).is_some() {
        return next.run(req).await;
    }
    let path = req.uri().path().to_string();
    let expected = if path == "/login" {
        cookie(req.headers(), LOGIN_COOKIE)
    } else {
        session_user(&state, req.headers())
            .await
            .map(|u| u.csrf_token)
    };
    let (parts, body) = req.into_parts();
    let Ok(bytes) = to_bytes(body, MAX_FORM_BYTES).await else {
        return too_large(&path);
    };
    let given = match parts
        .headers
        .get("x-csrf-token")
        .and_then(|v| v.to_str().ok())
    {
        Some(h) => Some(h.to_string()),
        None if is_form(&parts.headers) => form_token(&bytes),
        None => None,
    };
    match (expected, given) {
        (Some(e), Some(g)) if !e.is_empty() && same(&e, &g) => {
            next.run(Request::from_parts(parts, Body::from(bytes)))
                .await
        }
        _ => forbidden(&path),
    }
}
