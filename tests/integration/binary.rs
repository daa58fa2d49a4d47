//! The real `shaftline` binary for tests that need a process: start `serve` on a
//! port-0 socket over a given database file, stop it gracefully or kill it hard, and
//! run one-shot subcommands.

use std::io::{BufRead, BufReader, Write};
use std::path::Path;
use std::process::{Child, Command, Output, Stdio};

pub const BIN: &str = env!("CARGO_BIN_EXE_shaftline");

/// A running server: the child process, its first stdout lines and its base URL.
pub struct Server {
    pub child: Child,
    pub lines: Vec<String>,
    pub url: String,
}

/// Starts `serve` on a free loopback port over `db`, with stderr sent to `stderr`.
// The child is owned by `Server`, whose users always stop or kill and wait for it.
#[allow(clippy::zombie_processes)]
pub fn start_with(db: &Path, stderr: Stdio, env: &[(&str, &str)]) -> Server {
    let mut cmd = Command::new(BIN);
    cmd.args(["serve", "--addr", "127.0.0.1:0"])
        .env("SHAFTLINE_DB", db)
        .stdout(Stdio::piped())
        .stderr(stderr);
    for (k, v) in env {
        cmd.env(k, v);
    }
    let mut child = cmd.spawn().expect("binary starts");
    let mut lines = Vec::new();
    let mut out = BufReader::new(child.stdout.take().expect("piped stdout"));
    loop {
        let mut line = String::new();
        assert!(
            out.read_line(&mut line).expect("stdout readable") > 0,
            "server exited early: {lines:?}"
        );
        let line = line.trim_end().to_string();
        lines.push(line.clone());
        if let Some(url) = line.strip_prefix("Shaftline listening on ") {
            let url = url.trim_end_matches('/').to_string();
            return Server { child, lines, url };
        }
    }
}

pub fn start(db: &Path) -> Server {
    start_with(db, Stdio::null(), &[])
}

impl Server {
    /// The one-time admin password printed on first start, if this start printed it.
    pub fn admin_password(&self) -> Option<String> {
        self.lines
            .iter()
            .find_map(|l| l.strip_prefix("admin password: "))
            .map(str::to_string)
    }

    /// SIGTERM and wait: the graceful path.
    pub fn stop(mut self) -> std::process::ExitStatus {
        let pid = self.child.id().to_string();
        Command::new("kill")
            .args(["-TERM", &pid])
            .status()
            .expect("kill runs");
        self.child.wait().expect("server exits")
    }

    /// SIGKILL and wait: no chance to flush or close anything.
    pub fn kill_hard(mut self) {
        self.child.kill().expect("SIGKILL delivered");
        self.child.wait().expect("server reaped");
    }
}

/// Runs a subcommand over `db` with `stdin` fed to it, and collects its output.
pub fn run(args: &[&str], db: &Path, stdin: &str) -> Output {
    let mut child = Command::new(BIN)
        .args(args)
        .env("SHAFTLINE_DB", db)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("binary starts");
    child
        .stdin
        .take()
        .expect("piped stdin")
        .write_all(stdin.as_bytes())
        .expect("stdin written");
    child.wait_with_output().expect("subcommand finishes")
}

/// A fresh API token for `user`, created through `shaftline token create`.
pub fn token(db: &Path, user: &str) -> String {
    let out = run(&["token", "create", user], db, "");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).expect("utf-8 stdout");
    text.lines().last().expect("token line").to_string()
}

/// A reqwest client for loopback calls with a bearer token.
pub fn client() -> reqwest::Client {
    reqwest::Client::builder()
        .redirect(reqwest::redirect::Policy::none())
        .build()
        .expect("client builds")
}
