//! The web layer's errors: `AppError` renders a helpful HTML page for 4xx and a generic
//! one for 5xx (the cause is logged); `ApiError` answers `{"error": {"path", "message"}}`.

use axum::http::StatusCode;
use axum::response::{Html, IntoResponse, Response};
use serde_json::{Value, json};

use crate::storage::StorageError;

/// An error of an HTML page handler.
#[derive(Debug, thiserror::Error)]
pub enum AppError {
    #[error("{0}")]
    NotFound(String),
    #[error("{0}")]
    Forbidden(String),
    #[error("{0}")]
    BadRequest(String),
    #[error("{0}")]
    Conflict(String),
    #[error("internal error: {0}")]
    Internal(String),
}

impl From<StorageError> for AppError {
    fn from(e: StorageError) -> Self {
        match e {
            StorageError::NotFound { what } => AppError::NotFound(format!("no such {what}")),
            StorageError::Conflict { .. } => AppError::Conflict(e.to_string()),
            StorageError::Invalid(m) => AppError::BadRequest(m),
            StorageError::Closed(m) => AppError::Conflict(m),
            other => AppError::Internal(other.to_string()),
        }
    }
}

impl AppError {
    fn status(&self) -> StatusCode {
        match self {
            AppError::NotFound(_) => StatusCode::NOT_FOUND,
            AppError::Forbidden(_) => StatusCode::FORBIDDEN,
            AppError::BadRequest(_) => StatusCode::BAD_REQUEST,
            AppError::Conflict(_) => StatusCode::CONFLICT,
            AppError::Internal(_) => StatusCode::INTERNAL_SERVER_ERROR,
        }
    }
}

/// A minimal self-contained page, so errors render even when templates cannot.
pub fn plain_page(status: StatusCode, message: &str) -> Response {
    let body = format!(
        "<!doctype html><html lang=\"en\"><head><meta charset=\"utf-8\">\
         <title>{code} · Shaftline</title><link rel=\"stylesheet\" href=\"/static/app.css\">\
         </head><body><main class=\"narrow\"><h1>{code}</h1><p class=\"error\">{msg}</p>\
         <p><a href=\"/\">Back to the studies</a></p></main></body></html>",
        code = status,
        msg = escape(message)
    );
    (status, Html(body)).into_response()
}

/// HTML-escapes text for the hand-built pages of this module.
pub fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
        .replace('\'', "&#39;")
}

impl IntoResponse for AppError {
    fn into_response(self) -> Response {
        let status = self.status();
        if let AppError::Internal(cause) = &self {
            tracing::error!(%cause, "request failed");
            return plain_page(
                status,
                "Something went wrong on the server; it has been logged.",
            );
        }
        plain_page(status, &self.to_string())
    }
}

/// An error of a JSON API handler.
#[derive(Debug)]
pub struct ApiError {
    pub status: StatusCode,
    pub path: String,
    pub message: String,
    /// On a conflict: the row's current revision, so the caller can re-read and retry.
    pub revision: Option<i64>,
    /// On a conflict: the values stored now (the study file), so nothing need be guessed.
    pub current: Option<Value>,
}

impl ApiError {
    pub fn new(status: StatusCode, path: &str, message: impl Into<String>) -> Self {
        ApiError {
            status,
            path: path.to_string(),
            message: message.into(),
            revision: None,
            current: None,
        }
    }
}

impl From<StorageError> for ApiError {
    fn from(e: StorageError) -> Self {
        match e {
            StorageError::NotFound { what } => {
                ApiError::new(StatusCode::NOT_FOUND, "id", format!("no such {what}"))
            }
            StorageError::Conflict { revision, .. } => ApiError {
                revision: Some(revision),
                ..ApiError::new(StatusCode::CONFLICT, "revision", e.to_string())
            },
            StorageError::Invalid(m) => ApiError::new(StatusCode::UNPROCESSABLE_ENTITY, "", m),
            StorageError::Closed(m) => ApiError::new(StatusCode::CONFLICT, "status", m),
            other => {
                tracing::error!(cause = %other, "api request failed");
                ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "", "internal error")
            }
        }
    }
}

impl IntoResponse for ApiError {
    fn into_response(self) -> Response {
        let mut body = json!({ "error": { "path": self.path, "message": self.message } });
        if let Some(rev) = self.revision {
            body["error"]["revision"] = json!(rev);
        }
        if let Some(current) = self.current {
            body["error"]["current"] = current;
        }
        (self.status, axum::Json(body)).into_response()
    }
}
