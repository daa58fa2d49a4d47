//! Feasibility checks (engine.md §10): every (check, segment, OEI) outcome with its value,
//! limit and relative margin; violations; the binding constraint.

use super::closure::Closure;
use super::fly::{Flight, SegStats};
use super::mission::MissionGrid;
use super::motor::MotorModel;
use super::results::Violation;

/// Check names in the tie order of §10.
pub const CHECKS: [&str; 11] = [
    "torque",
    "speed",
    "winding_temperature",
    "magnet_temperature",
    "overload_duration",
    "envelope_diameter",
    "envelope_length",
    "mass_closure",
    "max_takeoff_mass",
    "energy_margin",
    "geometry",
];

/// Indices into [`CHECKS`], for the outcomes made per row.
mod ix {
    pub const TORQUE: usize = 0;
    pub const SPEED: usize = 1;
    pub const WINDING_TEMPERATURE: usize = 2;
    pub const MAGNET_TEMPERATURE: usize = 3;
    pub const OVERLOAD_DURATION: usize = 4;
    pub const ENVELOPE_DIAMETER: usize = 5;
    pub const ENVELOPE_LENGTH: usize = 6;
    pub const MASS_CLOSURE: usize = 7;
    pub const MAX_TAKEOFF_MASS: usize = 8;
    pub const ENERGY_MARGIN: usize = 9;
}

/// Checks that a larger motor eases (size-to-mission's first group, §9).
pub fn eased_by_size(check: &str) -> bool {
    matches!(
        check,
        "torque" | "winding_temperature" | "magnet_temperature" | "geometry"
    )
}

/// One evaluated check.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    pub check: usize,
    pub segment: Option<usize>,
    pub oei: bool,
    pub value: f64,
    pub limit: f64,
    /// A fixed message (geometry failures); the others are written by [`describe`] only
    /// when they are shown.
    pub message: Option<String>,
}

impl Outcome {
    pub fn name(&self) -> &'static str {
        CHECKS[self.check]
    }
    /// (limit − value)/|limit|; negative when violated.
    pub fn relative_margin(&self) -> f64 {
        (self.limit - self.value) / self.limit.abs().max(1e-12)
    }
    pub fn failed(&self) -> bool {
        self.value > self.limit
    }
    fn order(&self) -> (bool, usize, usize) {
        (self.oei, self.segment.unwrap_or(usize::MAX), self.check)
    }
    /// "torque, Takeoff, OEI"
    pub fn label(&self, grid: &MissionGrid) -> String {
        let mut s = self.name().to_string();
        if let Some(i) = self.segment {
            s.push_str(", ");
            s.push_str(&grid.segments[i].name);
        }
        if self.oei {
            s.push_str(", OEI");
        }
        s
    }
}

fn check_index(name: &str) -> usize {
    CHECKS
        .iter()
        .position(|c| *c == name)
        .unwrap_or(CHECKS.len() - 1)
}

fn where_(grid: &MissionGrid, seg: usize, oei: bool) -> String {
    let name = &grid.segments[seg].name;
    if oei {
        format!("in {name} (one motor out)")
    } else {
        format!("in {name}")
    }
}

/// Mission checks of one segment row, in tie order.
fn segment_outcomes(
    model: &MotorModel,
    seg: usize,
    oei: bool,
    s: &SegStats,
    out: &mut Vec<Outcome>,
) {
    let mut push = |check: usize, value: f64, limit: f64| {
        out.push(Outcome {
            check,
            segment: Some(seg),
            oei,
            value,
            limit,
            message: None,
        });
    };
    push(ix::TORQUE, s.max_torque_nm, s.capability_nm);
    let to_rpm = 30.0 / std::f64::consts::PI;
    push(ix::SPEED, s.omega * to_rpm, model.max_speed_rad_s * to_rpm);
    push(
        ix::WINDING_TEMPERATURE,
        s.peak_winding_c,
        model.winding_limit_c,
    );
    if let Some(lim) = model.magnet_limit_c {
        push(ix::MAGNET_TEMPERATURE, s.peak_stator_c, lim);
    }
    if let Some((_, permitted)) = model.overload {
        push(ix::OVERLOAD_DURATION, s.max_overload_s, permitted);
    }
}

/// The message of an outcome.
pub fn describe(o: &Outcome, grid: &MissionGrid) -> String {
    if let Some(m) = &o.message {
        return m.clone();
    }
    let at = o
        .segment
        .map(|i| where_(grid, i, o.oei))
        .unwrap_or_default();
    let (v, l) = (o.value, o.limit);
    match o.name() {
        "torque" => format!("torque demand reaches {v:.1} N·m {at}; capability {l:.1} N·m"),
        "speed" => format!("motor speed {v:.0} rpm {at}; maximum {l:.0} rpm"),
        "winding_temperature" => format!(
            "winding temperature reaches {v:.1} °C {at}; limit {l:.1} °C (insulation class less hot-spot allowance)"
        ),
        "magnet_temperature" => {
            format!("magnet temperature reaches {v:.1} °C {at}; limit {l:.1} °C")
        }
        "overload_duration" => {
            format!(
                "torque stays above the continuous rating for {v:.0} s {at}; the datasheet permits {l:.0} s"
            )
        }
        "envelope_diameter" => format!("envelope diameter {v:.3} m; installation allows {l:.3} m"),
        "envelope_length" => format!("envelope length {v:.3} m; installation allows {l:.3} m"),
        "mass_closure" => format!(
            "the takeoff mass does not close below 3 × the maximum takeoff mass; at {l:.1} kg the parts sum to {v:.1} kg"
        ),
        "max_takeoff_mass" => format!("takeoff mass {v:.1} kg; maximum {l:.1} kg"),
        "energy_margin" => {
            format!("the mission needs {v:.2} kWh; the battery holds {l:.2} kWh usable")
        }
        _ => "the motor cannot be built at this size".to_string(),
    }
}

/// Candidate-level inputs to the checks.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limits {
    pub max_diameter_m: Option<f64>,
    pub max_length_m: Option<f64>,
    pub mtom_kg: f64,
    /// Usable battery energy (fixed battery), J.
    pub usable_energy_j: Option<f64>,
}

/// Every check outcome of a flown candidate, in tie order.
pub fn outcomes(
    model: &MotorModel,
    flight: &Flight,
    closure: &Closure,
    lim: &Limits,
) -> Vec<Outcome> {
    let mut out = Vec::new();
    outcomes_into(model, flight, closure, lim, &mut out);
    out
}

/// [`outcomes`] into `out` (cleared first), so that a caller scoring many designs reuses
/// one buffer.
pub fn outcomes_into(
    model: &MotorModel,
    flight: &Flight,
    closure: &Closure,
    lim: &Limits,
    out: &mut Vec<Outcome>,
) {
    out.clear();
    out.reserve(5 * (flight.nominal.len() + flight.oei.len()) + 4);
    // Written in tie order (nominal rows by segment, then the candidate-level checks,
    // then the OEI rows), so that only the OEI rows, whose runs may come in any segment
    // order, need sorting: the same order as a stable sort of the whole.
    for (i, s) in flight.nominal.iter().enumerate() {
        segment_outcomes(model, i, false, s, out);
    }
    let mut push = |check: usize, value: f64, limit: f64| {
        out.push(Outcome {
            check,
            segment: None,
            oei: false,
            value,
            limit,
            message: None,
        });
    };
    if let (Some(v), Some(l)) = (model.envelope_diameter_m, lim.max_diameter_m) {
        push(ix::ENVELOPE_DIAMETER, v, l);
    }
    if let (Some(v), Some(l)) = (model.envelope_length_m, lim.max_length_m) {
        push(ix::ENVELOPE_LENGTH, v, l);
    }
    if closure.converged {
        push(ix::MAX_TAKEOFF_MASS, closure.takeoff_mass_kg, lim.mtom_kg);
    } else {
        push(ix::MASS_CLOSURE, closure.parts.sum_kg, lim.mtom_kg);
    }
    if let Some(usable) = lim.usable_energy_j {
        push(ix::ENERGY_MARGIN, flight.battery_j / 3.6e6, usable / 3.6e6);
    }
    let oei_from = out.len();
    for (i, s) in &flight.oei {
        segment_outcomes(model, *i, true, s, out);
    }
    debug_assert!(out[..oei_from].is_sorted_by_key(|o| o.order()));
    out[oei_from..].sort_by_key(|o| o.order());
}

/// A geometry failure as an outcome (size-to-mission: a scale at which the motor cannot be built).
pub fn geometry_outcome(message: String) -> Outcome {
    Outcome {
        check: check_index("geometry"),
        segment: None,
        oei: false,
        value: 1.0,
        limit: 0.0,
        message: Some(message),
    }
}

/// The failed outcomes as violations.
pub fn violations(outcomes: &[Outcome], grid: &MissionGrid) -> Vec<Violation> {
    outcomes
        .iter()
        .filter(|o| o.failed())
        .map(|o| Violation {
            check: o.name().to_string(),
            segment: o.segment.map(|i| grid.segments[i].name.clone()),
            oei: o.oei,
            value: o.value,
            limit: o.limit,
            message: describe(o, grid),
        })
        .collect()
}

/// The binding outcome: a failed mass closure; otherwise the smallest relative margin
/// (for an infeasible candidate, the largest relative exceedance); ties in tie order.
pub fn binding(outcomes: &[Outcome], filter: impl Fn(&Outcome) -> bool) -> Option<&Outcome> {
    if let Some(o) = outcomes
        .iter()
        .find(|o| o.check == ix::MASS_CLOSURE && o.failed())
    {
        return Some(o);
    }
    let mut best: Option<&Outcome> = None;
    for o in outcomes.iter().filter(|o| filter(o)) {
        if best.is_none_or(|b| o.relative_margin() < b.relative_margin()) {
            best = Some(o);
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_row_check_indices_name_their_checks() {
        for (i, name) in [
            (ix::TORQUE, "torque"),
            (ix::SPEED, "speed"),
            (ix::WINDING_TEMPERATURE, "winding_temperature"),
            (ix::MAGNET_TEMPERATURE, "magnet_temperature"),
            (ix::OVERLOAD_DURATION, "overload_duration"),
            (ix::ENVELOPE_DIAMETER, "envelope_diameter"),
            (ix::ENVELOPE_LENGTH, "envelope_length"),
            (ix::MASS_CLOSURE, "mass_closure"),
            (ix::MAX_TAKEOFF_MASS, "max_takeoff_mass"),
            (ix::ENERGY_MARGIN, "energy_margin"),
        ] {
            assert_eq!(CHECKS[i], name);
            assert_eq!(check_index(name), i);
        }
    }
}
