//! The review's live channel on a real loopback socket: a late joiner gets the current
//! screen first, then the presenter's moves and new comments arrive within a bounded wait.

use std::time::Duration;

use serde_json::Value;

use crate::reviews::app_with_review;

/// Reads the event stream until an event named `name` arrives; returns its data line.
async fn next_event(resp: &mut reqwest::Response, name: &str, buf: &mut String) -> String {
    loop {
        if let Some(start) = buf.find(&format!("event: {name}\n")) {
            let rest = &buf[start..];
            if let Some(end) = rest.find("\n\n") {
                let block = rest[..end].to_string();
                buf.replace_range(..start + end + 2, "");
                let data = block.lines().find_map(|l| l.strip_prefix("data: "));
                return data.unwrap_or("").to_string();
            }
        }
        let chunk = resp
            .chunk()
            .await
            .expect("stream reads")
            .expect("stream stays open");
        buf.push_str(&String::from_utf8_lossy(&chunk));
    }
}

#[tokio::test]
async fn a_follower_receives_the_presenters_move_within_a_second() {
    let (app, _, id) = app_with_review().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    app.post_present(&eve, id, "compare").await;
    let base = app.serve().await;
    let client = reqwest::Client::new();
    let mut stream = client
        .get(format!("{base}/reviews/{id}/events"))
        .header("cookie", &vic.cookie)
        .send()
        .await
        .unwrap();
    assert_eq!(stream.status(), 200);
    let mut buf = String::new();
    let wait = Duration::from_secs(1);
    let first = tokio::time::timeout(wait, next_event(&mut stream, "view", &mut buf)).await;
    let first: Value =
        serde_json::from_str(&first.expect("late joiner gets the current screen")).unwrap();
    assert_eq!(
        first["view"], "compare",
        "a late joiner lands where the presenter is"
    );

    let form = [("view", "candidates/4"), ("csrf_token", eve.csrf.as_str())];
    let moved = client
        .post(format!("{base}/reviews/{id}/view"))
        .header("cookie", &eve.cookie)
        .header("content-type", "application/x-www-form-urlencoded")
        .body(serde_urlencoded::to_string(form).unwrap())
        .send()
        .await
        .unwrap();
    assert!(moved.status().is_success() || moved.status().is_redirection());
    let got = tokio::time::timeout(wait, next_event(&mut stream, "view", &mut buf)).await;
    let got: Value = serde_json::from_str(&got.expect("the move arrives within 1 s")).unwrap();
    assert_eq!(got["view"], "candidates/4");
    assert_eq!(got["url"], format!("/reviews/{id}/candidates/4"));

    app.post_comment(&vic, id, "", "seen live").await;
    let c = tokio::time::timeout(wait, next_event(&mut stream, "comment", &mut buf)).await;
    let c: Value = serde_json::from_str(&c.expect("the comment arrives within 1 s")).unwrap();
    assert_eq!(
        (c["who"].as_str(), c["body"].as_str()),
        (Some("vic"), Some("seen live"))
    );
}
