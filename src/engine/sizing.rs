//! Inputs of the sizing models resolved against engine.md's defaults (§3.2, §3.3, §5),
//! with every default that was taken recorded as an assumption.

use super::assume::Assumptions;
use super::materials::insulation_class_temp_c;
use super::steel::{self, LossCoefficients};
use super::study::{Cooling, InsulationClass, SizingCommon, Winding};

/// The cooling-class table of §5: h (W/m²K), fin factor, default A (A/m) and J (A/mm²).
/// Assumptions, each h within Incropera's Table 1.1 ranges.
pub fn cooling_table(c: Cooling) -> (f64, f64, f64, f64) {
    match c {
        Cooling::NaturalAir => (15.0, 1.5, 25_000.0, 3.5),
        Cooling::ForcedAir => (33.0, 1.5, 45_000.0, 6.0),
        Cooling::LiquidJacket => (300.0, 1.0, 80_000.0, 11.0),
        Cooling::DirectOil => (1500.0, 1.0, 100_000.0, 14.0),
    }
}

/// Resolved sizing inputs (SI units; J in A/m²).
#[derive(Debug, Clone, PartialEq)]
pub struct SizingParams {
    pub pole_pairs: f64,
    pub slots: f64,
    pub winding: Winding,
    pub cooling: Cooling,
    pub electric_loading: f64,
    pub current_density: f64,
    pub b_gap: f64,
    pub fill: f64,
    pub k_w: f64,
    pub b_tooth: f64,
    pub b_yoke: f64,
    pub k_fe: f64,
    pub gap: f64,
    pub carter: f64,
    pub pole_arc: f64,
    pub br: f64,
    pub mu_r: f64,
    pub alpha_br: f64,
    pub magnet_max_c: f64,
    pub steel: LossCoefficients,
    pub insulation: InsulationClass,
    pub winding_limit_c: f64,
    pub structure_factor: f64,
    pub overload_factor: f64,
    pub tip_speed: f64,
    pub user_max_speed_rpm: Option<f64>,
    pub user_base_speed_rpm: Option<f64>,
    pub build_factor: f64,
    pub end_winding_factor: f64,
    pub bearing_fraction: f64,
    pub emf_fraction: f64,
    pub h_conv: f64,
    pub fin: f64,
    pub h_liner: f64,
    pub housing_radial: f64,
    pub housing_axial: f64,
    pub hub_factor: f64,
}

impl SizingParams {
    /// Flat-top magnet field in the gap, B_m = B̂_g·π/(4·sin(α_p·π/2)), T.
    pub fn magnet_field(&self) -> f64 {
        self.b_gap * std::f64::consts::PI
            / (4.0 * (self.pole_arc * std::f64::consts::FRAC_PI_2).sin())
    }
    /// Magnet thickness h_m = μ_r·k_c·g·B_m/(Br − B_m), m.
    pub fn magnet_thickness(&self) -> f64 {
        let bm = self.magnet_field();
        self.mu_r * self.carter * self.gap * bm / (self.br - bm)
    }
    /// Tooth fraction at the bore (radial) or inner radius (axial), f_t = B_m/(k_Fe·B_t).
    pub fn tooth_fraction(&self) -> f64 {
        self.magnet_field() / (self.k_fe * self.b_tooth)
    }
    /// Tangential stress σ = k_w·A·B̂_g/√2 (unity power factor, i_d = 0), Pa.
    pub fn shear_stress(&self) -> f64 {
        self.k_w * self.electric_loading * self.b_gap / std::f64::consts::SQRT_2
    }
}

/// Resolves the common sizing inputs; `default_winding` differs by topology.
/// Returns the steel-grade error message when a grade's classical loss exceeds its total.
pub fn resolve(
    c: &SizingCommon,
    default_winding: Winding,
    a: &mut Assumptions,
) -> Result<SizingParams, String> {
    let p = c.pole_pairs as f64;
    let winding = c.winding.unwrap_or_else(|| {
        a.note_with(|| format!("{} winding (default)", winding_name(default_winding)));
        default_winding
    });
    let cooling = c.cooling.unwrap_or_else(|| {
        a.note("forced_air cooling (default)");
        Cooling::ForcedAir
    });
    let (h, fin, a_def, j_def) = cooling_table(cooling);
    let cname = cooling.as_str();
    let concentrated = winding == Winding::Concentrated;
    let slots_def = if concentrated { 3.0 * p } else { 6.0 * p };
    let kw_def = if concentrated { 0.93 } else { 0.95 };
    let ke_def = if concentrated { 0.25 } else { 0.6 };
    let or =
        |a: &mut Assumptions, v: Option<f64>, d: f64, text: &str| a.or(v, d, || text.to_string());
    let slots = a.or(c.slot_count.map(f64::from), slots_def, || {
        format!("{slots_def} slots (default for the winding)")
    });
    let insulation = c.insulation_class.unwrap_or_else(|| {
        a.note("insulation class H (default)");
        InsulationClass::H
    });
    let hot_spot = or(
        a,
        c.hot_spot_allowance_k,
        10.0,
        "hot-spot allowance 10 K (default)",
    );
    let sigma = or(
        a,
        c.steel_conductivity_s_per_m,
        steel::DEFAULT_CONDUCTIVITY_S_M,
        "lamination conductivity 1.9e6 S/m (default)",
    );
    let steel = steel_coefficients(c, sigma, a)?;
    Ok(SizingParams {
        pole_pairs: p,
        slots,
        winding,
        cooling,
        electric_loading: a.or(c.electric_loading_a_per_m, a_def, || {
            format!("electric loading {} kA/m ({cname} default)", a_def / 1000.0)
        }),
        current_density: 1e6
            * a.or(c.current_density_a_per_mm2, j_def, || {
                format!("current density {j_def} A/mm² ({cname} default)")
            }),
        b_gap: or(
            a,
            c.airgap_flux_density_t,
            0.9,
            "peak air-gap flux density 0.9 T (default)",
        ),
        fill: or(a, c.fill_factor, 0.45, "slot fill 0.45 (default)"),
        k_w: a.or(c.winding_factor, kw_def, || {
            format!("winding factor {kw_def} (default)")
        }),
        b_tooth: or(
            a,
            c.tooth_flux_density_t,
            1.7,
            "tooth flux density 1.7 T (default)",
        ),
        b_yoke: or(
            a,
            c.yoke_flux_density_t,
            1.5,
            "yoke flux density 1.5 T (default)",
        ),
        k_fe: or(a, c.stacking_factor, 0.95, "stacking factor 0.95 (default)"),
        gap: or(
            a,
            c.airgap_m,
            0.0015,
            "mechanical air gap incl. sleeve 1.5 mm (default)",
        ),
        carter: or(a, c.carter_factor, 1.1, "Carter factor 1.1 (default)"),
        pole_arc: or(a, c.pole_arc_ratio, 0.8, "pole-arc ratio 0.8 (default)"),
        br: or(
            a,
            c.remanence_t,
            1.25,
            "magnet remanence 1.25 T at 20 °C (default)",
        ),
        mu_r: or(
            a,
            c.recoil_permeability,
            1.05,
            "recoil permeability 1.05 (default)",
        ),
        alpha_br: or(
            a,
            c.remanence_temp_coeff_per_k,
            -0.0012,
            "remanence coefficient −0.12 %/K, NdFeB (default)",
        ),
        magnet_max_c: or(
            a,
            c.magnet_max_temp_c,
            150.0,
            "magnet maximum temperature 150 °C (default)",
        ),
        steel,
        insulation,
        winding_limit_c: insulation_class_temp_c(insulation) - hot_spot,
        structure_factor: or(
            a,
            c.structure_factor,
            1.35,
            "structure factor 1.35 × active mass (default)",
        ),
        overload_factor: or(a, c.overload_factor, 2.0, "overload factor 2.0 (default)"),
        tip_speed: or(
            a,
            c.tip_speed_limit_m_s,
            150.0,
            "rotor tip-speed limit 150 m/s (default)",
        ),
        user_max_speed_rpm: c.max_speed_rpm,
        user_base_speed_rpm: c.base_speed_rpm,
        build_factor: or(
            a,
            c.build_factor,
            1.5,
            "iron-loss build factor 1.5 (default)",
        ),
        end_winding_factor: a.or(c.end_winding_factor, ke_def, || {
            format!("end winding {ke_def} × pole pitch per end (default)")
        }),
        bearing_fraction: or(
            a,
            c.bearing_torque_fraction,
            0.001,
            "bearing friction 0.1 % of rated torque (default)",
        ),
        emf_fraction: or(
            a,
            c.emf_bus_fraction,
            0.9,
            "peak line back-EMF at base speed 90 % of the DC bus (default)",
        ),
        h_conv: a.or(c.convection_w_per_m2k, h, || {
            format!("convection {h} W/m²K ({cname} default)")
        }),
        fin: a.or(c.fin_factor, fin, || {
            format!("fin factor {fin} ({cname} default)")
        }),
        h_liner: or(
            a,
            c.liner_conductance_w_per_m2k,
            150.0,
            "slot liner conductance 150 W/m²K (default)",
        ),
        housing_radial: or(
            a,
            c.housing_radial_allowance_m,
            0.010,
            "housing radial allowance 10 mm (default)",
        ),
        housing_axial: or(
            a,
            c.housing_axial_allowance_m,
            0.015,
            "housing axial allowance 15 mm per end (default)",
        ),
        hub_factor: or(
            a,
            c.hub_inertia_factor,
            1.1,
            "rotor inertia × 1.1 for hub and fixings (default)",
        ),
    })
}

fn steel_coefficients(
    c: &SizingCommon,
    sigma: f64,
    a: &mut Assumptions,
) -> Result<LossCoefficients, String> {
    if let Some(l) = &c.steel_loss {
        return Ok(LossCoefficients {
            k_h: l.hysteresis_w_per_kg_hz_t2,
            k_e: l.eddy_w_per_kg_hz2_t2,
        });
    }
    let name = c.steel_grade.clone().unwrap_or_else(|| {
        a.note_with(|| format!("steel {} (default)", steel::DEFAULT_GRADE));
        steel::DEFAULT_GRADE.to_string()
    });
    let grade = steel::find_grade(&name).ok_or_else(|| format!("unknown steel grade {name}"))?;
    steel::grade_coefficients(grade, sigma)
        .ok_or_else(|| format!("the classical eddy loss of {name} alone exceeds its specified loss at this conductivity"))
}

fn winding_name(w: Winding) -> &'static str {
    match w {
        Winding::Distributed => "distributed",
        Winding::Concentrated => "concentrated",
    }
}
