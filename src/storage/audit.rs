//! The append-only audit trail: `record` writes one change inside the caller's
//! transaction (so a change and its record commit or vanish together); the readers
//! return a study's history. Nothing here updates or deletes a record.

use serde_json::{Map, Value};
use sqlx::{AssertSqlSafe, SqliteConnection};

use super::studies::Item;
use super::{Db, Result, now_text};

/// One change, as the caller describes it.
#[derive(Debug, Clone)]
pub struct Change {
    pub study_id: Option<i64>,
    pub entity_kind: &'static str,
    pub entity_id: i64,
    pub action: &'static str,
    pub before: Option<Value>,
    pub after: Option<Value>,
}

/// One stored record of the trail.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct AuditRow {
    pub id: i64,
    pub at: String,
    pub actor: String,
    pub study_id: Option<i64>,
    pub entity_kind: String,
    pub entity_id: i64,
    pub action: String,
    pub before: Option<String>,
    pub after: Option<String>,
}

/// Appends `change` made by `actor` on the transaction's connection.
pub async fn record(conn: &mut SqliteConnection, actor: &str, change: Change) -> Result<()> {
    sqlx::query(
        "INSERT INTO audit_log (at, actor, study_id, entity_kind, entity_id, action, before, after)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
    )
    .bind(now_text())
    .bind(actor)
    .bind(change.study_id)
    .bind(change.entity_kind)
    .bind(change.entity_id)
    .bind(change.action)
    .bind(change.before.map(|v| v.to_string()))
    .bind(change.after.map(|v| v.to_string()))
    .execute(conn)
    .await?;
    Ok(())
}

/// A study's history, oldest first.
pub async fn study_history(db: &Db, study_id: i64) -> Result<Vec<AuditRow>> {
    Ok(sqlx::query_as(
        "SELECT id, at, actor, study_id, entity_kind, entity_id, action, before, after
         FROM audit_log WHERE study_id = ? ORDER BY id",
    )
    .bind(study_id)
    .fetch_all(db)
    .await?)
}

/// Changes of accounts, oldest first.
pub async fn account_history(db: &Db) -> Result<Vec<AuditRow>> {
    Ok(sqlx::query_as(
        "SELECT id, at, actor, study_id, entity_kind, entity_id, action, before, after
         FROM audit_log WHERE entity_kind = 'account' ORDER BY id",
    )
    .fetch_all(db)
    .await?)
}

/// The study's own fields as one JSON object (read inside the transaction).
pub(super) async fn study_header(conn: &mut SqliteConnection, id: i64) -> Result<Option<Value>> {
    let row: Option<(String,)> = sqlx::query_as(
        "SELECT json_object('name', name, 'notes', notes, 'aircraft', json(aircraft),
                'installation', json(installation), 'integration', json(integration),
                'scoring', json(scoring))
         FROM study WHERE id = ?",
    )
    .bind(id)
    .fetch_optional(conn)
    .await?;
    Ok(match row {
        Some((text,)) => Some(serde_json::from_str(&text)?),
        None => None,
    })
}

/// A row's body (read inside the transaction).
pub(super) async fn item_body(
    conn: &mut SqliteConnection,
    item: Item,
    study_id: i64,
    id: i64,
) -> Result<Option<Value>> {
    let sql = format!(
        "SELECT body FROM {} WHERE study_id = ? AND id = ?",
        item.table()
    );
    let row: Option<(String,)> = sqlx::query_as(AssertSqlSafe(sql))
        .bind(study_id)
        .bind(id)
        .fetch_optional(conn)
        .await?;
    Ok(match row {
        Some((text,)) => Some(serde_json::from_str(&text)?),
        None => None,
    })
}

/// The whole study: its fields with the ordered segment and candidate bodies.
pub(super) async fn study_snapshot(conn: &mut SqliteConnection, id: i64) -> Result<Value> {
    let mut whole = match study_header(&mut *conn, id).await? {
        Some(Value::Object(m)) => m,
        _ => Map::new(),
    };
    for (item, key) in [(Item::Segment, "segments"), (Item::Candidate, "candidates")] {
        let sql = format!(
            "SELECT body FROM {} WHERE study_id = ? ORDER BY position, id",
            item.table()
        );
        let rows: Vec<(String,)> = sqlx::query_as(AssertSqlSafe(sql))
            .bind(id)
            .fetch_all(&mut *conn)
            .await?;
        let bodies = rows
            .iter()
            .map(|(t,)| serde_json::from_str(t))
            .collect::<std::result::Result<Vec<Value>, _>>()?;
        whole.insert(key.into(), Value::Array(bodies));
    }
    Ok(Value::Object(whole))
}

/// The change of one study-level entity (`study` or `weights`).
pub(super) fn study_change(
    id: i64,
    kind: &'static str,
    action: &'static str,
    before: Option<Value>,
    after: Option<Value>,
) -> Change {
    Change {
        study_id: Some(id),
        entity_kind: kind,
        entity_id: id,
        action,
        before,
        after,
    }
}
