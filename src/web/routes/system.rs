//! Liveness check, the embedded stylesheet and the sweep progress script (no CDN, no
//! web fonts).

use crate::web::routes::Routes;
use axum::http::header;
use axum::response::IntoResponse;
use axum::routing::get;

const APP_CSS: &str = include_str!("../../../static/app.css");
const SWEEP_JS: &str = include_str!("../../../static/sweep.js");

pub fn router() -> Routes {
    Routes::new()
        .route("/health", get(health))
        .route("/static/app.css", get(stylesheet))
        .route("/static/sweep.js", get(sweep_script))
}

async fn health() -> impl IntoResponse {
    axum::Json(serde_json::json!({ "status": "ok" }))
}

async fn stylesheet() -> impl IntoResponse {
    ([(header::CONTENT_TYPE, "text/css; charset=utf-8")], APP_CSS)
}

async fn sweep_script() -> impl IntoResponse {
    (
        [(header::CONTENT_TYPE, "text/javascript; charset=utf-8")],
        SWEEP_JS,
    )
}
