//! Subcommands of the `shaftline` binary: serving, accounts, API tokens and backups.

use std::io::{BufRead, Write};

use anyhow::{Context, bail};
use clap::{Parser, Subcommand};

use crate::config::{DbArgs, ServeArgs};
use crate::secrets;
use crate::storage::{self, accounts, accounts::Role};

/// Propulsion motor trade studies for electric aircraft.
#[derive(Debug, Parser)]
#[command(name = "shaftline", version)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Commands,
}

#[derive(Debug, Subcommand)]
pub enum Commands {
    /// Run the web application.
    Serve(ServeArgs),
    /// Manage accounts.
    User {
        #[command(flatten)]
        db: DbArgs,
        #[command(subcommand)]
        action: UserAction,
    },
    /// Manage API tokens for scripts.
    Token {
        #[command(flatten)]
        db: DbArgs,
        #[command(subcommand)]
        action: TokenAction,
    },
    /// Score a study file headless (the same engine as the server).
    Score(crate::cli_engine::ScoreArgs),
    /// Score a family of designs: vary one to three inputs of a sizing candidate.
    Sweep(crate::cli_study::SweepArgs),
    /// How often each candidate stays feasible, on the front and best under uncertainty.
    Robustness(crate::cli_study::RobustnessArgs),
    /// Print the engine benchmark figures.
    Bench(crate::cli_engine::BenchArgs),
    /// Write a consistent copy of the database (safe while the server runs).
    Backup {
        #[command(flatten)]
        db: DbArgs,
        /// The new file to write; an existing file is never overwritten.
        dest: std::path::PathBuf,
    },
}

#[derive(Debug, Subcommand)]
pub enum UserAction {
    /// Add an account; the password is read from the first line of stdin.
    Add {
        name: String,
        #[arg(long, value_parser = parse_role)]
        role: Role,
    },
    /// Set an account's password (read from the first line of stdin).
    Passwd { name: String },
    /// List accounts and their roles.
    List,
}

#[derive(Debug, Subcommand)]
pub enum TokenAction {
    /// Create an API token for a user; the token is printed once, alone on the last line.
    Create { name: String },
}

fn parse_role(s: &str) -> Result<Role, String> {
    s.parse()
}

/// Runs an account or token subcommand against the database.
pub async fn run_user(db: &DbArgs, action: UserAction) -> anyhow::Result<()> {
    let pool = storage::open_file(db.path_str()?)
        .await
        .context("opening the database")?;
    let result = user_action(&pool, action).await;
    pool.close().await;
    result
}

async fn user_action(pool: &storage::Db, action: UserAction) -> anyhow::Result<()> {
    match action {
        UserAction::Add { name, role } => {
            secrets::check_username(&name).map_err(anyhow::Error::msg)?;
            let hash = read_password_hash()?;
            accounts::insert_user(pool, &name, &hash, role).await?;
            println!("added {name} ({role})");
        }
        UserAction::Passwd { name } => {
            if accounts::find_user(pool, &name).await?.is_none() {
                bail!("user: no account named '{name}'");
            }
            let hash = read_password_hash()?;
            accounts::set_password_hash(pool, &name, &hash).await?;
            println!("password changed for {name}");
        }
        UserAction::List => {
            for u in accounts::list_users(pool).await? {
                println!("{}\t{}\t{}", u.username, u.role, u.created_at);
            }
        }
    }
    Ok(())
}

pub async fn run_token(db: &DbArgs, action: TokenAction) -> anyhow::Result<()> {
    let pool = storage::open_file(db.path_str()?)
        .await
        .context("opening the database")?;
    let TokenAction::Create { name } = action;
    let token = secrets::random_token(43);
    let result = accounts::insert_api_token(&pool, &secrets::token_digest(&token), &name).await;
    pool.close().await;
    result.with_context(|| format!("creating a token for '{name}'"))?;
    println!("API token for {name} (shown once; send it as 'Authorization: Bearer <token>'):");
    println!("{token}");
    std::io::stdout().flush()?;
    Ok(())
}

/// `shaftline backup DEST.db`: copies the database named by `--db` into `dest`.
pub async fn run_backup(db: &DbArgs, dest: &std::path::Path) -> anyhow::Result<()> {
    let src = db.path_str()?;
    if !std::path::Path::new(src).exists() {
        bail!("backup: no database at '{src}' (set --db or SHAFTLINE_DB)");
    }
    let pool = storage::open_file(src)
        .await
        .context("opening the database")?;
    let result = storage::backup::backup_to(&pool, dest).await;
    pool.close().await;
    result?;
    println!("backed up {src} to {}", dest.display());
    Ok(())
}

fn read_password_hash() -> anyhow::Result<String> {
    let mut line = String::new();
    std::io::stdin()
        .lock()
        .read_line(&mut line)
        .context("reading the password from stdin")?;
    let password = line.trim_end_matches(['\r', '\n']);
    secrets::check_new_password(password).map_err(anyhow::Error::msg)?;
    secrets::hash_password(password).map_err(anyhow::Error::msg)
}
