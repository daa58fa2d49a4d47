//! Users, browser sessions and API tokens. Only hashes of secrets reach this module.

use serde_json::{Value, json};
use sqlx::AssertSqlSafe;

use super::audit::{self, Change};
use super::{Db, Result, StorageError, begin_write, now_text, now_unix};

/// Access levels; each includes everything the ones before it may do.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Role {
    Viewer,
    Editor,
    Admin,
}

impl Role {
    pub const ALL: [Role; 3] = [Role::Viewer, Role::Editor, Role::Admin];

    pub fn as_str(self) -> &'static str {
        match self {
            Role::Viewer => "viewer",
            Role::Editor => "editor",
            Role::Admin => "admin",
        }
    }
}

impl std::str::FromStr for Role {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<Self, String> {
        match s {
            "viewer" => Ok(Role::Viewer),
            "editor" => Ok(Role::Editor),
            "admin" => Ok(Role::Admin),
            other => Err(format!(
                "role must be viewer, editor or admin (got '{other}')"
            )),
        }
    }
}

impl std::fmt::Display for Role {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

/// A stored account.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct UserRow {
    pub id: i64,
    pub username: String,
    pub password_hash: String,
    pub role: String,
    pub created_at: String,
    /// Bumped by every change of the account (role, password).
    pub revision: i64,
    pub updated_at: String,
    pub updated_by: String,
}

impl UserRow {
    /// The role; an unknown stored value (impossible under the CHECK) reads as viewer.
    pub fn role(&self) -> Role {
        self.role.parse().unwrap_or(Role::Viewer)
    }
}

/// A signed-in browser: the session's user and its anti-forgery token.
#[derive(Debug, Clone, sqlx::FromRow)]
pub struct SessionUser {
    pub user_id: i64,
    pub username: String,
    pub role: String,
    pub csrf_token: String,
}

pub async fn count_users(db: &Db) -> Result<i64> {
    let (n,): (i64,) = sqlx::query_as("SELECT COUNT(*) FROM user")
        .fetch_one(db)
        .await?;
    Ok(n)
}

/// The actor recorded for changes made outside the web (command line, first start).
pub const SYSTEM_ACTOR: &str = "system";

pub async fn insert_user(db: &Db, username: &str, password_hash: &str, role: Role) -> Result<i64> {
    insert_user_as(db, username, password_hash, role, SYSTEM_ACTOR).await
}

/// Adds an account; `by` is who did it (audited, without the hash).
pub async fn insert_user_as(
    db: &Db,
    username: &str,
    password_hash: &str,
    role: Role,
    by: &str,
) -> Result<i64> {
    let now = now_text();
    let mut tx = begin_write(db).await?;
    let res = sqlx::query(
        "INSERT INTO user (username, password_hash, role, created_at, updated_at, updated_by)
         VALUES (?, ?, ?, ?, ?, ?)",
    )
    .bind(username)
    .bind(password_hash)
    .bind(role.as_str())
    .bind(&now)
    .bind(&now)
    .bind(by)
    .execute(&mut *tx)
    .await;
    let id = match res {
        Ok(done) => done.last_insert_rowid(),
        Err(sqlx::Error::Database(e)) if e.is_unique_violation() => {
            return Err(StorageError::Invalid(format!(
                "username: '{username}' is already taken"
            )));
        }
        Err(e) => return Err(e.into()),
    };
    let after = json!({ "username": username, "role": role.as_str() });
    audit::record(&mut tx, by, account_change(id, "create", None, Some(after))).await?;
    tx.commit().await?;
    Ok(id)
}

fn account_change(
    id: i64,
    action: &'static str,
    before: Option<Value>,
    after: Option<Value>,
) -> Change {
    Change {
        study_id: None,
        entity_kind: "account",
        entity_id: id,
        action,
        before,
        after,
    }
}

pub async fn find_user(db: &Db, username: &str) -> Result<Option<UserRow>> {
    Ok(sqlx::query_as(
        "SELECT id, username, password_hash, role, created_at, revision, updated_at, updated_by
         FROM user WHERE username = ?",
    )
    .bind(username)
    .fetch_optional(db)
    .await?)
}

pub async fn list_users(db: &Db) -> Result<Vec<UserRow>> {
    Ok(sqlx::query_as(
        "SELECT id, username, password_hash, role, created_at, revision, updated_at, updated_by
         FROM user ORDER BY username",
    )
    .fetch_all(db)
    .await?)
}

/// Sets one column of an account and audits the change (`shown` turns the old value
/// into what the record says of the old and new values: never a password hash).
/// With `revision`, the change is made only if that is still the account's revision;
/// otherwise it is a `Conflict` naming who changed the account and when.
async fn update_user_column(
    db: &Db,
    username: &str,
    column: &'static str,
    value: &str,
    shown: impl FnOnce(&str) -> (Value, Value),
    revision: Option<i64>,
    by: &str,
) -> Result<i64> {
    let mut tx = begin_write(db).await?;
    let old_sql =
        format!("SELECT {column}, revision, updated_at, updated_by FROM user WHERE username = ?");
    let old: Option<(String, i64, String, String)> = sqlx::query_as(AssertSqlSafe(old_sql))
        .bind(username)
        .fetch_optional(&mut *tx)
        .await?;
    let (old, current, at, last_by) = old.ok_or(StorageError::NotFound { what: "user" })?;
    if revision.is_some_and(|r| r != current) {
        return Err(StorageError::Conflict {
            by: last_by,
            at,
            revision: current,
        });
    }
    let shown = shown(&old);
    let sql = format!(
        "UPDATE user SET {column} = ?, updated_at = ?, updated_by = ?, revision = revision + 1
         WHERE username = ? RETURNING id"
    );
    let row: Option<(i64,)> = sqlx::query_as(AssertSqlSafe(sql))
        .bind(value)
        .bind(now_text())
        .bind(by)
        .bind(username)
        .fetch_optional(&mut *tx)
        .await?;
    let (id,) = row.ok_or(StorageError::NotFound { what: "user" })?;
    let change = account_change(id, "update", Some(shown.0), Some(shown.1));
    audit::record(&mut tx, by, change).await?;
    tx.commit().await?;
    Ok(id)
}

/// Replaces a password hash and signs the user out everywhere.
pub async fn set_password_hash(db: &Db, username: &str, password_hash: &str) -> Result<()> {
    set_password_hash_as(db, username, password_hash, SYSTEM_ACTOR).await
}

pub async fn set_password_hash_as(
    db: &Db,
    username: &str,
    password_hash: &str,
    by: &str,
) -> Result<()> {
    let shown = |_: &str| {
        (
            json!({ "username": username, "password": "(previous)" }),
            json!({ "username": username, "password": "(changed)" }),
        )
    };
    let id = update_user_column(
        db,
        username,
        "password_hash",
        password_hash,
        shown,
        None,
        by,
    )
    .await?;
    sqlx::query("DELETE FROM session WHERE user_id = ?")
        .bind(id)
        .execute(db)
        .await?;
    Ok(())
}

pub async fn set_role(db: &Db, username: &str, role: Role) -> Result<()> {
    set_role_as(db, username, role, SYSTEM_ACTOR).await
}

/// Sets a role without a revision check (the command line, first start).
pub async fn set_role_as(db: &Db, username: &str, role: Role, by: &str) -> Result<()> {
    set_role_checked(db, username, role, None, by).await
}

/// Sets a role, provided `revision` (when given) is still the account's revision.
pub async fn set_role_checked(
    db: &Db,
    username: &str,
    role: Role,
    revision: Option<i64>,
    by: &str,
) -> Result<()> {
    let shown = |old: &str| {
        (
            json!({ "username": username, "role": old }),
            json!({ "username": username, "role": role.as_str() }),
        )
    };
    update_user_column(db, username, "role", role.as_str(), shown, revision, by).await?;
    Ok(())
}

pub async fn insert_session(
    db: &Db,
    token_hash: &str,
    user_id: i64,
    csrf_token: &str,
    lifetime_s: i64,
) -> Result<()> {
    sqlx::query(
        "INSERT INTO session (token_hash, user_id, csrf_token, created_at, expires_at)
         VALUES (?, ?, ?, ?, ?)",
    )
    .bind(token_hash)
    .bind(user_id)
    .bind(csrf_token)
    .bind(now_text())
    .bind(now_unix() + lifetime_s)
    .execute(db)
    .await?;
    Ok(())
}

/// The user of a live (unexpired) session.
pub async fn find_session(db: &Db, token_hash: &str) -> Result<Option<SessionUser>> {
    Ok(sqlx::query_as(
        "SELECT u.id AS user_id, u.username, u.role, s.csrf_token
         FROM session s JOIN user u ON u.id = s.user_id
         WHERE s.token_hash = ? AND s.expires_at > ?",
    )
    .bind(token_hash)
    .bind(now_unix())
    .fetch_optional(db)
    .await?)
}

pub async fn delete_session(db: &Db, token_hash: &str) -> Result<()> {
    sqlx::query("DELETE FROM session WHERE token_hash = ?")
        .bind(token_hash)
        .execute(db)
        .await?;
    Ok(())
}

/// Removes expired sessions; returns how many were removed.
pub async fn delete_expired_sessions(db: &Db) -> Result<u64> {
    let done = sqlx::query("DELETE FROM session WHERE expires_at <= ?")
        .bind(now_unix())
        .execute(db)
        .await?;
    Ok(done.rows_affected())
}

pub async fn insert_api_token(db: &Db, token_hash: &str, username: &str) -> Result<()> {
    let user = find_user(db, username)
        .await?
        .ok_or(StorageError::NotFound { what: "user" })?;
    sqlx::query("INSERT INTO api_token (token_hash, user_id, created_at) VALUES (?, ?, ?)")
        .bind(token_hash)
        .bind(user.id)
        .bind(now_text())
        .execute(db)
        .await?;
    Ok(())
}

/// The owner of an API token, read fresh on every request (no caching of accounts).
pub async fn find_token_user(db: &Db, token_hash: &str) -> Result<Option<UserRow>> {
    Ok(sqlx::query_as(
        "SELECT u.id, u.username, u.password_hash, u.role, u.created_at, u.revision,
                u.updated_at, u.updated_by
         FROM api_token t JOIN user u ON u.id = t.user_id WHERE t.token_hash = ?",
    )
    .bind(token_hash)
    .fetch_optional(db)
    .await?)
}
