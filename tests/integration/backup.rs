//! `shaftline backup`: a consistent copy taken while the server runs, never over an
//! existing file, and a server started on the copy finds every study and account.

use serde_json::Value;

use crate::binary::{self, client};

async fn studies(url: &str, token: &str) -> Vec<Value> {
    let resp = client()
        .get(format!("{url}/api/studies"))
        .bearer_auth(token)
        .send()
        .await
        .unwrap();
    assert_eq!(resp.status(), 200);
    resp.json().await.unwrap()
}

async fn study_file(url: &str, token: &str, id: &str) -> Value {
    let resp = client()
        .get(format!("{url}/api/studies/{id}"))
        .bearer_auth(token)
        .send()
        .await
        .unwrap();
    assert_eq!(resp.status(), 200, "study {id} readable");
    resp.json().await.unwrap()
}

/// Adds a second study through the API (a renamed copy of the demo).
async fn add_study(url: &str, token: &str) {
    let list = studies(url, token).await;
    let id = list[0]["id"].as_str().unwrap().to_string();
    let mut file = study_file(url, token, &id).await;
    file["name"] = Value::from("Backup check variant");
    let resp = client()
        .post(format!("{url}/api/studies"))
        .bearer_auth(token)
        .json(&file)
        .send()
        .await
        .unwrap();
    assert_eq!(resp.status(), 201, "{}", resp.text().await.unwrap());
}

#[tokio::test]
async fn a_backup_taken_while_serving_restores_every_study_and_account() {
    let dir = tempfile::tempdir().unwrap();
    let (db, copy) = (dir.path().join("live.db"), dir.path().join("copy.db"));
    let server = binary::start(&db);
    let added = binary::run(
        &["user", "add", "rita", "--role", "editor"],
        &db,
        "rita's password\n",
    );
    assert!(added.status.success());
    let token = binary::token(&db, "rita");
    add_study(&server.url, &token).await;
    let before = studies(&server.url, &token).await;
    assert_eq!(before.len(), 2);

    let out = binary::run(&["backup", copy.to_str().unwrap()], &db, "");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let again = binary::run(&["backup", copy.to_str().unwrap()], &db, "");
    assert!(!again.status.success(), "an existing file is refused");
    assert!(String::from_utf8_lossy(&again.stderr).contains("already exists"));
    assert!(server.stop().success());

    let restored = binary::start(&copy);
    assert_eq!(
        restored.admin_password(),
        None,
        "the copy is not a first start"
    );
    let after = studies(&restored.url, &token).await;
    assert_eq!(after, before, "every study with its revision");
    for s in &before {
        let id = s["id"].as_str().unwrap();
        assert_eq!(
            study_file(&restored.url, &token, id).await,
            study_file_offline(&db, id).await,
            "study {id} restored whole"
        );
    }
    let list = String::from_utf8(binary::run(&["user", "list"], &copy, "").stdout).unwrap();
    for who in ["admin\tadmin", "rita\teditor"] {
        assert!(list.lines().any(|l| l.starts_with(who)), "{who} in {list}");
    }
    assert!(restored.stop().success());
}

/// The study file straight from the original database (the server on it is stopped).
async fn study_file_offline(db: &std::path::Path, id: &str) -> Value {
    let pool = shaftline::storage::open_file(db.to_str().unwrap())
        .await
        .unwrap();
    let (_, doc) = shaftline::storage::studies::load_doc(&pool, id.parse().unwrap())
        .await
        .unwrap();
    pool.close().await;
    let study = shaftline::web::validate::validate_doc(&doc)
        .unwrap()
        .unwrap();
    serde_json::to_value(&study).unwrap()
}

#[test]
fn a_backup_of_a_missing_database_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let out = binary::run(
        &["backup", dir.path().join("c.db").to_str().unwrap()],
        &dir.path().join("absent.db"),
        "",
    );
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("no database"));
    assert!(!dir.path().join("absent.db").exists(), "nothing created");
}
