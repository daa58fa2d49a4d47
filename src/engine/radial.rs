//! Radial-flux, inner-rotor, surface-PM sizing model (engine.md §3.2; Pyrhönen et al.,
//! *Design of Rotating Electrical Machines*, ch. 6; Hendershot & Miller).

use super::materials::{CU_DENSITY, NDFEB_DENSITY};
use super::motor::{GapCylinder, MotorModel};
use super::sized::{SizedContext, SizedParts, annular_inertia, annulus, into_model};
use super::sizing::SizingParams;
use super::steel::STEEL_DENSITY_KG_M3 as RHO_FE;
use std::f64::consts::PI;

/// Rated torque T_r = σ·(π/2)·D²·L (TRV = 2σ), N·m.
pub fn rated_torque(p: &SizingParams, bore_m: f64, length_m: f64) -> f64 {
    p.shear_stress() * PI / 2.0 * bore_m * bore_m * length_m
}

/// Bore diameter that gives rated torque `t` at aspect ratio χ = L/D, m.
pub fn bore_for_torque(p: &SizingParams, t: f64, chi: f64) -> f64 {
    (2.0 * t / (p.shear_stress() * PI * chi)).cbrt()
}

/// Slot depth h_s from S_slot = (1 − f_t)·π·(D + h_s)·h_s, m.
pub fn slot_depth(slot_area: f64, tooth_fraction: f64, bore: f64) -> f64 {
    let k = slot_area / ((1.0 - tooth_fraction) * PI);
    0.5 * (-bore + (bore * bore + 4.0 * k).sqrt())
}

/// Sizes a radial motor of bore D and active length L. `Err` with a reason when the rotor
/// back iron has no room (its inner radius ≤ 0).
pub fn build(
    p: &SizingParams,
    bore: f64,
    length: f64,
    ctx: &SizedContext,
) -> Result<MotorModel, String> {
    let pp = p.pole_pairs;
    let t_rated = rated_torque(p, bore, length);
    let bm = p.magnet_field();
    let hm = p.magnet_thickness();
    let s_cu = p.electric_loading * PI * bore / p.current_density;
    let s_slot = s_cu / p.fill;
    let ft = p.tooth_fraction();
    let hs = slot_depth(s_slot, ft, bore);
    let hy = p.b_gap * bore / (2.0 * pp * p.b_yoke * p.k_fe);
    let d_so = bore + 2.0 * hs + 2.0 * hy;
    let r_mo = bore / 2.0 - p.gap;
    let r_mi = r_mo - hm;
    let r_bi = r_mi - hy;
    if r_bi <= 0.0 {
        return Err(format!(
            "the rotor has no room for its back iron: bore {:.1} mm leaves an inner radius of {:.1} mm",
            bore * 1e3,
            r_bi * 1e3
        ));
    }
    let pole_pitch = PI * bore / (2.0 * pp);
    let l_end = p.end_winding_factor * pole_pitch;
    let v_cu = s_cu * (length + 2.0 * l_end);
    let m_teeth = RHO_FE * p.k_fe * (PI * (bore + hs) * hs - s_slot) * length;
    let m_yoke = RHO_FE * p.k_fe * annulus(bore / 2.0 + hs, d_so / 2.0) * length;
    let m_rotor = RHO_FE * annulus(r_bi, r_mi) * length;
    let m_mag = NDFEB_DENSITY * p.pole_arc * annulus(r_mi, r_mo) * length;
    let m_cu = CU_DENSITY * v_cu;
    let active = m_teeth + m_yoke + m_rotor + m_mag + m_cu;
    let inertia =
        p.hub_factor * (annular_inertia(m_mag, r_mi, r_mo) + annular_inertia(m_rotor, r_bi, r_mi));
    let env_d = d_so + 2.0 * p.housing_radial;
    let env_l = length + 2.0 * l_end + 2.0 * p.housing_axial;
    let w_s = s_slot / (p.slots * hs);
    let g_ws = p.h_liner * p.slots * 2.0 * (hs + w_s) * length;
    // Housing = the envelope: lateral surface with fins, both end faces without.
    let g_sc = p.h_conv * (p.fin * PI * env_d * env_l + 2.0 * PI * env_d * env_d / 4.0);
    let mut parts = SizedParts {
        rated_torque_nm: t_rated,
        copper_mass_kg: m_cu,
        copper_volume_m3: v_cu,
        iron_pieces: vec![(m_teeth, p.b_tooth), (m_yoke, p.b_yoke)],
        active_mass_kg: active,
        rotor_inertia_kg_m2: inertia,
        envelope_diameter_m: env_d,
        envelope_length_m: env_l,
        tip_speed_max_rad_s: p.tip_speed / (bore / 2.0 - p.gap),
        disc_radii_m: vec![r_mo],
        cylinder: Some(GapCylinder {
            radius_m: r_mo,
            length_m: length,
            gap_m: p.gap,
        }),
        g_ws,
        g_sc,
        ..Default::default()
    };
    for (k, v) in [
        ("bore_diameter_m", bore),
        ("active_length_m", length),
        ("stator_outer_diameter_m", d_so),
        ("slot_depth_m", hs),
        ("slot_width_m", w_s),
        ("slot_count", p.slots),
        ("tooth_fraction", ft),
        ("stator_yoke_m", hy),
        ("rotor_back_iron_m", hy),
        ("magnet_thickness_m", hm),
        ("magnet_field_t", bm),
        ("end_winding_m", l_end),
        ("copper_area_m2", s_cu),
        ("copper_mass_kg", m_cu),
        ("stator_teeth_mass_kg", m_teeth),
        ("stator_yoke_mass_kg", m_yoke),
        ("rotor_iron_mass_kg", m_rotor),
        ("magnet_mass_kg", m_mag),
        ("magnet_inner_radius_m", r_mi),
        ("rotor_inner_radius_m", r_bi),
    ] {
        parts.put(k, v);
    }
    Ok(into_model(p, parts, ctx))
}
