//! A bounded load test against a running server on loopback: `clients` concurrent
//! clients share `requests` requests mixing a page view, the study list, results and
//! read-modify-write edits of one study. It reports latency percentiles and error
//! counts, and checks for lost updates: every edit increments a counter kept in the
//! study's notes, so the final counter must equal the start plus the acknowledged edits.

mod fresh;
pub mod http;

pub use fresh::run_fresh;

use std::net::SocketAddr;
use std::sync::Arc;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

use serde_json::Value;

/// What one load run measured.
#[derive(Debug, Clone, Default)]
pub struct Report {
    pub requests: usize,
    pub latencies: Vec<Duration>,
    /// Answers with a 5xx status.
    pub server_errors: usize,
    /// Connections that failed or answers that could not be read.
    pub transport_errors: usize,
    /// Stale edits refused with 409 (expected under contention; retried).
    pub conflicts: usize,
    /// Other 4xx answers (none are expected).
    pub client_errors: usize,
    pub acknowledged_edits: usize,
    /// Acknowledged edits missing from the final counter (or, negative, extra ones).
    pub lost_updates: i64,
}

impl Report {
    /// The `p`-th percentile latency (0 < p ≤ 100), nearest rank.
    pub fn percentile(&self, p: f64) -> Duration {
        let mut v = self.latencies.clone();
        v.sort();
        if v.is_empty() {
            return Duration::ZERO;
        }
        let rank = ((p / 100.0) * v.len() as f64).ceil() as usize;
        v[rank.clamp(1, v.len()) - 1]
    }

    /// The one-paragraph summary printed by tests and `shaftline bench`.
    pub fn summary(&self) -> String {
        let ms = |d: Duration| d.as_secs_f64() * 1e3;
        format!(
            "load: {} requests; p50 {:.1} ms, p95 {:.1} ms, p99 {:.1} ms; 5xx {}, transport {}, \
             other 4xx {}, 409 retried {}; edits acknowledged {}, lost {}",
            self.requests,
            ms(self.percentile(50.0)),
            ms(self.percentile(95.0)),
            ms(self.percentile(99.0)),
            self.server_errors,
            self.transport_errors,
            self.client_errors,
            self.conflicts,
            self.acknowledged_edits,
            self.lost_updates
        )
    }

    fn merge(&mut self, o: Report) {
        self.requests += o.requests;
        self.latencies.extend(o.latencies);
        self.server_errors += o.server_errors;
        self.transport_errors += o.transport_errors;
        self.conflicts += o.conflicts;
        self.client_errors += o.client_errors;
        self.acknowledged_edits += o.acknowledged_edits;
    }
}

/// Where to send the load and as whom (a bearer token of an editor).
#[derive(Debug, Clone)]
pub struct Target {
    pub addr: SocketAddr,
    pub token: String,
    pub study_id: i64,
}

struct Shared {
    target: Target,
    next: AtomicUsize,
    total: usize,
}

const COUNTER: &str = "load counter: ";

fn counter_of(file: &Value) -> i64 {
    file["notes"]
        .as_str()
        .and_then(|n| n.strip_prefix(COUNTER))
        .and_then(|n| n.parse().ok())
        .unwrap_or(0)
}

/// Runs `requests` requests over `clients` concurrent clients; stops by itself.
pub async fn run(target: Target, clients: usize, requests: usize) -> Report {
    let shared = Arc::new(Shared {
        target,
        next: AtomicUsize::new(0),
        total: requests,
    });
    let start = read_counter(&shared).await;
    let tasks: Vec<_> = (0..clients.max(1))
        .map(|_| tokio::spawn(client(shared.clone())))
        .collect();
    let mut report = Report::default();
    for t in tasks {
        if let Ok(r) = t.await {
            report.merge(r);
        }
    }
    let end = read_counter(&shared).await;
    report.lost_updates = match (start, end) {
        (Some(s), Some(e)) => s + report.acknowledged_edits as i64 - e,
        _ => report.acknowledged_edits as i64,
    };
    report
}

async fn client(shared: Arc<Shared>) -> Report {
    let mut r = Report::default();
    loop {
        let i = shared.next.fetch_add(1, Ordering::Relaxed);
        if i >= shared.total {
            return r;
        }
        let id = shared.target.study_id;
        match i % 4 {
            0 => drop(timed(&shared, &mut r, "GET", "/login".into(), &[], "").await),
            1 => drop(timed(&shared, &mut r, "GET", "/api/studies".into(), &[], "").await),
            2 => {
                let path = format!("/api/studies/{id}/results");
                drop(timed(&shared, &mut r, "GET", path, &[], "").await)
            }
            _ => edit(&shared, &mut r).await,
        }
    }
}

/// One request with its latency and outcome counted; the answer when one came.
async fn timed(
    shared: &Shared,
    r: &mut Report,
    method: &str,
    path: String,
    extra: &[(&str, &str)],
    body: &str,
) -> Option<http::Answer> {
    let auth = format!("Bearer {}", shared.target.token);
    let mut headers = vec![("Authorization", auth.as_str())];
    headers.extend_from_slice(extra);
    if !body.is_empty() {
        headers.push(("Content-Type", "application/json"));
    }
    let started = Instant::now();
    let answer = http::send(shared.target.addr, method, &path, &headers, body).await;
    r.latencies.push(started.elapsed());
    r.requests += 1;
    match answer {
        Err(_) => r.transport_errors += 1,
        Ok(ref a) if a.status >= 500 => r.server_errors += 1,
        Ok(ref a) if a.status == 409 => r.conflicts += 1,
        Ok(ref a) if a.status >= 400 => r.client_errors += 1,
        Ok(_) => {}
    }
    answer.ok()
}

/// Read, increment the counter, write back with If-Match; retry a few times on 409.
async fn edit(shared: &Shared, r: &mut Report) {
    let path = format!("/api/studies/{}", shared.target.study_id);
    for _ in 0..5 {
        let Some(got) = timed(shared, r, "GET", path.clone(), &[], "").await else {
            return;
        };
        let (Some(etag), Ok(mut file)) = (
            got.header("etag").map(str::to_string),
            serde_json::from_str::<Value>(&got.body),
        ) else {
            return;
        };
        file["notes"] = Value::from(format!("{COUNTER}{}", counter_of(&file) + 1));
        let body = file.to_string();
        let put = timed(
            shared,
            r,
            "PUT",
            path.clone(),
            &[("If-Match", etag.as_str())],
            &body,
        )
        .await;
        match put.map(|a| a.status) {
            Some(200) => {
                r.acknowledged_edits += 1;
                return;
            }
            Some(409) => continue,
            _ => return,
        }
    }
}

async fn read_counter(shared: &Shared) -> Option<i64> {
    let path = format!("/api/studies/{}", shared.target.study_id);
    let auth = format!("Bearer {}", shared.target.token);
    let headers = [("Authorization", auth.as_str())];
    let got = http::send(shared.target.addr, "GET", &path, &headers, "")
        .await
        .ok()?;
    let file: Value = serde_json::from_str(&got.body).ok()?;
    Some(counter_of(&file))
}
