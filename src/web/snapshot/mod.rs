//! Views of one results snapshot (results-format JSON with the study file it came from):
//! candidate table, comparison, segment view, trade plot, minutes and diff. Everything
//! here is a pure function of the snapshot, so live pages and frozen reviews can share it;
//! no database, no HTTP.

pub mod diff;
pub mod minutes;
pub mod plot;
pub mod tables;

use serde_json::Value;

/// The caution every results page and the review minutes carry (app.md).
pub const CAUTION: &str = "Preliminary design estimates from simplified physical models and \
the inputs shown. Not for certification, flight or manufacture. Verify with detailed \
electromagnetic, thermal and structural analysis and with test; follow the airworthiness \
requirements that apply to your aircraft and your organisation's approved procedures. \
High-voltage systems and rotating machinery can injure or kill.";

/// Each candidate's key numbers at the snapshot, in the order minutes list them.
pub const KEY_METRICS: [(&str, &str); 11] = [
    ("feasible", "Feasible"),
    ("binding_constraint", "Binding constraint"),
    ("motor_mass_kg", "Motor mass [kg]"),
    ("propulsion_mass_kg", "Propulsion mass [kg]"),
    ("battery_mass_kg", "Battery mass [kg]"),
    ("takeoff_mass_kg", "Takeoff mass [kg]"),
    ("mission_energy_kwh", "Mission energy [kWh]"),
    ("mission_motor_efficiency", "Mission motor efficiency"),
    ("peak_winding_temp_c", "Peak winding temperature [°C]"),
    ("trade_score", "Trade score"),
    ("rank", "Rank"),
];

/// A frozen (or live) pair: the study file and its results, both as stored JSON.
#[derive(Debug, Clone)]
pub struct Snapshot {
    pub study: Value,
    pub results: Value,
}

impl Snapshot {
    /// The candidates' result objects in study order.
    pub fn candidates(&self) -> &[Value] {
        self.results
            .get("candidates")
            .and_then(Value::as_array)
            .map(Vec::as_slice)
            .unwrap_or(&[])
    }

    pub fn candidate_names(&self) -> Vec<String> {
        self.candidates().iter().map(name_of).collect()
    }

    /// The mission segment names in flight order.
    pub fn segment_names(&self) -> Vec<String> {
        self.study
            .get("segments")
            .and_then(Value::as_array)
            .map(|a| a.iter().map(name_of).collect())
            .unwrap_or_default()
    }

    /// The scoring objectives the results were ranked by.
    pub fn objectives(&self) -> Vec<String> {
        self.results
            .get("objectives")
            .and_then(Value::as_array)
            .map(|a| {
                a.iter()
                    .filter_map(Value::as_str)
                    .map(str::to_string)
                    .collect()
            })
            .unwrap_or_default()
    }
}

/// The `name` of a JSON object, or "".
pub fn name_of(v: &Value) -> String {
    v.get("name")
        .and_then(Value::as_str)
        .unwrap_or("")
        .to_string()
}

/// Display text of a result value: numbers rounded for reading, booleans as yes/no.
pub fn show(v: Option<&Value>) -> String {
    match v {
        None | Some(Value::Null) => "–".into(),
        Some(Value::Bool(b)) => (if *b { "yes" } else { "no" }).into(),
        Some(Value::String(s)) => s.clone(),
        Some(Value::Number(n)) => match n.as_f64() {
            Some(x) if n.is_f64() => format_number(x),
            _ => n.to_string(),
        },
        Some(other) => other.to_string(),
    }
}

/// Four significant figures at least, never scientific notation for readable ranges.
pub fn format_number(x: f64) -> String {
    let mag = x.abs();
    let decimals = if mag >= 1000.0 {
        0
    } else if mag >= 100.0 {
        1
    } else if mag >= 1.0 {
        2
    } else {
        4
    };
    format!("{x:.decimals$}")
}
