//! Datasheet candidates (engine.md §3.1): ratings from the supplier's numbers, a loss model
//! fitted to the efficiency points (NNLS) or split from one point, and a one-node thermal
//! model calibrated self-consistently.

use super::assume::Assumptions;
use super::materials::insulation_class_temp_c;
use super::motor::{
    CurrentModel, Geo, LossModel, MotorModel, Sink, ThermalModel, resistance_ratio,
};
use super::nnls::nnls;
use super::study::{DatasheetSource, InsulationClass, Topology};
use super::thermal::OneNode;

const RPM: f64 = std::f64::consts::PI / 30.0;

/// The fitted or split loss coefficients and how they were found.
#[derive(Debug, Clone, PartialEq)]
pub struct LossFit {
    pub k_c: f64,
    pub k_h: f64,
    pub k_e: f64,
    pub k_0: f64,
    /// RMS error of the fit in efficiency (a fraction; ×100 for points), `None` for a split.
    pub rms_error: Option<f64>,
}

/// One (speed rad/s, torque N·m, efficiency) point.
type Point = (f64, f64, f64);

/// Fits P_loss = k_c·T² + k_h·ω + k_e·ω² + k_0 (at θ_ref) by non-negative least squares on
/// the watts P_loss = T·ω·(1/η − 1), when the points cover ≥ 3 points, ≥ 2 speeds and
/// ≥ 2 torques; `None` otherwise.
pub fn fit_losses(points: &[Point]) -> Option<LossFit> {
    let distinct = |f: fn(&Point) -> f64| {
        let mut v: Vec<f64> = points.iter().map(f).collect();
        v.sort_by(f64::total_cmp);
        v.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * b.abs().max(1.0));
        v.len()
    };
    if points.len() < 3 || distinct(|p| p.0) < 2 || distinct(|p| p.1) < 2 {
        return None;
    }
    let a: Vec<Vec<f64>> = points
        .iter()
        .map(|&(w, t, _)| vec![t * t, w, w * w, 1.0])
        .collect();
    let b: Vec<f64> = points
        .iter()
        .map(|&(w, t, e)| t * w * (1.0 / e - 1.0))
        .collect();
    let x = nnls(&a, &b, 4);
    let sq: f64 = points
        .iter()
        .map(|&(w, t, e)| {
            let loss = x[0] * t * t + x[1] * w + x[2] * w * w + x[3];
            let eta = t * w / (t * w + loss);
            (eta - e) * (eta - e)
        })
        .sum();
    Some(LossFit {
        k_c: x[0],
        k_h: x[1],
        k_e: x[2],
        k_0: x[3],
        rms_error: Some((sq / points.len() as f64).sqrt()),
    })
}

/// Builds the motor model of a datasheet candidate.
pub fn build(d: &DatasheetSource, a: &mut Assumptions) -> MotorModel {
    let w_cont = d.continuous_speed_rpm * RPM;
    let p_cont = d.continuous_power_kw * 1000.0;
    let p_peak = d.peak_power_kw * 1000.0;
    let t_rated = p_cont / w_cont;
    let t_peak = d.peak_torque_nm.unwrap_or(p_peak / w_cont);
    let base = p_peak / t_peak;
    let theta_ref = a.or(d.data_winding_temp_c, 100.0, || {
        "datasheet winding temperature 100 °C (default)".into()
    });
    let class = d.insulation_class.unwrap_or_else(|| {
        a.note("insulation class H (default)");
        InsulationClass::H
    });
    let allowance = a.or(d.hot_spot_allowance_k, 10.0, || {
        "hot-spot allowance 10 K (default)".into()
    });
    let tau = a.or(d.thermal_time_constant_s, 600.0, || {
        "thermal time constant 600 s (default)".into()
    });
    let ambient = a.or(d.rated_ambient_c, 40.0, || {
        "rated ambient 40 °C (default)".into()
    });
    let limit = insulation_class_temp_c(class) - allowance;

    let fit = loss_model(d, t_rated, w_cont, a);
    let loss_at = |t: f64, w: f64, theta: f64| {
        fit.k_c * t * t * resistance_ratio(theta, theta_ref)
            + fit.k_h * w
            + fit.k_e * w * w
            + fit.k_0
    };
    // Self-consistent one-node calibration: the rated point settles at the limit.
    let resistance = (limit - ambient) / loss_at(t_rated, w_cont, limit);
    a.note("one thermal node (the winding), every loss into it, sink ISA air");

    let current = match d.torque_constant_nm_per_a {
        Some(kt) => CurrentModel::TorqueConstant(kt),
        None => CurrentModel::None,
    };
    let topology = match d.topology {
        Topology::Radial => "radial",
        Topology::Axial => "axial",
    };
    let method = if fit.rms_error.is_some() {
        "nnls_fit"
    } else {
        "split"
    };
    let geometry = vec![
        ("topology", Geo::Text(topology)),
        ("loss_model", Geo::Text(method)),
        ("loss_k_copper_w_per_nm2", Geo::Num(fit.k_c)),
        ("loss_k_linear_w_s", Geo::Num(fit.k_h)),
        ("loss_k_quadratic_w_s2", Geo::Num(fit.k_e)),
        ("loss_k_constant_w", Geo::Num(fit.k_0)),
        (
            "loss_fit_rms_error",
            fit.rms_error.map_or(Geo::Null, Geo::Num),
        ),
        ("thermal_resistance_k_per_w", Geo::Num(resistance)),
        ("thermal_capacitance_j_per_k", Geo::Num(tau / resistance)),
    ];
    MotorModel {
        rated_torque_nm: t_rated,
        peak_torque_nm: t_peak,
        base_speed_rad_s: base,
        max_speed_rad_s: d.max_speed_rpm * RPM,
        continuous_power_w: p_cont,
        max_power_w: p_peak,
        mass_kg: d.mass_kg,
        rotor_inertia_kg_m2: d.rotor_inertia_kg_m2,
        envelope_diameter_m: d.envelope_diameter_m,
        envelope_length_m: d.envelope_length_m,
        winding_limit_c: limit,
        magnet_limit_c: None,
        losses: LossModel::Fitted {
            k_c: fit.k_c,
            k_h: fit.k_h,
            k_e: fit.k_e,
            k_0: fit.k_0,
            theta_ref_c: theta_ref,
        },
        thermal: ThermalModel::OneNode(OneNode {
            resistance,
            capacitance: tau / resistance,
        }),
        sink: Sink::Air,
        current,
        overload: Some((p_cont, d.peak_duration_s)),
        geometry,
    }
}

fn loss_model(d: &DatasheetSource, t_rated: f64, w_cont: f64, a: &mut Assumptions) -> LossFit {
    let mut points: Vec<Point> = vec![(w_cont, t_rated, d.continuous_efficiency)];
    let listed = d.efficiency_points.as_deref().unwrap_or(&[]);
    points.extend(
        listed
            .iter()
            .map(|p| (p.speed_rpm * RPM, p.torque_nm, p.efficiency)),
    );
    if let Some(fit) = fit_losses(&points) {
        a.note_with(|| {
            format!(
                "losses fitted to {} efficiency points (NNLS), RMS error {:.2} efficiency points",
                points.len(),
                100.0 * fit.rms_error.unwrap_or(0.0)
            )
        });
        return fit;
    }
    let loss = t_rated * w_cont * (1.0 / d.continuous_efficiency - 1.0);
    let (c, h, e, k) = match &d.loss_split {
        Some(s) => {
            a.note("continuous-point loss split as given in loss_split");
            (s.copper, s.iron_linear, s.iron_quadratic, s.constant)
        }
        None => {
            a.note("continuous-point loss split 60 % copper, 25 % ∝ω, 10 % ∝ω², 5 % constant (default)");
            (0.60, 0.25, 0.10, 0.05)
        }
    };
    if !listed.is_empty() {
        a.note_with(|| format!(
            "the {} listed efficiency points were not used: a fit needs ≥ 3 points over ≥ 2 speeds and ≥ 2 torques",
            listed.len()
        ));
    }
    LossFit {
        k_c: c * loss / (t_rated * t_rated),
        k_h: h * loss / w_cont,
        k_e: e * loss / (w_cont * w_cont),
        k_0: k * loss,
        rms_error: None,
    }
}
