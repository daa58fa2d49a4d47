//! Design sweeps and robustness sampling.

use crate::fixtures::demo;
use shaftline::engine::evaluate::{StudyContext, evaluate};
use shaftline::engine::results::METRICS;
use shaftline::engine::robust::{self, Uncertainty};
use shaftline::engine::sweep::{self, Sweep};
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

const A1: &str = "A1 axial double rotor, direct oil";

fn a1_sweep(spec: &[&str]) -> Sweep {
    let axes = spec.iter().map(|s| sweep::parse_axis(s).unwrap()).collect();
    Sweep::new(&demo(), A1, axes).unwrap()
}

#[test]
fn sweep_rows_equal_scoring_the_same_designs_one_by_one() {
    let study = demo();
    let sw = a1_sweep(&["outer_radius_m=0.10:0.20:4", "inner_outer_ratio=0.5:0.7:3"]);
    assert_eq!(sw.len(), 12);
    let (done, cancel) = (AtomicUsize::new(0), AtomicBool::new(false));
    let mut rows = Vec::new();
    let emitted = sweep::run(&study, &sw, &done, &cancel, |i, v, r| {
        rows.push((i, v.to_vec(), r.clone()))
    });
    assert_eq!(emitted, 12);
    assert_eq!(
        done.load(Ordering::Relaxed),
        12,
        "progress reaches every design"
    );
    let ctx = StudyContext::new(&study);
    let base = &study.candidates[2];
    for (k, (i, values, row)) in rows.iter().enumerate() {
        assert_eq!(*i, k, "grid order");
        assert_eq!(values, &sw.values(k));
        let one = evaluate(&ctx, &sw.design(base, k).unwrap());
        assert_eq!(row.feasible, one.feasible);
        assert_eq!(row.binding_constraint, one.binding_constraint);
        for (m, _) in METRICS {
            assert_eq!(row.metric(m), one.metric(m), "design {k} metric {m}");
        }
    }
    // The first axis varies slowest.
    assert_eq!(sw.values(0), vec![0.10, 0.5]);
    assert_eq!(sw.values(1), vec![0.10, 0.6]);
    assert_eq!(sw.values(3)[0], 0.10 + 0.10 / 3.0);
}

#[test]
fn a_larger_outer_radius_in_the_sweep_gives_more_rated_torque() {
    let study = demo();
    let sw = a1_sweep(&["outer_radius_m=0.10:0.20:6"]);
    let mut torque = Vec::new();
    sweep::run(
        &study,
        &sw,
        &AtomicUsize::new(0),
        &AtomicBool::new(false),
        |_, _, r| torque.push(r.rated_torque_nm),
    );
    assert!(torque.windows(2).all(|w| w[1] > w[0]), "{torque:?}");
}

#[test]
fn cancel_stops_the_work() {
    // Cancelled as the first row comes out: that chunk is handed out in full, the one
    // scored meanwhile is dropped, and nothing after it is scored.
    let study = demo();
    let sw = a1_sweep(&["outer_radius_m=0.10:0.20:400"]);
    let (done, cancel) = (AtomicUsize::new(0), AtomicBool::new(false));
    let emitted = sweep::run_in_chunks(&study, &sw, 64, &done, &cancel, |_, _, _| {
        cancel.store(true, Ordering::Relaxed)
    });
    assert_eq!(emitted, 64, "rows of the first chunk only");
    let scored = done.load(Ordering::Relaxed);
    assert!((64..=128).contains(&scored), "designs scored: {scored}");
}

#[test]
fn a_cancel_from_another_thread_stops_the_work() {
    let study = demo();
    let sw = a1_sweep(&["outer_radius_m=0.10:0.20:400"]);
    let (done, cancel) = (AtomicUsize::new(0), AtomicBool::new(false));
    let emitted = std::thread::scope(|s| {
        s.spawn(|| {
            while done.load(Ordering::Relaxed) == 0 {
                std::thread::yield_now();
            }
            cancel.store(true, Ordering::Relaxed);
        });
        // Small chunks, so that the cancel lands before the last one whatever the timing.
        sweep::run_in_chunks(&study, &sw, 8, &done, &cancel, |_, _, _| {
            while !cancel.load(Ordering::Relaxed) {
                std::thread::yield_now();
            }
        })
    });
    assert!(emitted <= 8, "at most the first chunk's rows: {emitted}");
    let scored = done.load(Ordering::Relaxed);
    assert!((8..=16).contains(&scored), "designs scored: {scored}");
}

#[test]
fn bad_sweeps_name_what_is_wrong() {
    let study = demo();
    for (spec, path) in [
        ("outer_radius_m=0.2:0.1:5", "vary.outer_radius_m"),
        ("outer_radius_m=0.1:0.2:0", "vary.outer_radius_m"),
        ("outer_radius_m=0.1:0.2", "vary.outer_radius_m"),
        ("tip_speed=1:2:3", "vary"),
        ("cooling=ice", "vary.cooling"),
    ] {
        assert_eq!(sweep::parse_axis(spec).unwrap_err().path, path, "{spec}");
    }
    let axis = |s: &str| sweep::parse_axis(s).unwrap();
    assert_eq!(
        Sweep::new(&study, "nobody", vec![axis("pole_pairs=4:8:3")])
            .unwrap_err()
            .path,
        "candidate"
    );
    let ds = "DS-1 radial 45 kW continuous (datasheet)";
    assert_eq!(
        Sweep::new(&study, ds, vec![axis("pole_pairs=4:8:3")])
            .unwrap_err()
            .path,
        "candidate"
    );
    assert_eq!(
        Sweep::new(&study, A1, vec![axis("bore_diameter_m=0.1:0.2:3")])
            .unwrap_err()
            .path,
        "vary.bore_diameter_m"
    );
    let big = vec![
        axis("outer_radius_m=0.1:0.2:1000"),
        axis("inner_outer_ratio=0.5:0.7:1000"),
    ];
    assert_eq!(Sweep::new(&study, A1, big).unwrap_err().path, "vary");
}

fn seeded(seed: u64) -> impl FnMut() -> f64 {
    // SplitMix64 (Steele, Lea & Flood 2014): a small seeded source for the tests.
    let mut x = seed;
    move || {
        x = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = x;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }
}

#[test]
fn seeded_robustness_is_reproducible_and_bounded() {
    let study = demo();
    let unc = Uncertainty::default();
    let a = robust::run(&study, &unc, 12, &mut seeded(7));
    let b = robust::run(&study, &unc, 12, &mut seeded(7));
    assert_eq!(a, b);
    let c = robust::run(&study, &unc, 12, &mut seeded(8));
    assert_ne!(a, c, "another seed draws other samples");
    for r in &a.candidates {
        for p in [r.p_feasible, r.p_pareto, r.p_best] {
            assert!((0.0..=1.0).contains(&p), "{}: {p}", r.name);
        }
        assert!(
            r.p_pareto <= r.p_feasible && r.p_best <= r.p_pareto,
            "{}",
            r.name
        );
    }
    let best_total: f64 = a.candidates.iter().map(|r| r.p_best).sum();
    assert!(best_total <= 1.0 + 1e-12);
}

#[test]
fn with_no_spread_robustness_repeats_the_nominal_verdicts() {
    let study = demo();
    let one = (1.0, 1.0);
    let unc = Uncertainty {
        battery_specific_energy: one,
        cd0: one,
        prop_efficiency: one,
        motor_mass: one,
        motor_losses: one,
    };
    let r = robust::run(&study, &unc, 3, &mut seeded(1));
    let nominal = shaftline::engine::score_study(&study);
    for (row, c) in r.candidates.iter().zip(&nominal.candidates) {
        assert_eq!(
            row.p_feasible,
            if c.feasible { 1.0 } else { 0.0 },
            "{}",
            c.name
        );
        assert_eq!(
            row.p_best,
            if c.rank == Some(1) { 1.0 } else { 0.0 },
            "{}",
            c.name
        );
    }
}

#[test]
fn designs_flown_in_lockstep_score_exactly_as_one_by_one() {
    use shaftline::engine::evaluate::{evaluate_lean, evaluate_lean_group};
    let study = demo();
    let ctx = StudyContext::new(&study);
    let sw = a1_sweep(&[
        "outer_radius_m=0.11:0.19:20",
        "current_density_a_per_mm2=6:12:2",
    ]);
    // Forty geometry designs, the datasheet and size-to-mission candidates of the demo:
    // two full lockstep groups, a remainder, and candidates that go one by one.
    let mut cands: Vec<_> = (0..40)
        .map(|i| sw.design(&study.candidates[2], i).unwrap())
        .collect();
    cands.extend(study.candidates.iter().cloned());
    let group = evaluate_lean_group(&ctx, &cands);
    assert_eq!(group.len(), cands.len());
    for (c, g) in cands.iter().zip(&group) {
        let one = evaluate_lean(&ctx, c);
        assert_eq!(g, &one, "{}", c.name);
    }
}
