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
        mut trace: Option<&mut Vec<TracePoint>>,
    ) {
        out.mass_kg = m;
        out.nominal.clear();
        out.oei.clear();
        out.battery_j = 0.0;
        out.prop_j = 0.0;
        out.max_elec_per_motor_w = 0.0;
        out.max_prop_torque_nm = 0.0;
        let n = grid.motor_count as f64;
        let mut state = self.initial(grid);
        let mut starts: Vec<State> = Vec::with_capacity(grid.segments.len());
        let mut time = 0.0;
        for (i, g) in grid.segments.iter().enumerate() {
            starts.push(state);
            let stats = self.segment(
                g,
                i,
                m,
                n,
                false,
                &mut state,
                out,
                &mut time,
                trace.as_deref_mut(),
            );
            out.battery_j += stats.battery_j;
            out.prop_j += stats.prop_j;
            out.nominal.push(stats);
        }
        for &(a, b) in &grid.oei_runs {
            let mut st = starts[a];
            let mut t = grid.segments[..a].iter().map(|g| g.duration_s).sum::<f64>();
            for (i, g) in grid.segments.iter().enumerate().take(b + 1).skip(a) {
                let stats = self.segment(
                    g,
                    i,
                    m,
                    n - 1.0,
                    true,
                    &mut st,
                    out,
                    &mut t,
                    trace.as_deref_mut(),
                );
                out.oei.push((i, stats));
            }
        }
    }

    #[allow(clippy::too_many_arguments)]
    fn segment(
        &self,
        g: &SegmentGrid,
        i: usize,
        m: f64,
        n_active: f64,
        oei: bool,
        st: &mut State,
        out: &mut Flight,
        time: &mut f64,
        mut trace: Option<&mut Vec<TracePoint>>,
    ) -> SegStats {
        let c = &self.segs[i];
        let dt = g.dt_s;
        let shaft_div = 1.0 / (n_active * self.drive.gear_efficiency);
        let inv_omega = 1.0 / c.omega;
        let inv_prop_omega = 1.0 / (n_active * g.prop_omega);
        let inv_eta_inv = 1.0 / self.drive.inverter_efficiency;
        let inv_eta_b = 1.0 / self.drive.battery_efficiency;
        let mut s = SegStats {
            duration_s: g.duration_s,
            motors: n_active,
            omega: c.omega,
            capability_nm: c.capability_nm,
            peak_winding_c: st.winding,
            peak_stator_c: st.stator,
            ..Default::default()
        };
        let k = self.kernel;
        let ls = self.drive.loss_scale;
        let [[m00, m01], [m10, m11]] = c.prop;
        let (aw, bw) = (1.0 - m00 - m01, (1.0 - m00) * k.inv_gws);
        let (a_s, b_s) = (1.0 - m10 - m11, -m10 * k.inv_gws);
        let alpha = super::materials::CU_ALPHA_PER_K;
        // b = 1 + α_Br(θ_s − 20) and ρ(θ_w) ∝ 1 + α_Cu(θ_w − 20) as one multiply-add each.
        let b0 = 1.0 - 20.0 * k.alpha_br;
        let (cu0, cu1) = (ls * k.cu_a * (1.0 - 20.0 * alpha), ls * k.cu_a * alpha);
        // Accumulators live in locals so that the loop keeps them in registers.
        let (mut shaft, mut tq, mut cu_j, mut fe_j, mut mech_j, mut in_j, mut el_j, mut prop_j) =
            (0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0);
        let (mut max_t, mut max_o, mut max_i) = (0.0f64, 0.0f64, 0.0f64);
        let (mut pk_w, mut pk_s) = (s.peak_winding_c, s.peak_stator_c);
        let (mut max_el, mut max_pt) = (out.max_elec_per_motor_w, out.max_prop_torque_nm);
        let (mut w, mut st_s, mut ov) = (st.winding, st.stator, st.overload_s);
        let mut floored_any = false;
        let mut t_now = *time;
        for p in &g.steps {
            let raw = if oei { p.c0_oei } else { p.c0 } + m * (p.c1 + m * p.c2);
            floored_any |= raw < g.floor_w;
            let power = fmax(raw, g.floor_w);
            let pm = power * shaft_div;
            let torque = pm * inv_omega;
            let sink = k.air_weight * p.air_temp_c + k.sink_const;
            let b = fmax(b0 + k.alpha_br * fmin(st_s, k.magnet_cap), 0.1);
            let inv_b = 1.0 / b;
            let tb = torque * inv_b;
            let cu = (cu0 + cu1 * fmin(w, k.winding_cap)) * (tb * tb);
            let fe = ls * b * b * c.iron_w;
            let mech = ls * (c.other_w + c.wind_k * p.rho_nu02);
            let loss = cu + fe + mech;
            let input = pm + loss;
            let elec = input * inv_eta_inv;
            let current = input * c.current_per_w * inv_b + torque * k.current_per_nm;
            // Exact step x' = x_eq + M·(x − x_eq), with x_eq linear in the losses, regrouped
            // so that only the loss terms wait for this step's losses.
            let es = sink + loss * k.inv_gsc;
            let w_next = (m00 * w + m01 * st_s) + aw * es + bw * cu;
            st_s = (m10 * w + m11 * st_s) + a_s * es + b_s * cu;
            w = w_next;
            ov = if torque > c.overload_nm { ov + dt } else { 0.0 };
            shaft += pm;
            tq += torque;
            cu_j += cu;
            fe_j += fe;
            mech_j += mech;
            in_j += input;
            el_j += elec;
            prop_j += power;
            max_t = fmax(max_t, torque);
            max_o = fmax(max_o, ov);
            max_i = fmax(max_i, current);
            pk_w = fmax(pk_w, w);
            pk_s = fmax(pk_s, st_s);
            max_el = fmax(max_el, elec);
            max_pt = fmax(max_pt, power * inv_prop_omega);
            t_now += dt;
            if let Some(tr) = trace.as_deref_mut() {
                tr.push(TracePoint {
                    time_s: t_now,
                    segment: i,
                    oei,
                    winding_c: w,
                    stator_c: st_s,
                    torque_nm: torque,
                    speed_rad_s: c.omega,
                });
            }
        }
        // Every step has the same length: the integrals are the sums times Δt.
        s.shaft_j = shaft * dt;
        s.torque_ns = tq * dt;
        s.copper_j = cu_j * dt;
        s.iron_j = fe_j * dt;
        s.mech_j = mech_j * dt;
        s.input_j = in_j * dt;
        s.elec_j = n_active * el_j * dt;
        s.prop_j = prop_j * dt;
        s.max_torque_nm = max_t;
        s.max_overload_s = max_o;
        s.max_current_a = max_i;
        s.peak_winding_c = pk_w;
        s.peak_stator_c = pk_s;
        s.floor_applied = floored_any;
        out.max_elec_per_motor_w = max_el;
        out.max_prop_torque_nm = max_pt;
        (st.winding, st.stator, st.overload_s) = (w, st_s, ov);
        *time = t_now;
        s.battery_j = s.elec_j * inv_eta_b;
        s.end_winding_c = st.winding;
        s.end_stator_c = st.stator;
        s
    }
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
