//! Review diffs: a review against the live study and against another review of the
//! same study; changed inputs by JSON path, candidates added and removed, result deltas.

use serde_json::{Value, json};

use crate::reviews::{app_with_review, set_payload};

#[tokio::test]
async fn the_diff_of_a_payload_change_lists_the_path_and_the_takeoff_mass_deltas() {
    let (app, token, first) = app_with_review().await;
    app.edit_demo_study(&token, set_payload(200.0)).await;
    let second = app
        .start_demo_review(&token, "After the payload change")
        .await;
    for against in ["live".to_string(), second.to_string()] {
        let r = app.api_review_diff(&token, first, &against).await;
        assert_eq!(r.status, 200, "{}", r.body);
        let d: Value = serde_json::from_str(&r.body).unwrap();
        let want = json!([{ "path": "aircraft.payload_kg", "old": 180.0, "new": 200.0 }]);
        assert_eq!(
            d["inputs"], want,
            "only the payload changed (against {against})"
        );
        assert_eq!(d["candidates"], json!({ "added": [], "removed": [] }));
        let takeoff: Vec<&Value> = d["results"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|c| c["metric"] == "takeoff_mass_kg")
            .collect();
        assert_eq!(takeoff.len(), 7, "every candidate's takeoff mass moved");
        for c in takeoff {
            let delta = c["delta"].as_f64().unwrap();
            let (old, new) = (c["old"].as_f64().unwrap(), c["new"].as_f64().unwrap());
            assert!(
                (new - old - delta).abs() < 1e-9 && delta >= 20.0,
                "{c}: at least the 20 kg payload"
            );
        }
    }
    let same = app.api_review_diff(&token, second, "live").await;
    let d: Value = serde_json::from_str(&same.body).unwrap();
    assert_eq!(
        (
            d["inputs"].as_array().unwrap().len(),
            d["results"].as_array().unwrap().len()
        ),
        (0, 0)
    );
    let eve = app.session("eve").await;
    let page = app.get_diff_page(&eve, first, "live").await;
    assert!(page.body.contains("aircraft.payload_kg") && page.body.contains("Caution"));
}

#[tokio::test]
async fn a_diff_names_its_candidates_added_and_removed_and_refuses_other_studies() {
    let (app, token, first) = app_with_review().await;
    app.edit_demo_study(&token, |s| {
        let list = s["candidates"].as_array_mut().unwrap();
        let mut copy = list[0].clone();
        copy["name"] = json!("R1b copy");
        list.remove(1);
        list.push(copy);
    })
    .await;
    let d: Value =
        serde_json::from_str(&app.api_review_diff(&token, first, "live").await.body).unwrap();
    assert_eq!(d["candidates"]["added"], json!(["R1b copy"]));
    assert_eq!(
        d["candidates"]["removed"],
        json!(["R2 radial, liquid jacket, geared 2.5:1"])
    );
    let r = app.api_review_diff(&token, first, "banana").await;
    assert_eq!(r.status, 422);
    assert!(r.body.contains("against"), "{}", r.body);
    let r = app.api_review_diff(&token, first, &first.to_string()).await;
    assert_eq!(r.status, 422, "a review against itself is refused");
}
