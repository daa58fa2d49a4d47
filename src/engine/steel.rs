//! Electrical steel: EN 10106 / IEC 60404-8-4 grades and the two-term specific loss
//! p_fe(B, f) = k_h·f·B² + k_e·f²·B² (W/kg), engine.md §4.

use std::f64::consts::PI;

/// Mass density used for every lamination grade, kg/m³ (engine.md §3.2; the EN 10106
/// conventional densities of the built-in grades lie within 7600–7800).
pub const STEEL_DENSITY_KG_M3: f64 = 7650.0;

/// Default electrical conductivity of the laminations, S/m *(assumption)*.
pub const DEFAULT_CONDUCTIVITY_S_M: f64 = 1.9e6;

/// A built-in grade: its thickness and its specified loss at a reference point.
#[derive(Debug, Clone, Copy)]
pub struct Grade {
    pub name: &'static str,
    pub thickness_m: f64,
    pub ref_loss_w_kg: f64,
    pub ref_flux_t: f64,
    pub ref_freq_hz: f64,
}

const fn en10106(name: &'static str, thickness_mm: f64, loss_w_kg: f64) -> Grade {
    Grade {
        name,
        thickness_m: thickness_mm * 1e-3,
        ref_loss_w_kg: loss_w_kg,
        ref_flux_t: 1.5,
        ref_freq_hz: 50.0,
    }
}

/// Built-in grades. Names and losses follow the EN 10106 designation rule
/// (M ppp-tt A: ppp = 100 × max loss at 1.5 T, 50 Hz; tt = 100 × thickness in mm).
pub const GRADES: [Grade; 13] = [
    en10106("M235-35A", 0.35, 2.35),
    en10106("M250-35A", 0.35, 2.50),
    en10106("M270-35A", 0.35, 2.70),
    en10106("M300-35A", 0.35, 3.00),
    en10106("M330-35A", 0.35, 3.30),
    en10106("M270-50A", 0.50, 2.70),
    en10106("M330-50A", 0.50, 3.30),
    en10106("M400-50A", 0.50, 4.00),
    en10106("M470-50A", 0.50, 4.70),
    en10106("M600-50A", 0.50, 6.00),
    en10106("M800-50A", 0.50, 8.00),
    en10106("M800-65A", 0.65, 8.00),
    // A thin high-frequency grade: 0.20 mm, 15 W/kg at 1.0 T, 400 Hz (assumption, typical
    // of thin high-frequency grades).
    Grade {
        name: "thin-020",
        thickness_m: 0.20e-3,
        ref_loss_w_kg: 15.0,
        ref_flux_t: 1.0,
        ref_freq_hz: 400.0,
    },
];

pub const DEFAULT_GRADE: &str = "M270-35A";

pub fn grade_names() -> Vec<&'static str> {
    GRADES.iter().map(|g| g.name).collect()
}

pub fn find_grade(name: &str) -> Option<&'static Grade> {
    GRADES.iter().find(|g| g.name == name)
}

/// Loss coefficients of the two-term model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LossCoefficients {
    /// W/(kg·Hz·T²)
    pub k_h: f64,
    /// W/(kg·Hz²·T²)
    pub k_e: f64,
}

impl LossCoefficients {
    /// Specific loss p_fe(B, f), W/kg.
    pub fn specific_loss(&self, flux_t: f64, freq_hz: f64) -> f64 {
        let b2 = flux_t * flux_t;
        (self.k_h * freq_hz + self.k_e * freq_hz * freq_hz) * b2
    }
}

/// Classical eddy-current coefficient k_e = π²·σ·d²/(6·ρ_Fe), W/(kg·Hz²·T²)
/// (Bertotti 1988; any lamination text).
pub fn classical_eddy_coefficient(
    conductivity_s_m: f64,
    thickness_m: f64,
    density_kg_m3: f64,
) -> f64 {
    PI * PI * conductivity_s_m * thickness_m * thickness_m / (6.0 * density_kg_m3)
}

/// Coefficients of a grade: k_e classical, k_h so that p_fe equals the grade's loss at its
/// reference point. `None` when the classical part alone exceeds the grade's loss.
pub fn grade_coefficients(grade: &Grade, conductivity_s_m: f64) -> Option<LossCoefficients> {
    let k_e = classical_eddy_coefficient(conductivity_s_m, grade.thickness_m, STEEL_DENSITY_KG_M3);
    let b2 = grade.ref_flux_t * grade.ref_flux_t;
    let f = grade.ref_freq_hz;
    let eddy = k_e * f * f * b2;
    if eddy >= grade.ref_loss_w_kg {
        return None;
    }
    let k_h = (grade.ref_loss_w_kg - eddy) / (f * b2);
    Some(LossCoefficients { k_h, k_e })
}
