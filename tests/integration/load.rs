//! The bounded load test on loopback, modest size: 50 concurrent clients, a fixed
//! number of requests mixing page views, results and edits. Asserts zero 5xx, zero
//! transport errors and zero lost updates; latency is printed, never asserted.

use shaftline::config::WebConfig;
use shaftline::loadtest::{self, Target};
use shaftline::storage;
use shaftline::web::{AppState, app};

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn fifty_clients_get_no_server_errors_and_lose_no_updates() {
    let dir = tempfile::tempdir().unwrap();
    let db = storage::open_file(dir.path().join("load.db").to_str().unwrap())
        .await
        .unwrap();
    let study_id = shaftline::setup::seed_demo(&db).await.unwrap();
    storage::accounts::insert_user(&db, "eve", "unused", storage::accounts::Role::Editor)
        .await
        .unwrap();
    let token = shaftline::secrets::random_token(43);
    storage::accounts::insert_api_token(&db, &shaftline::secrets::token_digest(&token), "eve")
        .await
        .unwrap();
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let addr = listener.local_addr().unwrap();
    let router = app(AppState::new(db.clone(), WebConfig::default()));
    let server = tokio::spawn(async move { axum::serve(listener, router).await });
    let report = loadtest::run(
        Target {
            addr,
            token,
            study_id,
        },
        50,
        240,
    )
    .await;
    println!("{}", report.summary());
    server.abort();
    assert!(report.requests >= 240, "every planned request ran");
    assert_eq!(report.server_errors, 0, "{}", report.summary());
    assert_eq!(report.transport_errors, 0, "{}", report.summary());
    assert_eq!(report.client_errors, 0, "{}", report.summary());
    assert!(report.acknowledged_edits > 0, "{}", report.summary());
    assert_eq!(report.lost_updates, 0, "{}", report.summary());
}
