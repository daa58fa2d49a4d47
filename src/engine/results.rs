//! The result format `shaftline-results/1` (format.md): what every page, export and
//! review shows. Keys are the contract; units ride in the names.

use serde::Serialize;
use serde_json::{Map, Value};

pub const RESULTS_FORMAT: &str = "shaftline-results/1";

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StudyResults {
    pub format: String,
    pub study: String,
    pub engine_version: String,
    /// Objectives the Pareto front and trade score used.
    pub objectives: Vec<String>,
    pub candidates: Vec<CandidateResult>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Violation {
    pub check: String,
    pub segment: Option<String>,
    pub oei: bool,
    pub value: f64,
    pub limit: f64,
    pub message: String,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SegmentRow {
    pub name: String,
    pub kind: String,
    pub duration_s: f64,
    pub shaft_power_kw_per_motor: f64,
    pub motor_speed_rpm: f64,
    pub motor_torque_nm: f64,
    pub peak_torque_nm: f64,
    pub torque_capability_nm: f64,
    pub motor_efficiency: f64,
    pub copper_loss_w: f64,
    pub iron_loss_w: f64,
    pub mechanical_loss_w: f64,
    pub inverter_loss_w: f64,
    pub electric_power_kw: f64,
    pub battery_energy_kwh: f64,
    pub end_winding_temp_c: f64,
    pub peak_winding_temp_c: f64,
    pub end_stator_temp_c: f64,
    pub peak_stator_temp_c: f64,
    pub peak_phase_current_a: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CandidateResult {
    pub name: String,
    pub kind: String,
    pub topology: String,
    pub feasible: bool,
    pub violations: Vec<Violation>,
    pub binding_constraint: Option<String>,
    pub rated_torque_nm: f64,
    pub peak_torque_nm: f64,
    pub base_speed_rpm: f64,
    pub max_speed_rpm: f64,
    pub max_power_kw: f64,
    pub motor_mass_kg: f64,
    pub inverter_mass_kg: f64,
    pub gearbox_mass_kg: f64,
    pub propulsion_mass_kg: f64,
    pub battery_mass_kg: f64,
    pub takeoff_mass_kg: f64,
    pub closure_sum_of_parts_kg: f64,
    pub mission_energy_kwh: f64,
    pub reserve_energy_kwh: f64,
    pub mission_motor_efficiency: f64,
    pub cruise_motor_efficiency: Option<f64>,
    pub mission_drive_efficiency: f64,
    pub peak_winding_temp_c: f64,
    pub peak_magnet_temp_c: Option<f64>,
    pub winding_margin_k: f64,
    pub magnet_margin_k: Option<f64>,
    pub torque_margin: Option<f64>,
    pub specific_power_kw_per_kg: f64,
    pub peak_specific_power_kw_per_kg: f64,
    pub torque_density_nm_per_kg: f64,
    pub rotor_inertia_kg_m2: Option<f64>,
    pub peak_phase_current_a: Option<f64>,
    pub envelope_diameter_m: Option<f64>,
    pub envelope_length_m: Option<f64>,
    pub energy_margin_kwh: Option<f64>,
    pub energy_margin_pct: Option<f64>,
    pub mass_closure_converged: bool,
    pub geometry: Map<String, Value>,
    pub segments: Vec<SegmentRow>,
    pub oei_segments: Vec<SegmentRow>,
    pub pareto_optimal: bool,
    pub trade_score: Option<f64>,
    pub rank: Option<usize>,
    pub assumptions: Vec<String>,
}

impl CandidateResult {
    /// The value of a result metric by name (the objective names of engine.md §10 and the
    /// other scalar metrics); `None` when the metric is null or unknown.
    pub fn metric(&self, name: &str) -> Option<f64> {
        metric_reader(name).and_then(|read| read(self))
    }
}

/// Reads one metric of a result.
pub type MetricReader = fn(&CandidateResult) -> Option<f64>;

/// The reader of a metric by name, as [`CandidateResult::metric`] reads it: looked up once
/// for the columns of many rows. `None` for an unknown name.
pub fn metric_reader(name: &str) -> Option<MetricReader> {
    Some(match name {
        "rated_torque_nm" => |r| Some(r.rated_torque_nm),
        "peak_torque_nm" => |r| Some(r.peak_torque_nm),
        "base_speed_rpm" => |r| Some(r.base_speed_rpm),
        "max_speed_rpm" => |r| Some(r.max_speed_rpm),
        "max_power_kw" => |r| Some(r.max_power_kw),
        "motor_mass_kg" => |r| Some(r.motor_mass_kg),
        "inverter_mass_kg" => |r| Some(r.inverter_mass_kg),
        "gearbox_mass_kg" => |r| Some(r.gearbox_mass_kg),
        "propulsion_mass_kg" => |r| Some(r.propulsion_mass_kg),
        "battery_mass_kg" => |r| Some(r.battery_mass_kg),
        "takeoff_mass_kg" => |r| Some(r.takeoff_mass_kg),
        "closure_sum_of_parts_kg" => |r| Some(r.closure_sum_of_parts_kg),
        "mission_energy_kwh" => |r| Some(r.mission_energy_kwh),
        "reserve_energy_kwh" => |r| Some(r.reserve_energy_kwh),
        "mission_motor_efficiency" => |r| Some(r.mission_motor_efficiency),
        "cruise_motor_efficiency" => |r| r.cruise_motor_efficiency,
        "mission_drive_efficiency" => |r| Some(r.mission_drive_efficiency),
        "peak_winding_temp_c" => |r| Some(r.peak_winding_temp_c),
        "peak_magnet_temp_c" => |r| r.peak_magnet_temp_c,
        "winding_margin_k" => |r| Some(r.winding_margin_k),
        "magnet_margin_k" => |r| r.magnet_margin_k,
        "torque_margin" => |r| r.torque_margin,
        "specific_power_kw_per_kg" => |r| Some(r.specific_power_kw_per_kg),
        "peak_specific_power_kw_per_kg" => |r| Some(r.peak_specific_power_kw_per_kg),
        "torque_density_nm_per_kg" => |r| Some(r.torque_density_nm_per_kg),
        "rotor_inertia_kg_m2" => |r| r.rotor_inertia_kg_m2,
        "peak_phase_current_a" => |r| r.peak_phase_current_a,
        "envelope_diameter_m" => |r| r.envelope_diameter_m,
        "envelope_length_m" => |r| r.envelope_length_m,
        "energy_margin_kwh" => |r| r.energy_margin_kwh,
        "energy_margin_pct" => |r| r.energy_margin_pct,
        "trade_score" => |r| r.trade_score,
        _ => return None,
    })
}

/// Scalar metrics in the order exports list them, with their display units.
pub const METRICS: [(&str, &str); 34] = [
    ("rated_torque_nm", "N·m"),
    ("peak_torque_nm", "N·m"),
    ("base_speed_rpm", "rpm"),
    ("max_speed_rpm", "rpm"),
    ("max_power_kw", "kW"),
    ("motor_mass_kg", "kg"),
    ("inverter_mass_kg", "kg"),
    ("gearbox_mass_kg", "kg"),
    ("propulsion_mass_kg", "kg"),
    ("battery_mass_kg", "kg"),
    ("takeoff_mass_kg", "kg"),
    ("closure_sum_of_parts_kg", "kg"),
    ("mission_energy_kwh", "kWh"),
    ("reserve_energy_kwh", "kWh"),
    ("mission_motor_efficiency", ""),
    ("cruise_motor_efficiency", ""),
    ("mission_drive_efficiency", ""),
    ("peak_winding_temp_c", "°C"),
    ("peak_magnet_temp_c", "°C"),
    ("winding_margin_k", "K"),
    ("magnet_margin_k", "K"),
    ("torque_margin", ""),
    ("specific_power_kw_per_kg", "kW/kg"),
    ("peak_specific_power_kw_per_kg", "kW/kg"),
    ("torque_density_nm_per_kg", "N·m/kg"),
    ("rotor_inertia_kg_m2", "kg·m²"),
    ("peak_phase_current_a", "A"),
    ("envelope_diameter_m", "m"),
    ("envelope_length_m", "m"),
    ("energy_margin_kwh", "kWh"),
    ("energy_margin_pct", "%"),
    ("trade_score", ""),
    ("mass_closure_converged", ""),
    ("rank", ""),
];
