//! ISA / U.S. Standard Atmosphere 1976, 0–20 km geopotential, with an ISA temperature
//! offset and Sutherland viscosity (engine.md §1).

/// Sea-level temperature, K (US76).
pub const T0_K: f64 = 288.15;
/// Sea-level pressure, Pa (US76).
pub const P0_PA: f64 = 101_325.0;
/// Troposphere lapse rate, K/m (US76).
pub const LAPSE_K_PER_M: f64 = -0.0065;
/// Specific gas constant of air, J/(kg·K) (US76: R*/M0 = 8.31432/0.0289644).
pub const R_AIR: f64 = 287.052_87;
/// Standard gravity, m/s² (US76).
pub const G0: f64 = 9.806_65;
/// Tropopause geopotential altitude, m.
pub const TROPOPAUSE_M: f64 = 11_000.0;
/// Isothermal layer temperature, K.
pub const T11_K: f64 = 216.65;
/// Lowest and highest altitudes the model accepts, m.
pub const MIN_ALT_M: f64 = -500.0;
pub const MAX_ALT_M: f64 = 20_000.0;

/// Air state at one altitude.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Air {
    pub temperature_k: f64,
    pub pressure_pa: f64,
    pub density_kg_m3: f64,
    /// Dynamic viscosity, Pa·s.
    pub viscosity_pa_s: f64,
}

impl Air {
    pub fn temperature_c(&self) -> f64 {
        self.temperature_k - 273.15
    }
    /// Kinematic viscosity ν = μ/ρ, m²/s.
    pub fn kinematic_viscosity_m2_s(&self) -> f64 {
        self.viscosity_pa_s / self.density_kg_m3
    }
}

/// ISA pressure at a geopotential (pressure) altitude, Pa.
pub fn isa_pressure_pa(h_m: f64) -> f64 {
    if h_m <= TROPOPAUSE_M {
        let t = T0_K + LAPSE_K_PER_M * h_m;
        P0_PA * (t / T0_K).powf(-G0 / (LAPSE_K_PER_M * R_AIR))
    } else {
        let p11 = isa_pressure_pa(TROPOPAUSE_M);
        p11 * (-G0 * (h_m - TROPOPAUSE_M) / (R_AIR * T11_K)).exp()
    }
}

/// ISA temperature at a geopotential altitude, K.
pub fn isa_temperature_k(h_m: f64) -> f64 {
    if h_m <= TROPOPAUSE_M {
        T0_K + LAPSE_K_PER_M * h_m
    } else {
        T11_K
    }
}

/// Sutherland's law μ = 1.458e-6·T^1.5/(T + 110.4), Pa·s.
pub fn sutherland_viscosity(t_k: f64) -> f64 {
    1.458e-6 * t_k.powf(1.5) / (t_k + 110.4)
}

/// The air at a pressure altitude with an ISA temperature offset ΔT (K): T = T_ISA + ΔT,
/// p = p_ISA, ρ = p/(R·T). The altitude must lie in −500…20 000 m (checked at input).
pub fn air(h_m: f64, isa_offset_k: f64) -> Air {
    let t = isa_temperature_k(h_m) + isa_offset_k;
    let p = isa_pressure_pa(h_m);
    Air {
        temperature_k: t,
        pressure_pa: p,
        density_kg_m3: p / (R_AIR * t),
        viscosity_pa_s: sutherland_viscosity(t),
    }
}
