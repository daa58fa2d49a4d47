//! Material constants and insulation classes used by the motor models.

use super::study::InsulationClass;

/// IACS copper resistivity at 20 °C, Ω·m (copper.org; IACS = 1/58 MS/m).
pub const CU_RESISTIVITY_20C: f64 = 1.7241e-8;
/// Copper resistance temperature coefficient at 20 °C, 1/K (IEC 60028).
pub const CU_ALPHA_PER_K: f64 = 0.00393;
/// Densities, kg/m³ (engine.md §3.2).
pub const CU_DENSITY: f64 = 8900.0;
pub const NDFEB_DENSITY: f64 = 7500.0;
/// Specific heats, J/(kg·K) (engine.md §5).
pub const CU_SPECIFIC_HEAT: f64 = 385.0;
pub const IRON_SPECIFIC_HEAT: f64 = 460.0;
pub const ALUMINIUM_SPECIFIC_HEAT: f64 = 900.0;

/// Copper resistivity ρ_Cu(θ) = 1.7241e-8·(1 + α_Cu(θ − 20)), Ω·m.
pub fn copper_resistivity(temp_c: f64) -> f64 {
    CU_RESISTIVITY_20C * (1.0 + CU_ALPHA_PER_K * (temp_c - 20.0))
}

/// IEC 60085 thermal class temperature, °C.
pub fn insulation_class_temp_c(class: InsulationClass) -> f64 {
    match class {
        InsulationClass::B => 130.0,
        InsulationClass::F => 155.0,
        InsulationClass::H => 180.0,
        InsulationClass::N => 200.0,
        InsulationClass::R => 220.0,
    }
}

/// Remanence at a temperature, Br(θ) = Br20·(1 + α_Br(θ − 20)), T.
pub fn remanence_at(br20_t: f64, alpha_per_k: f64, temp_c: f64) -> f64 {
    br20_t * (1.0 + alpha_per_k * (temp_c - 20.0))
}
