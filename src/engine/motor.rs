//! The motor model every candidate becomes for the integrator (engine.md §3): ratings,
//! torque capability, losses at (T, ω, θ_w, θ_m), thermal network, limits, mass, envelope.

use super::materials::{CU_ALPHA_PER_K, copper_resistivity};
use super::thermal::{OneNode, TwoNode};

/// Loss model of a motor.
#[derive(Debug, Clone, PartialEq)]
pub enum LossModel {
    /// Datasheet fit P = k_c·T²·r(θ_w) + k_h·ω + k_e·ω² + k_0 (§3.1).
    Fitted {
        k_c: f64,
        k_h: f64,
        k_e: f64,
        k_0: f64,
        /// Winding temperature the data refers to, °C.
        theta_ref_c: f64,
    },
    /// Sized-motor physics (§3.4).
    Sized(SizedLosses),
}

/// Per-design constants of a sized motor's losses.
#[derive(Debug, Clone, PartialEq)]
pub struct SizedLosses {
    /// J²·V_cu/T_r², so that P_cu = ρ_Cu(θ)·cu_k·(T/b)², m·A²/(N·m)²… in W/(Ω·m·(N·m)²).
    pub cu_k: f64,
    /// Iron loss at b = 1: P_fe = b²·(iron_h·f + iron_e·f²), W/Hz and W/Hz².
    pub iron_h: f64,
    pub iron_e: f64,
    pub pole_pairs: f64,
    /// Bearing friction torque, N·m.
    pub bearing_torque_nm: f64,
    /// Windage: free discs (each counted with both faces) and the radial gap cylinder.
    pub disc_radii_m: Vec<f64>,
    pub cylinder: Option<GapCylinder>,
    /// Remanence temperature coefficient, 1/K.
    pub alpha_br: f64,
    /// Line-line back-EMF constant: E_rms at base speed with 20 °C magnets, V.
    pub e_rms_base_v: f64,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GapCylinder {
    pub radius_m: f64,
    pub length_m: f64,
    pub gap_m: f64,
}

/// Thermal network of a motor.
#[derive(Debug, Clone, PartialEq)]
pub enum ThermalModel {
    OneNode(OneNode),
    TwoNode(TwoNode),
}

/// Where the coolant sink sits.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Sink {
    /// ISA air at the step's altitude.
    Air,
    /// A liquid at a fixed inlet temperature, °C.
    Liquid(f64),
}

/// How phase current is found.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum CurrentModel {
    None,
    /// I_rms = T/k_t
    TorqueConstant(f64),
    /// I_rms = (P_m + P_loss)/(3·E_rms)
    BackEmf,
}

/// Everything the integrator needs about one motor.
#[derive(Debug, Clone, PartialEq)]
pub struct MotorModel {
    pub rated_torque_nm: f64,
    pub peak_torque_nm: f64,
    pub base_speed_rad_s: f64,
    pub max_speed_rad_s: f64,
    /// Continuous and peak power for specific-power figures, W.
    pub continuous_power_w: f64,
    pub max_power_w: f64,
    pub mass_kg: f64,
    pub rotor_inertia_kg_m2: Option<f64>,
    pub envelope_diameter_m: Option<f64>,
    pub envelope_length_m: Option<f64>,
    /// Winding limit (class − hot-spot allowance) and magnet limit, °C.
    pub winding_limit_c: f64,
    pub magnet_limit_c: Option<f64>,
    pub losses: LossModel,
    pub thermal: ThermalModel,
    pub sink: Sink,
    pub current: CurrentModel,
    /// Datasheet overload rule: continuous power (W) and the permitted peak duration (s).
    pub overload: Option<(f64, f64)>,
    /// Sizing outputs and masses by part, for the result's `geometry` object.
    pub geometry: Vec<(&'static str, Geo)>,
}

/// A value of the result's `geometry` object, kept without allocation until reported.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Geo {
    Num(f64),
    Text(&'static str),
    Null,
}

impl Geo {
    pub fn to_json(self) -> serde_json::Value {
        match self {
            Geo::Num(x) => serde_json::json!(x),
            Geo::Text(t) => serde_json::json!(t),
            Geo::Null => serde_json::Value::Null,
        }
    }
}

/// Loss split of one operating point, W.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Losses {
    pub copper_w: f64,
    pub iron_w: f64,
    pub mechanical_w: f64,
}

impl Losses {
    pub fn total(&self) -> f64 {
        self.copper_w + self.iron_w + self.mechanical_w
    }
}

impl MotorModel {
    /// A numeric geometry output by name.
    pub fn geo(&self, key: &str) -> Option<f64> {
        self.geometry
            .iter()
            .find(|(k, _)| *k == key)
            .and_then(|(_, v)| match v {
                Geo::Num(x) => Some(*x),
                _ => None,
            })
    }

    /// Torque capability T_max(ω) = T_pk·min(1, ω_b/ω), N·m.
    pub fn torque_capability(&self, omega: f64) -> f64 {
        if omega <= self.base_speed_rad_s {
            self.peak_torque_nm
        } else {
            self.peak_torque_nm * self.base_speed_rad_s / omega
        }
    }

    /// Continuous torque: rated torque up to base speed, constant power above it (sized
    /// motors); min(T_r, P_cont/ω) for datasheet motors. N·m.
    pub fn continuous_torque(&self, omega: f64) -> f64 {
        let knee = match self.overload {
            Some(_) => self.continuous_power_w / self.rated_torque_nm,
            None => self.base_speed_rad_s,
        };
        if omega <= knee {
            self.rated_torque_nm
        } else {
            self.rated_torque_nm * knee / omega
        }
    }

    /// Motor efficiency at an operating point with sea-level ISA air for the windage;
    /// `None` outside the torque or speed capability.
    pub fn efficiency_at(
        &self,
        torque_nm: f64,
        omega: f64,
        winding_c: f64,
        magnet_c: f64,
    ) -> Option<f64> {
        if torque_nm <= 0.0
            || omega <= 0.0
            || omega > self.max_speed_rad_s
            || torque_nm > self.torque_capability(omega)
        {
            return None;
        }
        let air = super::atmosphere::air(0.0, 0.0);
        let l = self.losses(
            torque_nm,
            omega,
            winding_c,
            magnet_c,
            air.density_kg_m3,
            air.kinematic_viscosity_m2_s(),
        );
        let p = torque_nm * omega;
        Some(p / (p + l.total()))
    }

    /// Magnet flux factor b = 1 + α_Br(θ_m − 20), floored at 0.1, with θ_m capped.
    pub fn flux_factor(&self, theta_m_c: f64) -> f64 {
        match &self.losses {
            LossModel::Sized(s) => {
                let cap = self.magnet_limit_c.unwrap_or(f64::INFINITY);
                (1.0 + s.alpha_br * (theta_m_c.min(cap) - 20.0)).max(0.1)
            }
            LossModel::Fitted { .. } => 1.0,
        }
    }

    /// Losses at torque T (N·m), speed ω (rad/s), winding and magnet temperatures (°C),
    /// air density ρ (kg/m³) and kinematic viscosity ν (m²/s). Temperatures are capped at
    /// their limits so that an overloaded motor stays finite (§3.4).
    pub fn losses(
        &self,
        torque: f64,
        omega: f64,
        theta_w: f64,
        theta_m: f64,
        rho: f64,
        nu: f64,
    ) -> Losses {
        let theta_w = theta_w.min(self.winding_limit_c);
        match &self.losses {
            LossModel::Fitted {
                k_c,
                k_h,
                k_e,
                k_0,
                theta_ref_c,
            } => Losses {
                copper_w: k_c * torque * torque * resistance_ratio(theta_w, *theta_ref_c),
                iron_w: k_h * omega + k_e * omega * omega,
                mechanical_w: *k_0,
            },
            LossModel::Sized(s) => {
                let b = self.flux_factor(theta_m);
                let f = s.pole_pairs * omega / (2.0 * std::f64::consts::PI);
                let tb = torque / b;
                Losses {
                    copper_w: copper_resistivity(theta_w) * s.cu_k * tb * tb,
                    iron_w: b * b * (s.iron_h * f + s.iron_e * f * f),
                    mechanical_w: s.bearing_torque_nm * omega
                        + rho * windage_per_density(s, omega, nu),
                }
            }
        }
    }
}

/// r(θ) = (1 + α_Cu(θ − 20))/(1 + α_Cu(θ_ref − 20)).
pub fn resistance_ratio(theta_c: f64, theta_ref_c: f64) -> f64 {
    (1.0 + CU_ALPHA_PER_K * (theta_c - 20.0)) / (1.0 + CU_ALPHA_PER_K * (theta_ref_c - 20.0))
}

/// Windage power divided by air density, W/(kg/m³).
/// Free disc, both faces: torque ½·C_M·ρ·ω²·R⁵, C_M = 0.146·Re^(−1/5), Re = ωR²/ν
/// (von Kármán's turbulent free-disc coefficient; from memory: Schlichting, Boundary-Layer
/// Theory). Gap cylinder: P = π·C_f·ρ·ω³·r⁴·L, C_f = 0.0325·Re_g^(−0.2), Re_g = ω·r·g/ν
/// (from memory).
pub fn windage_per_density(s: &SizedLosses, omega: f64, nu: f64) -> f64 {
    if omega <= 0.0 {
        return 0.0;
    }
    let mut p = 0.0;
    for &r in &s.disc_radii_m {
        let re = omega * r * r / nu;
        let cm = 0.146 * re.powf(-0.2);
        p += 0.5 * cm * omega.powi(3) * r.powi(5);
    }
    if let Some(c) = s.cylinder {
        let re = omega * c.radius_m * c.gap_m / nu;
        let cf = 0.0325 * re.powf(-0.2);
        p += std::f64::consts::PI * cf * omega.powi(3) * c.radius_m.powi(4) * c.length_m;
    }
    p
}
