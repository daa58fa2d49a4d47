//! The real binary: first start seeds and prints the admin password once; account and
//! token subcommands work against the same database file.

use std::io::{BufRead, BufReader, Write};
use std::process::{Child, Command, Stdio};

const BIN: &str = env!("CARGO_BIN_EXE_shaftline");

/// Starts `serve` on a free port; returns the child, the stdout lines up to the
/// listening line, and the base URL.
// The child is handed to the caller, which always stops and waits for it.
#[allow(clippy::zombie_processes)]
fn start(db: &std::path::Path) -> (Child, Vec<String>, String) {
    let mut child = Command::new(BIN)
        .args(["serve", "--addr", "127.0.0.1:0"])
        .env("SHAFTLINE_DB", db)
        .stdout(Stdio::piped())
        .stderr(Stdio::null())
        .spawn()
        .expect("binary starts");
    let mut lines = Vec::new();
    let mut out = BufReader::new(child.stdout.take().unwrap());
    loop {
        let mut line = String::new();
        assert!(
            out.read_line(&mut line).unwrap() > 0,
            "server exited early: {lines:?}"
        );
        let line = line.trim_end().to_string();
        lines.push(line.clone());
        if let Some(url) = line.strip_prefix("Shaftline listening on ") {
            return (child, lines, url.trim_end_matches('/').to_string());
        }
    }
}

fn stop(mut child: Child) -> std::process::ExitStatus {
    let pid = child.id().to_string();
    Command::new("kill").args(["-TERM", &pid]).status().unwrap();
    child.wait().unwrap()
}

fn run(args: &[&str], db: &std::path::Path, stdin: &str) -> std::process::Output {
    let mut child = Command::new(BIN)
        .args(args)
        .env("SHAFTLINE_DB", db)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(stdin.as_bytes())
        .unwrap();
    child.wait_with_output().unwrap()
}

#[tokio::test]
async fn first_start_prints_the_admin_password_once_and_seeds_the_demo() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("s.db");
    let (child, lines, url) = start(&db);
    let pw_lines: Vec<&String> = lines
        .iter()
        .filter(|l| l.starts_with("admin password: "))
        .collect();
    assert_eq!(pw_lines.len(), 1, "{lines:?}");
    let password = pw_lines[0]
        .trim_start_matches("admin password: ")
        .to_string();
    assert!(password.len() >= 16);
    let health = reqwest::get(format!("{url}/health")).await.unwrap();
    assert_eq!(health.status(), 200);
    assert!(stop(child).success(), "graceful shutdown exits 0");
    assert!(!dir.path().join("s.db-wal").exists(), "pool closed cleanly");

    let pool = shaftline::storage::open_file(db.to_str().unwrap())
        .await
        .unwrap();
    let admin = shaftline::storage::accounts::find_user(&pool, "admin")
        .await
        .unwrap()
        .unwrap();
    assert!(
        admin.password_hash.starts_with("$argon2id$") && !admin.password_hash.contains(&password)
    );
    assert!(shaftline::secrets::verify_password(
        &password,
        &admin.password_hash
    ));
    let studies = shaftline::storage::studies::list_studies(&pool, None)
        .await
        .unwrap();
    assert_eq!(studies.len(), 1);
    assert_eq!(studies[0].candidates, 7);
    pool.close().await;

    let (child, lines, _) = start(&db);
    assert!(
        lines.iter().all(|l| !l.contains("password")),
        "second start is silent: {lines:?}"
    );
    assert!(stop(child).success());
}

#[test]
fn user_and_token_subcommands_manage_accounts() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("c.db");
    let add = run(
        &["user", "add", "rita", "--role", "editor"],
        &db,
        "a good password\n",
    );
    assert!(
        add.status.success(),
        "{}",
        String::from_utf8_lossy(&add.stderr)
    );
    let short = run(&["user", "add", "sam", "--role", "viewer"], &db, "short\n");
    assert!(!short.status.success());
    assert!(String::from_utf8_lossy(&short.stderr).contains("at least 8"));
    let bad_role = run(
        &["user", "add", "sam", "--role", "boss"],
        &db,
        "long enough\n",
    );
    assert!(!bad_role.status.success());
    let list = String::from_utf8(run(&["user", "list"], &db, "").stdout).unwrap();
    assert!(
        list.lines().any(|l| l.starts_with("rita\teditor")),
        "{list}"
    );
    assert!(!list.contains("sam"));
    assert!(
        run(&["user", "passwd", "rita"], &db, "another password\n")
            .status
            .success()
    );
    assert!(
        !run(&["user", "passwd", "nobody"], &db, "another password\n")
            .status
            .success()
    );
    let token = run(&["token", "create", "rita"], &db, "");
    assert!(token.status.success());
    let out = String::from_utf8(token.stdout).unwrap();
    let last = out.lines().last().unwrap();
    assert!(
        last.len() >= 32
            && last
                .bytes()
                .all(|c| c.is_ascii_alphanumeric() || c == b'_' || c == b'-'),
        "{last}"
    );
}
