//! The trade page: default and chosen metric pairs, the matrix and ranking, and the
//! weights form (save, stale revision, bad weight, viewer refused).

use shaftline::storage::studies::get_study;

use crate::helpers::spawn_app;

const W_MASS: &str = "weight.propulsion_mass_kg";
const W_ENERGY: &str = "weight.mission_energy_kwh";

#[tokio::test]
async fn the_trade_page_defaults_to_the_first_two_objectives() {
    let app = spawn_app().await;
    let s = app.session("vic").await;
    let page = app.get_trade(&s, app.demo_id, "").await;
    assert_eq!(page.status, 200, "{}", page.body);
    assert!(
        page.body
            .contains("Pareto plot: propulsion_mass_kg against mission_energy_kwh")
    );
    assert!(
        page.body.contains("<svg id=\"plot-pareto\""),
        "the plot is inline"
    );
    assert!(
        page.body.contains("propulsion_mass_kg [kg]"),
        "axis title with unit"
    );
    assert!(
        page.body.contains("(Pareto front)"),
        "front points carry titles"
    );
    assert!(
        page.body.contains("(Infeasible)"),
        "the demo's too-small candidate is infeasible"
    );
    assert_eq!(
        page.body.matches("<tr><td class=\"num\">").count(),
        7,
        "seven ranking rows"
    );
    assert!(page.body.contains("id=\"trade-matrix\"") && page.body.contains("Engine version"));
    assert!(
        !page.body.contains("name=\"weight."),
        "a viewer sees weights, not inputs"
    );
}

#[tokio::test]
async fn a_chosen_pair_is_plotted_and_a_pair_without_direction_has_no_front() {
    let app = spawn_app().await;
    let s = app.session("vic").await;
    let page = app
        .get_trade(
            &s,
            app.demo_id,
            "?x=motor_mass_kg&y=mission_motor_efficiency",
        )
        .await;
    assert_eq!(page.status, 200);
    assert!(
        page.body
            .contains("Pareto plot: motor_mass_kg against mission_motor_efficiency")
    );
    assert!(!page.body.contains("id=\"no-front\""));
    let flat = app
        .get_trade(&s, app.demo_id, "?x=rated_torque_nm&y=motor_mass_kg")
        .await;
    assert!(
        flat.body.contains("id=\"no-front\""),
        "rated torque has no better direction"
    );
    assert!(flat.body.contains("(Feasible)") && !flat.body.contains("(Pareto front)"));
    let bad = app.get_trade(&s, app.demo_id, "?x=colour").await;
    assert_eq!(bad.status, 400);
    assert!(
        bad.body.contains("x: must be one of the result metrics"),
        "{}",
        bad.body
    );
}

#[tokio::test]
async fn an_editor_saves_weights_and_the_ranking_follows() {
    let app = spawn_app().await;
    let s = app.session("eve").await;
    let rev = get_study(&app.db, app.demo_id).await.unwrap().revision;
    let r = app
        .post_weights(&s, app.demo_id, rev, &[(W_MASS, "3"), (W_ENERGY, "1")])
        .await;
    assert_eq!(r.status, 303, "{}", r.body);
    let row = get_study(&app.db, app.demo_id).await.unwrap();
    assert_eq!(row.revision, rev + 1);
    let scoring: serde_json::Value = serde_json::from_str(row.scoring.as_deref().unwrap()).unwrap();
    assert_eq!(scoring["weights"]["propulsion_mass_kg"], 3.0);
    assert_eq!(
        scoring["objectives"][1], "mission_energy_kwh",
        "objectives kept"
    );
    let page = app.get_trade(&s, app.demo_id, "").await;
    assert!(
        page.body
            .contains("name=\"weight.propulsion_mass_kg\" value=\"3\""),
        "form shows the saved weight"
    );
}

#[tokio::test]
async fn a_stale_weights_edit_is_refused_and_changes_nothing() {
    let app = spawn_app().await;
    let s = app.session("eve").await;
    let rev = get_study(&app.db, app.demo_id).await.unwrap().revision;
    let first = app
        .post_weights(&s, app.demo_id, rev, &[(W_MASS, "2"), (W_ENERGY, "1")])
        .await;
    assert_eq!(first.status, 303);
    let stale = app
        .post_weights(&s, app.demo_id, rev, &[(W_MASS, "9"), (W_ENERGY, "1")])
        .await;
    assert_eq!(stale.status, 409);
    assert!(
        stale.body.contains("eve"),
        "names who changed it: {}",
        stale.body
    );
    let row = get_study(&app.db, app.demo_id).await.unwrap();
    assert!(
        row.scoring.unwrap().contains("\"propulsion_mass_kg\":2.0"),
        "the first save stands"
    );
}

#[tokio::test]
async fn a_bad_weight_names_the_field_and_stores_nothing() {
    let app = spawn_app().await;
    let s = app.session("eve").await;
    let before = get_study(&app.db, app.demo_id).await.unwrap();
    let cases = [
        (
            "-1",
            "scoring.weights.propulsion_mass_kg: must be a number from 0 to 1000000",
        ),
        (
            "lots",
            "scoring.weights.propulsion_mass_kg: must be a number from 0 to 1000000 (got &#39;lots&#39;)",
        ),
        ("0", "at least one weight must be &gt; 0"),
    ];
    for (mass, want) in cases {
        let energy = if mass == "0" { "0" } else { "1" };
        let r = app
            .post_weights(
                &s,
                app.demo_id,
                before.revision,
                &[(W_MASS, mass), (W_ENERGY, energy)],
            )
            .await;
        assert_eq!(r.status, 400, "weight {mass}");
        assert!(r.body.contains(want), "weight {mass}: {}", r.body);
    }
    let after = get_study(&app.db, app.demo_id).await.unwrap();
    assert_eq!(
        (after.revision, after.scoring),
        (before.revision, before.scoring),
        "nothing stored"
    );
}

#[tokio::test]
async fn a_viewer_cannot_save_weights() {
    let app = spawn_app().await;
    let s = app.session("vic").await;
    let before = get_study(&app.db, app.demo_id).await.unwrap();
    let r = app
        .post_weights(
            &s,
            app.demo_id,
            before.revision,
            &[(W_MASS, "2"), (W_ENERGY, "1")],
        )
        .await;
    assert_eq!(r.status, 403);
    assert_eq!(
        get_study(&app.db, app.demo_id).await.unwrap().revision,
        before.revision
    );
}
