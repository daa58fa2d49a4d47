//! Axial-flux sizing model, double-rotor yokeless or single-sided (engine.md §3.3;
//! Huang et al. 1999; Gieras, Wang & Kamper, *Axial Flux Permanent Magnet Brushless Machines*).

use super::materials::{CU_DENSITY, NDFEB_DENSITY};
use super::motor::{Geo, MotorModel};
use super::sized::{SizedContext, SizedParts, annular_inertia, annulus, into_model};
use super::sizing::SizingParams;
use super::steel::STEEL_DENSITY_KG_M3 as RHO_FE;
use super::study::AxialVariant;
use std::f64::consts::{PI, SQRT_2};

/// Radial slices for the stator-segment iron loss (midpoint rule).
pub const IRON_SLICES: usize = 16;

/// Rated torque T_r = (π/√2)·k_w·B̂_g·A_i·R_o³·λ(1 − λ²), N·m.
pub fn rated_torque(p: &SizingParams, r_o: f64, lambda: f64) -> f64 {
    PI / SQRT_2
        * p.k_w
        * p.b_gap
        * p.electric_loading
        * r_o.powi(3)
        * lambda
        * (1.0 - lambda * lambda)
}

/// Outer radius that gives rated torque `t` at ratio λ, m.
pub fn radius_for_torque(p: &SizingParams, t: f64, lambda: f64) -> f64 {
    (t / rated_torque(p, 1.0, lambda)).cbrt()
}

/// Sizes an axial motor of outer radius R_o and ratio λ = R_i/R_o.
pub fn build(
    p: &SizingParams,
    variant: AxialVariant,
    r_o: f64,
    lambda: f64,
    ctx: &SizedContext,
) -> MotorModel {
    let pp = p.pole_pairs;
    let q = p.slots;
    let r_i = lambda * r_o;
    let dr = r_o - r_i;
    let t_rated = rated_torque(p, r_o, lambda);
    let bm = p.magnet_field();
    let hm = p.magnet_thickness();
    let s_cu = p.electric_loading * 2.0 * PI * r_i / p.current_density;
    let s_slot = s_cu / p.fill;
    let ft = p.tooth_fraction();
    let w_s = (1.0 - ft) * 2.0 * PI * r_i / q;
    let hs = s_slot / (q * w_s);
    let face = annulus(r_i, r_o);
    let m_segments = RHO_FE * p.k_fe * hs * (face - q * w_s * dr);
    let l_end = p.end_winding_factor * PI * 0.5 * (r_o + r_i) / pp;
    let v_cu = s_cu * (dr + 2.0 * l_end);
    let m_cu = CU_DENSITY * v_cu;
    let h_r = p.b_gap * (PI * r_o / pp) / (PI * p.b_yoke);
    let (rotors, gaps, yoke) = match variant {
        AxialVariant::DoubleRotor => (2.0, 2.0, false),
        AxialVariant::SingleSided => (1.0, 1.0, true),
    };
    let m_rotor_each = RHO_FE * face * h_r;
    let m_mag_each = NDFEB_DENSITY * p.pole_arc * face * hm;
    let m_yoke = if yoke { RHO_FE * face * h_r } else { 0.0 };
    let active = m_segments + m_cu + rotors * (m_rotor_each + m_mag_each) + m_yoke;
    let inertia = p.hub_factor * rotors * annular_inertia(m_rotor_each + m_mag_each, r_i, r_o);
    let stack = rotors * (h_r + hm) + gaps * p.gap + hs + if yoke { h_r / p.k_fe } else { 0.0 };
    let env_d = 2.0 * (r_o + l_end) + 2.0 * p.housing_radial;
    let env_l = stack + 2.0 * p.housing_axial;
    let mut iron_pieces = segment_slices(p, r_i, r_o, w_s, hs);
    if yoke {
        iron_pieces.push((m_yoke, p.b_yoke));
    }
    let g_ws = p.h_liner * q * 2.0 * (hs + w_s) * dr;
    // Stator outer rim and both stator faces, with the fin factor.
    let g_sc = p.h_conv * p.fin * (2.0 * PI * r_o * hs + 2.0 * face);
    let mut parts = SizedParts {
        rated_torque_nm: t_rated,
        copper_mass_kg: m_cu,
        copper_volume_m3: v_cu,
        iron_pieces,
        active_mass_kg: active,
        rotor_inertia_kg_m2: inertia,
        envelope_diameter_m: env_d,
        envelope_length_m: env_l,
        tip_speed_max_rad_s: p.tip_speed / r_o,
        disc_radii_m: vec![r_o; rotors as usize],
        cylinder: None,
        g_ws,
        g_sc,
        geometry: Vec::with_capacity(32),
    };
    for (k, v) in [
        ("outer_radius_m", r_o),
        ("inner_radius_m", r_i),
        ("inner_outer_ratio", lambda),
        ("stator_axial_length_m", hs),
        ("slot_width_m", w_s),
        ("slot_count", q),
        ("tooth_fraction", ft),
        ("rotor_back_iron_m", h_r),
        ("stator_yoke_m", if yoke { h_r / p.k_fe } else { 0.0 }),
        ("magnet_thickness_m", hm),
        ("magnet_field_t", bm),
        ("end_winding_m", l_end),
        ("copper_area_m2", s_cu),
        ("copper_mass_kg", m_cu),
        ("stator_segments_mass_kg", m_segments),
        ("stator_yoke_mass_kg", m_yoke),
        ("rotor_iron_mass_kg", rotors * m_rotor_each),
        ("magnet_mass_kg", rotors * m_mag_each),
        ("rotor_count", rotors),
        ("stack_length_m", stack),
    ] {
        parts.put(k, v);
    }
    if yoke {
        parts.geometry.push((
            "note",
            Geo::Text("single-sided: unbalanced axial pull on the bearings"),
        ));
    }
    into_model(p, parts, ctx)
}

/// Stator segments cut into radial slices: each slice's iron mass and its tooth flux density
/// B(r) = B_m·τ_s(r)/(k_Fe·(τ_s(r) − w_s)), τ_s(r) = 2πr/Q (midpoint rule).
pub fn segment_slices(p: &SizingParams, r_i: f64, r_o: f64, w_s: f64, hs: f64) -> Vec<(f64, f64)> {
    let dr = (r_o - r_i) / IRON_SLICES as f64;
    let bm = p.magnet_field();
    // Room for the single-sided variant's yoke as well.
    let mut slices = Vec::with_capacity(IRON_SLICES + 1);
    slices.extend((0..IRON_SLICES).map(|k| {
        let r = r_i + (k as f64 + 0.5) * dr;
        let tau = 2.0 * PI * r / p.slots;
        let mass = RHO_FE * p.k_fe * hs * (2.0 * PI * r - p.slots * w_s) * dr;
        (mass, bm * tau / (p.k_fe * (tau - w_s)))
    }));
    slices
}
