//! Random valid studies never make the engine panic or produce a non-finite number.

use proptest::prelude::*;
use serde_json::{Value, json};
use shaftline::engine::results::{CandidateResult, METRICS, SegmentRow};
use shaftline::engine::{score_study, study::parse_study};

fn segment(i: usize, rule: u8, x: f64, oei: bool) -> Value {
    let power = match rule {
        0 => json!({"rule": "shaft_power", "kw": 2.0 + 60.0 * x}),
        1 => json!({"rule": "power_loading", "w_per_kg": 20.0 + 120.0 * x}),
        _ => {
            json!({"rule": "steady", "tas_m_s": 30.0 + 40.0 * x, "prop_efficiency": 0.6 + 0.3 * x, "climb_rate_m_s": 4.0 * x - 2.0})
        }
    };
    let mut s = json!({"name": format!("S{i}"), "kind": "cruise", "power": power, "duration_s": 30.0 + 900.0 * x,
                       "altitude_start_m": 3000.0 * x, "prop_speed_rpm": 1200.0 + 2000.0 * x, "oei": oei});
    if rule == 2 {
        s["idle_floor_kw"] = json!(1.0);
    }
    s
}

fn candidate(i: usize, kind: u8, x: f64, y: f64) -> Value {
    let cooling =
        ["natural_air", "forced_air", "liquid_jacket", "direct_oil"][(4.0 * y).min(3.0) as usize];
    let source = match kind {
        0 => {
            json!({"kind": "datasheet", "topology": "radial", "mass_kg": 10.0 + 40.0 * x, "continuous_power_kw": 20.0 + 80.0 * x,
                    "continuous_speed_rpm": 2000.0 + 2000.0 * y, "peak_power_kw": 100.0 + 100.0 * x, "peak_duration_s": 30.0 + 300.0 * y,
                    "max_speed_rpm": 4500.0, "continuous_efficiency": 0.88 + 0.1 * y, "torque_constant_nm_per_a": 0.5 + x})
        }
        1 => {
            json!({"kind": "radial_sizing", "mode": "size_to_mission", "aspect_ratio": 0.3 + 1.5 * x, "pole_pairs": 2 + (10.0 * y) as u32,
                    "cooling": cooling})
        }
        2 => {
            json!({"kind": "radial_sizing", "mode": "geometry", "bore_diameter_m": 0.08 + 0.2 * x, "active_length_m": 0.05 + 0.15 * y,
                    "pole_pairs": 3 + (8.0 * x) as u32, "cooling": cooling, "steel_grade": "M400-50A"})
        }
        3 => {
            json!({"kind": "axial_sizing", "variant": "double_rotor", "mode": "size_to_mission", "inner_outer_ratio": 0.4 + 0.4 * x,
                    "pole_pairs": 4 + (16.0 * y) as u32, "cooling": cooling})
        }
        _ => {
            json!({"kind": "axial_sizing", "variant": "single_sided", "mode": "geometry", "outer_radius_m": 0.06 + 0.2 * x,
                    "pole_pairs": 4 + (16.0 * y) as u32, "cooling": cooling})
        }
    };
    json!({"name": format!("C{i}"), "drive": {"gear_ratio": if y > 0.7 { 1.0 + 3.0 * x } else { 1.0 }}, "source": source})
}

fn check_finite(label: &str, x: f64) {
    assert!(x.is_finite(), "{label} is {x}");
}

fn check_row(r: &SegmentRow) {
    let v = serde_json::to_value(r).unwrap();
    for (k, x) in v.as_object().unwrap() {
        if k != "peak_phase_current_a" {
            assert!(
                x.is_number() || x.is_string(),
                "segment {}.{k} is {x}",
                r.name
            );
        }
    }
}

fn check_candidate(c: &CandidateResult) {
    for (m, _) in METRICS {
        if let Some(x) = c.metric(m) {
            check_finite(&format!("{}.{m}", c.name), x);
        }
    }
    for v in &c.violations {
        check_finite("violation value", v.value);
        check_finite("violation limit", v.limit);
    }
    for (k, x) in &c.geometry {
        assert!(
            x.is_number() || x.is_string() || k == "loss_fit_rms_error",
            "geometry.{k} is {x}"
        );
    }
    c.segments.iter().chain(&c.oei_segments).for_each(check_row);
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, .. ProptestConfig::default() })]

    #[test]
    fn random_valid_studies_score_without_panic_or_non_finite_numbers(
        motors in 1u32..5,
        payload in 0.0f64..600.0,
        e in 60.0f64..500.0,
        fixed in any::<bool>(),
        segs in prop::collection::vec((0u8..3, 0.0f64..1.0, any::<bool>()), 1..5),
        cands in prop::collection::vec((0u8..5, 0.0f64..1.0, 0.0f64..1.0), 1..4),
    ) {
        let battery = if fixed {
            json!({"mode": "fixed", "specific_energy_wh_per_kg": e, "mass_kg": 100.0 + payload})
        } else {
            json!({"mode": "sized", "specific_energy_wh_per_kg": e})
        };
        let study = json!({
            "format": "shaftline-study/1", "name": "random",
            "aircraft": {"motor_count": motors, "airframe_mass_kg": 300.0, "payload_kg": payload, "max_takeoff_mass_kg": 1200.0,
                         "wing_area_m2": 11.0, "aspect_ratio": 12.0, "oswald_efficiency": 0.8, "cd0": 0.025, "battery": battery},
            "installation": {"max_diameter_m": 0.4},
            "segments": segs.iter().enumerate().map(|(i, (r, x, o))| segment(i, *r, *x, *o)).collect::<Vec<_>>(),
            "candidates": cands.iter().enumerate().map(|(i, (k, x, y))| candidate(i, *k, *x, *y)).collect::<Vec<_>>(),
        });
        // Some random geometries are physically impossible: those must be input errors.
        if let Ok(s) = parse_study(&study) {
            let r = score_study(&s);
            prop_assert_eq!(r.candidates.len(), cands.len());
            r.candidates.iter().for_each(check_candidate);
            // The closure's lower bound holds on any study, not only the demo.
            crate::flight::check_closure_bound(&s);
        }
    }
}
