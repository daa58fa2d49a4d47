//! Segment and candidate rows of a study: insert, update, reorder, delete. Every write
//! checks the row's revision and bumps the study's, in one transaction.

use super::audit::{self, Change};
use super::studies::{Item, ItemRow, bump_study, get_item, study_conflict};
use super::{Db, Result, StorageError, begin_write, now_text};
use serde_json::Value;
use sqlx::AssertSqlSafe;

/// Which neighbour a row swaps places with.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MoveDirection {
    Up,
    Down,
}

/// The audit record of a change to one row.
fn row_change(item: Item, study_id: i64, id: i64, action: &'static str) -> Change {
    Change {
        study_id: Some(study_id),
        entity_kind: item.table(),
        entity_id: id,
        action,
        before: None,
        after: None,
    }
}

async fn insert_row(
    tx: &mut sqlx::Transaction<'_, sqlx::Sqlite>,
    item: Item,
    study_id: i64,
    body: &Value,
    by: &str,
) -> Result<i64> {
    let sql = format!(
        "INSERT INTO {t} (study_id, position, body, updated_at, updated_by)
         VALUES (?, (SELECT COALESCE(MAX(position) + 1, 0) FROM {t} WHERE study_id = ?), ?, ?, ?)",
        t = item.table()
    );
    let id = sqlx::query(AssertSqlSafe(sql))
        .bind(study_id)
        .bind(study_id)
        .bind(body.to_string())
        .bind(now_text())
        .bind(by)
        .execute(&mut **tx)
        .await?
        .last_insert_rowid();
    let change = Change {
        after: Some(body.clone()),
        ..row_change(item, study_id, id, "create")
    };
    audit::record(tx, by, change).await?;
    Ok(id)
}

/// Appends a row at the end of the study's list. Returns the new row's id.
pub async fn insert_item(
    db: &Db,
    item: Item,
    study_id: i64,
    body: &Value,
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    bump_study(&mut tx, study_id, by).await?;
    let id = insert_row(&mut tx, item, study_id, body, by).await?;
    tx.commit().await?;
    Ok(id)
}

/// Appends rows at the end of the study's list, all of them or none, provided
/// `revision` is still the study's revision (the one they were validated against).
/// Returns the study's new revision.
pub async fn append_items(
    db: &Db,
    item: Item,
    study_id: i64,
    revision: i64,
    bodies: &[Value],
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let current: Option<(i64,)> = sqlx::query_as("SELECT revision FROM study WHERE id = ?")
        .bind(study_id)
        .fetch_optional(&mut *tx)
        .await?;
    match current {
        None => return Err(StorageError::NotFound { what: "study" }),
        Some((rev,)) if rev != revision => {
            drop(tx);
            return Err(study_conflict(db, study_id).await);
        }
        Some(_) => {}
    }
    for body in bodies {
        insert_row(&mut tx, item, study_id, body, by).await?;
    }
    let rev = bump_study(&mut tx, study_id, by).await?;
    tx.commit().await?;
    Ok(rev)
}

async fn item_conflict(db: &Db, item: Item, study_id: i64, id: i64) -> StorageError {
    match get_item(db, item, study_id, id).await {
        Ok(row) => StorageError::Conflict {
            by: row.updated_by,
            at: row.updated_at,
            revision: row.revision,
        },
        Err(e) => e,
    }
}

/// Replaces a row's body if `revision` is still its revision. Returns the new revision.
pub async fn update_item(
    db: &Db,
    item: Item,
    study_id: i64,
    id: i64,
    revision: i64,
    body: &Value,
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let before = audit::item_body(&mut tx, item, study_id, id).await?;
    let sql = format!(
        "UPDATE {} SET body = ?, revision = revision + 1, updated_at = ?, updated_by = ?
         WHERE study_id = ? AND id = ? AND revision = ? RETURNING revision",
        item.table()
    );
    let row: Option<(i64,)> = sqlx::query_as(AssertSqlSafe(sql.clone()))
        .bind(body.to_string())
        .bind(now_text())
        .bind(by)
        .bind(study_id)
        .bind(id)
        .bind(revision)
        .fetch_optional(&mut *tx)
        .await?;
    let Some((rev,)) = row else {
        drop(tx);
        return Err(item_conflict(db, item, study_id, id).await);
    };
    let change = Change {
        before,
        after: Some(body.clone()),
        ..row_change(item, study_id, id, "update")
    };
    audit::record(&mut tx, by, change).await?;
    bump_study(&mut tx, study_id, by).await?;
    tx.commit().await?;
    Ok(rev)
}

/// Deletes a row if `revision` is still its revision.
pub async fn delete_item(
    db: &Db,
    item: Item,
    study_id: i64,
    id: i64,
    revision: i64,
    by: &str,
) -> Result<()> {
    let mut tx = begin_write(db).await?;
    let before = audit::item_body(&mut tx, item, study_id, id).await?;
    let sql = format!(
        "DELETE FROM {} WHERE study_id = ? AND id = ? AND revision = ?",
        item.table()
    );
    let done = sqlx::query(AssertSqlSafe(sql.clone()))
        .bind(study_id)
        .bind(id)
        .bind(revision)
        .execute(&mut *tx)
        .await?;
    if done.rows_affected() == 0 {
        drop(tx);
        return Err(item_conflict(db, item, study_id, id).await);
    }
    let change = Change {
        before,
        ..row_change(item, study_id, id, "delete")
    };
    audit::record(&mut tx, by, change).await?;
    bump_study(&mut tx, study_id, by).await?;
    tx.commit().await?;
    Ok(())
}

/// Swaps a row with its neighbour above or below, provided `revision` is still the
/// row's revision; at either end nothing changes. Both rows that trade places get a
/// new revision, so a second move made on the old page is refused as stale.
pub async fn move_item(
    db: &Db,
    item: Item,
    study_id: i64,
    id: i64,
    revision: i64,
    dir: MoveDirection,
    by: &str,
) -> Result<()> {
    let mut tx = begin_write(db).await?;
    let list_sql = format!(
        "SELECT id, position, body, revision, updated_at, updated_by FROM {}
         WHERE study_id = ? ORDER BY position, id",
        item.table()
    );
    let rows: Vec<ItemRow> = sqlx::query_as(AssertSqlSafe(list_sql.clone()))
        .bind(study_id)
        .fetch_all(&mut *tx)
        .await?;
    let at = rows
        .iter()
        .position(|r| r.id == id)
        .ok_or(StorageError::NotFound { what: item.what() })?;
    if rows[at].revision != revision {
        drop(tx);
        return Err(item_conflict(db, item, study_id, id).await);
    }
    let other = match dir {
        MoveDirection::Up => at.checked_sub(1),
        MoveDirection::Down => Some(at + 1).filter(|&i| i < rows.len()),
    };
    let Some(other) = other else {
        return Ok(());
    };
    // Rewrite positions densely so rows with equal positions also reorder cleanly.
    let mut order: Vec<i64> = rows.iter().map(|r| r.id).collect();
    order.swap(at, other);
    let sql = format!("UPDATE {} SET position = ? WHERE id = ?", item.table());
    for (pos, row_id) in order.iter().enumerate() {
        sqlx::query(AssertSqlSafe(sql.clone()))
            .bind(pos as i64)
            .bind(row_id)
            .execute(&mut *tx)
            .await?;
    }
    let bump = format!(
        "UPDATE {} SET revision = revision + 1, updated_at = ?, updated_by = ? WHERE id = ?",
        item.table()
    );
    let now = now_text();
    for row_id in [rows[at].id, rows[other].id] {
        sqlx::query(AssertSqlSafe(bump.clone()))
            .bind(&now)
            .bind(by)
            .bind(row_id)
            .execute(&mut *tx)
            .await?;
    }
    let change = Change {
        before: Some(serde_json::json!({ "position": at })),
        after: Some(serde_json::json!({ "position": other })),
        ..row_change(item, study_id, id, "move")
    };
    audit::record(&mut tx, by, change).await?;
    bump_study(&mut tx, study_id, by).await?;
    tx.commit().await?;
    Ok(())
}
