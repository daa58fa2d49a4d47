//! Turns askama templates into responses, and the navigation bar every page carries.

use askama::Template;
use axum::http::StatusCode;
use axum::response::{Html, IntoResponse, Response};

use super::auth::CurrentUser;
use super::error::plain_page;

/// An askama page as an HTML response (500 with the cause logged if rendering fails).
pub struct HtmlTemplate<T>(pub T);

impl<T: Template> IntoResponse for HtmlTemplate<T> {
    fn into_response(self) -> Response {
        match self.0.render() {
            Ok(html) => Html(html).into_response(),
            Err(e) => {
                tracing::error!(error = %e, "template rendering failed");
                plain_page(
                    StatusCode::INTERNAL_SERVER_ERROR,
                    "The page could not be rendered.",
                )
            }
        }
    }
}

/// What the header of every page shows: who is signed in, and the logout form's token.
#[derive(Debug, Clone, Default)]
pub struct Nav {
    pub username: String,
    pub role: String,
    pub csrf_token: String,
    pub is_admin: bool,
    pub can_edit: bool,
}

impl Nav {
    pub fn of(user: &CurrentUser) -> Self {
        use crate::storage::accounts::Role;
        Nav {
            username: user.username.clone(),
            role: user.role.to_string(),
            csrf_token: user.csrf_token.clone(),
            is_admin: user.role >= Role::Admin,
            can_edit: user.role >= Role::Editor,
        }
    }

    pub fn signed_in(&self) -> bool {
        !self.username.is_empty()
    }
}
