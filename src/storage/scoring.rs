//! The study's scoring (objectives and weights), replaced as a whole provided the
//! study's revision is current; a stale edit changes nothing.

use serde_json::Value;

use super::studies::{bump_study, study_conflict};
use super::{Db, Result};

/// Stores `scoring` (already validated by the engine) on study `id` if `revision` is
/// still its revision. Returns the new revision.
pub async fn update_study_scoring(
    db: &Db,
    id: i64,
    revision: i64,
    scoring: &Value,
    by: &str,
) -> Result<i64> {
    let mut tx = db.begin().await?;
    let done = sqlx::query("UPDATE study SET scoring = ? WHERE id = ? AND revision = ?")
        .bind(scoring.to_string())
        .bind(id)
        .bind(revision)
        .execute(&mut *tx)
        .await?;
    if done.rows_affected() == 0 {
        drop(tx);
        return Err(study_conflict(db, id).await);
    }
    let rev = bump_study(&mut tx, id, by).await?;
    tx.commit().await?;
    Ok(rev)
}
