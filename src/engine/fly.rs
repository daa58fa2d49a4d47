//! Flying one candidate through the mission at one takeoff mass (engine.md §2, §5–§7):
//! the time-stepped loop with per-design constants prepared once, allocating nothing.

use super::mission::{MissionGrid, SegmentGrid, StepPoint};
use super::motor::{CurrentModel, LossModel, MotorModel, Sink, ThermalModel};

/// Drive-train and aircraft constants of one candidate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Drive {
    pub gear_ratio: f64,
    /// Gearbox efficiency (1 when direct drive).
    pub gear_efficiency: f64,
    pub inverter_efficiency: f64,
    pub battery_efficiency: f64,
    /// Initial temperature of every node, °C (preflight, or `None`: the first step's sink).
    pub preflight_c: Option<f64>,
    /// Multiplier on every motor loss (1 nominally; robustness samples vary it).
    pub loss_scale: f64,
}

/// Per-segment constants of one design.
#[derive(Debug, Clone, Copy, PartialEq)]
struct SegConst {
    omega: f64,
    capability_nm: f64,
    /// Datasheet overload threshold min(T_r, P_cont/ω), N·m (∞ when no rule).
    overload_nm: f64,
    /// Iron loss at b = 1 (sized), or k_h·ω + k_e·ω² (datasheet), W.
    iron_w: f64,
    /// Bearing friction (sized) or k_0 (datasheet), W.
    other_w: f64,
    /// Windage coefficient: P = wind_k·ρ·ν^0.2, W.
    wind_k: f64,
    /// Phase current per watt of motor input at b = 1: 1/(3·E_rms), A/W.
    current_per_w: f64,
    /// The step propagator of the thermal state (for one node: its decay on both rows,
    /// so that the stator reading follows the winding).
    prop: [[f64; 2]; 2],
}

/// Per-design constants shared by every step: the loss and thermal models written in one
/// branch-free form (datasheet motors have no flux derating and one thermal node).
#[derive(Debug, Clone, Copy, PartialEq)]
struct Kernel {
    /// Copper loss = cu_a·(1 + α_Cu(θ_w − 20))·(T/b)², θ_w capped.
    cu_a: f64,
    winding_cap: f64,
    /// b = max(1 + alpha_br·(min(θ_s, magnet_cap) − 20), 0.1).
    alpha_br: f64,
    magnet_cap: f64,
    /// Equilibrium: θ_s = sink + (P_cu + P_rest)·inv_gsc; θ_w = θ_s + P_cu·inv_gws.
    inv_gsc: f64,
    inv_gws: f64,
    /// Phase current per N·m (torque-constant motors), A/(N·m).
    current_per_nm: f64,
    /// Sink = air_weight·T_air + sink_const.
    air_weight: f64,
    sink_const: f64,
}

/// A design prepared for flying: its model and the constants of each segment.
pub struct Prepared<'a> {
    pub model: &'a MotorModel,
    pub drive: Drive,
    kernel: Kernel,
    segs: Vec<SegConst>,
}

/// Accumulated figures of one segment (nominal or one motor out), per motor unless noted.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SegStats {
    pub duration_s: f64,
    /// Motors sharing the load in this row.
    pub motors: f64,
    pub omega: f64,
    pub capability_nm: f64,
    /// ∫ over the segment (· dt): shaft power per motor, torque, copper, iron, mechanical,
    /// input power per motor (shaft + losses), DC power of all active motors.
    pub shaft_j: f64,
    pub torque_ns: f64,
    pub copper_j: f64,
    pub iron_j: f64,
    pub mech_j: f64,
    pub input_j: f64,
    pub elec_j: f64,
    pub battery_j: f64,
    pub prop_j: f64,
    pub max_torque_nm: f64,
    pub max_overload_s: f64,
    pub max_current_a: f64,
    pub peak_winding_c: f64,
    pub peak_stator_c: f64,
    pub end_winding_c: f64,
    pub end_stator_c: f64,
    pub floor_applied: bool,
}

/// One flight at one takeoff mass.
#[derive(Debug, Clone, Default)]
pub struct Flight {
    pub mass_kg: f64,
    pub nominal: Vec<SegStats>,
    /// One-motor-out rows, for the segments of each OEI run in order.
    pub oei: Vec<(usize, SegStats)>,
    pub battery_j: f64,
    pub prop_j: f64,
    /// Highest per-motor electrical power (DC) and propeller-shaft torque, nominal or OEI.
    pub max_elec_per_motor_w: f64,
    pub max_prop_torque_nm: f64,
}

/// A point of the temperature trace, for plots.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TracePoint {
    pub time_s: f64,
    pub segment: usize,
    pub oei: bool,
    pub winding_c: f64,
    pub stator_c: f64,
    pub torque_nm: f64,
    pub speed_rad_s: f64,
}

#[derive(Debug, Clone, Copy)]
struct State {
    winding: f64,
    stator: f64,
    overload_s: f64,
}

impl<'a> Prepared<'a> {
    pub fn new(model: &'a MotorModel, drive: Drive, grid: &MissionGrid) -> Prepared<'a> {
        let segs = grid
            .segments
            .iter()
            .map(|g| seg_const(model, &drive, g))
            .collect();
        Prepared {
            model,
            drive,
            kernel: kernel(model),
            segs,
        }
    }

    fn sink(&self, s: &StepPoint) -> f64 {
        match self.model.sink {
            Sink::Air => s.air_temp_c,
            Sink::Liquid(t) => t,
        }
    }

    fn initial(&self, grid: &MissionGrid) -> State {
        let t0 = self
            .drive
            .preflight_c
            .unwrap_or_else(|| self.sink(&grid.segments[0].steps[0]));
        State {
            winding: t0,
            stator: t0,
            overload_s: 0.0,
        }
    }

    /// Flies the nominal mission and every OEI run at takeoff mass `m`.
    pub fn fly(
        &self,
        grid: &MissionGrid,
        m: f64,
        out: &mut Flight,
        trace: Option<&mut Vec<TracePoint>>,
    ) {
        fly_lanes([self], grid, [m], [out], trace);
    }
}

/// [`fly_lanes`] for N designs, compiled for AVX2 where the processor has it (the
/// arithmetic is the same, lane by lane; only the instructions differ).
pub fn fly_lanes_fast<const N: usize>(
    preps: [&Prepared; N],
    grid: &MissionGrid,
    m: [f64; N],
    outs: [&mut Flight; N],
) {
    #[cfg(target_arch = "x86_64")]
    {
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: the processor was just found to support AVX2.
            unsafe { fly_lanes_avx2(preps, grid, m, outs) };
            return;
        }
    }
    fly_lanes(preps, grid, m, outs, None);
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn fly_lanes_avx2<const N: usize>(
    preps: [&Prepared; N],
    grid: &MissionGrid,
    m: [f64; N],
    outs: [&mut Flight; N],
) {
    fly_lanes(preps, grid, m, outs, None);
}

/// Flies N designs through the same mission in lockstep, lane by lane the same
/// arithmetic as one design alone (so the results are identical); N independent
/// dependency chains keep the processor busy and let the compiler vectorise across
/// designs. `trace` records lane 0 only.
#[inline(always)]
pub fn fly_lanes<const N: usize>(
    preps: [&Prepared; N],
    grid: &MissionGrid,
    m: [f64; N],
    mut outs: [&mut Flight; N],
    mut trace: Option<&mut Vec<TracePoint>>,
) {
    for (out, m) in outs.iter_mut().zip(m) {
        out.mass_kg = m;
        out.nominal.clear();
        out.oei.clear();
        out.battery_j = 0.0;
        out.prop_j = 0.0;
        out.max_elec_per_motor_w = 0.0;
        out.max_prop_torque_nm = 0.0;
    }
    let n = grid.motor_count as f64;
    let mut state: [State; N] = std::array::from_fn(|l| preps[l].initial(grid));
    let mut starts: Vec<[State; N]> = Vec::with_capacity(grid.segments.len());
    let mut time = 0.0;
    for (i, g) in grid.segments.iter().enumerate() {
        starts.push(state);
        let stats = segment_lanes(
            &preps,
            g,
            i,
            &m,
            n,
            false,
            &mut state,
            &mut outs,
            &mut time,
            trace.as_deref_mut(),
        );
        for (out, s) in outs.iter_mut().zip(stats) {
            out.battery_j += s.battery_j;
            out.prop_j += s.prop_j;
            out.nominal.push(s);
        }
    }
    for &(a, b) in &grid.oei_runs {
        let mut st = starts[a];
        let mut t = grid.segments[..a].iter().map(|g| g.duration_s).sum::<f64>();
        for (i, g) in grid.segments.iter().enumerate().take(b + 1).skip(a) {
            let stats = segment_lanes(
                &preps,
                g,
                i,
                &m,
                n - 1.0,
                true,
                &mut st,
                &mut outs,
                &mut t,
                trace.as_deref_mut(),
            );
            for (out, s) in outs.iter_mut().zip(stats) {
                out.oei.push((i, s));
            }
        }
    }
}

/// Per-lane constants of one segment, laid out lane-wise for the step loop.
struct Lanes<const N: usize> {
    shaft_div: [f64; N],
    inv_omega: [f64; N],
    inv_eta_inv: [f64; N],
    inv_prop_omega: f64,
    b0: [f64; N],
    alpha_br: [f64; N],
    magnet_cap: [f64; N],
    winding_cap: [f64; N],
    cu0: [f64; N],
    cu1: [f64; N],
    iron: [f64; N],
    other: [f64; N],
    wind: [f64; N],
    cur_w: [f64; N],
    cur_nm: [f64; N],
    inv_gsc: [f64; N],
    air_w: [f64; N],
    sink_c: [f64; N],
    overload: [f64; N],
    m: [[f64; 4]; N],
    ab: [[f64; 4]; N],
}

impl<const N: usize> Lanes<N> {
    fn new(preps: &[&Prepared; N], g: &SegmentGrid, i: usize, n_active: f64) -> Self {
        let f = |get: &dyn Fn(&Prepared, &SegConst, &Kernel) -> f64| -> [f64; N] {
            std::array::from_fn(|l| get(preps[l], &preps[l].segs[i], &preps[l].kernel))
        };
        let alpha = super::materials::CU_ALPHA_PER_K;
        Lanes {
            shaft_div: f(&|p, _, _| 1.0 / (n_active * p.drive.gear_efficiency)),
            inv_omega: f(&|_, c, _| 1.0 / c.omega),
            inv_eta_inv: f(&|p, _, _| 1.0 / p.drive.inverter_efficiency),
            inv_prop_omega: 1.0 / (n_active * g.prop_omega),
            // b = 1 + α_Br(θ_s − 20) and ρ(θ_w) ∝ 1 + α_Cu(θ_w − 20) as one multiply-add each.
            b0: f(&|_, _, k| 1.0 - 20.0 * k.alpha_br),
            alpha_br: f(&|_, _, k| k.alpha_br),
            magnet_cap: f(&|_, _, k| k.magnet_cap),
            winding_cap: f(&|_, _, k| k.winding_cap),
            cu0: f(&|p, _, k| p.drive.loss_scale * k.cu_a * (1.0 - 20.0 * alpha)),
            cu1: f(&|p, _, k| p.drive.loss_scale * k.cu_a * alpha),
            iron: f(&|p, c, _| p.drive.loss_scale * c.iron_w),
            other: f(&|p, c, _| p.drive.loss_scale * c.other_w),
            wind: f(&|p, c, _| p.drive.loss_scale * c.wind_k),
            cur_w: f(&|_, c, _| c.current_per_w),
            cur_nm: f(&|_, _, k| k.current_per_nm),
            inv_gsc: f(&|_, _, k| k.inv_gsc),
            air_w: f(&|_, _, k| k.air_weight),
            sink_c: f(&|_, _, k| k.sink_const),
            overload: f(&|_, c, _| c.overload_nm),
            m: std::array::from_fn(|l| {
                let [[a, b], [c, d]] = preps[l].segs[i].prop;
                [a, b, c, d]
            }),
            // Exact step x' = x_eq + M·(x − x_eq), x_eq linear in the losses, regrouped
            // so that only the loss terms wait for this step's losses.
            ab: std::array::from_fn(|l| {
                let [[m00, m01], [m10, m11]] = preps[l].segs[i].prop;
                let g2 = preps[l].kernel.inv_gws;
                [
                    1.0 - m00 - m01,
                    (1.0 - m00) * g2,
                    1.0 - m10 - m11,
                    -m10 * g2,
                ]
            }),
        }
    }
}

#[allow(clippy::too_many_arguments)]
#[inline(always)]
fn segment_lanes<const N: usize>(
    preps: &[&Prepared; N],
    g: &SegmentGrid,
    i: usize,
    m: &[f64; N],
    n_active: f64,
    oei: bool,
    st: &mut [State; N],
    outs: &mut [&mut Flight; N],
    time: &mut f64,
    mut trace: Option<&mut Vec<TracePoint>>,
) -> [SegStats; N] {
    let k = Lanes::new(preps, g, i, n_active);
    let dt = g.dt_s;
    let z = [0.0f64; N];
    // Accumulators live in lane arrays so that the loop keeps them in registers.
    let (mut shaft, mut tq, mut cu_j, mut fe_j, mut mech_j, mut in_j, mut el_j, mut prop_j) =
        (z, z, z, z, z, z, z, z);
    let (mut max_t, mut max_o, mut max_i) = (z, z, z);
    let mut pk_w: [f64; N] = std::array::from_fn(|l| st[l].winding);
    let mut pk_s: [f64; N] = std::array::from_fn(|l| st[l].stator);
    let mut max_el: [f64; N] = std::array::from_fn(|l| outs[l].max_elec_per_motor_w);
    let mut max_pt: [f64; N] = std::array::from_fn(|l| outs[l].max_prop_torque_nm);
    let mut w: [f64; N] = std::array::from_fn(|l| st[l].winding);
    let mut ss: [f64; N] = std::array::from_fn(|l| st[l].stator);
    let mut ov: [f64; N] = std::array::from_fn(|l| st[l].overload_s);
    let mut floored = [false; N];
    let mut t_now = *time;
    for p in &g.steps {
        let c0 = if oei { p.c0_oei } else { p.c0 };
        for l in 0..N {
            let raw = c0 + m[l] * (p.c1 + m[l] * p.c2);
            floored[l] |= raw < g.floor_w;
            let power = fmax(raw, g.floor_w);
            let pm = power * k.shaft_div[l];
            let torque = pm * k.inv_omega[l];
            let sink = k.air_w[l] * p.air_temp_c + k.sink_c[l];
            let b = fmax(k.b0[l] + k.alpha_br[l] * fmin(ss[l], k.magnet_cap[l]), 0.1);
            let inv_b = 1.0 / b;
            let tb = torque * inv_b;
            let cu = (k.cu0[l] + k.cu1[l] * fmin(w[l], k.winding_cap[l])) * (tb * tb);
            let fe = b * b * k.iron[l];
            let mech = k.other[l] + k.wind[l] * p.rho_nu02;
            let loss = cu + fe + mech;
            let input = pm + loss;
            let elec = input * k.inv_eta_inv[l];
            let current = input * k.cur_w[l] * inv_b + torque * k.cur_nm[l];
            let es = sink + loss * k.inv_gsc[l];
            let [m00, m01, m10, m11] = k.m[l];
            let [aw, bw, a_s, b_s] = k.ab[l];
            let w_next = (m00 * w[l] + m01 * ss[l]) + aw * es + bw * cu;
            ss[l] = (m10 * w[l] + m11 * ss[l]) + a_s * es + b_s * cu;
            w[l] = w_next;
            ov[l] = if torque > k.overload[l] {
                ov[l] + dt
            } else {
                0.0
            };
            shaft[l] += pm;
            tq[l] += torque;
            cu_j[l] += cu;
            fe_j[l] += fe;
            mech_j[l] += mech;
            in_j[l] += input;
            el_j[l] += elec;
            prop_j[l] += power;
            max_t[l] = fmax(max_t[l], torque);
            max_o[l] = fmax(max_o[l], ov[l]);
            max_i[l] = fmax(max_i[l], current);
            pk_w[l] = fmax(pk_w[l], w[l]);
            pk_s[l] = fmax(pk_s[l], ss[l]);
            max_el[l] = fmax(max_el[l], elec);
            max_pt[l] = fmax(max_pt[l], power * k.inv_prop_omega);
            if l == 0
                && let Some(tr) = trace.as_deref_mut()
            {
                tr.push(TracePoint {
                    time_s: t_now + dt,
                    segment: i,
                    oei,
                    winding_c: w[0],
                    stator_c: ss[0],
                    torque_nm: torque,
                    speed_rad_s: preps[0].segs[i].omega,
                });
            }
        }
        t_now += dt;
    }
    *time = t_now;
    std::array::from_fn(|l| {
        let c = &preps[l].segs[i];
        st[l] = State {
            winding: w[l],
            stator: ss[l],
            overload_s: ov[l],
        };
        outs[l].max_elec_per_motor_w = max_el[l];
        outs[l].max_prop_torque_nm = max_pt[l];
        // Every step has the same length: the integrals are the sums times Δt.
        let elec_j = n_active * el_j[l] * dt;
        SegStats {
            duration_s: g.duration_s,
            motors: n_active,
            omega: c.omega,
            capability_nm: c.capability_nm,
            shaft_j: shaft[l] * dt,
            torque_ns: tq[l] * dt,
            copper_j: cu_j[l] * dt,
            iron_j: fe_j[l] * dt,
            mech_j: mech_j[l] * dt,
            input_j: in_j[l] * dt,
            elec_j,
            battery_j: elec_j / preps[l].drive.battery_efficiency,
            prop_j: prop_j[l] * dt,
            max_torque_nm: max_t[l],
            max_overload_s: max_o[l],
            max_current_a: max_i[l],
            peak_winding_c: pk_w[l],
            peak_stator_c: pk_s[l],
            end_winding_c: w[l],
            end_stator_c: ss[l],
            floor_applied: floored[l],
        }
    })
}

fn seg_const(model: &MotorModel, drive: &Drive, g: &SegmentGrid) -> SegConst {
    let omega = g.prop_omega * drive.gear_ratio;
    let overload_nm = match model.overload {
        Some((p_cont, _)) => model.rated_torque_nm.min(p_cont / omega),
        None => f64::INFINITY,
    };
    let (iron_w, other_w, wind_k, current_per_w) = match &model.losses {
        LossModel::Fitted { k_h, k_e, k_0, .. } => {
            (k_h * omega + k_e * omega * omega, *k_0, 0.0, 0.0)
        }
        LossModel::Sized(s) => {
            let f = s.pole_pairs * omega / (2.0 * std::f64::consts::PI);
            let w28 = omega.powf(2.8);
            let mut wind = 0.0;
            for &r in &s.disc_radii_m {
                wind += 0.5 * 0.146 * w28 * r.powf(4.6);
            }
            if let Some(cyl) = s.cylinder {
                wind += std::f64::consts::PI
                    * 0.0325
                    * w28
                    * cyl.radius_m.powf(3.8)
                    * cyl.length_m
                    * cyl.gap_m.powf(-0.2);
            }
            let emf = s.e_rms_base_v * omega.min(model.base_speed_rad_s) / model.base_speed_rad_s;
            let per_w = if model.current == CurrentModel::BackEmf {
                1.0 / (3.0 * emf)
            } else {
                0.0
            };
            (
                s.iron_h * f + s.iron_e * f * f,
                s.bearing_torque_nm * omega,
                wind,
                per_w,
            )
        }
    };
    let prop = match &model.thermal {
        ThermalModel::TwoNode(net) => net.propagator(g.dt_s).m,
        ThermalModel::OneNode(node) => {
            let d = node.decay(g.dt_s);
            [[d, 0.0], [d, 0.0]]
        }
    };
    SegConst {
        omega,
        capability_nm: model.torque_capability(omega),
        overload_nm,
        iron_w,
        other_w,
        wind_k,
        current_per_w,
        prop,
    }
}

fn kernel(model: &MotorModel) -> Kernel {
    let (air_weight, sink_const) = match model.sink {
        Sink::Air => (1.0, 0.0),
        Sink::Liquid(t) => (0.0, t),
    };
    let current_per_nm = match model.current {
        CurrentModel::TorqueConstant(kt) => 1.0 / kt,
        _ => 0.0,
    };
    let (inv_gsc, inv_gws) = match &model.thermal {
        ThermalModel::TwoNode(net) => (1.0 / net.g_sc, 1.0 / net.g_ws),
        ThermalModel::OneNode(node) => (node.resistance, 0.0),
    };
    let common = |cu_a, alpha_br, magnet_cap| Kernel {
        cu_a,
        winding_cap: model.winding_limit_c,
        alpha_br,
        magnet_cap,
        inv_gsc,
        inv_gws,
        current_per_nm,
        air_weight,
        sink_const,
    };
    match &model.losses {
        LossModel::Fitted {
            k_c, theta_ref_c, ..
        } => common(
            k_c / (1.0 + super::materials::CU_ALPHA_PER_K * (theta_ref_c - 20.0)),
            0.0,
            f64::INFINITY,
        ),
        LossModel::Sized(sz) => common(
            super::materials::CU_RESISTIVITY_20C * sz.cu_k,
            sz.alpha_br,
            model.magnet_limit_c.unwrap_or(f64::INFINITY),
        ),
    }
}

/// max for finite numbers: one instruction, where `f64::max` also orders NaN.
#[inline(always)]
fn fmax(a: f64, b: f64) -> f64 {
    if a > b { a } else { b }
}

#[inline(always)]
fn fmin(a: f64, b: f64) -> f64 {
    if a < b { a } else { b }
}
