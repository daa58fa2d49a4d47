//! Storage: sqlx over SQLite, and nothing else (no HTTP, no templates).
//! Rows are plain structs; JSON columns hold study-format objects validated upstream.

pub mod accounts;
pub mod audit;
pub mod backup;
mod items;
pub mod reviews;
pub mod scoring;
pub mod studies;

use std::str::FromStr;
use std::time::Duration;

use sqlx::SqlitePool;
use sqlx::sqlite::{SqliteConnectOptions, SqliteJournalMode, SqlitePoolOptions, SqliteSynchronous};

/// The connection pool every storage function takes.
pub type Db = SqlitePool;

/// Everything that can go wrong in storage.
#[derive(Debug, thiserror::Error)]
pub enum StorageError {
    #[error("database error: {0}")]
    Sqlx(#[from] sqlx::Error),
    #[error("migration failed: {0}")]
    Migrate(#[from] sqlx::migrate::MigrateError),
    #[error("stored JSON is unreadable: {0}")]
    Json(#[from] serde_json::Error),
    #[error("{what} not found")]
    NotFound { what: &'static str },
    /// A stale revision: who changed the row last, when, and its revision now.
    #[error("changed by {by} at {at}; reload")]
    Conflict {
        by: String,
        at: String,
        revision: i64,
    },
    #[error("{0}")]
    Invalid(String),
    /// A write to something that no longer accepts writes (a closed review).
    #[error("{0}")]
    Closed(String),
}

pub type Result<T> = std::result::Result<T, StorageError>;

/// Opens (creating if missing) the SQLite file at `path` with WAL, foreign keys and a
/// busy timeout, then runs the migrations.
pub async fn open_file(path: &str) -> Result<Db> {
    let options = SqliteConnectOptions::from_str(&format!("sqlite://{path}"))?
        .create_if_missing(true)
        .foreign_keys(true)
        .journal_mode(SqliteJournalMode::Wal)
        .synchronous(SqliteSynchronous::Normal)
        .busy_timeout(Duration::from_secs(5));
    let pool = SqlitePoolOptions::new()
        .max_connections(4)
        .connect_with(options)
        .await?;
    migrate(&pool).await?;
    Ok(pool)
}

/// A fresh in-memory database for tests: one connection that never idles out, since
/// the database vanishes with its last connection.
pub async fn open_memory() -> Result<Db> {
    let options = SqliteConnectOptions::from_str("sqlite::memory:")?.foreign_keys(true);
    let pool = SqlitePoolOptions::new()
        .max_connections(1)
        .min_connections(1)
        .idle_timeout(None)
        .max_lifetime(None)
        .connect_with(options)
        .await?;
    migrate(&pool).await?;
    Ok(pool)
}

/// A write transaction that takes the write lock at once (`BEGIN IMMEDIATE`), so
/// reads inside it (the revision check, the audit's before-values) are never
/// invalidated by a writer that commits in between.
pub async fn begin_write(db: &Db) -> Result<sqlx::Transaction<'static, sqlx::Sqlite>> {
    Ok(db.begin_with("BEGIN IMMEDIATE").await?)
}

async fn migrate(pool: &Db) -> Result<()> {
    sqlx::migrate!("./migrations").run(pool).await?;
    Ok(())
}

/// The current instant as an RFC 3339 UTC string, as stored in `*_at` columns.
pub fn now_text() -> String {
    time::OffsetDateTime::now_utc()
        .replace_nanosecond(0)
        .ok()
        .and_then(|t| {
            t.format(&time::format_description::well_known::Rfc3339)
                .ok()
        })
        .unwrap_or_default()
}

/// The current instant in Unix seconds.
pub fn now_unix() -> i64 {
    time::OffsetDateTime::now_utc().unix_timestamp()
}
