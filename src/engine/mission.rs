//! The mission as the integrator sees it (engine.md §2): each segment's duration, step
//! grid, air at each step's midpoint and the power demand as a quadratic in takeoff mass.
//! Computed once per study; nothing here depends on the candidate.

use super::atmosphere::{self, G0};
use super::bound::BoundGrid;
use super::study::{PowerRule, SegmentKind, Study};
use serde::Serialize;

/// One integration step: P(m) = max(c0 + c1·m + c2·m², floor) in W (all motors, at the
/// propeller shafts), and the air at the step's midpoint altitude.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StepPoint {
    pub c0: f64,
    /// c0 with the one-motor-out drag increment (steady segments only).
    pub c0_oei: f64,
    pub c1: f64,
    pub c2: f64,
    pub altitude_m: f64,
    pub air_temp_c: f64,
    pub density: f64,
    /// Kinematic viscosity, m²/s.
    pub nu: f64,
    /// ρ·ν^0.2, the air factor of the windage laws.
    pub rho_nu02: f64,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SegmentGrid {
    pub name: String,
    pub kind: SegmentKind,
    pub oei: bool,
    pub duration_s: f64,
    pub dt_s: f64,
    /// Propeller shaft speed, rad/s.
    pub prop_omega: f64,
    /// prop_omega^2.8, the windage law's speed factor at direct drive.
    pub prop_omega_pow_2_8: f64,
    pub floor_w: f64,
    pub steady: bool,
    pub steps: Vec<StepPoint>,
    /// Σ ρ·ν^0.2 over the steps: the segment's windage energy is its ω^2.8 factor times
    /// this times Δt.
    pub rho_nu02_sum: f64,
}

impl SegmentGrid {
    /// Shaft power of a step at takeoff mass m, W, with the idle floor; and whether the
    /// floor was applied.
    #[inline]
    pub fn power(&self, s: &StepPoint, m: f64, oei: bool) -> (f64, bool) {
        let c0 = if oei { s.c0_oei } else { s.c0 };
        let p = c0 + m * (s.c1 + m * s.c2);
        if p < self.floor_w {
            (self.floor_w, true)
        } else {
            (p, false)
        }
    }
}

/// The study's mission grid and the runs of consecutive OEI-flagged segments.
#[derive(Debug, Clone, PartialEq)]
pub struct MissionGrid {
    pub segments: Vec<SegmentGrid>,
    /// Inclusive (first, last) segment indices of each OEI run; empty for one motor.
    pub oei_runs: Vec<(usize, usize)>,
    pub motor_count: u32,
    /// The study-level part of the closure's lower bound.
    pub bound: BoundGrid,
}

/// Duration of a segment, s (the combination was validated at input).
pub fn segment_duration(seg: &super::study::Segment) -> f64 {
    if let Some(t) = seg.duration_s {
        return t;
    }
    match seg.power {
        PowerRule::Steady {
            tas_m_s,
            climb_rate_m_s,
            ..
        } => match seg.distance_m {
            Some(d) => d / tas_m_s,
            None => {
                ((seg.altitude_end() - seg.altitude_start()) / climb_rate_m_s.unwrap_or(0.0)).abs()
            }
        },
        _ => 0.0,
    }
}

impl MissionGrid {
    pub fn new(study: &Study) -> MissionGrid {
        let a = &study.aircraft;
        let integ = study.integration.as_ref();
        let time_step = integ.and_then(|i| i.time_step_s).unwrap_or(10.0);
        let min_steps = integ.and_then(|i| i.min_steps_per_segment).unwrap_or(20) as f64;
        let offset = a.isa_offset_k.unwrap_or(0.0);
        let segments: Vec<SegmentGrid> = study
            .segments
            .iter()
            .map(|seg| {
                let t = segment_duration(seg);
                let n = min_steps.max((t / time_step).ceil()) as usize;
                let dt = t / n as f64;
                let (h0, h1) = (seg.altitude_start(), seg.altitude_end());
                let oei_inc = seg.oei_cd0_increment.unwrap_or(0.002);
                let prop_omega = seg.prop_speed_rpm * std::f64::consts::PI / 30.0;
                let steps: Vec<StepPoint> = (0..n)
                    .map(|k| {
                        let h = h0 + (k as f64 + 0.5) / n as f64 * (h1 - h0);
                        step_point(study, &seg.power, h, offset, oei_inc)
                    })
                    .collect();
                let rho_nu02_sum = steps.iter().map(|p| p.rho_nu02).sum();
                SegmentGrid {
                    name: seg.name.clone(),
                    kind: seg.kind,
                    oei: seg.is_oei(),
                    duration_s: t,
                    dt_s: dt,
                    prop_omega,
                    prop_omega_pow_2_8: prop_omega.powf(2.8),
                    floor_w: seg.idle_floor_kw.unwrap_or(0.0) * 1000.0,
                    steady: matches!(seg.power, PowerRule::Steady { .. }),
                    steps,
                    rho_nu02_sum,
                }
            })
            .collect();
        let oei_runs = if a.motor_count >= 2 {
            oei_runs(&segments)
        } else {
            Vec::new()
        };
        let bound = BoundGrid::new(
            &segments,
            &oei_runs,
            a.motor_count,
            a.airframe_mass_kg + a.payload_kg,
            a.max_takeoff_mass_kg,
        );
        MissionGrid {
            segments,
            oei_runs,
            motor_count: a.motor_count,
            bound,
        }
    }

    pub fn total_steps(&self) -> usize {
        self.segments.iter().map(|s| s.steps.len()).sum()
    }
}

fn oei_runs(segments: &[SegmentGrid]) -> Vec<(usize, usize)> {
    let mut runs = Vec::new();
    let mut start = None;
    for (i, s) in segments.iter().enumerate() {
        match (s.oei, start) {
            (true, None) => start = Some(i),
            (false, Some(a)) => {
                runs.push((a, i - 1));
                start = None;
            }
            _ => {}
        }
    }
    if let Some(a) = start {
        runs.push((a, segments.len() - 1));
    }
    runs
}

fn step_point(study: &Study, rule: &PowerRule, h: f64, offset: f64, oei_inc: f64) -> StepPoint {
    let air = atmosphere::air(h, offset);
    let nu = air.kinematic_viscosity_m2_s();
    let (c0, c0_oei, c1, c2) = match *rule {
        PowerRule::Steady {
            tas_m_s: v,
            prop_efficiency: eta,
            climb_rate_m_s,
            cd0_increment,
        } => {
            let a = &study.aircraft;
            let s = a.wing_area_m2.unwrap_or(1.0);
            let k = 1.0
                / (std::f64::consts::PI
                    * a.oswald_efficiency.unwrap_or(1.0)
                    * a.aspect_ratio.unwrap_or(1.0));
            let cd0 = a.cd0.unwrap_or(0.0) + cd0_increment.unwrap_or(0.0);
            let q = 0.5 * air.density_kg_m3 * v * v;
            // D·V = q·S·C_D0·V + K·(m·g)²·V/(q·S); P = (D·V + W·ROC)/η_p.
            (
                q * s * cd0 * v / eta,
                q * s * (cd0 + oei_inc) * v / eta,
                G0 * climb_rate_m_s.unwrap_or(0.0) / eta,
                k * G0 * G0 * v / (q * s * eta),
            )
        }
        PowerRule::PowerLoading { w_per_kg } => (0.0, 0.0, w_per_kg, 0.0),
        PowerRule::ShaftPower { kw } => (kw * 1000.0, kw * 1000.0, 0.0, 0.0),
    };
    StepPoint {
        c0,
        c0_oei,
        c1,
        c2,
        altitude_m: h,
        air_temp_c: air.temperature_c(),
        density: air.density_kg_m3,
        nu,
        rho_nu02: air.density_kg_m3 * nu.powf(0.2),
    }
}

/// A segment row's computed duration and mean shaft power at a given takeoff mass.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SegmentPreview {
    pub name: String,
    pub duration_s: f64,
    /// Time-averaged total shaft power at the propellers, kW.
    pub shaft_power_kw: f64,
}

/// Duration and power of every segment at takeoff mass `m` (for the segment table).
pub fn segment_preview(study: &Study, takeoff_mass_kg: f64) -> Vec<SegmentPreview> {
    let grid = MissionGrid::new(study);
    grid.segments
        .iter()
        .map(|g| {
            let mean = g
                .steps
                .iter()
                .map(|s| g.power(s, takeoff_mass_kg, false).0)
                .sum::<f64>()
                / g.steps.len() as f64;
            SegmentPreview {
                name: g.name.clone(),
                duration_s: g.duration_s,
                shaft_power_kw: mean / 1000.0,
            }
        })
        .collect()
}
