//! The bounded load test on loopback, modest size: 50 concurrent clients, a fixed
//! number of requests mixing page views, results and edits. Asserts zero 5xx, zero
//! transport errors and zero lost updates; latency is printed, never asserted.

use shaftline::loadtest;

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn fifty_clients_get_no_server_errors_and_lose_no_updates() {
    let report = loadtest::run_fresh(50, 240)
        .await
        .expect("a fresh server on loopback");
    println!("{}", report.summary());
    assert!(report.requests >= 240, "every planned request ran");
    assert_eq!(report.server_errors, 0, "{}", report.summary());
    assert_eq!(report.transport_errors, 0, "{}", report.summary());
    assert_eq!(report.client_errors, 0, "{}", report.summary());
    assert!(report.acknowledged_edits > 0, "{}", report.summary());
    assert_eq!(report.lost_updates, 0, "{}", report.summary());
}
