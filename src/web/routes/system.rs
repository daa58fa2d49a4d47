//! Liveness check and the embedded stylesheet (no CDN, no web fonts).

use axum::Router;
use axum::http::header;
use axum::response::IntoResponse;
use axum::routing::get;

use crate::web::AppState;

const APP_CSS: &str = include_str!("../../../static/app.css");

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/health", get(health))
        .route("/static/app.css", get(stylesheet))
}

async fn health() -> impl IntoResponse {
    axum::Json(serde_json::json!({ "status": "ok" }))
}

async fn stylesheet() -> impl IntoResponse {
    ([(header::CONTENT_TYPE, "text/css; charset=utf-8")], APP_CSS)
}
