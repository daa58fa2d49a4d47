//! The exact thermal step and the cooling-class calibration.

use shaftline::engine::atmosphere::air;
use shaftline::engine::motor::{MotorModel, Sink, ThermalModel};
use shaftline::engine::sized::SizedContext;
use shaftline::engine::sizing;
use shaftline::engine::study::{AxialVariant, Cooling, InsulationClass, SizingCommon, Winding};
use shaftline::engine::thermal::{OneNode, TwoNode};
use shaftline::engine::{axial, radial};

/// Classical RK4 on the two-node equations, for comparison with the exact step.
fn rk4(net: &TwoNode, x0: (f64, f64), pw: f64, ps: f64, sink: f64, t: f64, n: usize) -> (f64, f64) {
    let f = |x: (f64, f64)| {
        (
            (pw - net.g_ws * (x.0 - x.1)) / net.c_winding,
            (ps + net.g_ws * (x.0 - x.1) - net.g_sc * (x.1 - sink)) / net.c_stator,
        )
    };
    let h = t / n as f64;
    let mut x = x0;
    for _ in 0..n {
        let k1 = f(x);
        let k2 = f((x.0 + 0.5 * h * k1.0, x.1 + 0.5 * h * k1.1));
        let k3 = f((x.0 + 0.5 * h * k2.0, x.1 + 0.5 * h * k2.1));
        let k4 = f((x.0 + h * k3.0, x.1 + h * k3.1));
        x.0 += h / 6.0 * (k1.0 + 2.0 * k2.0 + 2.0 * k3.0 + k4.0);
        x.1 += h / 6.0 * (k1.1 + 2.0 * k2.1 + 2.0 * k3.1 + k4.1);
    }
    x
}

#[test]
fn the_exact_two_node_step_matches_a_fine_rk4_integration() {
    let nets = [
        TwoNode {
            c_winding: 2700.0,
            c_stator: 14_000.0,
            g_ws: 60.0,
            g_sc: 13.0,
        },
        TwoNode {
            c_winding: 800.0,
            c_stator: 5000.0,
            g_ws: 25.0,
            g_sc: 400.0,
        },
    ];
    for net in nets {
        for dt in [1.0, 10.0, 137.0] {
            let exact = net.step(&net.propagator(dt), (35.0, 28.0), 900.0, 400.0, 15.0);
            let fine = rk4(&net, (35.0, 28.0), 900.0, 400.0, 15.0, dt, 10_000);
            assert_close!(exact.0, fine.0, abs = 1e-6);
            assert_close!(exact.1, fine.1, abs = 1e-6);
        }
    }
}

#[test]
fn the_one_node_step_is_the_exponential_approach_to_equilibrium() {
    let n = OneNode {
        resistance: 0.05,
        capacitance: 12_000.0,
    };
    let tau = 600.0;
    let after = n.step(n.decay(tau), 20.0, 1000.0, 20.0);
    // After one time constant the rise reaches 1 − e^{−1} of P·R.
    assert_close!(
        after - 20.0,
        1000.0 * 0.05 * (1.0 - (-1.0f64).exp()),
        rel = 1e-12
    );
}

fn settled_rise_fraction(m: &MotorModel, sink: f64, rpm: f64) -> f64 {
    let ThermalModel::TwoNode(net) = m.thermal else {
        panic!("sized motors have two nodes")
    };
    let a = air(0.0, 0.0);
    let omega = rpm * std::f64::consts::PI / 30.0;
    let (mut w, mut s) = (sink, sink);
    for _ in 0..500 {
        let l = m.losses(
            m.rated_torque_nm,
            omega,
            w,
            s,
            a.density_kg_m3,
            a.kinematic_viscosity_m2_s(),
        );
        (w, s) = net.equilibrium(l.copper_w, l.iron_w + l.mechanical_w, sink);
    }
    (w - sink) / (m.winding_limit_c - sink)
}

#[test]
fn every_cooling_class_settles_its_default_motors_at_60_to_85_percent_of_the_allowed_rise() {
    // Common practice, no source: the calibration the cooling-class defaults promise
    // (engine.md §5): radial D 0.2 m, L 0.1 m, p 8, distributed; axial double rotor
    // R_o 0.15 m, λ 0.6, p 10, concentrated; class H; rated torque at 2000 rpm, sea level.
    for cooling in Cooling::ALL {
        let sink = if cooling.is_liquid() {
            50.0
        } else {
            288.15 - 273.15
        };
        let ctx = SizedContext {
            base_speed_rad_s: 2200.0 * std::f64::consts::PI / 30.0,
            dc_bus_v: 400.0,
            sink: if cooling.is_liquid() {
                Sink::Liquid(sink)
            } else {
                Sink::Air
            },
        };
        let common = |pp| SizingCommon {
            pole_pairs: pp,
            cooling: Some(cooling),
            insulation_class: Some(InsulationClass::H),
            ..Default::default()
        };
        let pr =
            sizing::resolve(&common(8), Winding::Distributed, &mut Default::default()).unwrap();
        let pa =
            sizing::resolve(&common(10), Winding::Concentrated, &mut Default::default()).unwrap();
        let r = radial::build(&pr, 0.2, 0.1, &ctx).unwrap();
        let a = axial::build(&pa, AxialVariant::DoubleRotor, 0.15, 0.6, &ctx);
        for (label, m) in [("radial", r), ("axial", a)] {
            let f = settled_rise_fraction(&m, sink, 2000.0);
            assert!(
                (0.60..=0.85).contains(&f),
                "{cooling:?} {label}: settles at {:.1} % of the allowed rise",
                100.0 * f
            );
        }
    }
}
