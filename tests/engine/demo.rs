//! The demo study scores with plausible numbers, and A3 fails the one-motor-out takeoff.

use crate::fixtures::demo;
use shaftline::engine::score_study;

#[test]
fn every_demo_candidate_gets_plausible_numbers() {
    let r = score_study(&demo());
    assert_eq!(r.candidates.len(), 7);
    for c in &r.candidates {
        let n = &c.name;
        // demo.md hand estimate: takeoff mass ~790–850 kg; allow the spread of the motors.
        assert!(
            (750.0..=900.0).contains(&c.takeoff_mass_kg),
            "{n}: takeoff {}",
            c.takeoff_mass_kg
        );
        // ~34 kWh including a ~12 kWh reserve (demo.md).
        assert!(
            (28.0..=40.0).contains(&c.mission_energy_kwh),
            "{n}: energy {}",
            c.mission_energy_kwh
        );
        assert!(
            (9.0..=15.0).contains(&c.reserve_energy_kwh),
            "{n}: reserve {}",
            c.reserve_energy_kwh
        );
        assert!(
            (200.0..=280.0).contains(&c.battery_mass_kg),
            "{n}: battery {}",
            c.battery_mass_kg
        );
        // PM machines of this size: 90–98.5 % over a mission (common practice, no source).
        assert!(
            (0.90..=0.985).contains(&c.mission_motor_efficiency),
            "{n}: η {}",
            c.mission_motor_efficiency
        );
        // Motors of 50–120 kW: 5–60 kg each (common practice, no source).
        assert!(
            (5.0..=60.0).contains(&c.motor_mass_kg),
            "{n}: motor {}",
            c.motor_mass_kg
        );
        if let Some(i) = c.peak_phase_current_a {
            // ~110 kW on a 400 V bus with 90 % EMF: some 300–450 A peak, below 600 A.
            assert!(i > 100.0 && i < 600.0, "{n}: current {i}");
        }
        // Takeoff: ~51 kW and ~195 N·m per motor at 2500 rpm (demo.md).
        let t = &c.segments[1];
        assert!(
            (45.0..=60.0).contains(&t.shaft_power_kw_per_motor),
            "{n}: takeoff {} kW",
            t.shaft_power_kw_per_motor
        );
        if c.gearbox_mass_kg == 0.0 {
            assert!(
                (170.0..=230.0).contains(&t.motor_torque_nm),
                "{n}: takeoff {} N·m",
                t.motor_torque_nm
            );
        }
        assert!(
            c.assumptions.iter().any(|a| a.contains("default")),
            "{n} lists its defaults"
        );
    }
}

#[test]
fn a3_is_infeasible_with_a_one_motor_out_torque_violation() {
    let r = score_study(&demo());
    let a3 = r
        .candidates
        .iter()
        .find(|c| c.name.starts_with("A3"))
        .unwrap();
    assert!(!a3.feasible);
    assert!(
        a3.violations
            .iter()
            .any(|v| v.check == "torque" && v.oei && v.segment.as_deref() == Some("Takeoff"))
    );
    assert_eq!(
        a3.binding_constraint.as_deref(),
        Some("torque, Takeoff, OEI")
    );
    assert_eq!(a3.rank, None);
    assert!(!a3.pareto_optimal);
}

#[test]
fn sized_candidates_meet_their_binding_check_just_at_the_sized_scale() {
    let r = score_study(&demo());
    // The feasible size-to-mission candidates (A3 has a fixed geometry).
    for c in r
        .candidates
        .iter()
        .filter(|c| c.kind != "datasheet" && c.feasible && !c.name.starts_with("A3"))
    {
        assert!(c.binding_constraint.is_some(), "{}", c.name);
        let b = c.binding_constraint.as_deref().unwrap();
        assert!(
            b.starts_with("torque")
                || b.starts_with("winding_temperature")
                || b.starts_with("magnet_temperature"),
            "{}: {b}",
            c.name
        );
        if b.starts_with("torque") {
            assert!(
                (c.torque_margin.unwrap() - 1.0).abs() < 1e-4,
                "{}: torque margin {:?}",
                c.name,
                c.torque_margin
            );
        }
    }
}

#[test]
fn ranks_and_front_cover_exactly_the_feasible_candidates() {
    let r = score_study(&demo());
    let feasible: Vec<_> = r.candidates.iter().filter(|c| c.feasible).collect();
    assert!(!feasible.is_empty());
    let mut ranks: Vec<usize> = feasible.iter().map(|c| c.rank.unwrap()).collect();
    ranks.sort();
    assert_eq!(ranks, (1..=feasible.len()).collect::<Vec<_>>());
    assert!(feasible.iter().any(|c| c.pareto_optimal));
    for c in &feasible {
        let s = c.trade_score.unwrap();
        assert!((0.0..=1.0).contains(&s));
    }
    let best = feasible.iter().find(|c| c.rank == Some(1)).unwrap();
    assert!(
        best.pareto_optimal,
        "the best weighted score is on the front"
    );
}
