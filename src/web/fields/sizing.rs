//! Form fields of the engine-sized candidates, radial and axial: each kind's own
//! geometry fields followed by the loadings, materials and limits both share.

use super::datasheet::DRIVE;
use super::{INSULATION, f, req};
use crate::web::forms::{Field, Kind};
use Kind::{Integer, Number};

const SIZING_MODES: &[&str] = &["geometry", "size_to_mission"];
const AXIAL_VARIANTS: &[&str] = &["double_rotor", "single_sided"];
const WINDINGS: &[&str] = &["distributed", "concentrated"];
const COOLINGS: &[&str] = &["natural_air", "forced_air", "liquid_jacket", "direct_oil"];
const STEELS: &[&str] = &["M270-35A", "thin-020"];

/// Fields both sizing kinds share.
const SIZING: [Field; 20] = [
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
];

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
