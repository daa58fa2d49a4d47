//! The result metrics that may be used as trade objectives, with their directions (§10).

/// Whether an objective is better small or large.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Direction {
    Minimise,
    Maximise,
}

/// Every objective name with its direction, in the order of engine.md §10.
pub const OBJECTIVES: [(&str, Direction); 22] = [
    ("motor_mass_kg", Direction::Minimise),
    ("propulsion_mass_kg", Direction::Minimise),
    ("battery_mass_kg", Direction::Minimise),
    ("takeoff_mass_kg", Direction::Minimise),
    ("mission_energy_kwh", Direction::Minimise),
    ("reserve_energy_kwh", Direction::Minimise),
    ("peak_winding_temp_c", Direction::Minimise),
    ("peak_magnet_temp_c", Direction::Minimise),
    ("peak_phase_current_a", Direction::Minimise),
    ("rotor_inertia_kg_m2", Direction::Minimise),
    ("envelope_diameter_m", Direction::Minimise),
    ("envelope_length_m", Direction::Minimise),
    ("mission_motor_efficiency", Direction::Maximise),
    ("cruise_motor_efficiency", Direction::Maximise),
    ("mission_drive_efficiency", Direction::Maximise),
    ("specific_power_kw_per_kg", Direction::Maximise),
    ("peak_specific_power_kw_per_kg", Direction::Maximise),
    ("torque_density_nm_per_kg", Direction::Maximise),
    ("winding_margin_k", Direction::Maximise),
    ("magnet_margin_k", Direction::Maximise),
    ("torque_margin", Direction::Maximise),
    ("energy_margin_kwh", Direction::Maximise),
];

/// Default objectives when a study names none.
pub const DEFAULT_OBJECTIVES: [&str; 2] = ["propulsion_mass_kg", "mission_energy_kwh"];

pub fn direction(name: &str) -> Option<Direction> {
    OBJECTIVES.iter().find(|(n, _)| *n == name).map(|(_, d)| *d)
}

pub fn names() -> Vec<&'static str> {
    OBJECTIVES.iter().map(|(n, _)| *n).collect()
}
