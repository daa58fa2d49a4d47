//! Sign-in, sign-out and the admin's account page.

use crate::web::routes::Routes;
use askama::Template;
use std::net::{IpAddr, SocketAddr};

use axum::extract::{ConnectInfo, Form, Path, Query, State};
use axum::http::{Extensions, HeaderMap, StatusCode, header};
use axum::response::{AppendHeaders, IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;

use crate::secrets;
use crate::storage::accounts::{self, Role, UserRow};
use crate::web::AppState;
use crate::web::auth::{Admin, LOGIN_COOKIE, SESSION_COOKIE, cookie, set_cookie};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};

pub fn router() -> Routes {
    Routes::new()
        .route("/login", get(show_login).post(login))
        .route("/logout", post(logout))
        .route("/admin/users", get(list_users).post(add_user))
        .route("/admin/users/{name}/role", post(set_role))
}

#[derive(Template)]
#[template(path = "accounts/login.html")]
struct LoginPage {
    nav: Nav,
    csrf_token: String,
    next: String,
    username: String,
    message: Option<String>,
}

#[derive(Deserialize)]
struct NextQuery {
    next: Option<String>,
}

/// Only same-site paths may be a post-login destination.
fn safe_next(next: Option<&str>) -> String {
    match next {
        Some(n) if n.starts_with('/') && !n.starts_with("//") && !n.contains('\\') => n.to_string(),
        _ => "/".to_string(),
    }
}

fn login_page(
    state: &AppState,
    headers: &HeaderMap,
    next: String,
    username: String,
    message: Option<String>,
) -> Response {
    let existing = cookie(headers, LOGIN_COOKIE).filter(|t| t.len() == 32);
    let token = existing
        .clone()
        .unwrap_or_else(|| secrets::random_token(32));
    let page = LoginPage {
        nav: Nav::default(),
        csrf_token: token.clone(),
        next,
        username,
        message,
    };
    let mut resp = HtmlTemplate(page).into_response();
    if existing.is_none() {
        let value = set_cookie(state, LOGIN_COOKIE, &token, 3600);
        if let Ok(v) = value.parse() {
            resp.headers_mut().append(header::SET_COOKIE, v);
        }
    }
    resp
}

async fn show_login(
    State(state): State<AppState>,
    headers: HeaderMap,
    Query(q): Query<NextQuery>,
) -> Response {
    login_page(
        &state,
        &headers,
        safe_next(q.next.as_deref()),
        String::new(),
        None,
    )
}

#[derive(Deserialize)]
struct LoginForm {
    username: String,
    password: String,
    next: Option<String>,
}

async fn check_login(state: &AppState, form: &LoginForm) -> Result<Option<UserRow>, AppError> {
    let Some(user) = accounts::find_user(&state.db, &form.username).await? else {
        return Ok(None);
    };
    let (password, phc) = (form.password.clone(), user.password_hash.clone());
    let ok = tokio::task::spawn_blocking(move || secrets::verify_password(&password, &phc))
        .await
        .map_err(|e| AppError::Internal(e.to_string()))?;
    Ok(ok.then_some(user))
}

/// The client's address, when the server was started with connection info.
fn client_addr(ext: &Extensions) -> Option<IpAddr> {
    ext.get::<ConnectInfo<SocketAddr>>().map(|c| c.0.ip())
}

async fn login(
    State(state): State<AppState>,
    headers: HeaderMap,
    ext: Extensions,
    Form(form): Form<LoginForm>,
) -> Result<Response, AppError> {
    let next = safe_next(form.next.as_deref());
    let addr = client_addr(&ext);
    if let Err(refusal) = state.login_limiter.check(&form.username, addr) {
        let msg = refusal.message().to_string();
        let page = login_page(&state, &headers, next, form.username, Some(msg));
        return Ok((StatusCode::TOO_MANY_REQUESTS, page).into_response());
    }
    let Some(user) = check_login(&state, &form).await? else {
        state
            .login_limiter
            .record_failure_from(&form.username, addr);
        let msg = "Unknown username or wrong password.";
        return Ok(login_page(
            &state,
            &headers,
            next,
            form.username,
            Some(msg.into()),
        ));
    };
    state.login_limiter.record_success(&form.username);
    let token = secrets::random_token(43);
    let csrf = secrets::random_token(32);
    let lifetime = state.config.session_lifetime_s;
    accounts::insert_session(
        &state.db,
        &secrets::token_digest(&token),
        user.id,
        &csrf,
        lifetime,
    )
    .await?;
    let session = set_cookie(&state, SESSION_COOKIE, &token, lifetime);
    let clear_login = set_cookie(&state, LOGIN_COOKIE, "", 0);
    let cookies = AppendHeaders([
        (header::SET_COOKIE, session),
        (header::SET_COOKIE, clear_login),
    ]);
    Ok((cookies, Redirect::to(&next)).into_response())
}

async fn logout(State(state): State<AppState>, headers: HeaderMap) -> Result<Response, AppError> {
    if let Some(token) = cookie(&headers, SESSION_COOKIE) {
        accounts::delete_session(&state.db, &secrets::token_digest(&token)).await?;
    }
    let clear = set_cookie(&state, SESSION_COOKIE, "", 0);
    Ok(([(header::SET_COOKIE, clear)], Redirect::to("/login")).into_response())
}

#[derive(Template)]
#[template(path = "accounts/users.html")]
struct UsersPage {
    nav: Nav,
    users: Vec<UserRow>,
    roles: Vec<&'static str>,
    message: Option<String>,
    form_username: String,
    form_role: &'static str,
    err_username: Option<String>,
    err_password: Option<String>,
}

impl UsersPage {
    async fn load(state: &AppState, nav: Nav) -> Result<Self, AppError> {
        Ok(UsersPage {
            nav,
            users: accounts::list_users(&state.db).await?,
            roles: Role::ALL.iter().map(|r| r.as_str()).collect(),
            message: None,
            form_username: String::new(),
            form_role: "viewer",
            err_username: None,
            err_password: None,
        })
    }
}

async fn list_users(
    State(state): State<AppState>,
    Admin(user): Admin,
) -> Result<impl IntoResponse, AppError> {
    Ok(HtmlTemplate(UsersPage::load(&state, Nav::of(&user)).await?))
}

#[derive(Deserialize)]
struct NewUserForm {
    username: String,
    password: String,
    role: String,
}

async fn add_user(
    State(state): State<AppState>,
    Admin(user): Admin,
    Form(form): Form<NewUserForm>,
) -> Result<Response, AppError> {
    let mut page = UsersPage::load(&state, Nav::of(&user)).await?;
    page.form_username = form.username.clone();
    let role: Role = form.role.parse().map_err(AppError::BadRequest)?;
    page.form_role = role.as_str();
    page.err_username = secrets::check_username(&form.username).err();
    page.err_password = secrets::check_new_password(&form.password).err();
    if page.err_username.is_some() || page.err_password.is_some() {
        return Ok((StatusCode::UNPROCESSABLE_ENTITY, HtmlTemplate(page)).into_response());
    }
    let password = form.password.clone();
    let hash = tokio::task::spawn_blocking(move || secrets::hash_password(&password))
        .await
        .map_err(|e| AppError::Internal(e.to_string()))?
        .map_err(AppError::Internal)?;
    match accounts::insert_user_as(&state.db, &form.username, &hash, role, &user.username).await {
        Ok(_) => Ok(Redirect::to("/admin/users").into_response()),
        Err(crate::storage::StorageError::Invalid(m)) => {
            page.err_username = Some(m);
            Ok((StatusCode::UNPROCESSABLE_ENTITY, HtmlTemplate(page)).into_response())
        }
        Err(e) => Err(e.into()),
    }
}

#[derive(Deserialize)]
struct RoleForm {
    role: String,
    /// The account's revision on the page the change was made from.
    revision: i64,
}

async fn set_role(
    State(state): State<AppState>,
    Admin(user): Admin,
    Path(name): Path<String>,
    Form(form): Form<RoleForm>,
) -> Result<Response, AppError> {
    let role: Role = form.role.parse().map_err(AppError::BadRequest)?;
    if name == user.username && role < Role::Admin {
        return Err(AppError::BadRequest(
            "role: you cannot remove your own admin role".into(),
        ));
    }
    let by = &user.username;
    match accounts::set_role_checked(&state.db, &name, role, Some(form.revision), by).await {
        Ok(()) => Ok(Redirect::to("/admin/users").into_response()),
        Err(e @ crate::storage::StorageError::Conflict { .. }) => {
            let now = accounts::find_user(&state.db, &name)
                .await?
                .ok_or(AppError::NotFound("no such user".into()))?;
            Err(AppError::Conflict(format!(
                "Nothing was changed: the account {name} was {e}. Its role is now {} \
                 (revision {}).",
                now.role, now.revision
            )))
        }
        Err(e) => Err(e.into()),
    }
}
