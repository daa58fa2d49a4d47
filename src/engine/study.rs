//! The study file `shaftline-study/1` as validated engine types (format.md).
//! Optional fields stay `None` when absent so that a study serialises back exactly as given;
//! the defaults of engine.md are applied by the models, which also record them as assumptions.

use serde::Serialize;
use std::collections::BTreeMap;

pub use super::parse::{
    parse_aircraft, parse_candidate, parse_scoring, parse_segment, parse_study, parse_study_str,
};

/// The only study format version this engine reads.
pub const STUDY_FORMAT: &str = "shaftline-study/1";

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Study {
    pub format: String,
    pub name: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
    pub aircraft: Aircraft,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub installation: Option<Installation>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub integration: Option<Integration>,
    pub segments: Vec<Segment>,
    pub candidates: Vec<Candidate>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub scoring: Option<Scoring>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Aircraft {
    pub motor_count: u32,
    pub airframe_mass_kg: f64,
    pub payload_kg: f64,
    pub max_takeoff_mass_kg: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub wing_area_m2: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub aspect_ratio: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub oswald_efficiency: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cd0: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub isa_offset_k: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub dc_bus_voltage_v: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub inverter_efficiency: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub inverter_specific_power_kw_per_kg: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub coolant_inlet_temp_c: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gearbox_stage_efficiency: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gearbox_specific_torque_nm_per_kg: Option<f64>,
    pub battery: Battery,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum BatteryMode {
    Sized,
    Fixed,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Battery {
    pub mode: BatteryMode,
    pub specific_energy_wh_per_kg: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub mass_kg: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub usable_fraction: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub end_of_life_fraction: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub discharge_efficiency: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Installation {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_diameter_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_length_m: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Integration {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub time_step_s: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min_steps_per_segment: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub preflight_temp_c: Option<f64>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SegmentKind {
    Taxi,
    Takeoff,
    Climb,
    Cruise,
    Descent,
    Loiter,
    Reserve,
}

impl SegmentKind {
    pub const NAMES: [&'static str; 7] = [
        "taxi", "takeoff", "climb", "cruise", "descent", "loiter", "reserve",
    ];
    pub const ALL: [SegmentKind; 7] = [
        SegmentKind::Taxi,
        SegmentKind::Takeoff,
        SegmentKind::Climb,
        SegmentKind::Cruise,
        SegmentKind::Descent,
        SegmentKind::Loiter,
        SegmentKind::Reserve,
    ];
    pub fn as_str(self) -> &'static str {
        Self::NAMES[self as usize]
    }
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "rule", rename_all = "snake_case")]
pub enum PowerRule {
    Steady {
        tas_m_s: f64,
        prop_efficiency: f64,
        #[serde(skip_serializing_if = "Option::is_none")]
        climb_rate_m_s: Option<f64>,
        #[serde(skip_serializing_if = "Option::is_none")]
        cd0_increment: Option<f64>,
    },
    PowerLoading {
        w_per_kg: f64,
    },
    ShaftPower {
        kw: f64,
    },
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Segment {
    pub name: String,
    pub kind: SegmentKind,
    pub power: PowerRule,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub duration_s: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub distance_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub altitude_start_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub altitude_end_m: Option<f64>,
    pub prop_speed_rpm: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub idle_floor_kw: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub oei: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub oei_cd0_increment: Option<f64>,
}

impl Segment {
    pub fn altitude_start(&self) -> f64 {
        self.altitude_start_m.unwrap_or(0.0)
    }
    pub fn altitude_end(&self) -> f64 {
        self.altitude_end_m.unwrap_or(self.altitude_start())
    }
    pub fn is_oei(&self) -> bool {
        self.oei.unwrap_or(false)
    }
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Candidate {
    pub name: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub drive: Option<Drive>,
    pub source: Source,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Drive {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gear_ratio: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gear_stages: Option<u32>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Source {
    Datasheet(DatasheetSource),
    RadialSizing(RadialSizing),
    AxialSizing(AxialSizing),
}

impl Source {
    pub fn kind_name(&self) -> &'static str {
        match self {
            Source::Datasheet(_) => "datasheet",
            Source::RadialSizing(_) => "radial_sizing",
            Source::AxialSizing(_) => "axial_sizing",
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Topology {
    Radial,
    Axial,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum InsulationClass {
    B,
    F,
    H,
    N,
    R,
}

impl InsulationClass {
    pub const NAMES: [&'static str; 5] = ["B", "F", "H", "N", "R"];
    pub fn from_name(s: &str) -> Option<Self> {
        match s {
            "B" => Some(Self::B),
            "F" => Some(Self::F),
            "H" => Some(Self::H),
            "N" => Some(Self::N),
            "R" => Some(Self::R),
            _ => None,
        }
    }
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EfficiencyPoint {
    pub speed_rpm: f64,
    pub torque_nm: f64,
    pub efficiency: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LossSplit {
    pub copper: f64,
    pub iron_linear: f64,
    pub iron_quadratic: f64,
    pub constant: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DatasheetSource {
    pub topology: Topology,
    pub mass_kg: f64,
    pub continuous_power_kw: f64,
    pub continuous_speed_rpm: f64,
    pub peak_power_kw: f64,
    pub peak_duration_s: f64,
    pub max_speed_rpm: f64,
    pub continuous_efficiency: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub efficiency_points: Option<Vec<EfficiencyPoint>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub data_winding_temp_c: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub insulation_class: Option<InsulationClass>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub thermal_time_constant_s: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rated_ambient_c: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub peak_torque_nm: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rotor_inertia_kg_m2: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub envelope_diameter_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub envelope_length_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub torque_constant_nm_per_a: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub loss_split: Option<LossSplit>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub hot_spot_allowance_k: Option<f64>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SizingMode {
    Geometry,
    SizeToMission,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum AxialVariant {
    DoubleRotor,
    SingleSided,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Winding {
    Distributed,
    Concentrated,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Cooling {
    NaturalAir,
    ForcedAir,
    LiquidJacket,
    DirectOil,
}

impl Cooling {
    pub const NAMES: [&'static str; 4] =
        ["natural_air", "forced_air", "liquid_jacket", "direct_oil"];
    pub const ALL: [Cooling; 4] = [
        Cooling::NaturalAir,
        Cooling::ForcedAir,
        Cooling::LiquidJacket,
        Cooling::DirectOil,
    ];
    pub fn as_str(self) -> &'static str {
        Self::NAMES[self as usize]
    }
    pub fn is_liquid(self) -> bool {
        matches!(self, Cooling::LiquidJacket | Cooling::DirectOil)
    }
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SteelLoss {
    pub hysteresis_w_per_kg_hz_t2: f64,
    pub eddy_w_per_kg_hz2_t2: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RadialSizing {
    pub mode: SizingMode,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bore_diameter_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub active_length_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub aspect_ratio: Option<f64>,
    #[serde(flatten)]
    pub common: SizingCommon,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AxialSizing {
    pub variant: AxialVariant,
    pub mode: SizingMode,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub outer_radius_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub inner_outer_ratio: Option<f64>,
    #[serde(flatten)]
    pub common: SizingCommon,
}

/// Inputs shared by both sizing models; every `None` takes the engine.md default.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct SizingCommon {
    pub pole_pairs: u32,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slot_count: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub winding: Option<Winding>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cooling: Option<Cooling>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub electric_loading_a_per_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub current_density_a_per_mm2: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub airgap_flux_density_t: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fill_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub winding_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tooth_flux_density_t: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub yoke_flux_density_t: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stacking_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub airgap_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub carter_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub pole_arc_ratio: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub remanence_t: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub recoil_permeability: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub remanence_temp_coeff_per_k: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub magnet_max_temp_c: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub steel_grade: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub steel_loss: Option<SteelLoss>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub insulation_class: Option<InsulationClass>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub structure_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub overload_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tip_speed_limit_m_s: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_speed_rpm: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub base_speed_rpm: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub build_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub steel_conductivity_s_per_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub end_winding_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bearing_torque_fraction: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub emf_bus_fraction: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub convection_w_per_m2k: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fin_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub liner_conductance_w_per_m2k: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub housing_radial_allowance_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub housing_axial_allowance_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub hub_inertia_factor: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub hot_spot_allowance_k: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Scoring {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub objectives: Option<Vec<String>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub weights: Option<BTreeMap<String, f64>>,
}
