//! What both sizing models share: turning geometry and masses into a motor model with
//! its losses (§3.4), thermal network (§5) and back-EMF constant.

use super::materials::{ALUMINIUM_SPECIFIC_HEAT, CU_SPECIFIC_HEAT, IRON_SPECIFIC_HEAT};
use super::motor::{
    CurrentModel, GapCylinder, Geo, LossModel, MotorModel, Sink, SizedLosses, ThermalModel,
};
use super::sizing::SizingParams;
use super::thermal::TwoNode;

/// Context a sized motor needs from the study.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SizedContext {
    /// Base speed, rad/s (given, or 1.1 × the highest motor speed of the mission).
    pub base_speed_rad_s: f64,
    pub dc_bus_v: f64,
    pub sink: Sink,
}

/// Geometry outputs of a sizing model, in SI units.
#[derive(Debug, Clone, Default)]
pub struct SizedParts {
    pub rated_torque_nm: f64,
    pub copper_mass_kg: f64,
    pub copper_volume_m3: f64,
    /// Stator iron carrying alternating flux, as (mass kg, flux density T) pieces.
    pub iron_pieces: Vec<(f64, f64)>,
    pub active_mass_kg: f64,
    pub rotor_inertia_kg_m2: f64,
    pub envelope_diameter_m: f64,
    pub envelope_length_m: f64,
    pub tip_speed_max_rad_s: f64,
    pub disc_radii_m: Vec<f64>,
    pub cylinder: Option<GapCylinder>,
    /// Conductances winding→stator and stator→coolant, W/K.
    pub g_ws: f64,
    pub g_sc: f64,
    pub geometry: Vec<(&'static str, Geo)>,
}

impl SizedParts {
    pub fn put(&mut self, key: &'static str, v: f64) {
        self.geometry.push((key, Geo::Num(v)));
    }
    fn stator_iron_mass(&self) -> f64 {
        self.iron_pieces.iter().map(|(m, _)| m).sum()
    }
}

/// Assembles the motor model from the parts.
pub fn into_model(p: &SizingParams, mut parts: SizedParts, ctx: &SizedContext) -> MotorModel {
    let t_rated = parts.rated_torque_nm;
    let total = p.structure_factor * parts.active_mass_kg;
    let structure = total - parts.active_mass_kg;
    let sum_b2: f64 = parts.iron_pieces.iter().map(|(m, b)| m * b * b).sum();
    let thermal = TwoNode {
        c_winding: parts.copper_mass_kg * CU_SPECIFIC_HEAT,
        c_stator: parts.stator_iron_mass() * IRON_SPECIFIC_HEAT
            + structure * ALUMINIUM_SPECIFIC_HEAT,
        g_ws: parts.g_ws,
        g_sc: parts.g_sc,
    };
    let j = p.current_density;
    let losses = SizedLosses {
        cu_k: j * j * parts.copper_volume_m3 / (t_rated * t_rated),
        iron_h: p.build_factor * p.steel.k_h * sum_b2,
        iron_e: p.build_factor * p.steel.k_e * sum_b2,
        pole_pairs: p.pole_pairs,
        bearing_torque_nm: p.bearing_fraction * t_rated,
        disc_radii_m: parts.disc_radii_m.clone(),
        cylinder: parts.cylinder,
        alpha_br: p.alpha_br,
        e_rms_base_v: p.emf_fraction * ctx.dc_bus_v / 6f64.sqrt(),
    };
    let max_speed = match p.user_max_speed_rpm {
        Some(rpm) => parts
            .tip_speed_max_rad_s
            .min(rpm * std::f64::consts::PI / 30.0),
        None => parts.tip_speed_max_rad_s,
    };
    let t_peak = p.overload_factor * t_rated;
    parts.put("active_mass_kg", parts.active_mass_kg);
    parts.put("structure_mass_kg", structure);
    parts.put("total_mass_kg", total);
    parts.put("shear_stress_pa", p.shear_stress());
    parts.put("winding_capacitance_j_per_k", thermal.c_winding);
    parts.put("stator_capacitance_j_per_k", thermal.c_stator);
    parts.put("winding_to_stator_w_per_k", thermal.g_ws);
    parts.put("stator_to_coolant_w_per_k", thermal.g_sc);
    MotorModel {
        rated_torque_nm: t_rated,
        peak_torque_nm: t_peak,
        base_speed_rad_s: ctx.base_speed_rad_s,
        max_speed_rad_s: max_speed,
        continuous_power_w: t_rated * ctx.base_speed_rad_s,
        max_power_w: t_peak * ctx.base_speed_rad_s,
        mass_kg: total,
        rotor_inertia_kg_m2: Some(parts.rotor_inertia_kg_m2),
        envelope_diameter_m: Some(parts.envelope_diameter_m),
        envelope_length_m: Some(parts.envelope_length_m),
        winding_limit_c: p.winding_limit_c,
        magnet_limit_c: Some(p.magnet_max_c),
        losses: LossModel::Sized(losses),
        thermal: ThermalModel::TwoNode(thermal),
        sink: ctx.sink,
        current: CurrentModel::BackEmf,
        overload: None,
        geometry: parts.geometry,
    }
}

/// Area of an annulus between radii r_i and r_o, m².
pub fn annulus(r_i: f64, r_o: f64) -> f64 {
    std::f64::consts::PI * (r_o * r_o - r_i * r_i)
}

/// Moment of inertia of a thick ring or annular disc about its axis, ½·m·(r_o² + r_i²),
/// kg·m² (handbook formula; r_i = 0 gives the solid disc ½·m·r²).
pub fn annular_inertia(mass_kg: f64, r_i: f64, r_o: f64) -> f64 {
    0.5 * mass_kg * (r_o * r_o + r_i * r_i)
}
