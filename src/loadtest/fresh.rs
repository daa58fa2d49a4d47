//! The load test against a fresh server of its own: a temporary database with the demo
//! study and an editor's API token, served on an ephemeral loopback port.

use anyhow::Context;

use super::{Report, Target, run};
use crate::config::WebConfig;
use crate::storage::{self, accounts};
use crate::web::{AppState, app};

/// Starts a server on 127.0.0.1 (port chosen by the system), runs `requests` requests
/// from `clients` concurrent clients against it, stops it and returns the report.
pub async fn run_fresh(clients: usize, requests: usize) -> anyhow::Result<Report> {
    let dir = tempfile_dir()?;
    let path = dir.join("load.db");
    let db = storage::open_file(path.to_str().context("temporary path")?).await?;
    let study_id = crate::setup::seed_demo(&db).await?;
    accounts::insert_user(&db, "loader", "unused", accounts::Role::Editor).await?;
    let token = crate::secrets::random_token(43);
    accounts::insert_api_token(&db, &crate::secrets::token_digest(&token), "loader").await?;
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await?;
    let addr = listener.local_addr()?;
    let router = app(AppState::new(db.clone(), WebConfig::default()));
    let server = tokio::spawn(async move { axum::serve(listener, router).await });
    let report = run(
        Target {
            addr,
            token,
            study_id,
        },
        clients,
        requests,
    )
    .await;
    server.abort();
    db.close().await;
    let _ = std::fs::remove_dir_all(&dir);
    Ok(report)
}

fn tempfile_dir() -> anyhow::Result<std::path::PathBuf> {
    let dir = std::env::temp_dir().join(format!(
        "shaftline-load-{}-{}",
        std::process::id(),
        storage::now_unix()
    ));
    std::fs::create_dir_all(&dir).with_context(|| format!("creating {}", dir.display()))?;
    Ok(dir)
}
