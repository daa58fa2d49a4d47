//! Turning a flown, checked candidate into its result row (format.md).

use super::assume::Assumptions;
use super::checks;
use super::evaluate::{Run, StudyContext};
use super::fly::SegStats;
use super::motor::{CurrentModel, MotorModel};
use super::results::{CandidateResult, SegmentRow, Violation};
use super::study::{Candidate, SegmentKind, Source, Topology};
use serde_json::Map;

const TO_RPM: f64 = 30.0 / std::f64::consts::PI;

fn topology(cand: &Candidate) -> &'static str {
    match &cand.source {
        Source::Datasheet(d) if d.topology == Topology::Axial => "axial",
        Source::Datasheet(_) | Source::RadialSizing(_) => "radial",
        Source::AxialSizing(_) => "axial",
    }
}

fn ratio(num: f64, den: f64) -> f64 {
    if den > 0.0 { num / den } else { 0.0 }
}

fn row(ctx: &StudyContext, i: usize, s: &SegStats, current: bool) -> SegmentRow {
    let g = &ctx.grid.segments[i];
    let t = s.duration_s;
    SegmentRow {
        name: g.name.clone(),
        kind: g.kind.as_str().to_string(),
        duration_s: t,
        shaft_power_kw_per_motor: ratio(s.shaft_j, t) / 1000.0,
        motor_speed_rpm: s.omega * TO_RPM,
        motor_torque_nm: ratio(s.torque_ns, t),
        peak_torque_nm: s.max_torque_nm,
        torque_capability_nm: s.capability_nm,
        motor_efficiency: ratio(s.shaft_j, s.input_j),
        copper_loss_w: ratio(s.copper_j, t),
        iron_loss_w: ratio(s.iron_j, t),
        mechanical_loss_w: ratio(s.mech_j, t),
        inverter_loss_w: ratio(s.elec_j / s.motors - s.input_j, t),
        electric_power_kw: ratio(s.elec_j, t) / 1000.0,
        battery_energy_kwh: s.battery_j / 3.6e6,
        end_winding_temp_c: s.end_winding_c,
        peak_winding_temp_c: s.peak_winding_c,
        end_stator_temp_c: s.end_stator_c,
        peak_stator_temp_c: s.peak_stator_c,
        peak_phase_current_a: current.then_some(std::f64::consts::SQRT_2 * s.max_current_a),
    }
}

/// The result row of a candidate flown and checked at its final size.
pub fn assemble(
    ctx: &StudyContext,
    cand: &Candidate,
    model: &MotorModel,
    run: &Run,
    sized_binding: Option<String>,
    mut a: Assumptions,
) -> CandidateResult {
    let f = &run.flight;
    let c = &run.closure;
    let n = ctx.grid.motor_count as f64;
    // Lean rows (quiet assumptions: sweeps) carry the verdict and binding check but not
    // the violation list, whose messages are the costliest text of a row.
    let detail = !a.is_quiet();
    let feasible = !run.outcomes.iter().any(|o| o.failed());
    let violations = if detail {
        checks::violations(&run.outcomes, &ctx.grid)
    } else {
        Vec::new()
    };
    let binding = match (feasible, sized_binding) {
        (true, Some(label)) => Some(label),
        _ => checks::binding(&run.outcomes, |_| true).map(|o| o.label(&ctx.grid)),
    };
    let all = f.nominal.iter().chain(f.oei.iter().map(|(_, s)| s));
    if all.clone().any(|s| s.floor_applied) {
        a.note("power raised to the idle floor where the demand fell below it: regeneration is not modelled");
    }
    let has_current = model.current != CurrentModel::None;
    let peak_current = all.clone().map(|s| s.max_current_a).fold(0.0, f64::max);
    let torque_margin = all
        .clone()
        .filter(|s| s.max_torque_nm > 0.0)
        .map(|s| s.capability_nm / s.max_torque_nm)
        .reduce(f64::min);
    // The segment sums in one pass, each added in segment order from −0.0 as `Iterator::sum`
    // would add it.
    let (mut cruise_in, mut cruise_shaft, mut reserve_j, mut shaft_j, mut input_j) =
        (-0.0, -0.0, -0.0, -0.0, -0.0);
    for (g, s) in ctx.grid.segments.iter().zip(&f.nominal) {
        match g.kind {
            SegmentKind::Cruise => {
                cruise_in += s.input_j;
                cruise_shaft += s.shaft_j;
            }
            SegmentKind::Reserve => reserve_j += s.battery_j,
            _ => {}
        }
        shaft_j += s.shaft_j;
        input_j += s.input_j;
    }
    let peak_winding = f
        .nominal
        .iter()
        .map(|s| s.peak_winding_c)
        .fold(f64::MIN, f64::max);
    let peak_stator = f
        .nominal
        .iter()
        .map(|s| s.peak_stator_c)
        .fold(f64::MIN, f64::max);
    let magnet_peak = model.magnet_limit_c.map(|_| peak_stator);
    let usable = c.parts.battery_kg * usable_j_per_kg(ctx);
    let fixed = ctx.study.aircraft.battery.mass_kg.is_some();
    let need_kwh = f.battery_j / 3.6e6;
    let margin_kwh = fixed.then(|| usable / 3.6e6 - need_kwh);
    let mass = model.mass_kg;
    CandidateResult {
        name: cand.name.clone(),
        kind: cand.source.kind_name().to_string(),
        topology: topology(cand).to_string(),
        feasible,
        violations,
        binding_constraint: binding,
        rated_torque_nm: model.rated_torque_nm,
        peak_torque_nm: model.peak_torque_nm,
        base_speed_rpm: model.base_speed_rad_s * TO_RPM,
        max_speed_rpm: model.max_speed_rad_s * TO_RPM,
        max_power_kw: model.max_power_w / 1000.0,
        motor_mass_kg: mass,
        inverter_mass_kg: c.parts.inverter_kg,
        gearbox_mass_kg: c.parts.gearbox_kg,
        propulsion_mass_kg: n * (mass + c.parts.inverter_kg + c.parts.gearbox_kg),
        battery_mass_kg: c.parts.battery_kg,
        takeoff_mass_kg: c.takeoff_mass_kg,
        closure_sum_of_parts_kg: c.parts.sum_kg,
        mission_energy_kwh: need_kwh,
        reserve_energy_kwh: reserve_j / 3.6e6,
        mission_motor_efficiency: ratio(shaft_j, input_j),
        cruise_motor_efficiency: (cruise_in > 0.0).then(|| cruise_shaft / cruise_in),
        mission_drive_efficiency: ratio(f.prop_j, f.battery_j),
        peak_winding_temp_c: peak_winding,
        peak_magnet_temp_c: magnet_peak,
        winding_margin_k: model.winding_limit_c - peak_winding,
        magnet_margin_k: model.magnet_limit_c.map(|l| l - peak_stator),
        torque_margin,
        specific_power_kw_per_kg: model.continuous_power_w / 1000.0 / mass,
        peak_specific_power_kw_per_kg: model.max_power_w / 1000.0 / mass,
        torque_density_nm_per_kg: model.rated_torque_nm / mass,
        rotor_inertia_kg_m2: model.rotor_inertia_kg_m2,
        peak_phase_current_a: has_current.then_some(std::f64::consts::SQRT_2 * peak_current),
        envelope_diameter_m: model.envelope_diameter_m,
        envelope_length_m: model.envelope_length_m,
        energy_margin_kwh: margin_kwh,
        energy_margin_pct: margin_kwh.map(|m| {
            if usable > 0.0 {
                100.0 * m / (usable / 3.6e6)
            } else {
                0.0
            }
        }),
        mass_closure_converged: c.converged,
        geometry: if detail {
            model
                .geometry
                .iter()
                .map(|(k, v)| (k.to_string(), v.to_json()))
                .collect()
        } else {
            Map::new()
        },
        segments: match detail {
            true => f
                .nominal
                .iter()
                .enumerate()
                .map(|(i, s)| row(ctx, i, s, has_current))
                .collect(),
            false => Vec::new(),
        },
        oei_segments: match detail {
            true => f
                .oei
                .iter()
                .map(|(i, s)| row(ctx, *i, s, has_current))
                .collect(),
            false => Vec::new(),
        },
        pareto_optimal: false,
        trade_score: None,
        rank: None,
        assumptions: a.notes,
    }
}

fn usable_j_per_kg(ctx: &StudyContext) -> f64 {
    let b = &ctx.study.aircraft.battery;
    b.specific_energy_wh_per_kg
        * 3600.0
        * b.usable_fraction.unwrap_or(0.9)
        * b.end_of_life_fraction.unwrap_or(0.8)
}

/// The row of a candidate that cannot be built at all: infeasible, with the reason as a
/// geometry violation; its figures are zero and carry no meaning.
pub fn unbuildable(
    ctx: &StudyContext,
    cand: &Candidate,
    message: String,
    a: Assumptions,
) -> CandidateResult {
    CandidateResult {
        name: cand.name.clone(),
        kind: cand.source.kind_name().to_string(),
        topology: topology(cand).to_string(),
        feasible: false,
        violations: vec![Violation {
            check: "geometry".into(),
            segment: None,
            oei: false,
            value: 1.0,
            limit: 0.0,
            message,
        }],
        binding_constraint: Some("geometry".into()),
        rated_torque_nm: 0.0,
        peak_torque_nm: 0.0,
        base_speed_rpm: 0.0,
        max_speed_rpm: 0.0,
        max_power_kw: 0.0,
        motor_mass_kg: 0.0,
        inverter_mass_kg: 0.0,
        gearbox_mass_kg: 0.0,
        propulsion_mass_kg: 0.0,
        battery_mass_kg: 0.0,
        takeoff_mass_kg: ctx.study.aircraft.max_takeoff_mass_kg,
        closure_sum_of_parts_kg: 0.0,
        mission_energy_kwh: 0.0,
        reserve_energy_kwh: 0.0,
        mission_motor_efficiency: 0.0,
        cruise_motor_efficiency: None,
        mission_drive_efficiency: 0.0,
        peak_winding_temp_c: 0.0,
        peak_magnet_temp_c: None,
        winding_margin_k: 0.0,
        magnet_margin_k: None,
        torque_margin: None,
        specific_power_kw_per_kg: 0.0,
        peak_specific_power_kw_per_kg: 0.0,
        torque_density_nm_per_kg: 0.0,
        rotor_inertia_kg_m2: None,
        peak_phase_current_a: None,
        envelope_diameter_m: None,
        envelope_length_m: None,
        energy_margin_kwh: None,
        energy_margin_pct: None,
        mass_closure_converged: false,
        geometry: Map::new(),
        segments: Vec::new(),
        oei_segments: Vec::new(),
        pareto_optimal: false,
        trade_score: None,
        rank: None,
        assumptions: a.notes,
    }
}
