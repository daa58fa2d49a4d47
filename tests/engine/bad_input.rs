//! Bad study files: each is rejected with the JSON path of the culprit.

use crate::fixtures::demo_value;
use serde_json::{Value, json};
use shaftline::engine::study::parse_study;

trait Pipe: Sized {
    fn pipe(self, f: impl FnOnce(Self) -> Self) -> Self {
        f(self)
    }
}
impl Pipe for Value {}

/// Sets `value` at a slash path in the demo (`None` removes the field).
fn with(path: &str, value: Option<Value>) -> Value {
    let mut v = demo_value();
    let (parent, last) = path.rsplit_once('/').unwrap_or(("", path));
    let target = if parent.is_empty() {
        &mut v
    } else {
        v.pointer_mut(&format!("/{parent}")).expect(path)
    };
    match (value, last.parse::<usize>()) {
        (Some(x), Ok(i)) => target[i] = x,
        (Some(x), Err(_)) => target[last] = x,
        (None, _) => {
            target.as_object_mut().expect(path).remove(last);
        }
    }
    v
}

#[test]
fn bad_study_files_are_rejected_with_the_path_of_the_bad_field() {
    let many_segments = json!((0..201).map(|i| json!({"name": format!("s{i}"), "kind": "taxi", "power": {"rule": "shaft_power", "kw": 1.0}, "duration_s": 10.0, "prop_speed_rpm": 1000.0})).collect::<Vec<_>>());
    let cases: Vec<(&str, Value, &str)> = vec![
        ("missing name", with("name", None), "name"),
        (
            "wrong format",
            with("format", Some(json!("shaftline-study/2"))),
            "format",
        ),
        (
            "unknown top-level field",
            with("colour", Some(json!("red"))),
            "colour",
        ),
        (
            "unknown aircraft field",
            with("aircraft/wingspan_m", Some(json!(10))),
            "aircraft.wingspan_m",
        ),
        (
            "zero motors",
            with("aircraft/motor_count", Some(json!(0))),
            "aircraft.motor_count",
        ),
        (
            "fractional motors",
            with("aircraft/motor_count", Some(json!(1.5))),
            "aircraft.motor_count",
        ),
        (
            "negative airframe mass",
            with("aircraft/airframe_mass_kg", Some(json!(-330))),
            "aircraft.airframe_mass_kg",
        ),
        (
            "negative payload",
            with("aircraft/payload_kg", Some(json!(-1))),
            "aircraft.payload_kg",
        ),
        (
            "text for a number",
            with("aircraft/cd0", Some(json!("NaN"))),
            "aircraft.cd0",
        ),
        (
            "huge number",
            with("aircraft/max_takeoff_mass_kg", Some(json!(1e300))),
            "aircraft.max_takeoff_mass_kg",
        ),
        (
            "null required field",
            with("aircraft/payload_kg", Some(Value::Null)),
            "aircraft.payload_kg",
        ),
        (
            "missing battery",
            with("aircraft/battery", None),
            "aircraft.battery",
        ),
        (
            "unknown battery mode",
            with("aircraft/battery/mode", Some(json!("hybrid"))),
            "aircraft.battery.mode",
        ),
        (
            "fixed battery without mass",
            with(
                "aircraft/battery",
                Some(json!({"mode": "fixed", "specific_energy_wh_per_kg": 200})),
            ),
            "aircraft.battery.mass_kg",
        ),
        (
            "usable fraction above one",
            with("aircraft/battery/usable_fraction", Some(json!(1.2))),
            "aircraft.battery.usable_fraction",
        ),
        (
            "steady rule without wing area",
            with("aircraft/wing_area_m2", None),
            "aircraft.wing_area_m2",
        ),
        ("no segments", with("segments", Some(json!([]))), "segments"),
        (
            "too many segments",
            with("segments", Some(many_segments)),
            "segments",
        ),
        (
            "duplicate segment names",
            with("segments/1/name", Some(json!("Taxi out"))),
            "segments[1].name",
        ),
        (
            "unknown segment kind",
            with("segments/0/kind", Some(json!("hover"))),
            "segments[0].kind",
        ),
        (
            "negative airspeed",
            with("segments/2/power/tas_m_s", Some(json!(-5))),
            "segments[2].power.tas_m_s",
        ),
        (
            "unknown power rule",
            with("segments/0/power/rule", Some(json!("thrust"))),
            "segments[0].power.rule",
        ),
        (
            "both duration and distance",
            with("segments/3/duration_s", Some(json!(100))),
            "segments[3]",
        ),
        (
            "distance on a power-loading rule",
            with("segments/1/duration_s", None).pipe(|mut v| {
                v["segments"][1]["distance_m"] = json!(500);
                v
            }),
            "segments[1].distance_m",
        ),
        (
            "no duration at all",
            with("segments/3/distance_m", None),
            "segments[3]",
        ),
        (
            "climb with a descending altitude",
            with("segments/2/altitude_end_m", Some(json!(0))),
            "segments[2]",
        ),
        (
            "altitude above 20 km",
            with("segments/3/altitude_start_m", Some(json!(25_000))),
            "segments[3].altitude_start_m",
        ),
        (
            "zero propeller speed",
            with("segments/0/prop_speed_rpm", Some(json!(0))),
            "segments[0].prop_speed_rpm",
        ),
        (
            "oei not a boolean",
            with("segments/1/oei", Some(json!("yes"))),
            "segments[1].oei",
        ),
        (
            "no candidates",
            with("candidates", Some(json!([]))),
            "candidates",
        ),
        (
            "duplicate candidate names",
            with(
                "candidates/1/name",
                Some(json!("R1 radial, forced air, direct drive")),
            ),
            "candidates[1].name",
        ),
        (
            "unknown source kind",
            with("candidates/0/source/kind", Some(json!("linear"))),
            "candidates[0].source.kind",
        ),
        (
            "unknown candidate field",
            with("candidates/0/source/colour", Some(json!("red"))),
            "candidates[0].source.colour",
        ),
        (
            "lambda of one",
            with("candidates/2/source/inner_outer_ratio", Some(json!(1.0))),
            "candidates[2].source.inner_outer_ratio",
        ),
        (
            "unknown steel grade",
            with("candidates/0/source/steel_grade", Some(json!("M999-99A"))),
            "candidates[0].source.steel_grade",
        ),
        (
            "zero pole pairs",
            with("candidates/0/source/pole_pairs", Some(json!(0))),
            "candidates[0].source.pole_pairs",
        ),
        (
            "aspect ratio in geometry mode",
            with("candidates/0/source/mode", Some(json!("geometry"))),
            "candidates[0].source.aspect_ratio",
        ),
        (
            "a rotor with no room for its back iron",
            with(
                "candidates/0/source",
                Some(
                    json!({"kind": "radial_sizing", "mode": "geometry", "bore_diameter_m": 0.02, "active_length_m": 0.02, "pole_pairs": 1}),
                ),
            ),
            "candidates[0].source.bore_diameter_m",
        ),
        (
            "magnet field above 0.9 Br",
            with("candidates/0/source/remanence_t", Some(json!(0.8))),
            "candidates[0].source.remanence_t",
        ),
        (
            "tooth fraction of 0.75 or more",
            with("candidates/0/source/tooth_flux_density_t", Some(json!(0.9))),
            "candidates[0].source.tooth_flux_density_t",
        ),
        (
            "efficiency of one",
            with(
                "candidates/5/source/continuous_efficiency",
                Some(json!(1.0)),
            ),
            "candidates[5].source.continuous_efficiency",
        ),
        (
            "peak below continuous power",
            with("candidates/5/source/peak_power_kw", Some(json!(30))),
            "candidates[5].source.peak_power_kw",
        ),
        (
            "gear ratio of zero",
            with("candidates/1/drive/gear_ratio", Some(json!(0))),
            "candidates[1].drive.gear_ratio",
        ),
        (
            "loss split not summing to one",
            with(
                "candidates/5/source/loss_split",
                Some(
                    json!({"copper": 0.5, "iron_linear": 0.2, "iron_quadratic": 0.1, "constant": 0.1}),
                ),
            ),
            "candidates[5].source.loss_split",
        ),
        (
            "unknown objective",
            with("scoring/objectives/1", Some(json!("cost_usd"))),
            "scoring.objectives[1]",
        ),
        (
            "one objective",
            with("scoring/objectives", Some(json!(["propulsion_mass_kg"]))),
            "scoring.objectives",
        ),
        (
            "weights missing an objective",
            with("scoring/weights", Some(json!({"propulsion_mass_kg": 1.0}))),
            "scoring.weights.mission_energy_kwh",
        ),
        (
            "negative weight",
            with("scoring/weights/mission_energy_kwh", Some(json!(-1))),
            "scoring.weights.mission_energy_kwh",
        ),
        (
            "rated ambient above the class B winding limit",
            with("candidates/5/source/insulation_class", Some(json!("B"))).pipe(|mut v| {
                v["candidates"][5]["source"]["rated_ambient_c"] = json!(125);
                v
            }),
            "candidates[5].source.rated_ambient_c",
        ),
    ];
    assert!(cases.len() >= 30);
    for (label, study, path) in cases {
        match parse_study(&study) {
            Ok(_) => panic!("{label}: accepted"),
            Err(e) => {
                assert_eq!(e.path, path, "{label}: {e}");
                assert!(!e.message.is_empty(), "{label}");
            }
        }
    }
}

#[test]
fn range_errors_state_the_allowed_range_and_the_value_given() {
    let e = parse_study(&with("segments/2/power/tas_m_s", Some(json!(-5)))).unwrap_err();
    assert_eq!(
        e.to_string(),
        "segments[2].power.tas_m_s: must be > 0 and ≤ 1000 (got -5)"
    );
}

#[test]
fn null_optional_fields_take_their_defaults() {
    let v = with("aircraft/isa_offset_k", Some(Value::Null));
    let s = parse_study(&v).unwrap();
    assert_eq!(s.aircraft.isa_offset_k, None);
}

#[test]
fn a_study_serialises_back_to_an_equal_study() {
    let s = parse_study(&demo_value()).unwrap();
    let again = parse_study(&serde_json::to_value(&s).unwrap()).unwrap();
    assert_eq!(s, again);
}
