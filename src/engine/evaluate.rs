//! Scoring one candidate: build its motor model (or size it), close the mass, check it,
//! and assemble its result row.

use super::assume::Assumptions;
use super::checks::{self, Limits, Outcome};
use super::closure::{self, AircraftConst, Closure};
use super::datasheet;
use super::fly::{Drive, Flight, GROUP, Group, Prepared};
use super::mission::MissionGrid;
use super::motor::{MotorModel, Sink};
use super::results::CandidateResult;
use super::sized::SizedContext;
use super::sizing::{self, SizingParams};
use super::study::{AxialVariant, Candidate, Source, Study, Winding};
use super::{axial, radial, report, search};

const RPM: f64 = std::f64::consts::PI / 30.0;

/// What every candidate of a study shares.
pub struct StudyContext<'a> {
    pub study: &'a Study,
    pub grid: MissionGrid,
}

impl<'a> StudyContext<'a> {
    pub fn new(study: &'a Study) -> Self {
        StudyContext {
            study,
            grid: MissionGrid::new(study),
        }
    }
}

/// How a sizing candidate scales: the scale is D (radial, L = χ·D) or R_o (axial, fixed λ).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Shape {
    Radial { aspect: f64 },
    RadialFixed { length: f64 },
    Axial { variant: AxialVariant, lambda: f64 },
}

/// A sizing candidate ready to be built at any scale.
pub struct Scalable {
    pub params: SizingParams,
    pub shape: Shape,
    pub ctx: SizedContext,
}

impl Scalable {
    pub fn build(&self, scale: f64) -> Result<MotorModel, String> {
        match self.shape {
            Shape::Radial { aspect } => {
                radial::build(&self.params, scale, aspect * scale, &self.ctx)
            }
            Shape::RadialFixed { length } => radial::build(&self.params, scale, length, &self.ctx),
            Shape::Axial { variant, lambda } => Ok(axial::build(
                &self.params,
                variant,
                scale,
                lambda,
                &self.ctx,
            )),
        }
    }
    /// Scale at which the rated torque equals `t`.
    pub fn scale_for_torque(&self, t: f64) -> f64 {
        match self.shape {
            Shape::Radial { aspect } => radial::bore_for_torque(&self.params, t, aspect),
            Shape::RadialFixed { length } => {
                (2.0 * t / (self.params.shear_stress() * std::f64::consts::PI * length)).sqrt()
            }
            Shape::Axial { lambda, .. } => axial::radius_for_torque(&self.params, t, lambda),
        }
    }
}

/// Everything needed to fly and check a model of one candidate.
pub struct Evaluator<'a> {
    pub ctx: &'a StudyContext<'a>,
    pub drive: Drive,
    pub aircraft: AircraftConst,
    pub limits: Limits,
}

/// One flown and checked model.
pub struct Run {
    pub closure: Closure,
    pub flight: Flight,
    pub outcomes: Vec<Outcome>,
}

impl<'a> Evaluator<'a> {
    pub fn run(&self, model: &MotorModel) -> Run {
        let prep = Prepared::new(model, self.drive, &self.ctx.grid);
        let mut flight = Flight::default();
        let closure = closure::close(&self.ctx.grid, &prep, &self.aircraft, &mut flight);
        let outcomes = checks::outcomes(model, &flight, &closure, &self.limits);
        Run {
            closure,
            flight,
            outcomes,
        }
    }
}

/// Scores one candidate of the study (without the study-level Pareto and trade score).
pub fn evaluate(ctx: &StudyContext, cand: &Candidate) -> CandidateResult {
    evaluate_full(ctx, cand).0
}

/// Scores one candidate and returns its final motor model and drive as well (none when the
/// motor cannot be built).
pub fn evaluate_full(
    ctx: &StudyContext,
    cand: &Candidate,
) -> (CandidateResult, Option<MotorModel>, Drive) {
    evaluate_with(ctx, cand, Assumptions::default())
}

/// The metrics of a candidate without its per-segment rows, geometry or assumption texts:
/// the rows of a sweep. Every metric equals that of [`evaluate`].
pub fn evaluate_lean(ctx: &StudyContext, cand: &Candidate) -> CandidateResult {
    evaluate_with(ctx, cand, Assumptions::quiet()).0
}

fn evaluate_with(
    ctx: &StudyContext,
    cand: &Candidate,
    mut a: Assumptions,
) -> (CandidateResult, Option<MotorModel>, Drive) {
    let ev = evaluator(ctx, cand, &mut a);
    let drive = ev.drive;
    let (result, model) = match &cand.source {
        Source::Datasheet(d) => {
            let model = datasheet::build(d, &mut a);
            let run = ev.run(&model);
            (
                report::assemble(ctx, cand, &model, &run, None, a),
                Some(model),
            )
        }
        Source::RadialSizing(_) | Source::AxialSizing(_) => {
            match scalable(ctx, cand, &ev, &mut a) {
                Ok((sc, fixed)) => search::evaluate_sized(&ev, cand, &sc, fixed, a),
                Err(msg) => (report::unbuildable(ctx, cand, msg, a), None),
            }
        }
    };
    (result, model, drive)
}

fn evaluator<'a>(
    ctx: &'a StudyContext<'a>,
    cand: &Candidate,
    a: &mut Assumptions,
) -> Evaluator<'a> {
    let s = ctx.study;
    let ac = &s.aircraft;
    let ratio = cand
        .drive
        .as_ref()
        .and_then(|d| d.gear_ratio)
        .unwrap_or(1.0);
    let geared = ratio != 1.0;
    let gear_efficiency = if geared {
        let stages = cand.drive.as_ref().and_then(|d| d.gear_stages).unwrap_or(1);
        let eta = a.or(ac.gearbox_stage_efficiency, 0.98, || {
            "gearbox 98 % per stage (default)".into()
        });
        if ac.gearbox_specific_torque_nm_per_kg.is_none() {
            a.note("gearbox 60 N·m/kg of propeller torque (default)");
        }
        eta.powi(stages as i32)
    } else {
        1.0
    };
    let inverter_efficiency = a.or(ac.inverter_efficiency, 0.98, || {
        "inverter efficiency 98 % (default)".into()
    });
    if ac.inverter_specific_power_kw_per_kg.is_none() {
        a.note("inverter 20 kW/kg (default)");
    }
    let b = &ac.battery;
    let battery_efficiency = a.or(b.discharge_efficiency, 0.97, || {
        "battery discharge efficiency 97 % (default)".into()
    });
    if b.usable_fraction.is_none() {
        a.note("battery usable fraction 90 % (default)");
    }
    if b.end_of_life_fraction.is_none() {
        a.note("battery end-of-life fraction 80 % (default)");
    }
    oei_notes(s, a);
    let installation = s.installation.as_ref();
    let aircraft = AircraftConst::new(s, geared);
    Evaluator {
        ctx,
        drive: Drive {
            gear_ratio: ratio,
            gear_efficiency,
            inverter_efficiency,
            battery_efficiency,
            preflight_c: s.integration.as_ref().and_then(|i| i.preflight_temp_c),
            loss_scale: 1.0,
        },
        aircraft,
        limits: Limits {
            max_diameter_m: installation.and_then(|i| i.max_diameter_m),
            max_length_m: installation.and_then(|i| i.max_length_m),
            mtom_kg: ac.max_takeoff_mass_kg,
            usable_energy_j: b.mass_kg.map(|m| m * aircraft.usable_j_per_kg),
        },
    }
}

fn oei_notes(s: &Study, a: &mut Assumptions) {
    let flagged = s.segments.iter().any(|g| g.is_oei());
    if flagged && s.aircraft.motor_count < 2 {
        a.note("segments flagged oei ignored: the aircraft has one motor");
    } else if s.segments.iter().any(|g| {
        g.is_oei()
            && g.oei_cd0_increment.is_none()
            && matches!(g.power, super::study::PowerRule::Steady { .. })
    }) {
        a.note("one-motor-out drag increment ΔC_D0 0.002 (default)");
    }
}

/// The sizing candidate as a scalable design, and its fixed scale in geometry mode.
fn scalable(
    ctx: &StudyContext,
    cand: &Candidate,
    ev: &Evaluator,
    a: &mut Assumptions,
) -> Result<(Scalable, Option<f64>), String> {
    let (common, default_winding) = match &cand.source {
        Source::RadialSizing(r) => (&r.common, Winding::Distributed),
        Source::AxialSizing(x) => (&x.common, Winding::Concentrated),
        Source::Datasheet(_) => unreachable!("datasheet candidates are not scalable"),
    };
    let params = sizing::resolve(common, default_winding, a)?;
    let highest = ctx
        .grid
        .segments
        .iter()
        .map(|g| g.prop_omega * ev.drive.gear_ratio)
        .fold(0.0, f64::max);
    let base = match params.user_base_speed_rpm {
        Some(rpm) => rpm * RPM,
        None => {
            a.note("base speed 1.1 × the highest motor speed of the mission (default)");
            1.1 * highest
        }
    };
    let sink = if params.cooling.is_liquid() {
        let t = a.or(ctx.study.aircraft.coolant_inlet_temp_c, 50.0, || {
            "coolant inlet 50 °C (default)".into()
        });
        Sink::Liquid(t)
    } else {
        Sink::Air
    };
    a.note("magnet temperature taken as the stator node");
    let sized_ctx = SizedContext {
        base_speed_rad_s: base,
        dc_bus_v: ctx.study.aircraft.dc_bus_voltage_v.unwrap_or(400.0),
        sink,
    };
    let (shape, fixed) = match &cand.source {
        Source::RadialSizing(r) => match (r.bore_diameter_m, r.active_length_m, r.aspect_ratio) {
            (Some(d), Some(l), _) => (Shape::RadialFixed { length: l }, Some(d)),
            (_, _, aspect) => (
                Shape::Radial {
                    aspect: aspect.unwrap_or(1.0),
                },
                None,
            ),
        },
        Source::AxialSizing(x) => {
            let lambda = a.or(x.inner_outer_ratio, 0.6, || {
                "inner/outer ratio 0.6 (default)".into()
            });
            (
                Shape::Axial {
                    variant: x.variant,
                    lambda,
                },
                x.outer_radius_m,
            )
        }
        Source::Datasheet(_) => unreachable!("datasheet candidates are not scalable"),
    };
    Ok((
        Scalable {
            params,
            shape,
            ctx: sized_ctx,
        },
        fixed,
    ))
}

/// Scores a candidate with a given motor model (a design frozen at its nominal size), its
/// losses scaled by `loss_scale`; used by the robustness samples.
pub fn evaluate_frozen(
    ctx: &StudyContext,
    cand: &Candidate,
    model: &MotorModel,
    loss_scale: f64,
) -> CandidateResult {
    let mut a = Assumptions::default();
    let mut ev = evaluator(ctx, cand, &mut a);
    ev.drive.loss_scale = loss_scale;
    let run = ev.run(model);
    report::assemble(ctx, cand, model, &run, None, a)
}

/// [`evaluate_lean`] for many candidates at once: designs of a fixed size (datasheet or
/// geometry mode) are flown [`GROUP`] at a time in lockstep, with the same results as one by
/// one; size-to-mission candidates and a remainder of fewer than [`GROUP`] go one by one.
pub fn evaluate_lean_group(ctx: &StudyContext, cands: &[Candidate]) -> Vec<CandidateResult> {
    const LANES: usize = GROUP;
    let mut out: Vec<Option<CandidateResult>> = vec![None; cands.len()];
    let mut fixed: Vec<(usize, Evaluator, MotorModel)> = Vec::with_capacity(cands.len());
    for (i, cand) in cands.iter().enumerate() {
        let mut a = Assumptions::quiet();
        let ev = evaluator(ctx, cand, &mut a);
        let model = match &cand.source {
            Source::Datasheet(d) => Some(datasheet::build(d, &mut a)),
            _ => match scalable(ctx, cand, &ev, &mut a) {
                Ok((sc, Some(scale))) => sc.build(scale).ok(),
                _ => None,
            },
        };
        match model {
            Some(m) => fixed.push((i, ev, m)),
            None => out[i] = Some(evaluate_lean(ctx, cand)),
        }
    }
    let mut groups = fixed.chunks_exact(LANES);
    // One set of flight and outcome buffers serves every lockstep group of the call.
    let mut flights: [Flight; LANES] = std::array::from_fn(|_| Flight::sized_for(&ctx.grid));
    let mut outcomes = Vec::new();
    for group in groups.by_ref() {
        let preps: [Prepared; LANES] =
            std::array::from_fn(|l| Prepared::new(&group[l].2, group[l].1.drive, &ctx.grid));
        let lanes = Group::new(preps.each_ref());
        let closures = closure::close_group(
            &ctx.grid,
            &lanes,
            std::array::from_fn(|l| &group[l].1.aircraft),
            &mut flights,
        );
        for (l, (i, ev, model)) in group.iter().enumerate() {
            let flight = std::mem::take(&mut flights[l]);
            checks::outcomes_into(model, &flight, &closures[l], &ev.limits, &mut outcomes);
            let run = Run {
                closure: closures[l],
                flight,
                outcomes: std::mem::take(&mut outcomes),
            };
            out[*i] = Some(report::assemble(
                ctx,
                &cands[*i],
                model,
                &run,
                None,
                Assumptions::quiet(),
            ));
            (flights[l], outcomes) = (run.flight, run.outcomes);
        }
    }
    for (i, ev, model) in groups.remainder() {
        let run = ev.run(model);
        out[*i] = Some(report::assemble(
            ctx,
            &cands[*i],
            model,
            &run,
            None,
            Assumptions::quiet(),
        ));
    }
    out.into_iter()
        .map(|r| r.unwrap_or_else(|| unreachable!("every candidate is scored")))
        .collect()
}
