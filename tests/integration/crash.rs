//! Crash durability: the real binary on a temporary database, a client making writes
//! over HTTP, `kill -9` at seeded random moments, restart. After every round the
//! database passes `PRAGMA integrity_check` and every acknowledged write is present.

use std::time::Duration;

use serde_json::Value;

use crate::binary::{self, client};

/// A small seeded generator (xorshift64), so every run kills at the same moments.
struct Seeded(u64);

impl Seeded {
    fn next_ms(&mut self, lo: u64, hi: u64) -> u64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        lo + self.0 % (hi - lo)
    }
}

/// Creates studies named `crash {round}.{n}` until the server goes away; returns the
/// (id, name) of every creation the server acknowledged with 201.
async fn write_until_killed(
    url: String,
    token: String,
    file: Value,
    round: usize,
) -> Vec<(String, String)> {
    let mut acked = Vec::new();
    for n in 0..10_000 {
        let mut f = file.clone();
        let name = format!("crash {round}.{n}");
        f["name"] = Value::from(name.clone());
        let sent = client()
            .post(format!("{url}/api/studies"))
            .bearer_auth(&token)
            .json(&f)
            .timeout(Duration::from_secs(10))
            .send()
            .await;
        let Ok(resp) = sent else { break };
        if resp.status() != 201 {
            break;
        }
        let Ok(body) = resp.json::<Value>().await else {
            break;
        };
        acked.push((body["id"].as_str().unwrap_or("").to_string(), name));
    }
    acked
}

async fn check(db: &std::path::Path, acked: &[(String, String)]) {
    let pool = shaftline::storage::open_file(db.to_str().unwrap())
        .await
        .unwrap();
    let (ok,): (String,) = sqlx::query_as("PRAGMA integrity_check")
        .fetch_one(&pool)
        .await
        .unwrap();
    assert_eq!(ok, "ok");
    for (id, name) in acked {
        let row = shaftline::storage::studies::get_study(&pool, id.parse().unwrap()).await;
        assert_eq!(
            row.map(|r| r.name).ok().as_ref(),
            Some(name),
            "acknowledged study {id}"
        );
    }
    pool.close().await;
}

#[tokio::test]
async fn acknowledged_writes_survive_twenty_hard_kills() {
    let dir = tempfile::tempdir().unwrap();
    let db = dir.path().join("crash.db");
    let first = binary::start(&db);
    let token = binary::token(&db, "admin");
    let list: Vec<Value> = client()
        .get(format!("{}/api/studies", first.url))
        .bearer_auth(&token)
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    let demo_id = list[0]["id"].as_str().unwrap().to_string();
    let file: Value = client()
        .get(format!("{}/api/studies/{demo_id}", first.url))
        .bearer_auth(&token)
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    assert!(first.stop().success());
    let mut rng = Seeded(0x5eed_cafe_f00d_1234);
    let mut acked = Vec::new();
    for round in 0..20 {
        let server = binary::start(&db);
        let writer = tokio::spawn(write_until_killed(
            server.url.clone(),
            token.clone(),
            file.clone(),
            round,
        ));
        tokio::time::sleep(Duration::from_millis(rng.next_ms(30, 400))).await;
        server.kill_hard();
        acked.extend(writer.await.unwrap());
        check(&db, &acked).await;
    }
    println!("crash: {} acknowledged writes over 20 kills", acked.len());
    assert!(
        acked.len() >= 20,
        "the client did make writes: {}",
        acked.len()
    );
}
