//! The SVG plots over the demo study: each parses as XML and carries its series names
//! and axis titles. The SVGs are kept under the target directory for a look.

use shaftline::engine::inspect::{Inspection, inspect_candidate};
use shaftline::engine::study::{Study, parse_study};
use shaftline::plots::{self, pareto};

fn demo() -> Study {
    let v: serde_json::Value = serde_json::from_str(shaftline::demo::DEMO_STUDY_JSON).unwrap();
    parse_study(&v).expect("the demo study parses")
}

/// Parses `svg`, keeps it under `target/plots/NAME.svg`, and returns all its text.
fn texts_of(svg: &str, name: &str) -> String {
    let doc = roxmltree::Document::parse(svg)
        .unwrap_or_else(|e| panic!("{name}: not well-formed XML: {e}"));
    assert_eq!(doc.root_element().tag_name().name(), "svg", "{name}: root");
    let dir = crate::helpers::artefact_dir("plots");
    std::fs::write(dir.join(format!("{name}.svg")), svg).unwrap();
    doc.descendants()
        .filter_map(|n| n.text())
        .collect::<Vec<_>>()
        .join("\n")
}

fn assert_has(text: &str, name: &str, wanted: &[&str]) {
    for w in wanted {
        assert!(text.contains(w), "{name}: missing text {w:?}");
    }
}

fn first_inspection() -> Inspection {
    inspect_candidate(&demo(), 0).expect("the first demo candidate can be inspected")
}

#[test]
fn the_torque_speed_plot_has_both_curves_and_the_segment_points() {
    let ins = first_inspection();
    let text = texts_of(&plots::torque_speed::plot(&ins).unwrap(), "torque-speed");
    assert_has(
        &text,
        "torque-speed",
        &[
            "Motor speed [rpm]",
            "Torque [N·m]",
            "Peak torque",
            "Continuous (dashed)",
            "One motor out (OEI)",
        ],
    );
    for s in &ins.result.segments {
        if s.motor_torque_nm > 0.0 {
            assert!(text.contains(&s.name), "segment {} is labelled", s.name);
        }
    }
    assert!(!ins.result.oei_segments.is_empty(), "the demo has OEI runs");
    assert!(text.contains("(OEI)"), "an OEI point is labelled");
}

#[test]
fn the_efficiency_map_has_shading_contours_and_points() {
    let ins = first_inspection();
    let svg = plots::efficiency::plot(&ins).unwrap();
    let text = texts_of(&svg, "efficiency");
    assert_has(
        &text,
        "efficiency",
        &[
            "Motor speed [rpm]",
            "Torque [N·m]",
            "Iso-efficiency line",
            "Mission point",
            "0.94",
            "η ≥ 0.97",
        ],
    );
    let rects = svg.matches("<rect").count();
    assert!(
        rects > 50,
        "the map is shaded in cells ({rects} rectangles)"
    );
}

#[test]
fn the_temperature_plot_has_the_limit_bands_and_oei_series() {
    let ins = first_inspection();
    let text = texts_of(&plots::temperature::plot(&ins).unwrap(), "temperature");
    assert_has(
        &text,
        "temperature",
        &[
            "Mission time [min]",
            "Temperature [°C]",
            "Winding",
            "Stator",
            "Winding, one motor out",
            "Winding limit (dashed)",
        ],
    );
    for s in &ins.result.segments {
        assert!(text.contains(&s.name), "band {} is named", s.name);
    }
    let runs = plots::temperature::oei_runs(&ins.trace);
    let oei_points = ins.trace.iter().filter(|p| p.oei).count();
    assert!(!runs.is_empty(), "the demo has OEI excursions");
    assert_eq!(
        runs.iter().map(Vec::len).sum::<usize>(),
        oei_points,
        "every OEI point is in a run"
    );
}

#[test]
fn the_losses_plot_stacks_four_parts_per_segment() {
    let ins = first_inspection();
    let text = texts_of(&plots::losses::plot(&ins.result).unwrap(), "losses");
    assert_has(
        &text,
        "losses",
        &[
            "Loss [W]",
            "Mission segment",
            "Copper",
            "Iron",
            "Mechanical",
            "Inverter",
        ],
    );
    for s in &ins.result.segments {
        assert!(text.contains(&s.name), "segment {} on the axis", s.name);
    }
}

#[test]
fn the_pareto_plot_titles_every_point() {
    let pts = vec![
        pareto::Point {
            number: 1,
            name: "Light & slow".into(),
            x: 10.0,
            y: 5.0,
            feasible: true,
        },
        pareto::Point {
            number: 2,
            name: "Heavy".into(),
            x: 20.0,
            y: 6.0,
            feasible: true,
        },
        pareto::Point {
            number: 3,
            name: "Too small".into(),
            x: 5.0,
            y: 1.0,
            feasible: false,
        },
    ];
    let dirs = Some((
        shaftline::engine::objectives::Direction::Minimise,
        shaftline::engine::objectives::Direction::Minimise,
    ));
    let classes = pareto::classify(&pts, dirs);
    let svg = pareto::plot(
        &pts,
        &classes,
        &pareto::Axes {
            x: "Mass [kg]",
            y: "Energy [kWh]",
        },
    )
    .unwrap();
    let text = texts_of(&svg, "pareto-unit");
    assert_has(
        &text,
        "pareto",
        &[
            "Mass [kg]",
            "Energy [kWh]",
            "Pareto front",
            "Dominated",
            "Infeasible",
            "1. Light & slow (Pareto front)",
            "2. Heavy (Dominated)",
            "3. Too small (Infeasible)",
        ],
    );
}

#[test]
fn the_overlay_names_each_candidate() {
    let study = demo();
    let series: Vec<_> = (0..2)
        .map(|i| {
            let ins = inspect_candidate(&study, i).unwrap();
            plots::temperature::Overlay::of(&ins.result.name, &ins.trace)
        })
        .collect();
    let text = texts_of(
        &plots::temperature::overlay(&series).unwrap(),
        "compare-temperature",
    );
    assert_has(
        &text,
        "overlay",
        &["Mission time [min]", "Winding temperature [°C]"],
    );
    for s in &series {
        assert!(
            text.contains(&plots::draw::short(&s.name, 30)),
            "{} in the legend",
            s.name
        );
    }
}

async fn candidate_ids(app: &crate::helpers::TestApp) -> Vec<i64> {
    shaftline::storage::studies::list_items(
        &app.db,
        shaftline::storage::studies::Item::Candidate,
        app.demo_id,
    )
    .await
    .unwrap()
    .iter()
    .map(|r| r.id)
    .collect()
}

#[tokio::test]
async fn the_candidate_page_shows_its_four_plots_with_the_map_temperatures() {
    let app = crate::helpers::spawn_app().await;
    let s = app.session("vic").await;
    let ids = candidate_ids(&app).await;
    let page = app.get_candidate_page(&s, app.demo_id, ids[0]).await;
    assert_eq!(page.status, 200);
    for id in [
        "plot-torque-speed",
        "plot-efficiency",
        "plot-temperature",
        "plot-losses",
    ] {
        assert!(
            page.body.contains(&format!("<svg id=\"{id}\"")),
            "{id} inline on the page"
        );
    }
    assert!(
        page.body.contains("100 °C winding and 80 °C magnets"),
        "the map says its temperatures"
    );
    assert!(
        page.body.contains("Engine version"),
        "the caution and engine version stay"
    );
}

#[tokio::test]
async fn the_compare_page_overlays_the_winding_temperatures() {
    let app = crate::helpers::spawn_app().await;
    let s = app.session("vic").await;
    let ids = candidate_ids(&app).await;
    let page = app
        .get_compare(&s, app.demo_id, &format!("?c={}&c={}", ids[0], ids[2]))
        .await;
    assert_eq!(page.status, 200);
    assert!(
        page.body.contains("<svg id=\"plot-compare-temperature\""),
        "overlay on the page"
    );
    let one = app
        .get_compare(&s, app.demo_id, &format!("?c={}", ids[0]))
        .await;
    assert!(
        !one.body.contains("plot-compare-temperature"),
        "no overlay for one candidate"
    );
}
