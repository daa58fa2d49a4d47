//! Form fields of one mission segment row.

use super::{f, req};
use crate::web::forms::{Field, Kind};
use Kind::{Check, Number, Text};

const SEGMENT_KINDS: &[&str] = &[
    "taxi", "takeoff", "climb", "cruise", "descent", "loiter", "reserve",
];
const POWER_RULES: &[&str] = &["steady", "power_loading", "shaft_power"];

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
