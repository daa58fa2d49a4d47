//! Flying one candidate through the mission at one takeoff mass (engine.md §2, §5–§7):
//! the time-stepped loop with per-design constants prepared once, allocating nothing.

use super::mission::{MissionGrid, SegmentGrid, StepPoint};
use super::motor::{CurrentModel, LossModel, MotorModel, Sink, ThermalModel};
use super::thermal::Propagator;

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
    /// Sized: iron loss at b = 1, W. Fitted: k_h·ω + k_e·ω² + k_0 split as iron and other.
    iron_w: f64,
    other_w: f64,
    /// Windage coefficient: P = wind_k·ρ·ν^0.2, W.
    wind_k: f64,
    /// Back-EMF (line, RMS) at this speed with 20 °C magnets, V.
    emf_v: f64,
    prop: Propagator,
    decay: f64,
}

/// A design prepared for flying: its model and the constants of each segment.
pub struct Prepared<'a> {
    pub model: &'a MotorModel,
    pub drive: Drive,
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
        Prepared { model, drive, segs }
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
        let model = self.model;
        let dt = g.dt_s;
        let shaft_div = 1.0 / (n_active * self.drive.gear_efficiency);
        let inv_omega = 1.0 / c.omega;
        let inv_prop_omega = 1.0 / (n_active * g.prop_omega);
        let inv_eta_inv = 1.0 / self.drive.inverter_efficiency;
        let inv_eta_b = 1.0 / self.drive.battery_efficiency;
        let w_lim = model.winding_limit_c;
        let mut s = SegStats {
            duration_s: g.duration_s,
            motors: n_active,
            omega: c.omega,
            capability_nm: c.capability_nm,
            peak_winding_c: st.winding,
            peak_stator_c: st.stator,
            ..Default::default()
        };
        for p in &g.steps {
            let (power, floored) = g.power(p, m, oei);
            s.floor_applied |= floored;
            let pm = power * shaft_div;
            let torque = pm * inv_omega;
            let sink = self.sink(p);
            let (cu, fe, mech, current_div) = match &model.losses {
                LossModel::Fitted {
                    k_c, theta_ref_c, ..
                } => {
                    let r = super::motor::resistance_ratio(st.winding.min(w_lim), *theta_ref_c);
                    (k_c * torque * torque * r, c.iron_w, c.other_w, 0.0)
                }
                LossModel::Sized(sz) => {
                    let b = model.flux_factor(st.stator);
                    let rho = super::materials::copper_resistivity(st.winding.min(w_lim));
                    let tb = torque / b;
                    let mech = c.other_w + c.wind_k * p.rho_nu02;
                    (
                        rho * sz.cu_k * tb * tb,
                        b * b * c.iron_w,
                        mech,
                        3.0 * c.emf_v * b,
                    )
                }
            };
            let ls = self.drive.loss_scale;
            let (cu, fe, mech) = (cu * ls, fe * ls, mech * ls);
            let loss = cu + fe + mech;
            let input = pm + loss;
            let elec = input * inv_eta_inv;
            let current = match model.current {
                CurrentModel::None => 0.0,
                CurrentModel::TorqueConstant(kt) => torque / kt,
                CurrentModel::BackEmf => input / current_div,
            };
            match &model.thermal {
                ThermalModel::TwoNode(net) => {
                    let (w, stt) = net.step(&c.prop, (st.winding, st.stator), cu, fe + mech, sink);
                    st.winding = w;
                    st.stator = stt;
                }
                ThermalModel::OneNode(node) => {
                    st.winding = node.step(c.decay, st.winding, loss, sink);
                    st.stator = st.winding;
                }
            }
            st.overload_s = if torque > c.overload_nm {
                st.overload_s + dt
            } else {
                0.0
            };
            s.shaft_j += pm * dt;
            s.torque_ns += torque * dt;
            s.copper_j += cu * dt;
            s.iron_j += fe * dt;
            s.mech_j += mech * dt;
            s.input_j += input * dt;
            s.elec_j += n_active * elec * dt;
            s.prop_j += power * dt;
            s.max_torque_nm = s.max_torque_nm.max(torque);
            s.max_overload_s = s.max_overload_s.max(st.overload_s);
            s.max_current_a = s.max_current_a.max(current);
            s.peak_winding_c = s.peak_winding_c.max(st.winding);
            s.peak_stator_c = s.peak_stator_c.max(st.stator);
            out.max_elec_per_motor_w = out.max_elec_per_motor_w.max(elec);
            out.max_prop_torque_nm = out.max_prop_torque_nm.max(power * inv_prop_omega);
            *time += dt;
            if let Some(tr) = trace.as_deref_mut() {
                tr.push(TracePoint {
                    time_s: *time,
                    segment: i,
                    oei,
                    winding_c: st.winding,
                    stator_c: st.stator,
                    torque_nm: torque,
                    speed_rad_s: c.omega,
                });
            }
        }
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
    let (iron_w, other_w, wind_k, emf_v) = match &model.losses {
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
            (
                s.iron_h * f + s.iron_e * f * f,
                s.bearing_torque_nm * omega,
                wind,
                emf,
            )
        }
    };
    let (prop, decay) = match &model.thermal {
        ThermalModel::TwoNode(net) => (net.propagator(g.dt_s), 0.0),
        ThermalModel::OneNode(node) => (Propagator { m: [[0.0; 2]; 2] }, node.decay(g.dt_s)),
    };
    SegConst {
        omega,
        capability_nm: model.torque_capability(omega),
        overload_nm,
        iron_w,
        other_w,
        wind_k,
        emf_v,
        prop,
        decay,
    }
}
