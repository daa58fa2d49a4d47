//! Studies with their ordered segment and candidate rows. JSON bodies arrive already
//! validated by the engine; this module only keeps them, in order, with revisions.

use serde_json::{Map, Value};
use sqlx::{Sqlite, Transaction};

use super::audit::{self, study_change};
use super::{Db, Result, StorageError, begin_write, now_text};
use sqlx::AssertSqlSafe;

/// A study split into the pieces the tables hold; the inverse of the study file.
#[derive(Debug, Clone, PartialEq)]
pub struct StudyDoc {
    pub name: String,
    pub notes: Option<String>,
    pub aircraft: Value,
    pub installation: Option<Value>,
    pub integration: Option<Value>,
    pub scoring: Option<Value>,
    pub segments: Vec<Value>,
    pub candidates: Vec<Value>,
}

impl StudyDoc {
    /// Splits a study-file JSON object (validated upstream) into table pieces.
    pub fn from_file_json(v: &Value) -> Result<Self> {
        let obj = v
            .as_object()
            .ok_or_else(|| StorageError::Invalid("study: must be an object".into()))?;
        let opt = |k: &str| obj.get(k).filter(|x| !x.is_null()).cloned();
        let list = |k: &str| match obj.get(k) {
            Some(Value::Array(a)) => a.clone(),
            _ => Vec::new(),
        };
        Ok(StudyDoc {
            name: obj
                .get("name")
                .and_then(Value::as_str)
                .unwrap_or("")
                .to_string(),
            notes: obj.get("notes").and_then(Value::as_str).map(str::to_string),
            aircraft: opt("aircraft").unwrap_or_else(|| Value::Object(Map::new())),
            installation: opt("installation"),
            integration: opt("integration"),
            scoring: opt("scoring"),
            segments: list("segments"),
            candidates: list("candidates"),
        })
    }

    /// Reassembles the study-file JSON object (`format` included).
    pub fn to_file_json(&self) -> Value {
        let mut m = Map::new();
        m.insert("format".into(), Value::from("shaftline-study/1"));
        m.insert("name".into(), Value::from(self.name.clone()));
        if let Some(n) = &self.notes {
            m.insert("notes".into(), Value::from(n.clone()));
        }
        m.insert("aircraft".into(), self.aircraft.clone());
        let optional = [
            ("installation", &self.installation),
            ("integration", &self.integration),
            ("scoring", &self.scoring),
        ];
        for (k, v) in optional {
            if let Some(v) = v {
                m.insert(k.into(), v.clone());
            }
        }
        m.insert("segments".into(), Value::Array(self.segments.clone()));
        m.insert("candidates".into(), Value::Array(self.candidates.clone()));
        Value::Object(m)
    }
}

/// A study's own row.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct StudyRow {
    pub id: i64,
    pub name: String,
    pub notes: Option<String>,
    pub aircraft: String,
    pub installation: Option<String>,
    pub integration: Option<String>,
    pub scoring: Option<String>,
    pub revision: i64,
    pub updated_at: String,
    pub updated_by: String,
}

/// One line of the studies list.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct StudySummary {
    pub id: i64,
    pub name: String,
    pub revision: i64,
    pub updated_at: String,
    pub candidates: i64,
}

/// A segment or candidate row; `body` is the row's study-format JSON object.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct ItemRow {
    pub id: i64,
    pub position: i64,
    pub body: String,
    pub revision: i64,
    pub updated_at: String,
    pub updated_by: String,
}

impl ItemRow {
    pub fn json(&self) -> Result<Value> {
        Ok(serde_json::from_str(&self.body)?)
    }
}

/// The two kinds of ordered rows a study owns.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Item {
    Segment,
    Candidate,
}

impl Item {
    pub(super) fn table(self) -> &'static str {
        match self {
            Item::Segment => "segment",
            Item::Candidate => "candidate",
        }
    }
    pub(super) fn what(self) -> &'static str {
        self.table()
    }
}

fn text(v: &Option<Value>) -> Option<String> {
    v.as_ref().map(Value::to_string)
}

pub async fn insert_study(db: &Db, doc: &StudyDoc, by: &str) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let now = now_text();
    let id = sqlx::query(
        "INSERT INTO study (name, notes, aircraft, installation, integration, scoring,
                            created_at, updated_at, updated_by)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
    )
    .bind(&doc.name)
    .bind(&doc.notes)
    .bind(doc.aircraft.to_string())
    .bind(text(&doc.installation))
    .bind(text(&doc.integration))
    .bind(text(&doc.scoring))
    .bind(&now)
    .bind(&now)
    .bind(by)
    .execute(&mut *tx)
    .await?
    .last_insert_rowid();
    insert_items(&mut tx, id, doc, by).await?;
    let after = audit::study_snapshot(&mut tx, id).await?;
    let change = study_change(id, "study", "create", None, Some(after));
    audit::record(&mut tx, by, change).await?;
    tx.commit().await?;
    Ok(id)
}

async fn insert_items(
    tx: &mut Transaction<'_, Sqlite>,
    id: i64,
    doc: &StudyDoc,
    by: &str,
) -> Result<()> {
    for (item, rows) in [
        (Item::Segment, &doc.segments),
        (Item::Candidate, &doc.candidates),
    ] {
        for (pos, body) in rows.iter().enumerate() {
            let sql = format!(
                "INSERT INTO {} (study_id, position, body, updated_at, updated_by)
                 VALUES (?, ?, ?, ?, ?)",
                item.table()
            );
            sqlx::query(AssertSqlSafe(sql.clone()))
                .bind(id)
                .bind(pos as i64)
                .bind(body.to_string())
                .bind(now_text())
                .bind(by)
                .execute(&mut **tx)
                .await?;
        }
    }
    Ok(())
}

/// Every study, most recently changed first; at most `limit` when given.
pub async fn list_studies(db: &Db, limit: Option<i64>) -> Result<Vec<StudySummary>> {
    Ok(sqlx::query_as(
        "SELECT s.id, s.name, s.revision, s.updated_at,
                (SELECT COUNT(*) FROM candidate c WHERE c.study_id = s.id) AS candidates
         FROM study s ORDER BY s.updated_at DESC, s.id DESC LIMIT ?",
    )
    .bind(limit.unwrap_or(-1))
    .fetch_all(db)
    .await?)
}

pub async fn get_study(db: &Db, id: i64) -> Result<StudyRow> {
    sqlx::query_as(
        "SELECT id, name, notes, aircraft, installation, integration, scoring, revision,
                updated_at, updated_by FROM study WHERE id = ?",
    )
    .bind(id)
    .fetch_optional(db)
    .await?
    .ok_or(StorageError::NotFound { what: "study" })
}

pub async fn list_items(db: &Db, item: Item, study_id: i64) -> Result<Vec<ItemRow>> {
    let sql = format!(
        "SELECT id, position, body, revision, updated_at, updated_by FROM {}
         WHERE study_id = ? ORDER BY position, id",
        item.table()
    );
    Ok(sqlx::query_as(AssertSqlSafe(sql.clone()))
        .bind(study_id)
        .fetch_all(db)
        .await?)
}

pub async fn get_item(db: &Db, item: Item, study_id: i64, id: i64) -> Result<ItemRow> {
    let sql = format!(
        "SELECT id, position, body, revision, updated_at, updated_by FROM {}
         WHERE study_id = ? AND id = ?",
        item.table()
    );
    sqlx::query_as(AssertSqlSafe(sql.clone()))
        .bind(study_id)
        .bind(id)
        .fetch_optional(db)
        .await?
        .ok_or(StorageError::NotFound { what: item.what() })
}

/// The study row and all its rows, reassembled.
pub async fn load_doc(db: &Db, id: i64) -> Result<(StudyRow, StudyDoc)> {
    let row = get_study(db, id).await?;
    let parse = |s: &Option<String>| -> Result<Option<Value>> {
        Ok(match s {
            Some(t) => Some(serde_json::from_str(t)?),
            None => None,
        })
    };
    let mut bodies = Vec::new();
    for item in [Item::Segment, Item::Candidate] {
        let rows = list_items(db, item, id).await?;
        bodies.push(rows.iter().map(ItemRow::json).collect::<Result<Vec<_>>>()?);
    }
    let candidates = bodies.pop().unwrap_or_default();
    let segments = bodies.pop().unwrap_or_default();
    let doc = StudyDoc {
        name: row.name.clone(),
        notes: row.notes.clone(),
        aircraft: serde_json::from_str(&row.aircraft)?,
        installation: parse(&row.installation)?,
        integration: parse(&row.integration)?,
        scoring: parse(&row.scoring)?,
        segments,
        candidates,
    };
    Ok((row, doc))
}

pub(super) async fn bump_study(tx: &mut Transaction<'_, Sqlite>, id: i64, by: &str) -> Result<i64> {
    let (rev,): (i64,) = sqlx::query_as(
        "UPDATE study SET revision = revision + 1, updated_at = ?, updated_by = ?
         WHERE id = ? RETURNING revision",
    )
    .bind(now_text())
    .bind(by)
    .bind(id)
    .fetch_optional(&mut **tx)
    .await?
    .ok_or(StorageError::NotFound { what: "study" })?;
    Ok(rev)
}

pub(super) async fn study_conflict(db: &Db, id: i64) -> StorageError {
    match get_study(db, id).await {
        Ok(row) => StorageError::Conflict {
            by: row.updated_by,
            at: row.updated_at,
            revision: row.revision,
        },
        Err(e) => e,
    }
}

/// Replaces the study's own fields (name, notes, aircraft, installation), provided
/// `revision` is still the study's revision. Returns the new revision.
pub async fn update_study_header(
    db: &Db,
    id: i64,
    revision: i64,
    doc: &StudyDoc,
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let before = audit::study_header(&mut tx, id).await?;
    let done = sqlx::query(
        "UPDATE study SET name = ?, notes = ?, aircraft = ?, installation = ?
         WHERE id = ? AND revision = ?",
    )
    .bind(&doc.name)
    .bind(&doc.notes)
    .bind(doc.aircraft.to_string())
    .bind(text(&doc.installation))
    .bind(id)
    .bind(revision)
    .execute(&mut *tx)
    .await?;
    if done.rows_affected() == 0 {
        drop(tx);
        return Err(study_conflict(db, id).await);
    }
    let rev = bump_study(&mut tx, id, by).await?;
    let after = audit::study_header(&mut tx, id).await?;
    audit::record(
        &mut tx,
        by,
        study_change(id, "study", "update", before, after),
    )
    .await?;
    tx.commit().await?;
    Ok(rev)
}

/// Full replace of a study and all its rows, provided `revision` is current.
pub async fn replace_study(
    db: &Db,
    id: i64,
    revision: i64,
    doc: &StudyDoc,
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let before = audit::study_snapshot(&mut tx, id).await?;
    let done = sqlx::query(
        "UPDATE study SET name = ?, notes = ?, aircraft = ?, installation = ?,
                          integration = ?, scoring = ?
         WHERE id = ? AND revision = ?",
    )
    .bind(&doc.name)
    .bind(&doc.notes)
    .bind(doc.aircraft.to_string())
    .bind(text(&doc.installation))
    .bind(text(&doc.integration))
    .bind(text(&doc.scoring))
    .bind(id)
    .bind(revision)
    .execute(&mut *tx)
    .await?;
    if done.rows_affected() == 0 {
        drop(tx);
        return Err(study_conflict(db, id).await);
    }
    for item in [Item::Segment, Item::Candidate] {
        let sql = format!("DELETE FROM {} WHERE study_id = ?", item.table());
        sqlx::query(AssertSqlSafe(sql.clone()))
            .bind(id)
            .execute(&mut *tx)
            .await?;
    }
    insert_items(&mut tx, id, doc, by).await?;
    let rev = bump_study(&mut tx, id, by).await?;
    record_replace(&mut tx, id, before, by).await?;
    tx.commit().await?;
    Ok(rev)
}

/// Audits a full replace, and the scoring weights apart when they changed.
async fn record_replace(
    tx: &mut Transaction<'_, Sqlite>,
    id: i64,
    before: Value,
    by: &str,
) -> Result<()> {
    let after = audit::study_snapshot(tx, id).await?;
    let (old_w, new_w) = (
        before.get("scoring").cloned(),
        after.get("scoring").cloned(),
    );
    audit::record(
        tx,
        by,
        study_change(id, "study", "replace", Some(before), Some(after)),
    )
    .await?;
    if old_w != new_w {
        audit::record(tx, by, study_change(id, "weights", "update", old_w, new_w)).await?;
    }
    Ok(())
}

pub use super::items::{
    MoveDirection, append_items, delete_item, insert_item, move_item, update_item,
};
