//! First start on an empty database: create `admin` with a one-time random password
//! and seed the demo study. The caller prints the password once; only its hash is kept.

use anyhow::Context;

use crate::engine::study::parse_study_str;
use crate::secrets;
use crate::storage::Db;
use crate::storage::accounts::{self, Role};
use crate::storage::studies::{self, StudyDoc};

/// Length of the generated admin password (6 random bits per character).
const ADMIN_PASSWORD_LEN: usize = 20;

/// On a database without accounts, creates `admin` and the demo study and returns the
/// admin password; otherwise does nothing and returns `None`.
pub async fn first_start(db: &Db) -> anyhow::Result<Option<String>> {
    if accounts::count_users(db).await? > 0 {
        return Ok(None);
    }
    if studies::list_studies(db, Some(1)).await?.is_empty() {
        seed_demo(db).await?;
    }
    let password = secrets::random_token(ADMIN_PASSWORD_LEN);
    let to_hash = password.clone();
    let hash = tokio::task::spawn_blocking(move || secrets::hash_password(&to_hash))
        .await?
        .map_err(anyhow::Error::msg)?;
    accounts::insert_user(db, "admin", &hash, Role::Admin).await?;
    Ok(Some(password))
}

/// Stores the demo study (validated by the engine first).
pub async fn seed_demo(db: &Db) -> anyhow::Result<i64> {
    let study = parse_study_str(crate::demo::DEMO_STUDY_JSON)
        .map_err(|e| anyhow::anyhow!("demo study: {e}"))?;
    let doc = StudyDoc::from_file_json(&serde_json::to_value(&study)?)?;
    studies::insert_study(db, &doc, "admin")
        .await
        .context("storing the demo study")
}
