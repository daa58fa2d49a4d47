//! Flight mechanics, energy bookkeeping and mass closure on the demo and variants of it.

use crate::fixtures::{demo, demo_value, parse};
use serde_json::json;
use shaftline::engine::atmosphere::{G0, air};
use shaftline::engine::evaluate::StudyContext;
use shaftline::engine::fly::{Detail, Flight, Prepared};
use shaftline::engine::mission::{MissionGrid, segment_preview};
use shaftline::engine::score_study;

#[test]
fn the_speed_of_minimum_power_matches_the_parabolic_polar() {
    // Minimum power at C_L = √(3·C_D0/K) for P = D·V with C_D = C_D0 + K·C_L² (Anderson,
    // Aircraft Performance and Design, ch. 5; reference-values §9).
    let mut v = demo_value();
    let (m, s, ar, e, cd0) = (800.0, 11.0, 12.0, 0.82, 0.024);
    let rho = air(1000.0, 0.0).density_kg_m3;
    let k = 1.0 / (std::f64::consts::PI * e * ar);
    let cl = (3.0 * cd0 / k).sqrt();
    let v_closed = (2.0 * m * G0 / (rho * s * cl)).sqrt();
    let mut scan = Vec::new();
    for i in 0..2500 {
        let tas = 20.0 + i as f64 * 0.01;
        v["segments"][3]["power"] =
            json!({"rule": "steady", "tas_m_s": tas, "prop_efficiency": 1.0});
        scan.push((tas, segment_preview(&parse(&v), m)[3].shaft_power_kw));
    }
    let best = scan.iter().min_by(|a, b| a.1.total_cmp(&b.1)).unwrap().0;
    assert!(
        (best - v_closed).abs() < 0.02,
        "scan {best} m/s, closed form {v_closed} m/s"
    );
}

#[test]
fn segment_durations_follow_time_distance_and_climb() {
    let study = demo();
    let p = segment_preview(&study, 800.0);
    assert_close!(p[0].duration_s, 300.0, rel = 1e-12);
    assert_close!(p[2].duration_s, 950.0 / 3.5, rel = 1e-12);
    assert_close!(p[3].duration_s, 80_000.0 / 50.0, rel = 1e-12);
    assert_close!(p[4].duration_s, 700.0 / 3.0, rel = 1e-12);
    // Takeoff at 130 W/kg of takeoff mass; taxi a constant 4 kW (demo.md).
    assert_close!(p[1].shaft_power_kw, 0.130 * 800.0, rel = 1e-12);
    assert_close!(p[0].shaft_power_kw, 4.0, rel = 1e-12);
    // Descent demand is below its 3 kW idle floor and is raised to it.
    assert_close!(p[4].shaft_power_kw, 3.0, rel = 1e-12);
}

fn fly_candidate(i: usize, mass: f64) -> (Flight, f64, f64) {
    let study = demo();
    let ctx = StudyContext::new(&study);
    let (_, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, &study.candidates[i]);
    let model = model.unwrap();
    let grid = MissionGrid::new(&study);
    let prep = Prepared::new(&model, drive, &grid);
    let mut f = Flight::default();
    prep.fly(&grid, mass, &mut f, None);
    (f, drive.inverter_efficiency, drive.battery_efficiency)
}

#[test]
fn a_lockstep_group_flies_every_lane_as_that_design_alone() {
    // Every kind of the demo in one group (datasheet one-node, radial and axial two-node,
    // air and liquid sinks, geared and direct), each at its own mass: the vector path,
    // the portable path and the one-design path give the same numbers to the last bit.
    use shaftline::engine::fly::{GROUP, Group};
    let study = demo();
    let ctx = StudyContext::new(&study);
    let built: Vec<_> = (0..GROUP)
        .map(|l| {
            let c = &study.candidates[l % study.candidates.len()];
            let (_, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, c);
            (model.unwrap(), drive)
        })
        .collect();
    let preps: Vec<Prepared> = built
        .iter()
        .map(|(m, d)| Prepared::new(m, *d, &ctx.grid))
        .collect();
    let group = Group::new(std::array::from_fn(|l| &preps[l]));
    let masses: [f64; GROUP] = std::array::from_fn(|l| 760.0 + 7.5 * l as f64);
    let mut fast: [Flight; GROUP] = std::array::from_fn(|_| Flight::default());
    let mut portable = fast.clone();
    group.fly(&ctx.grid, masses, fast.each_mut());
    group.fly_portable(&ctx.grid, masses, portable.each_mut(), Detail::Full);
    for l in 0..GROUP {
        let mut alone = Flight::default();
        preps[l].fly(&ctx.grid, masses[l], &mut alone, None);
        assert_eq!(fast[l], alone, "lane {l}, vector path");
        assert_eq!(portable[l], alone, "lane {l}, portable path");
        assert!(
            alone.battery_j > 0.0 && alone.oei.len() == 2,
            "lane {l} flew"
        );
    }
}

#[test]
fn a_closure_only_flight_gives_the_closure_the_numbers_of_a_full_flight() {
    // The mass closure flies its early iterations without the report-only peaks; what it
    // reads must be bit for bit what a full flight gives, or the closed mass would depend
    // on the detail.
    let study = demo();
    let ctx = StudyContext::new(&study);
    for c in &study.candidates {
        let (_, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, c);
        let model = model.unwrap();
        let prep = Prepared::new(&model, drive, &ctx.grid);
        let (mut full, mut lean) = (Flight::default(), Flight::default());
        prep.fly_as(&ctx.grid, 805.0, &mut full, Detail::Full);
        prep.fly_as(&ctx.grid, 805.0, &mut lean, Detail::Closure);
        assert_eq!(lean.battery_j, full.battery_j, "{}", c.name);
        assert_eq!(lean.prop_j, full.prop_j);
        assert_eq!(lean.max_elec_per_motor_w, full.max_elec_per_motor_w);
        assert_eq!(lean.max_prop_torque_nm, full.max_prop_torque_nm);
        // The closure-only flight writes no segment rows; the full one writes them all.
        assert!(lean.nominal.is_empty() && lean.oei.is_empty());
        assert_eq!(full.nominal.len(), ctx.grid.segments.len());
        assert!(full.nominal.iter().all(|s| s.peak_winding_c.is_finite()));
    }
}

#[test]
fn battery_energy_is_shaft_power_plus_every_loss_through_inverter_and_battery() {
    for i in [0, 1, 2, 5, 6] {
        let (f, eta_inv, eta_b) = fly_candidate(i, 820.0);
        let want: f64 = f
            .nominal
            .iter()
            .map(|s| s.motors * (s.shaft_j + s.copper_j + s.iron_j + s.mech_j) / (eta_inv * eta_b))
            .sum();
        assert_close!(f.battery_j, want, rel = 1e-9);
        // Motor input is shaft power plus the three loss groups.
        for s in &f.nominal {
            assert_close!(
                s.input_j,
                s.shaft_j + s.copper_j + s.iron_j + s.mech_j,
                rel = 1e-9
            );
        }
    }
}

#[test]
fn closed_battery_mass_satisfies_the_battery_equation() {
    let study = demo();
    let r = score_study(&study);
    for c in &r.candidates {
        assert!(c.mass_closure_converged, "{}", c.name);
        // m_b = E/(e·u·f_eol) with the demo's 200 Wh/kg, 90 % usable, 80 % end of life.
        let want = c.mission_energy_kwh * 1000.0 / (200.0 * 0.9 * 0.8);
        assert_close!(c.battery_mass_kg, want, abs = 0.01);
        let parts = 330.0 + 180.0 + c.propulsion_mass_kg + c.battery_mass_kg;
        assert_close!(c.takeoff_mass_kg, parts, abs = 0.01);
    }
}

#[test]
fn more_payload_never_lowers_mission_energy() {
    let mut v = demo_value();
    let mut last = [0.0; 7];
    for payload in [0.0, 60.0, 120.0, 180.0, 240.0] {
        v["aircraft"]["payload_kg"] = json!(payload);
        let r = score_study(&parse(&v));
        for (i, c) in r.candidates.iter().enumerate() {
            assert!(
                c.mission_energy_kwh >= last[i],
                "{} at payload {payload}",
                c.name
            );
            last[i] = c.mission_energy_kwh;
        }
    }
}

#[test]
fn one_motor_out_runs_cover_the_flagged_segments_and_spare_the_energy() {
    let r = score_study(&demo());
    for c in &r.candidates {
        let names: Vec<&str> = c.oei_segments.iter().map(|s| s.name.as_str()).collect();
        assert_eq!(names, ["Takeoff", "Climb"], "{}", c.name);
        let nominal_takeoff = &c.segments[1];
        let oei_takeoff = &c.oei_segments[0];
        // The surviving motor carries about twice the nominal per-motor torque (plus drag).
        assert!(
            oei_takeoff.motor_torque_nm > 1.9 * nominal_takeoff.motor_torque_nm,
            "{}",
            c.name
        );
        let energy: f64 = c.segments.iter().map(|s| s.battery_energy_kwh).sum();
        assert_close!(c.mission_energy_kwh, energy, rel = 1e-9);
    }
}

#[test]
fn a_fixed_battery_reports_its_energy_margin_and_a_shortfall_is_a_violation() {
    let mut v = demo_value();
    v["aircraft"]["battery"] =
        json!({"mode": "fixed", "specific_energy_wh_per_kg": 200.0, "mass_kg": 300.0});
    let r = score_study(&parse(&v));
    let c = &r.candidates[2];
    let usable = 300.0 * 200.0 * 0.9 * 0.8 / 1000.0;
    assert_close!(
        c.energy_margin_kwh.unwrap(),
        usable - c.mission_energy_kwh,
        rel = 1e-9
    );
    assert_close!(c.battery_mass_kg, 300.0, rel = 1e-12);
    v["aircraft"]["battery"]["mass_kg"] = json!(150.0);
    let r = score_study(&parse(&v));
    let c = &r.candidates[2];
    assert!(c.energy_margin_kwh.unwrap() < 0.0);
    assert!(
        c.violations.iter().any(|x| x.check == "energy_margin"),
        "{:?}",
        c.violations
    );
}

#[test]
fn a_mass_that_cannot_close_is_a_binding_violation_reported_at_the_maximum_takeoff_mass() {
    let mut v = demo_value();
    v["aircraft"]["battery"]["specific_energy_wh_per_kg"] = json!(40.0);
    let r = score_study(&parse(&v));
    for c in &r.candidates {
        assert!(!c.mass_closure_converged, "{}", c.name);
        assert!(!c.feasible);
        assert_eq!(c.takeoff_mass_kg, 950.0);
        assert!(c.closure_sum_of_parts_kg > 950.0 && c.closure_sum_of_parts_kg.is_finite());
        assert!(
            c.binding_constraint
                .as_deref()
                .unwrap_or("")
                .starts_with("mass_closure"),
            "{}: {:?}",
            c.name,
            c.binding_constraint
        );
    }
}

#[test]
fn grid_steps_are_at_least_twenty_and_at_most_ten_seconds() {
    let g = MissionGrid::new(&demo());
    for s in &g.segments {
        assert!(
            s.steps.len() >= 20 && s.dt_s <= 10.0 + 1e-9,
            "{}: {} steps of {} s",
            s.name,
            s.steps.len(),
            s.dt_s
        );
    }
    assert_eq!(g.oei_runs, vec![(1, 2)]);
}

/// Checks the closure's lower bound (engine::bound) on every buildable candidate of a
/// study: F_lb(m) ≤ F(m) at masses from m₀ to twice the maximum takeoff mass, and the
/// closure's start lies between m₀ and the root it closes on. Returns, per candidate,
/// the start, the closed mass and the flights the closure took.
pub fn check_closure_bound(study: &shaftline::engine::study::Study) -> Vec<(f64, f64, usize)> {
    use shaftline::engine::bound::{closure_start, floor_parts_kg};
    use shaftline::engine::closure::{AircraftConst, close, parts};
    let ctx = StudyContext::new(study);
    let mut out = Vec::new();
    for c in &study.candidates {
        let (_, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, c);
        let Some(model) = model else { continue };
        let ac = AircraftConst::new(study, drive.gear_ratio != 1.0);
        let prep = Prepared::new(&model, drive, &ctx.grid);
        let m0 = ac.airframe_kg
            + ac.payload_kg
            + ac.motors * model.mass_kg
            + ac.fixed_battery_kg.unwrap_or(0.0);
        let mut f = Flight::default();
        for m in [m0, 0.5 * (m0 + ac.mtom_kg), ac.mtom_kg, 2.0 * ac.mtom_kg] {
            prep.fly(&ctx.grid, m, &mut f, None);
            let flown = parts(&ac, model.mass_kg, &f).sum_kg;
            let bound = floor_parts_kg(&ctx.grid.bound, &prep, &ac, m);
            assert!(
                bound <= flown * (1.0 + 1e-12),
                "{} at {m} kg: bound {bound} kg above the flown sum {flown} kg",
                c.name
            );
        }
        let start = closure_start(&ctx.grid.bound, &prep, &ac, m0);
        let closure = close(&ctx.grid, &prep, &ac, &mut f);
        assert!(start.mass_kg >= m0, "{}: start below m0", c.name);
        if closure.converged {
            // The root is within the tolerance (0.01 kg) of the closed mass.
            assert!(
                start.mass_kg <= closure.takeoff_mass_kg + 0.01,
                "{}: start {} kg above the root {} kg",
                c.name,
                start.mass_kg,
                closure.takeoff_mass_kg
            );
        }
        out.push((start.mass_kg, closure.takeoff_mass_kg, closure.iterations));
    }
    out
}

#[test]
fn the_closure_starts_from_a_lower_bound_just_below_the_root() {
    // F_lb prices the losses at the coldest the motor can be and the peaks at one step
    // each: never above F, so its root is below F's smallest root (engine::bound). On the
    // demo it lands within 3 % of the root (mostly within 0.5 %), so every closure takes
    // at most three flights where starting from m₀ (a few hundred kilograms short) took
    // four.
    let found = check_closure_bound(&demo());
    assert_eq!(found.len(), demo().candidates.len());
    for (start, root, flights) in found {
        assert!(
            root - start < 0.03 * root,
            "start {start} kg, root {root} kg"
        );
        assert!(
            flights <= 3,
            "{flights} flights from {start} kg to {root} kg"
        );
    }
}
