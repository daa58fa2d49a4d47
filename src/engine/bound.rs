//! A lower bound of the closing mass (engine.md §8), where the mass closure's first flight
//! starts.
//!
//! The closure finds the smallest root of F(m) = m, F being the sum of the parts after
//! flying the mission at m. Fixed-point iteration from m₀ rises to that root; far below
//! it, the first flights only bring the iteration closer. This module writes a function
//! F_lb with F_lb(m) ≤ F(m) for every m ≥ m₀, non-decreasing in m and costing a few dozen
//! operations instead of a flight: the motor's losses taken at the most favourable
//! temperatures the mission allows (copper resistance at the coldest the winding can be,
//! flux at whichever end of the magnet's range lowers each loss), the idle floor and the
//! peaks bounded from below. The fixed-point iterates of F_lb from m₀ then stay below
//! those of F (x'_lb = F_lb(x_lb) ≤ F_lb(x) ≤ F(x) = x'), so the root of F_lb is below the
//! smallest root of F: the closure may start there, a few kilograms short of the root
//! instead of a few hundred, and close in two or three flights instead of four.

use super::closure::{AircraftConst, parts_from};
use super::fly::{Prepared, dk, sk};
use super::mission::SegmentGrid;

/// The study-level part of the bound: per segment, the sums of the step powers as
/// polynomials in the takeoff mass, and the steps that bound the peaks.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct BoundGrid {
    segs: Vec<BoundSeg>,
    peaks: Vec<PeakStep>,
    /// Coldest and warmest air of any step, °C (the sink of air-cooled motors).
    air_min_c: f64,
    air_max_c: f64,
}

#[derive(Debug, Clone, PartialEq)]
struct BoundSeg {
    steps: f64,
    dt_s: f64,
    /// Every step's raw power c0 + c1·m + c2·m² rises with m from the least possible
    /// takeoff mass (airframe + payload) and stays above the idle floor and zero there,
    /// so that Σ P = Σ raw and Σ P² = Σ raw² exactly, as polynomials that rise with m.
    rising: bool,
    /// Σ over the steps of c0, c1, c2.
    sum: [f64; 3],
    /// Σ raw² as a quartic in m, constant term first.
    sum_sq: [f64; 5],
    floor_w: f64,
    rho_nu02_sum: f64,
}

/// A step whose power bounds a segment's peak from below.
#[derive(Debug, Clone, PartialEq)]
struct PeakStep {
    seg: usize,
    oei: bool,
    /// c0 (c0 with the one-motor-out increment when `oei`), c1, c2.
    c: [f64; 3],
    rising: bool,
    floor_w: f64,
    rho_nu02: f64,
    prop_omega: f64,
}

impl BoundGrid {
    /// `least_mass_kg` is the least takeoff mass any candidate can have (airframe and
    /// payload), `ref_mass_kg` the mass at which each segment's highest step is picked.
    pub fn new(
        segments: &[SegmentGrid],
        oei_runs: &[(usize, usize)],
        motor_count: u32,
        least_mass_kg: f64,
        ref_mass_kg: f64,
    ) -> BoundGrid {
        let motors = motor_count as f64;
        let m = least_mass_kg;
        let raw = |c: [f64; 3], m: f64| c[0] + m * (c[1] + m * c[2]);
        let rises = |c: [f64; 3], floor: f64| {
            c[2] >= 0.0 && c[1] + 2.0 * c[2] * m >= 0.0 && raw(c, m) >= floor.max(0.0)
        };
        let in_oei = |i: usize| oei_runs.iter().any(|&(a, b)| (a..=b).contains(&i));
        let mut segs = Vec::with_capacity(segments.len());
        let mut peaks = Vec::new();
        let (mut air_min_c, mut air_max_c) = (f64::INFINITY, f64::NEG_INFINITY);
        for (i, g) in segments.iter().enumerate() {
            let mut sum = [0.0; 3];
            let mut sum_sq = [0.0; 5];
            let mut rising = true;
            for p in &g.steps {
                let c = [p.c0, p.c1, p.c2];
                rising &= rises(c, g.floor_w);
                sum[0] += c[0];
                sum[1] += c[1];
                sum[2] += c[2];
                sum_sq[0] += c[0] * c[0];
                sum_sq[1] += 2.0 * c[0] * c[1];
                sum_sq[2] += c[1] * c[1] + 2.0 * c[0] * c[2];
                sum_sq[3] += 2.0 * c[1] * c[2];
                sum_sq[4] += c[2] * c[2];
                air_min_c = air_min_c.min(p.air_temp_c);
                air_max_c = air_max_c.max(p.air_temp_c);
            }
            segs.push(BoundSeg {
                steps: g.steps.len() as f64,
                dt_s: g.dt_s,
                rising,
                sum,
                sum_sq,
                floor_w: g.floor_w,
                rho_nu02_sum: g.rho_nu02_sum,
            });
            let oei_too = in_oei(i);
            for oei in [false, true] {
                if oei && !oei_too {
                    continue;
                }
                let c =
                    |p: &super::mission::StepPoint| [if oei { p.c0_oei } else { p.c0 }, p.c1, p.c2];
                let best = g
                    .steps
                    .iter()
                    .max_by(|a, b| raw(c(a), ref_mass_kg).total_cmp(&raw(c(b), ref_mass_kg)));
                if let Some(p) = best {
                    peaks.push(PeakStep {
                        seg: i,
                        oei,
                        c: c(p),
                        rising: rises(c(p), g.floor_w),
                        floor_w: g.floor_w,
                        rho_nu02: p.rho_nu02,
                        prop_omega: g.prop_omega,
                    });
                }
            }
        }
        // The two highest steps in power per motor and the two highest in torque per
        // motor (the same order for the motor's torque, whose speed is the propeller's
        // times a fixed ratio).
        let active = |oei: bool| if oei { motors - 1.0 } else { motors };
        let at_ref = |p: &PeakStep| raw(p.c, ref_mass_kg) / active(p.oei);
        let mut by_power: Vec<PeakStep> = peaks.clone();
        by_power.sort_by(|a, b| at_ref(b).total_cmp(&at_ref(a)));
        let mut by_torque = peaks;
        by_torque.sort_by(|a, b| (at_ref(b) / b.prop_omega).total_cmp(&(at_ref(a) / a.prop_omega)));
        let mut peaks: Vec<PeakStep> = Vec::with_capacity(PEAKS);
        for p in by_power
            .into_iter()
            .take(2)
            .chain(by_torque.into_iter().take(2))
        {
            if !peaks.contains(&p) {
                peaks.push(p);
            }
        }
        BoundGrid {
            segs,
            peaks,
            air_min_c,
            air_max_c,
        }
    }
}

/// At most this many steps bound the peaks: the two highest in power per motor and the
/// two highest in torque per motor at the reference mass (any subset of the steps bounds
/// a maximum from below).
const PEAKS: usize = 4;

/// The bound for one design as polynomials in m, constant term first: the battery energy
/// (J), and per peak step the motor input power (W per motor) and propeller torque (N·m
/// per motor).
#[derive(Debug, Clone, Copy)]
struct Floor {
    energy: [f64; 5],
    input: [[f64; 5]; PEAKS],
    torque: [[f64; 3]; PEAKS],
}

/// p(m)² as a quartic, for p = c0 + c1·m + c2·m².
fn square(c: [f64; 3]) -> [f64; 5] {
    [
        c[0] * c[0],
        2.0 * c[0] * c[1],
        c[1] * c[1] + 2.0 * c[0] * c[2],
        2.0 * c[1] * c[2],
        c[2] * c[2],
    ]
}

fn horner<const N: usize>(c: &[f64; N], m: f64) -> f64 {
    c.iter().rev().fold(0.0, |acc, &k| acc * m + k)
}

fn floor_of(bound: &BoundGrid, prep: &Prepared, motors: f64) -> Floor {
    let pack = &prep.pack;
    let d = |k: usize| pack.design[k][0];
    // The winding and stator never fall below the coldest sink or their start (losses
    // only heat them).
    let sink = |air: f64| d(dk::AIR_W) * air + d(dk::SINK_C);
    let cold = d(dk::INITIAL_C)
        .min(sink(bound.air_min_c))
        .min(sink(bound.air_max_c));
    let b = |t: f64| (d(dk::B0) + d(dk::ALPHA_BR) * t.min(d(dk::MAGNET_CAP))).max(0.1);
    let (b_cold, b_capped) = (b(cold), b(d(dk::MAGNET_CAP)));
    let (b_lo, b_hi) = (b_cold.min(b_capped), b_cold.max(b_capped));
    let cu = |t: f64| d(dk::CU0) + d(dk::CU1) * t.min(d(dk::WINDING_CAP));
    // Copper loss ≥ kcu·T², iron loss ≥ b_lo²·(the segment's iron coefficient).
    let kcu = cu(cold).min(cu(d(dk::WINDING_CAP))).max(0.0) / (b_hi * b_hi);
    let iron_b2 = b_lo * b_lo;
    let shaft_div = d(dk::SHAFT_DIV_NOMINAL);
    let per_w = motors * d(dk::INV_ETA_INV) / d(dk::ETA_B);
    let mut energy = [0.0; 5];
    for (s, c) in bound.segs.iter().zip(&pack.segs) {
        let c = |k: usize| c[k][0];
        let k = per_w * s.dt_s;
        let fixed = s.steps * (iron_b2 * c(sk::IRON) + c(sk::OTHER)) + c(sk::WIND) * s.rho_nu02_sum;
        energy[0] += k * fixed;
        let torque_per_w = shaft_div * c(sk::INV_OMEGA);
        let q = kcu * torque_per_w * torque_per_w;
        if s.rising {
            let sum = [s.sum[0], s.sum[1], s.sum[2], 0.0, 0.0];
            for ((e, a), b) in energy.iter_mut().zip(sum).zip(s.sum_sq) {
                *e += k * (shaft_div * a + q * b);
            }
        } else {
            // Power at least the idle floor at every step (P² too when the floor is ≥ 0).
            let f = s.floor_w;
            energy[0] += k * s.steps * (shaft_div * f + q * f.max(0.0) * f.max(0.0));
        }
    }
    let mut input = [[0.0; 5]; PEAKS];
    let mut torque = [[0.0; 3]; PEAKS];
    for (k, p) in bound.peaks.iter().take(PEAKS).enumerate() {
        let c = |i: usize| pack.segs[p.seg][i][0];
        let (div, active) = match p.oei {
            true => (d(dk::SHAFT_DIV_OEI), motors - 1.0),
            false => (shaft_div, motors),
        };
        // A rising step's power is its raw power (≥ 0); any step's is at least the floor.
        let (power, positive) = match p.rising {
            true => (p.c, p.c),
            false => ([p.floor_w, 0.0, 0.0], [p.floor_w.max(0.0), 0.0, 0.0]),
        };
        let q = kcu * (div * c(sk::INV_OMEGA)).powi(2);
        let sq = square(positive);
        for (i, x) in input[k].iter_mut().enumerate() {
            let linear = if i < 3 { div * power[i] } else { 0.0 };
            *x = linear + q * sq[i];
        }
        input[k][0] += iron_b2 * c(sk::IRON) + c(sk::OTHER) + c(sk::WIND) * p.rho_nu02;
        let per = 1.0 / (active * p.prop_omega);
        torque[k] = power.map(|x| x * per);
    }
    Floor {
        energy,
        input,
        torque,
    }
}

/// F_lb(m): a lower bound of the sum of the parts after flying the mission at m.
fn floor_sum(prep: &Prepared, ac: &AircraftConst, f: &Floor, m: f64) -> f64 {
    let max_in = f.input.iter().map(|c| horner(c, m)).fold(0.0, f64::max);
    let max_torque = f.torque.iter().map(|c| horner(c, m)).fold(0.0, f64::max);
    parts_from(
        ac,
        prep.model.mass_kg,
        horner(&f.energy, m),
        max_in * prep.pack.design[dk::INV_ETA_INV][0],
        max_torque,
    )
    .sum_kg
}

/// Where the closure of `prep` may start: the root of F_lb found from m₀ (never above
/// the smallest root of F), and the slope of F_lb there, a little under F's slope near
/// the root, for the closure's first step.
pub fn closure_start(bound: &BoundGrid, prep: &Prepared, ac: &AircraftConst, m0: f64) -> Start {
    let f = floor_of(bound, prep, ac.motors);
    let g = |m: f64| floor_sum(prep, ac, &f, m) - m;
    // Fixed-point steps, accelerated by secant steps kept only where F_lb(m) ≥ m (F_lb
    // is convex: rising polynomials with their maxima and non-negative sums).
    let (mut m, mut gm) = (m0, g(m0));
    let mut prev: Option<(f64, f64)> = None;
    let ceiling = 3.0 * ac.mtom_kg;
    let mut slope = 0.0;
    for _ in 0..60 {
        if !(gm.is_finite() && gm > 0.0 && m < ceiling) {
            break;
        }
        if let Some((ma, ga)) = prev
            && ga > gm
            && m > ma
        {
            slope = 1.0 + (gm - ga) / (m - ma);
        }
        if gm < START_TOLERANCE_KG {
            break;
        }
        let fixed = m + gm;
        let secant = prev
            .filter(|&(ma, ga)| ga > gm && m > ma)
            .map(|(ma, ga)| m + gm * (m - ma) / (ga - gm))
            .filter(|&x| x.is_finite() && x > fixed && x <= ceiling);
        let (next, g_next) = match secant.map(|x| (x, g(x))) {
            Some((x, gx)) if gx >= 0.0 => (x, gx),
            _ => (fixed, g(fixed)),
        };
        prev = Some((m, gm));
        (m, gm) = (next, g_next);
    }
    if !(m.is_finite() && gm.is_finite() && gm >= 0.0 && m >= m0 && m <= ceiling) {
        return Start {
            mass_kg: m0,
            slope: None,
        };
    }
    Start {
        mass_kg: m + gm,
        slope: (slope > 0.0 && slope < 1.0).then_some(slope),
    }
}

/// How close to the bound's own root the start is taken: far inside the gap between the
/// bound and F (kilograms), so a looser search would not change the flights.
const START_TOLERANCE_KG: f64 = 1e-3;

/// See [`closure_start`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Start {
    pub mass_kg: f64,
    pub slope: Option<f64>,
}

/// F_lb at one mass (for tests: it must never exceed the sum of the parts flown).
pub fn floor_parts_kg(bound: &BoundGrid, prep: &Prepared, ac: &AircraftConst, m: f64) -> f64 {
    let f = floor_of(bound, prep, ac.motors);
    floor_sum(prep, ac, &f, m)
}
