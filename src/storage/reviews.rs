//! Design reviews: the frozen snapshot, participants, the presenter's view, comments and
//! decisions. Every write checks, inside its transaction, that the review is still open,
//! so a closed review stores nothing more. No HTTP here, and no scoring.

use sqlx::{Sqlite, Transaction};

use super::{Db, Result, StorageError, now_text};

/// A review row; the snapshot JSON stays as text until a page needs it.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct ReviewRow {
    pub id: i64,
    pub study_id: i64,
    pub title: String,
    pub study_revision: i64,
    pub study_json: String,
    pub results_json: String,
    pub engine_version: String,
    pub status: String,
    pub presenter: String,
    pub current_view: String,
    pub created_by: String,
    pub created_at: String,
    pub closed_by: Option<String>,
    pub closed_at: Option<String>,
}

impl ReviewRow {
    pub fn is_open(&self) -> bool {
        self.status == "open"
    }
}

/// What a new review freezes and who starts it.
pub struct NewReview<'a> {
    pub study_id: i64,
    pub title: &'a str,
    pub study_revision: i64,
    pub study_json: &'a str,
    pub results_json: &'a str,
    pub engine_version: &'a str,
    pub participants: &'a [String],
    pub by: &'a str,
}

#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct CommentRow {
    pub id: i64,
    pub candidate: Option<String>,
    pub body: String,
    pub created_by: String,
    pub created_at: String,
}

#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct DecisionRow {
    pub id: i64,
    pub candidate: String,
    pub outcome: String,
    pub rationale: String,
    pub decided_by: String,
    pub decided_at: String,
}

const REVIEW_COLUMNS: &str = "id, study_id, title, study_revision, study_json, results_json,
    engine_version, status, presenter, current_view, created_by, created_at, closed_by,
    closed_at";

/// Stores a new review with its snapshot and participants (the starter presents).
pub async fn insert_review(db: &Db, new: &NewReview<'_>) -> Result<i64> {
    let mut tx = db.begin().await?;
    let now = now_text();
    let id = sqlx::query(
        "INSERT INTO review (study_id, title, study_revision, study_json, results_json,
                             engine_version, presenter, created_by, created_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
    )
    .bind(new.study_id)
    .bind(new.title)
    .bind(new.study_revision)
    .bind(new.study_json)
    .bind(new.results_json)
    .bind(new.engine_version)
    .bind(new.by)
    .bind(new.by)
    .bind(&now)
    .execute(&mut *tx)
    .await?
    .last_insert_rowid();
    for name in std::iter::once(&new.by.to_string()).chain(new.participants) {
        add_participant_tx(&mut tx, id, name).await?;
    }
    tx.commit().await?;
    Ok(id)
}

async fn add_participant_tx(tx: &mut Transaction<'_, Sqlite>, id: i64, name: &str) -> Result<()> {
    sqlx::query(
        "INSERT OR IGNORE INTO review_participant (review_id, username, added_at)
         VALUES (?, ?, ?)",
    )
    .bind(id)
    .bind(name)
    .bind(now_text())
    .execute(&mut **tx)
    .await?;
    Ok(())
}

pub async fn get_review(db: &Db, id: i64) -> Result<ReviewRow> {
    let sql = format!("SELECT {REVIEW_COLUMNS} FROM review WHERE id = ?");
    sqlx::query_as(sqlx::AssertSqlSafe(sql))
        .bind(id)
        .fetch_optional(db)
        .await?
        .ok_or(StorageError::NotFound { what: "review" })
}

/// The reviews of a study, newest first.
pub async fn list_reviews(db: &Db, study_id: i64) -> Result<Vec<ReviewRow>> {
    let sql = format!("SELECT {REVIEW_COLUMNS} FROM review WHERE study_id = ? ORDER BY id DESC");
    Ok(sqlx::query_as(sqlx::AssertSqlSafe(sql))
        .bind(study_id)
        .fetch_all(db)
        .await?)
}

pub async fn list_participants(db: &Db, id: i64) -> Result<Vec<String>> {
    let rows: Vec<(String,)> = sqlx::query_as(
        "SELECT username FROM review_participant WHERE review_id = ? ORDER BY added_at, username",
    )
    .bind(id)
    .fetch_all(db)
    .await?;
    Ok(rows.into_iter().map(|(n,)| n).collect())
}

pub async fn list_comments(db: &Db, id: i64) -> Result<Vec<CommentRow>> {
    Ok(sqlx::query_as(
        "SELECT id, candidate, body, created_by, created_at FROM review_comment
         WHERE review_id = ? ORDER BY id",
    )
    .bind(id)
    .fetch_all(db)
    .await?)
}

/// Every decision in the order taken (the latest per candidate is in force).
pub async fn list_decisions(db: &Db, id: i64) -> Result<Vec<DecisionRow>> {
    Ok(sqlx::query_as(
        "SELECT id, candidate, outcome, rationale, decided_by, decided_at FROM review_decision
         WHERE review_id = ? ORDER BY id",
    )
    .bind(id)
    .fetch_all(db)
    .await?)
}

/// Opens a write transaction on an open review, or says why not.
async fn begin_open(db: &Db, id: i64) -> Result<Transaction<'static, Sqlite>> {
    let mut tx = db.begin().await?;
    let status: Option<(String,)> = sqlx::query_as("SELECT status FROM review WHERE id = ?")
        .bind(id)
        .fetch_optional(&mut *tx)
        .await?;
    match status {
        None => Err(StorageError::NotFound { what: "review" }),
        Some((s,)) if s != "open" => Err(StorageError::Closed(
            "this review is closed and read-only; nothing was saved".into(),
        )),
        Some(_) => Ok(tx),
    }
}

/// Records that `name` takes part (idempotent; closed reviews are left as they are).
pub async fn join_review(db: &Db, id: i64, name: &str) -> Result<()> {
    let mut tx = begin_open(db, id).await?;
    add_participant_tx(&mut tx, id, name).await?;
    tx.commit().await?;
    Ok(())
}

pub async fn insert_comment(
    db: &Db,
    id: i64,
    candidate: Option<&str>,
    body: &str,
    by: &str,
) -> Result<CommentRow> {
    let mut tx = begin_open(db, id).await?;
    let row = sqlx::query_as(
        "INSERT INTO review_comment (review_id, candidate, body, created_by, created_at)
         VALUES (?, ?, ?, ?, ?) RETURNING id, candidate, body, created_by, created_at",
    )
    .bind(id)
    .bind(candidate)
    .bind(body)
    .bind(by)
    .bind(now_text())
    .fetch_one(&mut *tx)
    .await?;
    add_participant_tx(&mut tx, id, by).await?;
    tx.commit().await?;
    Ok(row)
}

pub async fn insert_decision(
    db: &Db,
    id: i64,
    candidate: &str,
    outcome: &str,
    rationale: &str,
    by: &str,
) -> Result<DecisionRow> {
    let mut tx = begin_open(db, id).await?;
    let row = sqlx::query_as(
        "INSERT INTO review_decision (review_id, candidate, outcome, rationale, decided_by,
                                      decided_at)
         VALUES (?, ?, ?, ?, ?, ?)
         RETURNING id, candidate, outcome, rationale, decided_by, decided_at",
    )
    .bind(id)
    .bind(candidate)
    .bind(outcome)
    .bind(rationale)
    .bind(by)
    .bind(now_text())
    .fetch_one(&mut *tx)
    .await?;
    tx.commit().await?;
    Ok(row)
}

/// Stores what the presenter put on screen.
pub async fn set_view(db: &Db, id: i64, view: &str) -> Result<()> {
    let mut tx = begin_open(db, id).await?;
    sqlx::query("UPDATE review SET current_view = ? WHERE id = ?")
        .bind(view)
        .bind(id)
        .execute(&mut *tx)
        .await?;
    tx.commit().await?;
    Ok(())
}

/// Hands the presentation to `name`, who becomes a participant if not yet one.
pub async fn set_presenter(db: &Db, id: i64, name: &str) -> Result<()> {
    let mut tx = begin_open(db, id).await?;
    sqlx::query("UPDATE review SET presenter = ? WHERE id = ?")
        .bind(name)
        .bind(id)
        .execute(&mut *tx)
        .await?;
    add_participant_tx(&mut tx, id, name).await?;
    tx.commit().await?;
    Ok(())
}

/// Closes the review; from then on every write above is refused.
pub async fn close_review(db: &Db, id: i64, by: &str) -> Result<()> {
    let mut tx = begin_open(db, id).await?;
    sqlx::query("UPDATE review SET status = 'closed', closed_by = ?, closed_at = ? WHERE id = ?")
        .bind(by)
        .bind(now_text())
        .bind(id)
        .execute(&mut *tx)
        .await?;
    tx.commit().await?;
    Ok(())
}
