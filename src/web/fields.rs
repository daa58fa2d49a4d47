//! The form fields of each study-format object: labels, units, defaults pre-filled on
//! new forms (engine defaults, or the demo aircraft's values for required inputs) and
//! typical ranges. Field names are the objects' JSON paths.

use super::forms::{Field, Kind};

const fn f(
    path: &'static str,
    label: &'static str,
    unit: &'static str,
    kind: Kind,
    default: &'static str,
    hint: &'static str,
) -> Field {
    Field {
        name: path,
        path,
        label,
        unit,
        kind,
        default,
        hint,
        required: false,
    }
}

const fn req(
    path: &'static str,
    label: &'static str,
    unit: &'static str,
    kind: Kind,
    default: &'static str,
    hint: &'static str,
) -> Field {
    Field {
        name: path,
        path,
        label,
        unit,
        kind,
        default,
        hint,
        required: true,
    }
}

use Kind::{Check, Integer, LongText, Number, Points, Text};

const BATTERY_MODES: &[&str] = &["sized", "fixed"];
const SEGMENT_KINDS: &[&str] = &[
    "taxi", "takeoff", "climb", "cruise", "descent", "loiter", "reserve",
];
const POWER_RULES: &[&str] = &["steady", "power_loading", "shaft_power"];
const TOPOLOGIES: &[&str] = &["radial", "axial"];
const SIZING_MODES: &[&str] = &["geometry", "size_to_mission"];
const AXIAL_VARIANTS: &[&str] = &["double_rotor", "single_sided"];
const WINDINGS: &[&str] = &["distributed", "concentrated"];
const COOLINGS: &[&str] = &["natural_air", "forced_air", "liquid_jacket", "direct_oil"];
const INSULATION: &[&str] = &["B", "F", "H", "N", "R"];
const STEELS: &[&str] = &["M270-35A", "thin-020"];

/// Study name, notes, aircraft and installation envelope (the study page's top form).
pub const STUDY_HEADER: &[Field] = &[
    req(
        "name",
        "Study name",
        "",
        Text,
        "",
        "shown in lists and exports",
    ),
    f("notes", "Notes", "", LongText, "", "free text"),
    req("aircraft.motor_count", "Motors", "", Integer, "2", "1–16"),
    req(
        "aircraft.airframe_mass_kg",
        "Airframe mass",
        "kg",
        Number,
        "330",
        "empty, without propulsion and battery",
    ),
    req(
        "aircraft.payload_kg",
        "Payload",
        "kg",
        Number,
        "180",
        "people and kit",
    ),
    req(
        "aircraft.max_takeoff_mass_kg",
        "Max takeoff mass",
        "kg",
        Number,
        "950",
        "limit checked by the mass closure",
    ),
    f(
        "aircraft.wing_area_m2",
        "Wing area",
        "m²",
        Number,
        "11",
        "needed by steady segments; 8–20 for light aircraft",
    ),
    f(
        "aircraft.aspect_ratio",
        "Aspect ratio",
        "",
        Number,
        "12",
        "needed by steady segments; 7–20",
    ),
    f(
        "aircraft.oswald_efficiency",
        "Oswald efficiency",
        "",
        Number,
        "0.82",
        "needed by steady segments; 0.7–0.9",
    ),
    f(
        "aircraft.cd0",
        "Zero-lift drag coefficient C_D0",
        "",
        Number,
        "0.024",
        "needed by steady segments; 0.015–0.04",
    ),
    f(
        "aircraft.isa_offset_k",
        "ISA temperature offset",
        "K",
        Number,
        "0",
        "−30 to +30",
    ),
    f(
        "aircraft.dc_bus_voltage_v",
        "DC bus voltage",
        "V",
        Number,
        "400",
        "default 400; 200–1000",
    ),
    f(
        "aircraft.inverter_efficiency",
        "Inverter efficiency",
        "",
        Number,
        "0.98",
        "0.95–0.99",
    ),
    f(
        "aircraft.inverter_specific_power_kw_per_kg",
        "Inverter specific power",
        "kW/kg",
        Number,
        "20",
        "10–30",
    ),
    f(
        "aircraft.coolant_inlet_temp_c",
        "Coolant inlet temperature",
        "°C",
        Number,
        "50",
        "30–70",
    ),
    f(
        "aircraft.gearbox_stage_efficiency",
        "Gearbox stage efficiency",
        "",
        Number,
        "",
        "blank: engine default; 0.97–0.99",
    ),
    f(
        "aircraft.gearbox_specific_torque_nm_per_kg",
        "Gearbox specific torque",
        "N·m/kg",
        Number,
        "",
        "blank: engine default",
    ),
    req(
        "aircraft.battery.mode",
        "Battery",
        "",
        Kind::Choice(BATTERY_MODES),
        "sized",
        "sized to the mission, or a fixed pack",
    ),
    req(
        "aircraft.battery.specific_energy_wh_per_kg",
        "Pack specific energy",
        "Wh/kg",
        Number,
        "200",
        "150–300",
    ),
    f(
        "aircraft.battery.mass_kg",
        "Pack mass (fixed battery)",
        "kg",
        Number,
        "",
        "required when the battery is fixed",
    ),
    f(
        "aircraft.battery.usable_fraction",
        "Usable fraction",
        "",
        Number,
        "0.9",
        "0.8–0.95",
    ),
    f(
        "aircraft.battery.end_of_life_fraction",
        "End-of-life capacity",
        "",
        Number,
        "0.8",
        "0.7–0.9",
    ),
    f(
        "aircraft.battery.discharge_efficiency",
        "Discharge efficiency",
        "",
        Number,
        "0.97",
        "0.95–0.99",
    ),
    f(
        "installation.max_diameter_m",
        "Max motor diameter",
        "m",
        Number,
        "",
        "installation envelope per motor; blank: none",
    ),
    f(
        "installation.max_length_m",
        "Max motor length",
        "m",
        Number,
        "",
        "installation envelope per motor; blank: none",
    ),
];

/// One mission segment row.
pub const SEGMENT: &[Field] = &[
    req("name", "Name", "", Text, "", "unique in the study"),
    req(
        "kind",
        "Kind",
        "",
        Kind::Choice(SEGMENT_KINDS),
        "cruise",
        "",
    ),
    req(
        "power.rule",
        "Power rule",
        "",
        Kind::Choice(POWER_RULES),
        "steady",
        "fill only the fields of the chosen rule",
    ),
    f(
        "power.tas_m_s",
        "True airspeed (steady)",
        "m/s",
        Number,
        "",
        "30–80",
    ),
    f(
        "power.climb_rate_m_s",
        "Climb rate (steady)",
        "m/s",
        Number,
        "",
        "default 0; −5 to 6",
    ),
    f(
        "power.prop_efficiency",
        "Propeller efficiency (steady)",
        "",
        Number,
        "",
        "0.7–0.88",
    ),
    f(
        "power.cd0_increment",
        "C_D0 increment (steady)",
        "",
        Number,
        "",
        "default 0",
    ),
    f(
        "power.w_per_kg",
        "Power loading (power_loading)",
        "W/kg",
        Number,
        "",
        "of takeoff mass; 100–160 for takeoff",
    ),
    f(
        "power.kw",
        "Shaft power, all motors (shaft_power)",
        "kW",
        Number,
        "",
        "e.g. 2–10 for taxi",
    ),
    f(
        "duration_s",
        "Duration",
        "s",
        Number,
        "",
        "give one of duration, distance, or an altitude change with a climb rate",
    ),
    f(
        "distance_m",
        "Distance (steady)",
        "m",
        Number,
        "",
        "t = distance / airspeed",
    ),
    f(
        "altitude_start_m",
        "Start altitude",
        "m",
        Number,
        "0",
        "−500 to 20000",
    ),
    f(
        "altitude_end_m",
        "End altitude",
        "m",
        Number,
        "",
        "blank: same as start",
    ),
    req(
        "prop_speed_rpm",
        "Propeller speed",
        "rpm",
        Number,
        "2200",
        "1000–3000 for direct-drive propellers",
    ),
    f(
        "idle_floor_kw",
        "Idle power floor",
        "kW",
        Number,
        "",
        "default 0",
    ),
    f(
        "oei",
        "Check with one motor inoperative",
        "",
        Check,
        "",
        "adds an OEI run of this segment",
    ),
    f(
        "oei_cd0_increment",
        "OEI C_D0 increment",
        "",
        Number,
        "",
        "default 0.002",
    ),
];

const DRIVE: [Field; 3] = [
    req("name", "Name", "", Text, "", "unique in the study"),
    f(
        "drive.gear_ratio",
        "Gear ratio",
        ":1",
        Number,
        "1",
        "1 = direct drive; 1.5–4 geared",
    ),
    f(
        "drive.gear_stages",
        "Gear stages",
        "",
        Integer,
        "",
        "default 1 when geared",
    ),
];

/// A candidate typed in from a supplier's datasheet.
pub const DATASHEET: &[Field] = &[
    DRIVE[0],
    DRIVE[1],
    DRIVE[2],
    req(
        "source.topology",
        "Topology",
        "",
        Kind::Choice(TOPOLOGIES),
        "radial",
        "",
    ),
    req("source.mass_kg", "Motor mass", "kg", Number, "", "5–60"),
    req(
        "source.continuous_power_kw",
        "Continuous power",
        "kW",
        Number,
        "",
        "per motor",
    ),
    req(
        "source.continuous_speed_rpm",
        "Speed of the continuous rating",
        "rpm",
        Number,
        "",
        "",
    ),
    req(
        "source.peak_power_kw",
        "Peak power",
        "kW",
        Number,
        "",
        "≥ continuous",
    ),
    req(
        "source.peak_duration_s",
        "Permitted peak duration",
        "s",
        Number,
        "",
        "30–300",
    ),
    req("source.max_speed_rpm", "Max speed", "rpm", Number, "", ""),
    req(
        "source.continuous_efficiency",
        "Efficiency at the continuous point",
        "",
        Number,
        "",
        "0.90–0.97",
    ),
    f(
        "source.efficiency_points",
        "Measured efficiency points",
        "",
        Points,
        "",
        "one per line: speed_rpm, torque_nm, efficiency",
    ),
    f(
        "source.data_winding_temp_c",
        "Winding temperature of the data",
        "°C",
        Number,
        "100",
        "default 100",
    ),
    f(
        "source.insulation_class",
        "Insulation class",
        "",
        Kind::Choice(INSULATION),
        "H",
        "default H",
    ),
    f(
        "source.thermal_time_constant_s",
        "Thermal time constant",
        "s",
        Number,
        "600",
        "default 600; 300–1800",
    ),
    f(
        "source.rated_ambient_c",
        "Rated ambient",
        "°C",
        Number,
        "40",
        "default 40",
    ),
    f(
        "source.peak_torque_nm",
        "Peak torque",
        "N·m",
        Number,
        "",
        "blank: peak power / continuous speed",
    ),
    f(
        "source.rotor_inertia_kg_m2",
        "Rotor inertia",
        "kg·m²",
        Number,
        "",
        "",
    ),
    f(
        "source.envelope_diameter_m",
        "Envelope diameter",
        "m",
        Number,
        "",
        "",
    ),
    f(
        "source.envelope_length_m",
        "Envelope length",
        "m",
        Number,
        "",
        "",
    ),
    f(
        "source.torque_constant_nm_per_a",
        "Torque constant",
        "N·m/A rms",
        Number,
        "",
        "for phase current",
    ),
    f(
        "source.hot_spot_allowance_k",
        "Hot-spot allowance",
        "K",
        Number,
        "10",
        "default 10",
    ),
];

macro_rules! sizing_common {
    () => {
        [
            req("source.pole_pairs", "Pole pairs", "", Integer, "", "2–16"),
            f(
                "source.slot_count",
                "Slots",
                "",
                Integer,
                "",
                "default 6p distributed, 3p concentrated",
            ),
            f(
                "source.winding",
                "Winding",
                "",
                Kind::Choice(WINDINGS),
                "",
                "default distributed (radial), concentrated (axial)",
            ),
            f(
                "source.cooling",
                "Cooling",
                "",
                Kind::Choice(COOLINGS),
                "forced_air",
                "default forced_air",
            ),
            f(
                "source.electric_loading_a_per_m",
                "Electric loading",
                "A/m rms",
                Number,
                "",
                "blank: cooling-class default; 20000–120000",
            ),
            f(
                "source.current_density_a_per_mm2",
                "Current density",
                "A/mm² rms",
                Number,
                "",
                "blank: cooling-class default; 3–25",
            ),
            f(
                "source.airgap_flux_density_t",
                "Air-gap flux density (peak)",
                "T",
                Number,
                "0.9",
                "default 0.9; 0.6–1.1",
            ),
            f(
                "source.fill_factor",
                "Slot fill factor",
                "",
                Number,
                "0.45",
                "default 0.45; 0.3–0.6",
            ),
            f(
                "source.tooth_flux_density_t",
                "Tooth flux density",
                "T",
                Number,
                "1.7",
                "default 1.7",
            ),
            f(
                "source.yoke_flux_density_t",
                "Yoke flux density",
                "T",
                Number,
                "1.5",
                "default 1.5",
            ),
            f(
                "source.airgap_m",
                "Mechanical air gap",
                "m",
                Number,
                "0.0015",
                "default 0.0015",
            ),
            f(
                "source.steel_grade",
                "Electrical steel",
                "",
                Kind::Choice(STEELS),
                "M270-35A",
                "default M270-35A",
            ),
            f(
                "source.insulation_class",
                "Insulation class",
                "",
                Kind::Choice(INSULATION),
                "H",
                "default H",
            ),
            f(
                "source.magnet_max_temp_c",
                "Magnet max temperature",
                "°C",
                Number,
                "150",
                "default 150",
            ),
            f(
                "source.structure_factor",
                "Structure factor",
                "",
                Number,
                "1.35",
                "default 1.35; total / active mass",
            ),
            f(
                "source.overload_factor",
                "Overload factor",
                "",
                Number,
                "2",
                "default 2; peak / rated torque",
            ),
            f(
                "source.tip_speed_limit_m_s",
                "Rotor tip-speed limit",
                "m/s",
                Number,
                "150",
                "default 150",
            ),
            f(
                "source.max_speed_rpm",
                "Max speed",
                "rpm",
                Number,
                "",
                "blank: tip-speed limit",
            ),
            f(
                "source.base_speed_rpm",
                "Base speed",
                "rpm",
                Number,
                "",
                "blank: 1.1 × highest mission speed",
            ),
            f(
                "source.hot_spot_allowance_k",
                "Hot-spot allowance",
                "K",
                Number,
                "10",
                "default 10",
            ),
        ]
    };
}

const SIZING: [Field; 20] = sizing_common!();

const fn join<const A: usize, const B: usize, const N: usize>(
    a: [Field; A],
    b: [Field; B],
) -> [Field; N] {
    let mut out = [a[0]; N];
    let mut i = 0;
    while i < A {
        out[i] = a[i];
        i += 1;
    }
    while i < N {
        out[i] = b[i - A];
        i += 1;
    }
    out
}

const RADIAL_OWN: [Field; 7] = [
    DRIVE[0],
    DRIVE[1],
    DRIVE[2],
    req(
        "source.mode",
        "Sizing mode",
        "",
        Kind::Choice(SIZING_MODES),
        "size_to_mission",
        "fixed geometry, or sized to the mission",
    ),
    f(
        "source.bore_diameter_m",
        "Bore diameter (geometry)",
        "m",
        Number,
        "",
        "0.08–0.35",
    ),
    f(
        "source.active_length_m",
        "Active length (geometry)",
        "m",
        Number,
        "",
        "0.04–0.3",
    ),
    f(
        "source.aspect_ratio",
        "Aspect ratio L/D (size to mission)",
        "",
        Number,
        "",
        "0.3–1.5",
    ),
];
const RADIAL_ALL: [Field; 27] = join(RADIAL_OWN, SIZING);
/// A radial-flux candidate sized by the engine.
pub const RADIAL: &[Field] = &RADIAL_ALL;

const AXIAL_OWN: [Field; 7] = [
    DRIVE[0],
    DRIVE[1],
    DRIVE[2],
    req(
        "source.variant",
        "Variant",
        "",
        Kind::Choice(AXIAL_VARIANTS),
        "double_rotor",
        "",
    ),
    req(
        "source.mode",
        "Sizing mode",
        "",
        Kind::Choice(SIZING_MODES),
        "size_to_mission",
        "fixed geometry, or sized to the mission",
    ),
    f(
        "source.outer_radius_m",
        "Outer radius (geometry)",
        "m",
        Number,
        "",
        "0.08–0.25",
    ),
    f(
        "source.inner_outer_ratio",
        "Inner / outer radius",
        "",
        Number,
        "0.6",
        "default 0.6; 0.5–0.7",
    ),
];
const AXIAL_ALL: [Field; 27] = join(AXIAL_OWN, SIZING);
/// An axial-flux candidate sized by the engine.
pub const AXIAL: &[Field] = &AXIAL_ALL;

/// The three candidate kinds: value of `source.kind`, title, fields.
pub const CANDIDATE_KINDS: [(&str, &str, &[Field]); 3] = [
    ("datasheet", "Datasheet motor", DATASHEET),
    ("radial_sizing", "Radial-flux motor (sized)", RADIAL),
    ("axial_sizing", "Axial-flux motor (sized)", AXIAL),
];

/// The fields of a candidate kind, if it is one.
pub fn candidate_fields(kind: &str) -> Option<(&'static str, &'static [Field])> {
    CANDIDATE_KINDS
        .iter()
        .find(|(k, _, _)| *k == kind)
        .map(|(_, t, f)| (*t, *f))
}
