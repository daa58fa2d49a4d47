//! Command-line and environment settings, validated into typed values.

use std::net::SocketAddr;
use std::path::PathBuf;

use clap::Args;

/// Where the SQLite database lives; shared by every subcommand that touches it.
#[derive(Debug, Clone, Args)]
pub struct DbArgs {
    /// SQLite database file (created when missing).
    #[arg(
        long = "db",
        env = "SHAFTLINE_DB",
        default_value = "shaftline.db",
        global = true
    )]
    pub db: PathBuf,
}

impl DbArgs {
    pub fn path_str(&self) -> anyhow::Result<&str> {
        self.db
            .to_str()
            .ok_or_else(|| anyhow::anyhow!("--db: the path must be valid UTF-8"))
    }
}

/// Settings of `shaftline serve`.
#[derive(Debug, Clone, Args)]
pub struct ServeArgs {
    #[command(flatten)]
    pub db: DbArgs,
    /// Address and port to listen on.
    #[arg(long, env = "SHAFTLINE_ADDR", default_value = "127.0.0.1:8080")]
    pub addr: SocketAddr,
    /// Mark session cookies `Secure` (set when a TLS proxy fronts the server).
    #[arg(long, env = "SHAFTLINE_SECURE_COOKIES")]
    pub secure_cookies: bool,
    /// Hours a browser session lasts after login (1..=720).
    #[arg(long, env = "SHAFTLINE_SESSION_HOURS", default_value_t = 12,
          value_parser = clap::value_parser!(u32).range(1..=720))]
    pub session_hours: u32,
}

/// Runtime settings of the web application.
#[derive(Debug, Clone)]
pub struct WebConfig {
    pub secure_cookies: bool,
    pub session_lifetime_s: i64,
    /// Longest a request may take, body upload included, before a 408.
    pub request_timeout: std::time::Duration,
}

impl Default for WebConfig {
    fn default() -> Self {
        WebConfig {
            secure_cookies: false,
            session_lifetime_s: 12 * 3600,
            request_timeout: std::time::Duration::from_secs(30),
        }
    }
}

impl From<&ServeArgs> for WebConfig {
    fn from(a: &ServeArgs) -> Self {
        WebConfig {
            secure_cookies: a.secure_cookies,
            session_lifetime_s: i64::from(a.session_hours) * 3600,
            ..WebConfig::default()
        }
    }
}
