//! The web application: shared state, the router assembled from one router per
//! feature, security layers, and `serve` with graceful shutdown.

pub mod auth;
pub mod error;
pub mod fields;
pub mod forms;
pub mod html;
pub mod limiter;
pub mod live;
pub mod plots;
pub mod routes;
pub mod scoring;
pub mod snapshot;
pub mod sweeps;
pub mod validate;

use std::io::Write;
use std::sync::Arc;

use anyhow::Context;
use axum::Router;
use axum::extract::DefaultBodyLimit;
use axum::http::{HeaderName, HeaderValue, StatusCode, header};
use axum::middleware::from_fn_with_state;
use tower_http::set_header::SetResponseHeaderLayer;
use tower_http::timeout::TimeoutLayer;
use tower_http::trace::TraceLayer;

use crate::config::{ServeArgs, WebConfig};
use crate::storage::{self, Db};

/// What every handler can reach.
#[derive(Clone)]
pub struct AppState {
    pub db: Db,
    pub config: Arc<WebConfig>,
    pub login_limiter: Arc<limiter::LoginLimiter>,
    pub results: Arc<scoring::ResultsCache>,
    pub reviews: Arc<live::ReviewHub>,
    pub sweeps: Arc<sweeps::SweepJobs>,
}

impl AppState {
    pub fn new(db: Db, config: WebConfig) -> Self {
        AppState {
            db,
            config: Arc::new(config),
            login_limiter: Arc::default(),
            results: Arc::default(),
            reviews: Arc::default(),
            sweeps: Arc::default(),
        }
    }
}

const CSP: &str = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; \
                   frame-ancestors 'none'; form-action 'self'; base-uri 'none'";

fn header_layer(name: HeaderName, value: &'static str) -> SetResponseHeaderLayer<HeaderValue> {
    SetResponseHeaderLayer::if_not_present(name, HeaderValue::from_static(value))
}

/// Every feature's routes, merged; `app` serves them and tests list them.
pub fn routes() -> routes::Routes {
    routes::Routes::new()
        .merge(routes::system::router())
        .merge(routes::accounts::router())
        .merge(routes::studies::router())
        .merge(routes::study::router())
        .merge(routes::items::router())
        .merge(routes::exports::router())
        .merge(routes::import::router())
        .merge(routes::compare::router())
        .merge(routes::trade::router())
        .merge(routes::api::router())
        .merge(routes::reviews::router())
        .merge(routes::history::router())
        .merge(routes::sweeps::router())
        .merge(routes::robustness::router())
}

/// The path pattern of every route the application serves.
pub fn route_paths() -> Vec<&'static str> {
    routes().paths().to_vec()
}

/// The whole application, ready for `axum::serve` or `oneshot` in tests.
pub fn app(state: AppState) -> Router {
    routes()
        .into_router()
        .layer(from_fn_with_state(state.clone(), auth::csrf_guard))
        .layer(DefaultBodyLimit::max(auth::MAX_FORM_BYTES))
        .layer(TimeoutLayer::with_status_code(
            StatusCode::REQUEST_TIMEOUT,
            state.config.request_timeout,
        ))
        .layer(TraceLayer::new_for_http())
        .layer(header_layer(header::CONTENT_SECURITY_POLICY, CSP))
        .layer(header_layer(header::X_CONTENT_TYPE_OPTIONS, "nosniff"))
        .layer(header_layer(header::X_FRAME_OPTIONS, "DENY"))
        .layer(header_layer(header::REFERRER_POLICY, "same-origin"))
        .with_state(state)
}

/// `shaftline serve`: open the database, seed it on first start, listen until
/// SIGINT/SIGTERM, let in-flight requests finish, then close the pool.
pub async fn serve(args: ServeArgs) -> anyhow::Result<()> {
    let db = storage::open_file(args.db.path_str()?)
        .await
        .context("opening the database")?;
    if let Some(password) = crate::setup::first_start(&db)
        .await
        .context("first-start setup")?
    {
        let mut out = std::io::stdout().lock();
        writeln!(out, "admin password: {password}")?;
        out.flush()?;
    }
    let shutdown = shutdown_signal().context("installing the signal handlers")?;
    let listener = tokio::net::TcpListener::bind(args.addr)
        .await
        .with_context(|| format!("listening on {}", args.addr))?;
    let addr = listener.local_addr()?;
    println!("Shaftline listening on http://{addr}/");
    std::io::stdout().flush()?;
    let state = AppState::new(db.clone(), WebConfig::from(&args));
    let service = app(state).into_make_service_with_connect_info::<std::net::SocketAddr>();
    axum::serve(listener, service)
        .with_graceful_shutdown(shutdown)
        .await
        .context("serving")?;
    db.close().await;
    tracing::info!("stopped cleanly");
    Ok(())
}

/// Installs the SIGINT/SIGTERM handlers now and returns the future that waits for
/// either. Installing them before the listening line is printed means a signal sent
/// right after that line still shuts down gracefully instead of killing the process.
fn shutdown_signal() -> std::io::Result<impl std::future::Future<Output = ()>> {
    #[cfg(unix)]
    let mut term = tokio::signal::unix::signal(tokio::signal::unix::SignalKind::terminate())?;
    #[cfg(unix)]
    let mut int = tokio::signal::unix::signal(tokio::signal::unix::SignalKind::interrupt())?;
    Ok(async move {
        #[cfg(unix)]
        tokio::select! { _ = term.recv() => {}, _ = int.recv() => {} }
        #[cfg(not(unix))]
        let _ = tokio::signal::ctrl_c().await;
    })
}
