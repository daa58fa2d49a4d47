//! Flying one candidate through the mission at one takeoff mass (engine.md §2, §5–§7):
//! the time-stepped loop with per-design constants prepared once, allocating nothing.

use super::mission::{MissionGrid, SegmentGrid};
use super::motor::{CurrentModel, LossModel, MotorModel, Sink, ThermalModel};
use super::simd::Vf;

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
    pub(super) pack: Pack<1>,
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
#[derive(Debug, Clone, Default, PartialEq)]
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

impl Flight {
    /// An empty flight with room for every segment row of `grid`'s mission.
    pub fn sized_for(grid: &MissionGrid) -> Flight {
        let oei = grid.oei_runs.iter().map(|&(a, b)| b + 1 - a).sum();
        Flight {
            nominal: Vec::with_capacity(grid.segments.len()),
            oei: Vec::with_capacity(oei),
            ..Flight::default()
        }
    }
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

impl<'a> Prepared<'a> {
    pub fn new(model: &'a MotorModel, drive: Drive, grid: &MissionGrid) -> Prepared<'a> {
        let windage = windage_geometry(model);
        // Segments with the same step length share their thermal propagator.
        let mut props: Vec<(f64, [[f64; 2]; 2])> = Vec::new();
        let segs = grid.segments.iter().map(|g| {
            let prop = match props.iter().find(|(dt, _)| *dt == g.dt_s) {
                Some(&(_, m)) => m,
                None => {
                    let m = propagator(model, g.dt_s);
                    props.push((g.dt_s, m));
                    m
                }
            };
            seg_const(model, &drive, g, windage, prop)
        });
        let kernel = kernel(model);
        let mut pack = Pack::<1>::empty(grid.segments.len());
        pack.set_lane(0, model, &drive, &kernel, segs, grid);
        Prepared { model, drive, pack }
    }

    /// Flies the nominal mission and every OEI run at takeoff mass `m`.
    pub fn fly(
        &self,
        grid: &MissionGrid,
        m: f64,
        out: &mut Flight,
        trace: Option<&mut Vec<TracePoint>>,
    ) {
        match trace {
            Some(tr) => fly_kernel::<f64, 1, 1, true>(
                &self.pack,
                grid,
                [m],
                [out],
                |time_s, segment, oei, w, s, torque| {
                    tr.push(TracePoint {
                        time_s,
                        segment,
                        oei,
                        winding_c: w,
                        stator_c: s,
                        torque_nm: torque,
                        speed_rad_s: self.pack.segs[segment][sk::OMEGA][0],
                    })
                },
            ),
            None => self.fly_as(grid, m, out, Detail::Full),
        }
    }

    /// [`Prepared::fly`] at the given [`Detail`].
    pub fn fly_as(&self, grid: &MissionGrid, m: f64, out: &mut Flight, detail: Detail) {
        match detail {
            Detail::Full => fly_kernel::<f64, 1, 1, true>(&self.pack, grid, [m], [out], no_trace),
            Detail::Closure => {
                fly_kernel::<f64, 1, 1, false>(&self.pack, grid, [m], [out], no_trace)
            }
        }
    }
}

/// What a flight works out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Detail {
    /// Every figure of [`SegStats`].
    Full,
    /// Only what the mass closure reads — the battery energy and the peak electrical
    /// power and propeller torque, with the thermal state they depend on — computed by the
    /// very same operations as in a full flight; no segment rows (`nominal` and `oei`
    /// stay empty), no peaks of temperature, current or overload.
    Closure,
}

/// The number of designs flown in lockstep by [`Group`].
pub const GROUP: usize = 8;

/// [`GROUP`] prepared designs laid out lane by lane, flown through the mission together.
pub struct Group<'a> {
    preps: [&'a Prepared<'a>; GROUP],
    pack: Pack<GROUP>,
}

impl<'a> Group<'a> {
    pub fn new(preps: [&'a Prepared<'a>; GROUP]) -> Group<'a> {
        // Written lane by lane in one pass (no zeroed buffer first).
        let segs = (0..preps[0].pack.segs.len())
            .map(|i| std::array::from_fn(|k| std::array::from_fn(|l| preps[l].pack.segs[i][k][0])))
            .collect();
        let design = std::array::from_fn(|k| std::array::from_fn(|l| preps[l].pack.design[k][0]));
        Group {
            preps,
            pack: Pack { design, segs },
        }
    }

    pub fn prepared(&self, l: usize) -> &'a Prepared<'a> {
        self.preps[l]
    }

    /// Flies every design of the group at its own takeoff mass; each lane gets the same
    /// numbers as [`Prepared::fly`] would give it. Four designs share each AVX register
    /// where the processor has AVX2.
    pub fn fly(&self, grid: &MissionGrid, m: [f64; GROUP], outs: [&mut Flight; GROUP]) {
        self.fly_as(grid, m, outs, Detail::Full)
    }

    /// [`Group::fly`] at the given [`Detail`].
    pub fn fly_as(
        &self,
        grid: &MissionGrid,
        m: [f64; GROUP],
        outs: [&mut Flight; GROUP],
        detail: Detail,
    ) {
        #[cfg(target_arch = "x86_64")]
        {
            if std::arch::is_x86_feature_detected!("avx2") {
                // SAFETY: the processor was just found to support AVX2.
                unsafe { fly_group_avx2(&self.pack, grid, m, outs, detail) };
                return;
            }
        }
        self.fly_portable(grid, m, outs, detail);
    }

    /// [`Group::fly_as`] without vector instructions (the path of processors without
    /// AVX2): the same operations lane by lane, so the same numbers.
    pub fn fly_portable(
        &self,
        grid: &MissionGrid,
        m: [f64; GROUP],
        outs: [&mut Flight; GROUP],
        detail: Detail,
    ) {
        match detail {
            Detail::Full => {
                fly_kernel::<f64, GROUP, GROUP, true>(&self.pack, grid, m, outs, no_trace)
            }
            Detail::Closure => {
                fly_kernel::<f64, GROUP, GROUP, false>(&self.pack, grid, m, outs, no_trace)
            }
        }
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn fly_group_avx2(
    pack: &Pack<GROUP>,
    grid: &MissionGrid,
    m: [f64; GROUP],
    outs: [&mut Flight; GROUP],
    detail: Detail,
) {
    use super::simd::F4;
    match detail {
        Detail::Full => fly_kernel::<F4, { GROUP / 4 }, GROUP, true>(pack, grid, m, outs, no_trace),
        Detail::Closure => {
            fly_kernel::<F4, { GROUP / 4 }, GROUP, false>(pack, grid, m, outs, no_trace)
        }
    }
}

#[inline(always)]
fn no_trace(_: f64, _: usize, _: bool, _: f64, _: f64, _: f64) {}

/// Indices of the per-design constants of a [`Pack`].
pub(super) mod dk {
    pub const SHAFT_DIV_NOMINAL: usize = 0;
    pub const SHAFT_DIV_OEI: usize = 1;
    pub const INV_ETA_INV: usize = 2;
    pub const B0: usize = 3;
    pub const ALPHA_BR: usize = 4;
    pub const MAGNET_CAP: usize = 5;
    pub const WINDING_CAP: usize = 6;
    pub const CU0: usize = 7;
    pub const CU1: usize = 8;
    pub const CUR_NM: usize = 9;
    pub const INV_GSC: usize = 10;
    pub const AIR_W: usize = 11;
    pub const SINK_C: usize = 12;
    pub const INITIAL_C: usize = 13;
    pub const ETA_B: usize = 14;
    pub const COUNT: usize = 15;
}

/// Indices of the per-segment constants of a [`Pack`].
pub(super) mod sk {
    pub const INV_OMEGA: usize = 0;
    pub const IRON: usize = 1;
    pub const OTHER: usize = 2;
    pub const WIND: usize = 3;
    pub const CUR_W: usize = 4;
    pub const OVERLOAD: usize = 5;
    pub const M00: usize = 6;
    pub const M01: usize = 7;
    pub const M10: usize = 8;
    pub const M11: usize = 9;
    pub const AW: usize = 10;
    pub const QW: usize = 11;
    pub const AS: usize = 12;
    pub const QS: usize = 13;
    /// Read once per segment, for its row.
    pub const OMEGA: usize = 14;
    pub const CAPABILITY: usize = 15;
    pub const COUNT: usize = 16;
}

/// The constants of L designs, each one an array over the lanes, so that the step loop
/// loads every constant of several designs with one instruction.
#[derive(Clone)]
pub(super) struct Pack<const L: usize> {
    pub(super) design: [[f64; L]; dk::COUNT],
    pub(super) segs: Vec<[[f64; L]; sk::COUNT]>,
}

impl<const L: usize> Pack<L> {
    fn empty(segments: usize) -> Self {
        Pack {
            design: [[0.0; L]; dk::COUNT],
            segs: vec![[[0.0; L]; sk::COUNT]; segments],
        }
    }

    fn set_lane(
        &mut self,
        l: usize,
        model: &MotorModel,
        drive: &Drive,
        k: &Kernel,
        segs: impl IntoIterator<Item = SegConst>,
        grid: &MissionGrid,
    ) {
        let alpha = super::materials::CU_ALPHA_PER_K;
        let n = grid.motor_count as f64;
        let initial = drive.preflight_c.unwrap_or(match model.sink {
            Sink::Air => grid.segments[0].steps[0].air_temp_c,
            Sink::Liquid(t) => t,
        });
        let d = &mut self.design;
        d[dk::SHAFT_DIV_NOMINAL][l] = 1.0 / (n * drive.gear_efficiency);
        d[dk::SHAFT_DIV_OEI][l] = 1.0 / ((n - 1.0) * drive.gear_efficiency);
        d[dk::INV_ETA_INV][l] = 1.0 / drive.inverter_efficiency;
        // b = 1 + α_Br(θ_s − 20) and ρ(θ_w) ∝ 1 + α_Cu(θ_w − 20) as one multiply-add each.
        d[dk::B0][l] = 1.0 - 20.0 * k.alpha_br;
        d[dk::ALPHA_BR][l] = k.alpha_br;
        d[dk::MAGNET_CAP][l] = k.magnet_cap;
        d[dk::WINDING_CAP][l] = k.winding_cap;
        d[dk::CU0][l] = drive.loss_scale * k.cu_a * (1.0 - 20.0 * alpha);
        d[dk::CU1][l] = drive.loss_scale * k.cu_a * alpha;
        d[dk::CUR_NM][l] = k.current_per_nm;
        d[dk::INV_GSC][l] = k.inv_gsc;
        d[dk::AIR_W][l] = k.air_weight;
        d[dk::SINK_C][l] = k.sink_const;
        d[dk::INITIAL_C][l] = initial;
        d[dk::ETA_B][l] = drive.battery_efficiency;
        for (p, c) in self.segs.iter_mut().zip(segs) {
            let [[m00, m01], [m10, m11]] = c.prop;
            let g2 = k.inv_gws;
            p[sk::INV_OMEGA][l] = 1.0 / c.omega;
            p[sk::OMEGA][l] = c.omega;
            p[sk::CAPABILITY][l] = c.capability_nm;
            p[sk::IRON][l] = drive.loss_scale * c.iron_w;
            p[sk::OTHER][l] = drive.loss_scale * c.other_w;
            p[sk::WIND][l] = drive.loss_scale * c.wind_k;
            p[sk::CUR_W][l] = c.current_per_w;
            p[sk::OVERLOAD][l] = c.overload_nm;
            p[sk::M00][l] = m00;
            p[sk::M01][l] = m01;
            p[sk::M10][l] = m10;
            p[sk::M11][l] = m11;
            // Exact step x' = x_eq + M·(x − x_eq) with the equilibrium of the step's
            // losses, θ_s,eq = sink + (P_cu + P_rest)/G_sc and θ_w,eq = θ_s,eq + P_cu/G_ws:
            //   θ_w' = M00·θ_w + M01·θ_s + a_w·e0 + q_w·P_cu,
            //   θ_s' = M10·θ_w + M11·θ_s + a_s·e0 + q_s·P_cu,
            // with e0 = sink + P_rest/G_sc, a = 1 − row sum of M, q = a/G_sc + (coupling
            // of P_cu through 1/G_ws), so that only one multiply-add waits for P_cu.
            let (aw, a_s) = (1.0 - m00 - m01, 1.0 - m10 - m11);
            p[sk::AW][l] = aw;
            p[sk::QW][l] = aw * k.inv_gsc + (1.0 - m00) * g2;
            p[sk::AS][l] = a_s;
            p[sk::QS][l] = a_s * k.inv_gsc - m10 * g2;
        }
    }
}

/// The thermal and overload state of K vectors of designs.
#[derive(Clone, Copy)]
struct State<V, const K: usize> {
    winding: [V; K],
    stator: [V; K],
    overload_s: [V; K],
}

/// Flies the L = K·V::N designs of `pack` through the same mission in lockstep, each lane
/// with exactly the arithmetic of one design alone. `trace` sees lane 0 at every step.
#[inline(always)]
fn fly_kernel<V: Vf, const K: usize, const L: usize, const FULL: bool>(
    pack: &Pack<L>,
    grid: &MissionGrid,
    m: [f64; L],
    mut outs: [&mut Flight; L],
    mut trace: impl FnMut(f64, usize, bool, f64, f64, f64),
) {
    assert_eq!(K * V::N, L, "lanes");
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
    let init: [V; K] = std::array::from_fn(|j| V::load(&pack.design[dk::INITIAL_C], j * V::N));
    let zero = [V::splat(0.0); K];
    let mut state = State {
        winding: init,
        stator: init,
        overload_s: zero,
    };
    let mut starts: Vec<State<V, K>> = Vec::with_capacity(grid.segments.len());
    let mut time = 0.0;
    for (i, g) in grid.segments.iter().enumerate() {
        starts.push(state);
        let stats = segment_kernel::<V, K, L, FULL>(
            pack, g, i, &m, n, false, &mut state, &mut outs, &mut time, &mut trace,
        );
        for (out, s) in outs.iter_mut().zip(stats) {
            out.battery_j += s.battery_j;
            out.prop_j += s.prop_j;
            if FULL {
                out.nominal.push(s);
            }
        }
    }
    for &(a, b) in &grid.oei_runs {
        let mut st = starts[a];
        let mut t = grid.segments[..a].iter().map(|g| g.duration_s).sum::<f64>();
        for (i, g) in grid.segments.iter().enumerate().take(b + 1).skip(a) {
            let stats = segment_kernel::<V, K, L, FULL>(
                pack,
                g,
                i,
                &m,
                n - 1.0,
                true,
                &mut st,
                &mut outs,
                &mut t,
                &mut trace,
            );
            if FULL {
                for (out, s) in outs.iter_mut().zip(stats) {
                    out.oei.push((i, s));
                }
            }
        }
    }
}

#[allow(clippy::too_many_arguments)]
#[inline(always)]
fn segment_kernel<V: Vf, const K: usize, const L: usize, const FULL: bool>(
    pack: &Pack<L>,
    g: &SegmentGrid,
    i: usize,
    m: &[f64; L],
    n_active: f64,
    oei: bool,
    st: &mut State<V, K>,
    outs: &mut [&mut Flight; L],
    time: &mut f64,
    trace: &mut impl FnMut(f64, usize, bool, f64, f64, f64),
) -> [SegStats; L] {
    let d = &pack.design;
    let c = &pack.segs[i];
    let ld = |k: usize, j: usize| V::load(&d[k], j * V::N);
    let lc = |k: usize, j: usize| V::load(&c[k], j * V::N);
    let shaft_div = if oei {
        dk::SHAFT_DIV_OEI
    } else {
        dk::SHAFT_DIV_NOMINAL
    };
    let dt = V::splat(g.dt_s);
    let floor = V::splat(g.floor_w);
    let point_one = V::splat(0.1);
    let one = V::splat(1.0);
    let mass: [V; K] = std::array::from_fn(|j| V::load(m, j * V::N));
    let z = [V::splat(0.0); K];
    // Only what cannot be had from other sums at the segment's end is accumulated per
    // step: shaft power and torque follow from the propeller power (constant factors),
    // the mechanical loss from Σ ρ·ν^0.2, the input from its parts.
    let (mut cu_j, mut fe_j, mut prop_j) = (z, z, z);
    let (mut max_o, mut max_i, mut max_in, mut max_p) = (z, z, z, z);
    let mut min_raw = [V::splat(f64::INFINITY); K];
    let (mut w, mut ss, mut ov) = (st.winding, st.stator, st.overload_s);
    let (mut pk_w, mut pk_s) = (w, ss);
    let mut t_now = *time;
    for p in &g.steps {
        let c0 = V::splat(if oei { p.c0_oei } else { p.c0 });
        let (c1, c2) = (V::splat(p.c1), V::splat(p.c2));
        let air = V::splat(p.air_temp_c);
        let rho_nu02 = V::splat(p.rho_nu02);
        // Operation by operation over the K vectors, so that the K independent chains sit
        // side by side in the instruction stream and overlap in the processor.
        macro_rules! each {
            ($j:ident => $e:expr) => {
                for $j in 0..K {
                    $e;
                }
            };
        }
        let v = || [V::splat(0.0); K];
        let (mut power, mut pm, mut torque, mut b, mut inv_b) = (v(), v(), v(), v(), v());
        let (mut cu, mut rest, mut input, mut current, mut e0) = (v(), v(), v(), v(), v());
        each!(j => {
            let raw = c0 + mass[j] * (c1 + mass[j] * c2);
            if FULL {
                min_raw[j] = min_raw[j].min(raw);
            }
            power[j] = raw.max(floor);
        });
        each!(j => pm[j] = power[j] * ld(shaft_div, j));
        each!(j => torque[j] = pm[j] * lc(sk::INV_OMEGA, j));
        // Flux derating from the stator temperature at the step's start.
        each!(j => b[j] = (ld(dk::B0, j) + ld(dk::ALPHA_BR, j) * ss[j].min(ld(dk::MAGNET_CAP, j)))
            .max(point_one));
        each!(j => inv_b[j] = one / b[j]);
        // Copper: (cu0 + cu1·θ_w)·T² / b², the temperature and torque terms formed while
        // the division is under way.
        each!(j => {
            let coef = (ld(dk::CU0, j) + ld(dk::CU1, j) * w[j].min(ld(dk::WINDING_CAP, j)))
                * (torque[j] * torque[j]);
            cu[j] = coef * (inv_b[j] * inv_b[j]);
        });
        each!(j => {
            let fe = b[j] * b[j] * lc(sk::IRON, j);
            let mech = lc(sk::OTHER, j) + lc(sk::WIND, j) * rho_nu02;
            fe_j[j] = fe_j[j] + fe;
            rest[j] = fe + mech;
        });
        each!(j => {
            let loss = cu[j] + rest[j];
            input[j] = pm[j] + loss;
            if FULL {
                current[j] =
                    input[j] * lc(sk::CUR_W, j) * inv_b[j] + torque[j] * ld(dk::CUR_NM, j);
            }
        });
        // Exact thermal step (see `Pack::set_lane`): the parts that do not wait for the
        // copper loss first, then one multiply-add of it per node.
        each!(j => {
            let sink = ld(dk::AIR_W, j) * air + ld(dk::SINK_C, j);
            e0[j] = sink + rest[j] * ld(dk::INV_GSC, j);
        });
        each!(j => {
            let pw = (lc(sk::M00, j) * w[j] + lc(sk::M01, j) * ss[j]) + lc(sk::AW, j) * e0[j];
            let ps = (lc(sk::M10, j) * w[j] + lc(sk::M11, j) * ss[j]) + lc(sk::AS, j) * e0[j];
            w[j] = pw + lc(sk::QW, j) * cu[j];
            ss[j] = ps + lc(sk::QS, j) * cu[j];
        });
        each!(j => {
            if FULL {
                ov[j] = torque[j].gt_or_zero(lc(sk::OVERLOAD, j), ov[j] + dt);
                max_o[j] = max_o[j].max(ov[j]);
                max_i[j] = max_i[j].max(current[j]);
                pk_w[j] = pk_w[j].max(w[j]);
                pk_s[j] = pk_s[j].max(ss[j]);
            }
            cu_j[j] = cu_j[j] + cu[j];
            prop_j[j] = prop_j[j] + power[j];
            max_in[j] = max_in[j].max(input[j]);
            max_p[j] = max_p[j].max(power[j]);
        });
        let torque0 = torque[0].first();
        t_now += g.dt_s;
        trace(t_now, i, oei, w[0].first(), ss[0].first(), torque0);
    }
    *time = t_now;
    *st = State {
        winding: w,
        stator: ss,
        overload_s: ov,
    };
    let lanes = |v: &[V; K]| -> [f64; L] {
        let mut a = [0.0; L];
        for (j, x) in v.iter().enumerate() {
            x.store(&mut a, j * V::N);
        }
        a
    };
    let (cu_j, fe_j, prop_j) = (lanes(&cu_j), lanes(&fe_j), lanes(&prop_j));
    let (max_o, max_i, max_in, max_p) =
        (lanes(&max_o), lanes(&max_i), lanes(&max_in), lanes(&max_p));
    let (min_raw, pk_w, pk_s, w, ss) = (
        lanes(&min_raw),
        lanes(&pk_w),
        lanes(&pk_s),
        lanes(&w),
        lanes(&ss),
    );
    let dt = g.dt_s;
    let inv_prop_omega = 1.0 / (n_active * g.prop_omega);
    let steps = g.steps.len() as f64;
    std::array::from_fn(|l| {
        let inv_eta_inv = d[dk::INV_ETA_INV][l];
        let (shaft_div, inv_omega) = (d[shaft_div][l], c[sk::INV_OMEGA][l]);
        let out = &mut outs[l];
        // max(x·c) = max(x)·c for c > 0: rounding is monotonic.
        out.max_elec_per_motor_w = out.max_elec_per_motor_w.max(max_in[l] * inv_eta_inv);
        out.max_prop_torque_nm = out.max_prop_torque_nm.max(max_p[l] * inv_prop_omega);
        // Every step has the same length: the integrals are the sums times Δt.
        let shaft = prop_j[l] * shaft_div;
        let mech = c[sk::OTHER][l] * steps + c[sk::WIND][l] * g.rho_nu02_sum;
        let input = shaft + cu_j[l] + fe_j[l] + mech;
        let elec_j = n_active * (input * inv_eta_inv) * dt;
        SegStats {
            duration_s: g.duration_s,
            motors: n_active,
            omega: c[sk::OMEGA][l],
            capability_nm: c[sk::CAPABILITY][l],
            shaft_j: shaft * dt,
            torque_ns: shaft * inv_omega * dt,
            copper_j: cu_j[l] * dt,
            iron_j: fe_j[l] * dt,
            mech_j: mech * dt,
            input_j: input * dt,
            elec_j,
            battery_j: elec_j / d[dk::ETA_B][l],
            prop_j: prop_j[l] * dt,
            max_torque_nm: max_p[l] * shaft_div * inv_omega,
            max_overload_s: if FULL { max_o[l] } else { f64::NAN },
            max_current_a: if FULL { max_i[l] } else { f64::NAN },
            peak_winding_c: if FULL { pk_w[l] } else { f64::NAN },
            peak_stator_c: if FULL { pk_s[l] } else { f64::NAN },
            end_winding_c: w[l],
            end_stator_c: ss[l],
            floor_applied: FULL && min_raw[l] < g.floor_w,
        }
    })
}

/// The speed-free factor of the windage laws (§6): P_wind = ω^2.8 · ρ·ν^0.2 · this, W.
/// Von Kármán's free-disc moment for each rotating disc face pair, and the Taylor–Couette
/// cylinder in its gap where the rotor has one.
fn windage_geometry(model: &MotorModel) -> f64 {
    match &model.losses {
        LossModel::Fitted { .. } => 0.0,
        LossModel::Sized(s) => {
            let discs: f64 = s
                .disc_radii_m
                .iter()
                .map(|r| 0.5 * 0.146 * r.powf(4.6))
                .sum();
            let cylinder = s.cylinder.map_or(0.0, |cyl| {
                std::f64::consts::PI
                    * 0.0325
                    * cyl.radius_m.powf(3.8)
                    * cyl.length_m
                    * cyl.gap_m.powf(-0.2)
            });
            discs + cylinder
        }
    }
}

/// The step propagator of a model's thermal state (for one node: its decay on both rows,
/// so that the stator reading follows the winding).
fn propagator(model: &MotorModel, dt_s: f64) -> [[f64; 2]; 2] {
    match &model.thermal {
        ThermalModel::TwoNode(net) => net.propagator(dt_s).m,
        ThermalModel::OneNode(node) => {
            let d = node.decay(dt_s);
            [[d, 0.0], [d, 0.0]]
        }
    }
}

fn seg_const(
    model: &MotorModel,
    drive: &Drive,
    g: &SegmentGrid,
    windage: f64,
    prop: [[f64; 2]; 2],
) -> SegConst {
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
            // Direct drive turns at the propeller's speed, whose ω^2.8 the grid holds.
            let omega_28 = match drive.gear_ratio == 1.0 {
                true => g.prop_omega_pow_2_8,
                false => omega.powf(2.8),
            };
            let wind = omega_28 * windage;
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
