//! Form fields of a datasheet candidate, and the name and drive fields every
//! candidate kind starts with.

use super::{INSULATION, f, req};
use crate::web::forms::{Field, Kind};
use Kind::{Integer, Number, Points, Text};

const TOPOLOGIES: &[&str] = &["radial", "axial"];

/// Name and drive: the first fields of every candidate kind.
pub(super) const DRIVE: [Field; 3] = [
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
