//! `TestApp` helpers for design sweeps and robustness: one per route, the demo study as
//! the engine sees it, and a bounded wait for a background sweep to stop.

use std::time::Duration;

use shaftline::engine::study::Study;
use shaftline::storage::studies::{self, Item};
use shaftline::web::validate::validate_doc;

use crate::helpers::{Resp, Session, TestApp};

/// Longest wait for a background sweep to stop.
const SWEEP_WAIT: Duration = Duration::from_secs(120);

impl TestApp {
    /// The row id of the demo candidate whose name starts with `prefix`.
    pub async fn candidate_row(&self, study: i64, prefix: &str) -> i64 {
        let rows = studies::list_items(&self.db, Item::Candidate, study)
            .await
            .unwrap();
        rows.iter()
            .find(|r| {
                r.json().unwrap()["name"]
                    .as_str()
                    .unwrap()
                    .starts_with(prefix)
            })
            .map(|r| r.id)
            .expect("candidate exists")
    }

    /// The stored study as the engine's validated `Study`.
    pub async fn engine_study(&self, study: i64) -> Study {
        let (_, doc) = studies::load_doc(&self.db, study).await.unwrap();
        validate_doc(&doc).unwrap().expect("complete study")
    }

    pub async fn get_sweep_form(&self, s: &Session, study: i64, cid: i64) -> Resp {
        let path = format!("/studies/{study}/candidates/{cid}/sweep");
        self.get(&path, Some(s)).await
    }

    /// Posts the sweep form with the given `vary1`/`from1`/… pairs, with `csrf`.
    pub async fn post_start_sweep(
        &self,
        s: &Session,
        csrf: Option<&str>,
        (study, cid): (i64, i64),
        pairs: &[(&str, &str)],
    ) -> Resp {
        let path = format!("/studies/{study}/candidates/{cid}/sweep");
        self.post(&path, Some(s), csrf, pairs).await
    }

    /// Starts a sweep as `s` and returns its job id.
    pub async fn start_sweep(&self, s: &Session, at: (i64, i64), pairs: &[(&str, &str)]) -> String {
        let r = self.post_start_sweep(s, Some(&s.csrf), at, pairs).await;
        assert_eq!(r.status, 303, "sweep starts: {}", r.body);
        r.location()
            .strip_prefix("/sweeps/")
            .expect("redirect to the job")
            .to_string()
    }

    pub async fn get_sweep_page(&self, s: &Session, job: &str) -> Resp {
        self.get(&format!("/sweeps/{job}"), Some(s)).await
    }

    pub async fn get_sweep_rows(&self, s: &Session, job: &str) -> Resp {
        self.get(&format!("/sweeps/{job}/rows.csv"), Some(s)).await
    }

    pub async fn post_cancel_sweep(&self, s: &Session, csrf: Option<&str>, job: &str) -> Resp {
        self.post(&format!("/sweeps/{job}/cancel"), Some(s), csrf, &[])
            .await
    }

    pub async fn post_promote(
        &self,
        s: &Session,
        csrf: Option<&str>,
        job: &str,
        pairs: &[(&str, &str)],
    ) -> Resp {
        self.post(&format!("/sweeps/{job}/promote"), Some(s), csrf, pairs)
            .await
    }

    /// Polls the job page until the sweep is no longer running; returns the page.
    pub async fn wait_for_sweep(&self, s: &Session, job: &str) -> Resp {
        let poll = async {
            loop {
                let page = self.get_sweep_page(s, job).await;
                assert_eq!(page.status, 200, "{}", page.body);
                if !page.body.contains("data-state=\"running\"") {
                    return page;
                }
                tokio::time::sleep(Duration::from_millis(50)).await;
            }
        };
        tokio::time::timeout(SWEEP_WAIT, poll)
            .await
            .expect("the sweep stops within the bounded wait")
    }

    pub async fn get_robustness(&self, s: &Session, study: i64, query: &str) -> Resp {
        self.get(&format!("/studies/{study}/robustness{query}"), Some(s))
            .await
    }

    pub async fn get_robustness_csv(&self, s: &Session, study: i64, query: &str) -> Resp {
        self.get(&format!("/studies/{study}/robustness.csv{query}"), Some(s))
            .await
    }
}
