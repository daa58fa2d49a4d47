//! Online backup: a consistent copy of the live database written with `VACUUM INTO`,
//! safe while the server runs (it reads one snapshot under WAL). Never overwrites.

use std::path::Path;

use super::{Db, Result, StorageError};

/// Writes a consistent copy of `db` to `dest`, which must not exist yet.
pub async fn backup_to(db: &Db, dest: &Path) -> Result<()> {
    if dest.exists() {
        return Err(StorageError::Invalid(format!(
            "backup: '{}' already exists; choose a new file name (nothing was written)",
            dest.display()
        )));
    }
    let dest = dest.to_str().ok_or_else(|| {
        StorageError::Invalid("backup: the destination path must be valid UTF-8".into())
    })?;
    sqlx::query("VACUUM INTO ?").bind(dest).execute(db).await?;
    Ok(())
}
