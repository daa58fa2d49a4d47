//! `TestApp` helpers for design reviews: one per review route, plus a real socket for
//! the live channel and an edit of the demo study through the API.

use serde_json::{Value, json};

use crate::helpers::{Resp, Session, TestApp};

impl TestApp {
    /// Starts a review through the API as `token`'s user; returns the response.
    pub async fn api_start_review(&self, token: &str, study: i64, body: Value) -> Resp {
        let path = format!("/api/studies/{study}/reviews");
        self.api("POST", &path, Some(token), &[], Some(body.to_string()))
            .await
    }

    /// Starts a review of the demo study and returns its id.
    pub async fn start_demo_review(&self, token: &str, title: &str) -> i64 {
        let r = self
            .api_start_review(token, self.demo_id, json!({ "title": title }))
            .await;
        assert_eq!(r.status, 201, "review starts: {}", r.body);
        let v: Value = serde_json::from_str(&r.body).unwrap();
        v["id"].as_str().unwrap().parse().unwrap()
    }

    pub async fn api_review(&self, token: &str, id: i64) -> Resp {
        self.api("GET", &format!("/api/reviews/{id}"), Some(token), &[], None)
            .await
    }

    pub async fn api_review_json(&self, token: &str, id: i64) -> Value {
        let r = self.api_review(token, id).await;
        assert_eq!(r.status, 200, "{}", r.body);
        serde_json::from_str(&r.body).unwrap()
    }

    pub async fn api_review_diff(&self, token: &str, id: i64, against: &str) -> Resp {
        let path = format!("/api/reviews/{id}/diff?against={against}");
        self.api("GET", &path, Some(token), &[], None).await
    }

    pub async fn post_start_review(&self, s: &Session, study: i64, pairs: &[(&str, &str)]) -> Resp {
        self.submit(&format!("/studies/{study}/reviews"), s, pairs)
            .await
    }

    pub async fn get_review_page(&self, s: &Session, id: i64, view: &str) -> Resp {
        let path = if view.is_empty() {
            format!("/reviews/{id}")
        } else {
            format!("/reviews/{id}/{view}")
        };
        self.get(&path, Some(s)).await
    }

    pub async fn get_study_reviews(&self, s: &Session, study: i64) -> Resp {
        self.get(&format!("/studies/{study}/reviews"), Some(s))
            .await
    }

    pub async fn post_present(&self, s: &Session, id: i64, view: &str) -> Resp {
        self.submit(&format!("/reviews/{id}/view"), s, &[("view", view)])
            .await
    }

    pub async fn post_hand_over(&self, s: &Session, id: i64, to: &str) -> Resp {
        self.submit(&format!("/reviews/{id}/presenter"), s, &[("presenter", to)])
            .await
    }

    pub async fn post_comment(&self, s: &Session, id: i64, candidate: &str, body: &str) -> Resp {
        let pairs = [("candidate", candidate), ("body", body)];
        self.submit(&format!("/reviews/{id}/comments"), s, &pairs)
            .await
    }

    pub async fn post_decision(
        &self,
        s: &Session,
        id: i64,
        candidate: &str,
        outcome: &str,
        rationale: &str,
    ) -> Resp {
        let pairs = [
            ("candidate", candidate),
            ("outcome", outcome),
            ("rationale", rationale),
        ];
        self.submit(&format!("/reviews/{id}/decisions"), s, &pairs)
            .await
    }

    pub async fn post_close_review(&self, s: &Session, id: i64) -> Resp {
        self.submit(&format!("/reviews/{id}/close"), s, &[]).await
    }

    pub async fn get_minutes(&self, s: &Session, id: i64, ext: &str) -> Resp {
        self.get(&format!("/reviews/{id}/minutes.{ext}"), Some(s))
            .await
    }

    pub async fn get_diff_page(&self, s: &Session, id: i64, against: &str) -> Resp {
        self.get(&format!("/reviews/{id}/diff?against={against}"), Some(s))
            .await
    }

    /// Replaces the demo study through the API after `change` edits its JSON.
    pub async fn edit_demo_study(&self, token: &str, change: impl FnOnce(&mut Value)) {
        let path = format!("/api/studies/{}", self.demo_id);
        let got = self.api("GET", &path, Some(token), &[], None).await;
        let etag = got.headers["etag"].to_str().unwrap().to_string();
        let mut study: Value = serde_json::from_str(&got.body).unwrap();
        change(&mut study);
        let put = self
            .api(
                "PUT",
                &path,
                Some(token),
                &[("if-match", &etag)],
                Some(study.to_string()),
            )
            .await;
        assert_eq!(put.status, 200, "study edit is stored: {}", put.body);
    }

    /// Serves the app on a real loopback socket (port 0); returns its base URL.
    pub async fn serve(&self) -> String {
        let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
        let base = format!("http://{}", listener.local_addr().unwrap());
        let router = self.router.clone();
        tokio::spawn(async move { axum::serve(listener, router).await.unwrap() });
        base
    }

    /// Number of rows of a review table (for "nothing was stored" checks).
    pub async fn count_rows(&self, table: &str) -> i64 {
        let sql = format!("SELECT COUNT(*) FROM {table}");
        let (n,): (i64,) = sqlx::query_as(sqlx::AssertSqlSafe(sql))
            .fetch_one(&self.db)
            .await
            .unwrap();
        n
    }
}
