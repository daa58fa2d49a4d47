//! Sizing-model identities: torque per rotor volume, the axial optimum, scaling, inertia.

use shaftline::engine::motor::{MotorModel, Sink};
use shaftline::engine::sized::{SizedContext, annular_inertia};
use shaftline::engine::sizing::{self, SizingParams};
use shaftline::engine::study::{AxialVariant, Cooling, SizingCommon, Winding};
use shaftline::engine::{axial, radial};
use std::f64::consts::PI;

fn params(winding: Winding, pole_pairs: u32) -> SizingParams {
    let c = SizingCommon {
        pole_pairs,
        cooling: Some(Cooling::ForcedAir),
        ..Default::default()
    };
    sizing::resolve(&c, winding, &mut Default::default()).unwrap()
}

fn ctx() -> SizedContext {
    SizedContext {
        base_speed_rad_s: 300.0,
        dc_bus_v: 400.0,
        sink: Sink::Air,
    }
}

fn geo(m: &MotorModel, key: &str) -> f64 {
    m.geo(key).unwrap_or_else(|| panic!("geometry.{key}"))
}

#[test]
fn radial_torque_per_rotor_volume_is_twice_the_shear_stress() {
    // T = σ·πDL·D/2 = 2σ·V_r (reference-values §6: TRV = 2σ).
    let p = params(Winding::Distributed, 8);
    let (d, l) = (0.2, 0.1);
    let rotor_volume = PI * d * d / 4.0 * l;
    assert_close!(
        radial::rated_torque(&p, d, l) / rotor_volume,
        2.0 * p.shear_stress(),
        rel = 1e-12
    );
    // σ = k_w·A·B̂/√2 at unity power factor (reference-values §6).
    assert_close!(
        p.shear_stress(),
        0.95 * 45_000.0 * 0.9 / 2f64.sqrt(),
        rel = 1e-12
    );
}

#[test]
fn axial_torque_at_fixed_outer_radius_peaks_at_one_over_root_three() {
    // dT/dλ = 0 ⇒ λ* = 1/√3 for an A_i-limited design (reference-values §7; Campbell 1974).
    let p = params(Winding::Concentrated, 10);
    let best = (500..=700)
        .map(|i| i as f64 / 1000.0)
        .max_by(|a, b| {
            axial::rated_torque(&p, 0.15, *a).total_cmp(&axial::rated_torque(&p, 0.15, *b))
        })
        .unwrap();
    assert!(
        (best - 1.0 / 3f64.sqrt()).abs() <= 0.005,
        "argmax λ = {best}"
    );
    // T/T_max at λ = 0.5 is 0.9743 (reference-values §7 table, computed).
    let ratio =
        axial::rated_torque(&p, 0.15, 0.5) / axial::rated_torque(&p, 0.15, 1.0 / 3f64.sqrt());
    assert_close!(ratio, 0.9743, rel = 1e-4);
}

#[test]
fn axial_torque_grows_as_the_cube_of_the_outer_radius() {
    let p = params(Winding::Concentrated, 10);
    for (r, k) in [(0.1, 2.0), (0.12, 1.5), (0.2, 0.5)] {
        assert_close!(
            axial::rated_torque(&p, k * r, 0.6) / axial::rated_torque(&p, r, 0.6),
            k * k * k,
            rel = 1e-12
        );
    }
}

#[test]
fn ring_and_disc_inertia_match_the_handbook() {
    // Handbook check values (reference-values §10, computed from ½m(r_o² + r_i²)):
    // NdFeB ring ρ 7500, r 0.08–0.10 m, L 0.05 m → m 4.2412 kg, J 0.034777 kg·m²;
    // steel disc ρ 7650, r 0.10 m, L 0.05 m → m 12.0166 kg, J 0.060083 kg·m².
    let ring_mass = 7500.0 * PI * (0.10f64.powi(2) - 0.08f64.powi(2)) * 0.05;
    assert_close!(ring_mass, 4.2412, rel = 1e-4);
    assert_close!(annular_inertia(ring_mass, 0.08, 0.10), 0.034777, rel = 1e-4);
    let disc_mass = 7650.0 * PI * 0.1f64.powi(2) * 0.05;
    assert_close!(disc_mass, 12.0166, rel = 1e-4);
    assert_close!(annular_inertia(disc_mass, 0.0, 0.10), 0.060083, rel = 1e-4);
}

#[test]
fn radial_rotor_inertia_is_its_two_rings_with_the_hub_allowance() {
    let p = params(Winding::Distributed, 8);
    let m = radial::build(&p, 0.2, 0.1, &ctx()).unwrap();
    let r_mo = 0.1 - 0.0015;
    let (r_mi, r_bi) = (
        geo(&m, "magnet_inner_radius_m"),
        geo(&m, "rotor_inner_radius_m"),
    );
    let want = 1.1
        * (annular_inertia(geo(&m, "magnet_mass_kg"), r_mi, r_mo)
            + annular_inertia(geo(&m, "rotor_iron_mass_kg"), r_bi, r_mi));
    assert_close!(m.rotor_inertia_kg_m2.unwrap(), want, rel = 1e-12);
    // The magnet ring is 0.8 of a full NdFeB annulus (pole-arc ratio) over the active length.
    assert_close!(
        geo(&m, "magnet_mass_kg"),
        7500.0 * 0.8 * PI * (r_mo * r_mo - r_mi * r_mi) * 0.1,
        rel = 1e-12
    );
}

#[test]
fn radial_masses_add_up_and_the_structure_factor_applies() {
    let p = params(Winding::Distributed, 8);
    let m = radial::build(&p, 0.2, 0.1, &ctx()).unwrap();
    let parts: f64 = [
        "copper_mass_kg",
        "stator_teeth_mass_kg",
        "stator_yoke_mass_kg",
        "rotor_iron_mass_kg",
        "magnet_mass_kg",
    ]
    .iter()
    .map(|k| geo(&m, k))
    .sum();
    assert_close!(geo(&m, "active_mass_kg"), parts, rel = 1e-12);
    assert_close!(m.mass_kg, 1.35 * parts, rel = 1e-12);
    // Slot depth solves S_slot = (1 − f_t)·π·(D + h_s)·h_s.
    let (hs, ft) = (geo(&m, "slot_depth_m"), geo(&m, "tooth_fraction"));
    let s_slot = geo(&m, "copper_area_m2") / 0.45;
    assert_close!((1.0 - ft) * PI * (0.2 + hs) * hs, s_slot, rel = 1e-9);
}

#[test]
fn a_larger_scale_never_lowers_rated_torque() {
    let p = params(Winding::Distributed, 8);
    let q = params(Winding::Concentrated, 10);
    let mut last = (0.0, 0.0);
    for i in 1..60 {
        let s = 0.05 + 0.005 * i as f64;
        let r = radial::build(&p, s, 0.6 * s, &ctx())
            .map(|m| m.rated_torque_nm)
            .unwrap_or(0.0);
        let a = axial::build(&q, AxialVariant::DoubleRotor, s, 0.6, &ctx()).rated_torque_nm;
        assert!(
            r >= last.0 && a >= last.1,
            "scale {s}: radial {r} after {}, axial {a} after {}",
            last.0,
            last.1
        );
        last = (r, a);
    }
}

#[test]
fn a_rotor_without_room_for_its_back_iron_is_refused() {
    // One pole pair on a 20 mm bore: the yoke is thicker than what the magnets leave.
    let p = params(Winding::Distributed, 1);
    let err = radial::build(&p, 0.02, 0.02, &ctx()).unwrap_err();
    assert!(err.contains("back iron"), "{err}");
}

#[test]
fn axial_tooth_flux_falls_from_the_tooth_limit_at_the_inner_radius() {
    let p = params(Winding::Concentrated, 10);
    let r_i = 0.09;
    let w_s = (1.0 - p.tooth_fraction()) * 2.0 * PI * r_i / p.slots;
    let slices = axial::segment_slices(&p, r_i, 0.15, w_s, 0.02);
    assert_eq!(slices.len(), axial::IRON_SLICES);
    assert!(
        slices.windows(2).all(|w| w[1].1 < w[0].1),
        "flux density falls with radius"
    );
    assert!(slices[0].1 < p.b_tooth && slices[0].1 > 0.9 * p.b_tooth);
}

#[test]
fn the_datasheet_fit_recovers_known_coefficients() {
    use shaftline::engine::datasheet::fit_losses;
    // Synthetic losses P = k_c·T² + k_h·ω + k_e·ω² + k_0 sampled without noise.
    let (kc, kh, ke, k0) = (0.05, 0.8, 0.004, 150.0);
    let mut points = Vec::new();
    for rpm in [1200.0, 1800.0, 2400.0, 3000.0] {
        for t in [60.0, 150.0, 300.0] {
            let w: f64 = rpm * PI / 30.0;
            let loss = kc * t * t + kh * w + ke * w * w + k0;
            points.push((w, t, t * w / (t * w + loss)));
        }
    }
    let fit = fit_losses(&points).expect("12 points over 4 speeds and 3 torques");
    assert_close!(fit.k_c, kc, rel = 1e-6);
    assert_close!(fit.k_h, kh, rel = 1e-6);
    assert_close!(fit.k_e, ke, rel = 1e-6);
    assert_close!(fit.k_0, k0, rel = 1e-6);
    assert!(fit.rms_error.unwrap() < 1e-9);
    // Too few distinct speeds: no fit, the split is used instead.
    assert!(fit_losses(&points[..3]).is_none());
}

#[test]
fn the_fit_never_returns_negative_coefficients() {
    use shaftline::engine::datasheet::fit_losses;
    // Efficiency rising with speed at fixed torque would want a negative ω coefficient.
    let pts = [
        (100.0, 100.0, 0.90),
        (200.0, 100.0, 0.95),
        (300.0, 100.0, 0.97),
        (200.0, 200.0, 0.94),
    ];
    let fit = fit_losses(&pts).unwrap();
    for k in [fit.k_c, fit.k_h, fit.k_e, fit.k_0] {
        assert!(k >= 0.0, "{fit:?}");
    }
}
