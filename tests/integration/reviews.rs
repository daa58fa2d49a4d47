//! Design reviews over HTTP: frozen snapshots, roles, comments and decisions, closing,
//! golden minutes, diffs, and the live channel on a real socket.

use serde_json::{Value, json};

use crate::helpers::{Session, TestApp, spawn_app};

pub const DEMO_FIRST: &str = "R1 radial, forced air, direct drive";

pub async fn app_with_review() -> (TestApp, String, i64) {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let id = app
        .start_demo_review(&token, "Gate 2 motor down-select")
        .await;
    (app, token, id)
}

pub fn set_payload(kg: f64) -> impl FnOnce(&mut Value) {
    move |s| s["aircraft"]["payload_kg"] = json!(kg)
}

#[tokio::test]
async fn a_review_snapshot_stays_as_it_was_after_the_study_is_edited() {
    let (app, token, id) = app_with_review().await;
    let before = app.api_review_json(&token, id).await;
    assert_eq!(before["study"]["aircraft"]["payload_kg"], json!(180.0));

    app.edit_demo_study(&token, set_payload(200.0)).await;
    let eve = app.session("eve").await;
    let page_before_move = app.get_review_page(&eve, id, "").await.body;
    app.post_present(&eve, id, "trade").await;
    let after = app.api_review_json(&token, id).await;

    assert_eq!(
        before, after,
        "neither a study edit nor a screen change alters the review"
    );
    let live = app
        .api(
            "GET",
            &format!("/api/studies/{}", app.demo_id),
            Some(&token),
            &[],
            None,
        )
        .await;
    assert!(live.body.contains("200"), "the live study did change");
    let takeoff = before["results"]["candidates"][0]["takeoff_mass_kg"]
        .as_f64()
        .unwrap();
    assert!(
        page_before_move.contains(&format!("{takeoff:.0}"))
            || page_before_move.contains(&format!("{takeoff:.1}")),
        "the review page shows the snapshot's takeoff mass {takeoff}"
    );
}

#[tokio::test]
async fn starting_a_review_names_the_field_and_its_allowed_range() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let long = "x".repeat(201);
    let cases = [
        (json!({}), "title", "missing title"),
        (json!({ "title": "  " }), "title", "blank title"),
        (json!({ "title": long }), "title", "201 characters"),
        (
            json!({ "title": "ok", "participants": ["nobody"] }),
            "participants[0]",
            "unknown person",
        ),
    ];
    for (body, path, why) in cases {
        let r = app.api_start_review(&token, app.demo_id, body).await;
        assert_eq!(r.status, 422, "{why}: {}", r.body);
        let e: Value = serde_json::from_str(&r.body).unwrap();
        assert_eq!(e["error"]["path"], path, "{why}");
    }
    let r = app
        .api_start_review(&token, app.demo_id, json!({ "title": "" }))
        .await;
    assert!(
        r.body.contains("1–200 characters"),
        "the message gives the range: {}",
        r.body
    );
    let viewer = app.token_for("vic").await;
    let r = app
        .api_start_review(&viewer, app.demo_id, json!({ "title": "t" }))
        .await;
    assert_eq!(r.status, 403, "a viewer may not start a review");
    assert_eq!(
        app.count_rows("review").await,
        0,
        "no refused start stored anything"
    );
}

#[tokio::test]
async fn a_viewer_comments_and_only_the_presenter_or_an_editor_decides() {
    let app = spawn_app().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    let study_page = app.get_study_page(&eve, app.demo_id).await;
    assert!(
        study_page.body.contains("id=\"start-review\""),
        "editors see the start form"
    );
    let r = app
        .post_start_review(
            &eve,
            app.demo_id,
            &[("title", "Weekly trade"), ("participants", "vic")],
        )
        .await;
    assert_eq!(r.status, 303, "{}", r.body);
    let id: i64 = r
        .location()
        .trim_start_matches("/reviews/")
        .parse()
        .unwrap();

    assert_eq!(
        app.post_comment(&vic, id, DEMO_FIRST, "Cooling looks marginal")
            .await
            .status,
        303
    );
    assert_eq!(
        app.post_comment(&vic, id, "", "General remark")
            .await
            .status,
        303
    );
    let r = app.post_decision(&vic, id, DEMO_FIRST, "drop", "no").await;
    assert_eq!(
        r.status, 403,
        "a viewer who does not present may not decide"
    );
    let r = app
        .post_decision(&eve, id, DEMO_FIRST, "carry_forward", "Lightest feasible")
        .await;
    assert_eq!(r.status, 303, "{}", r.body);
    let bad = app.post_decision(&eve, id, DEMO_FIRST, "maybe", "x").await;
    assert_eq!(bad.status, 400);
    assert!(
        bad.body.contains("outcome"),
        "names the field: {}",
        bad.body
    );

    let token = app.token_for("ada").await;
    let v = app.api_review_json(&token, id).await;
    assert_eq!(v["comments"][0]["by"], "vic");
    assert_eq!(v["comments"][0]["candidate"], DEMO_FIRST);
    assert_eq!(
        v["comments"][1]["candidate"],
        Value::Null,
        "a comment on the review"
    );
    assert_eq!(
        v["decisions"].as_array().unwrap().len(),
        1,
        "the refused ones are not stored"
    );
    assert_eq!(v["decisions"][0]["outcome"], "carry_forward");
    assert_eq!(v["decisions"][0]["by"], "eve");
    assert!(v["decisions"][0]["at"].as_str().unwrap().ends_with('Z'));
}

#[tokio::test]
async fn the_presenter_hands_over_and_only_the_presenter_moves_the_screen() {
    let (app, _, id) = app_with_review().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    assert_eq!(app.post_present(&vic, id, "trade").await.status, 403);
    assert_eq!(
        app.post_present(&eve, id, "candidates/99").await.status,
        400
    );
    assert_eq!(app.post_hand_over(&eve, id, "vic").await.status, 303);
    assert_eq!(
        app.post_present(&eve, id, "trade").await.status,
        403,
        "eve handed over"
    );
    let r = app.post_present(&vic, id, "candidates/2").await;
    assert_eq!(
        (r.status.as_u16(), r.location()),
        (303, format!("/reviews/{id}/candidates/2").as_str())
    );
    let page = app.get_review_page(&eve, id, "").await;
    assert!(
        page.body.contains("data-current=\"candidates/2\""),
        "pages know the presenter's screen"
    );
}

#[tokio::test]
async fn a_closed_review_refuses_every_write_and_stores_nothing() {
    let (app, token, id) = app_with_review().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    app.post_comment(&vic, id, "", "before closing").await;
    assert_eq!(app.post_close_review(&eve, id).await.status, 303);
    let closed = app.api_review_json(&token, id).await;
    assert_eq!(closed["status"], "closed");
    let counts = (
        app.count_rows("review_comment").await,
        app.count_rows("review_decision").await,
    );

    let attempts = [
        ("comment", app.post_comment(&vic, id, "", "too late").await),
        (
            "decision",
            app.post_decision(&eve, id, DEMO_FIRST, "hold", "late")
                .await,
        ),
        ("view", app.post_present(&eve, id, "trade").await),
        ("handover", app.post_hand_over(&eve, id, "vic").await),
        ("close", app.post_close_review(&eve, id).await),
    ];
    for (what, r) in attempts {
        assert_eq!(r.status, 409, "{what} on a closed review");
        assert!(
            r.body.contains("closed and read-only"),
            "{what}: {}",
            r.body
        );
    }
    let after = (
        app.count_rows("review_comment").await,
        app.count_rows("review_decision").await,
    );
    assert_eq!(counts, after, "nothing was stored");
    assert_eq!(
        closed,
        app.api_review_json(&token, id).await,
        "the review is unchanged"
    );
    let page = app.get_review_page(&vic, id, "").await;
    assert!(
        !page.body.contains("id=\"comment-form\""),
        "no comment form on a closed review"
    );
}

/// Replaces every RFC 3339 UTC time stamp (`2026-01-31T12:00:00Z`) by `<time>`.
fn normalise_times(text: &str) -> String {
    let bytes = text.as_bytes();
    let shape = b"dddd-dd-ddTdd:dd:ddZ";
    let mut out = String::new();
    let mut i = 0;
    while i < bytes.len() {
        let fits = bytes.len() - i >= shape.len()
            && shape.iter().zip(&bytes[i..]).all(|(s, b)| match s {
                b'd' => b.is_ascii_digit(),
                other => other == b,
            });
        if fits {
            out.push_str("<time>");
            i += shape.len();
        } else {
            let ch = text[i..].chars().next().unwrap();
            out.push(ch);
            i += ch.len_utf8();
        }
    }
    out
}

async fn golden_review(app: &TestApp, eve: &Session, vic: &Session) -> i64 {
    let r = app
        .post_start_review(
            eve,
            app.demo_id,
            &[
                ("title", "Gate 2 | motor down-select"),
                ("participants", "vic"),
            ],
        )
        .await;
    let id: i64 = r
        .location()
        .trim_start_matches("/reviews/")
        .parse()
        .unwrap();
    app.post_comment(
        vic,
        id,
        DEMO_FIRST,
        "Forced air at the climb segment, is that enough?",
    )
    .await;
    app.post_decision(
        eve,
        id,
        DEMO_FIRST,
        "carry_forward",
        "Lightest feasible; check cooling",
    )
    .await;
    app.post_decision(
        eve,
        id,
        "A3 axial double rotor, too small",
        "drop",
        "Infeasible: short of takeoff torque with one motor out",
    )
    .await;
    app.post_comment(eve, id, "", "Next review after the thermal test")
        .await;
    app.post_close_review(eve, id).await;
    id
}

/// Text equal token by token, numbers equal to 1e-9 relative (so that a change in the
/// engine's last floating-point digits is not a change of the minutes).
fn same_apart_from_last_digits(got: &str, want: &str) -> bool {
    let split = |t: &str| -> Vec<String> {
        t.split(|c: char| c.is_whitespace() || matches!(c, ',' | '|' | '"' | '(' | ')'))
            .filter(|s| !s.is_empty())
            .map(String::from)
            .collect()
    };
    let (g, w) = (split(got), split(want));
    g.len() == w.len()
        && g.iter()
            .zip(&w)
            .all(|(a, b)| match (a.parse::<f64>(), b.parse::<f64>()) {
                (Ok(x), Ok(y)) => (x - y).abs() <= 1e-9 * y.abs().max(1e-12),
                _ => a == b,
            })
}

#[tokio::test]
async fn the_minutes_match_the_golden_files() {
    let app = spawn_app().await;
    let (eve, vic) = (app.session("eve").await, app.session("vic").await);
    let id = golden_review(&app, &eve, &vic).await;
    for ext in ["md", "csv"] {
        let r = app.get_minutes(&vic, id, ext).await;
        assert_eq!(r.status, 200);
        let got = normalise_times(&r.body);
        let path = format!(
            "{}/tests/data/review_minutes.{ext}",
            env!("CARGO_MANIFEST_DIR")
        );
        let want = std::fs::read_to_string(&path).unwrap_or_default();
        let same = same_apart_from_last_digits(&got, &want);
        if !same {
            // Left beside the golden file for a reviewer to compare; the test still fails.
            std::fs::write(format!("{path}.new"), &got).unwrap();
        }
        assert!(same, "minutes.{ext} differ from {path} (see {path}.new)");
    }
}

#[tokio::test]
async fn every_review_page_shows_the_caution_and_the_snapshot_engine_version() {
    let (app, _, id) = app_with_review().await;
    let vic = app.session("vic").await;
    for view in ["", "compare", "trade", "candidates/0", "segments/3"] {
        let r = app.get_review_page(&vic, id, view).await;
        assert_eq!(r.status, 200, "view '{view}'");
        assert!(
            r.body.contains("Not for certification"),
            "caution on '{view}'"
        );
        assert!(
            r.body.contains(&format!(
                "Engine version {}",
                shaftline::engine::ENGINE_VERSION
            )),
            "{view}"
        );
    }
    let trade = app.get_review_page(&vic, id, "trade").await.body;
    assert!(
        trade.contains("<svg") && trade.contains("<title>1 — R1"),
        "points carry titles"
    );
    for shape in ["pt-front", "pt-dominated", "pt-infeasible"] {
        assert!(trade.contains(shape), "the demo has a {shape} point");
    }
    let list = app.get_study_reviews(&vic, app.demo_id).await;
    assert!(list.body.contains("Gate 2 motor down-select"));
    assert_eq!(
        app.get_review_page(&vic, id, "candidates/7").await.status,
        404
    );
}
