//! Mass closure (engine.md §8): the smallest takeoff mass at which the sum of the parts,
//! after flying the mission at that mass, equals the mass flown.

use super::bound;
use super::fly::{Detail, Flight, GROUP, Group, Prepared};
use super::mission::MissionGrid;
use super::study::{BatteryMode, Study};

/// Aircraft-level constants of the closure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AircraftConst {
    pub airframe_kg: f64,
    pub payload_kg: f64,
    pub mtom_kg: f64,
    pub motors: f64,
    /// Usable energy per kg of pack: e·u·f_eol, J/kg.
    pub usable_j_per_kg: f64,
    /// Fixed battery mass, or `None` when sized.
    pub fixed_battery_kg: Option<f64>,
    /// Inverter specific power, W/kg.
    pub inverter_w_per_kg: f64,
    /// Gearbox specific torque, N·m/kg (`None` for direct drive).
    pub gearbox_nm_per_kg: Option<f64>,
}

impl AircraftConst {
    pub fn new(study: &Study, geared: bool) -> AircraftConst {
        let a = &study.aircraft;
        let b = &a.battery;
        let e = b.specific_energy_wh_per_kg * 3600.0;
        let u = b.usable_fraction.unwrap_or(0.9) * b.end_of_life_fraction.unwrap_or(0.8);
        AircraftConst {
            airframe_kg: a.airframe_mass_kg,
            payload_kg: a.payload_kg,
            mtom_kg: a.max_takeoff_mass_kg,
            motors: a.motor_count as f64,
            usable_j_per_kg: e * u,
            fixed_battery_kg: match b.mode {
                BatteryMode::Fixed => b.mass_kg,
                BatteryMode::Sized => None,
            },
            inverter_w_per_kg: a.inverter_specific_power_kw_per_kg.unwrap_or(20.0) * 1000.0,
            gearbox_nm_per_kg: geared.then(|| a.gearbox_specific_torque_nm_per_kg.unwrap_or(60.0)),
        }
    }
}

/// The masses that follow from one flight.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Parts {
    pub sum_kg: f64,
    pub battery_kg: f64,
    /// Per motor.
    pub inverter_kg: f64,
    pub gearbox_kg: f64,
}

pub fn parts(ac: &AircraftConst, motor_kg: f64, f: &Flight) -> Parts {
    parts_from(
        ac,
        motor_kg,
        f.battery_j,
        f.max_elec_per_motor_w,
        f.max_prop_torque_nm,
    )
}

/// [`parts`] from a flight's battery energy (J), highest electrical power per motor (W)
/// and highest propeller torque per motor (N·m).
pub fn parts_from(
    ac: &AircraftConst,
    motor_kg: f64,
    battery_j: f64,
    max_elec_per_motor_w: f64,
    max_prop_torque_nm: f64,
) -> Parts {
    let inverter_kg = max_elec_per_motor_w / ac.inverter_w_per_kg;
    let gearbox_kg = ac.gearbox_nm_per_kg.map_or(0.0, |k| max_prop_torque_nm / k);
    let battery_kg = ac
        .fixed_battery_kg
        .unwrap_or(battery_j / ac.usable_j_per_kg);
    Parts {
        sum_kg: ac.airframe_kg
            + ac.payload_kg
            + ac.motors * (motor_kg + inverter_kg + gearbox_kg)
            + battery_kg,
        battery_kg,
        inverter_kg,
        gearbox_kg,
    }
}

/// The outcome of the closure; the caller's flight buffer then holds the flight at the
/// closing mass (or at the maximum takeoff mass when it does not close).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Closure {
    pub converged: bool,
    pub takeoff_mass_kg: f64,
    pub parts: Parts,
    pub iterations: usize,
}

const TOLERANCE_KG: f64 = 0.01;
const MAX_ITERATIONS: usize = 200;

/// What the closure wants next: a flight at this mass, or it is done.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Next {
    Fly(f64),
    Done(Closure),
}

/// The closure as a state machine over flights, so that one design or several flown in
/// lockstep share the same iteration.
///
/// It finds the smallest root of F(m) = m from below: fixed-point steps (which rise
/// monotonically to that root because F increases with m), accelerated by secant steps
/// that are kept only when they land where F(m) ≥ m, i.e. still below the root. No root
/// below 3 × the maximum takeoff mass, a non-finite sum or too many iterations end it
/// with one last flight at the maximum takeoff mass.
#[derive(Debug, Clone, Copy)]
pub struct Closer {
    ac: AircraftConst,
    motor_kg: f64,
    m: f64,
    /// m₀ of engine.md §8, where the closure starts over should it ever find itself above
    /// the root with no point below it.
    m0: f64,
    /// The slope of F for the first step (see [`bound::closure_start`]), used once.
    slope: Option<f64>,
    /// The last two points below the root, (m, F(m) − m), older first.
    prev: [Option<(f64, f64)>; 2],
    evals: usize,
    at_mtom: bool,
    /// Whether the next flight is likely the last (see [`Closer::detail_next`]).
    last_likely: bool,
}

/// A step this small (or a quadratic one) usually lands within the tolerance: the flight
/// after it is flown in full detail, the ones before only for the closure.
const FINAL_APPROACH_KG: f64 = 5.0;

impl Closer {
    /// The closure of a prepared design, and the first mass to fly: not m₀ itself but
    /// the root of a lower bound of F found from m₀ ([`bound`]), which fixed-point steps
    /// from m₀ would pass on their way up (a reading of §8: the same root is found, from
    /// below, in fewer flights).
    pub fn start(ac: &AircraftConst, prep: &Prepared, grid: &MissionGrid) -> (Closer, f64) {
        let motor_kg = prep.model.mass_kg;
        let m0 = ac.airframe_kg
            + ac.payload_kg
            + ac.motors * motor_kg
            + ac.fixed_battery_kg.unwrap_or(0.0);
        let start = bound::closure_start(&grid.bound, prep, ac, m0);
        let m = start.mass_kg;
        (
            Closer {
                ac: *ac,
                motor_kg,
                m,
                m0,
                slope: start.slope,
                prev: [None; 2],
                evals: 0,
                at_mtom: false,
                last_likely: false,
            },
            m,
        )
    }

    /// The detail the next flight needs: in full when it is likely the last one (the
    /// flight at the maximum takeoff mass, after a quadratic step or a step under
    /// [`FINAL_APPROACH_KG`]), else only what the closure reads. The closure's numbers
    /// are the same either way; a closure that ends on a closure-only flight is flown
    /// once more, in full, at the same mass.
    pub fn detail_next(&self) -> Detail {
        if self.last_likely {
            Detail::Full
        } else {
            Detail::Closure
        }
    }

    /// Takes the flight at the mass last asked for and says what comes next.
    pub fn after(&mut self, flight: &Flight) -> Next {
        let flown = self.m;
        let (next, quadratic) = self.step(flight);
        if let Next::Fly(m) = next {
            self.last_likely = self.at_mtom || quadratic || (m - flown).abs() < FINAL_APPROACH_KG;
        }
        next
    }

    /// The iteration proper; also says whether the next mass came from a quadratic step.
    fn step(&mut self, flight: &Flight) -> (Next, bool) {
        let ac = &self.ac;
        let p = parts(ac, self.motor_kg, flight);
        if self.at_mtom {
            let done = Closure {
                converged: false,
                takeoff_mass_kg: ac.mtom_kg,
                parts: p,
                iterations: self.evals,
            };
            return (Next::Done(done), false);
        }
        self.evals += 1;
        let (m, g) = (self.m, p.sum_kg - self.m);
        let ceiling = 3.0 * ac.mtom_kg;
        if !p.sum_kg.is_finite() || p.sum_kg > ceiling || self.evals >= MAX_ITERATIONS {
            self.at_mtom = true;
            return (Next::Fly(ac.mtom_kg), false);
        }
        if g.abs() < TOLERANCE_KG {
            let done = Closure {
                converged: true,
                takeoff_mass_kg: p.sum_kg,
                parts: p,
                iterations: self.evals,
            };
            return (Next::Done(done), false);
        }
        if g < 0.0 && self.prev[1].is_none() && m != self.m0 {
            // Above the root with no point below it (the start was not below the root,
            // which the bound rules out): start over from m₀.
            self.slope = None;
            self.m = self.m0;
            return (Next::Fly(self.m), false);
        }
        if g < 0.0 {
            // A secant step went past the root: step back to the last point below it.
            let (m0, g0) = self.prev[1].unwrap_or((m, 0.0));
            self.prev = [None; 2];
            self.m = m0 + g0;
            return (Next::Fly(self.m), false);
        }
        // The fixed-point step F(m), or an accelerated step beyond it that stays finite
        // and below the ceiling (one past the root is caught by the next flight, g < 0).
        // From the first point, the step along the bound's slope (F_lb' a little under F'
        // near the root, so it stays short of the root, see [`bound`]).
        let hint = match (self.slope.take(), self.prev[1]) {
            (Some(s), None) => Some(m + g / (1.0 - s)),
            _ => None,
        };
        let [quadratic, secant] = accelerated(self.prev, (m, g));
        let (next, is_quadratic) = [(quadratic, true), (secant, false), (hint, false)]
            .into_iter()
            .find_map(|(x, q)| {
                x.filter(|&x| x.is_finite() && x > p.sum_kg && x <= ceiling)
                    .map(|x| (x, q))
            })
            .unwrap_or((p.sum_kg, false));
        self.prev = [self.prev[1], Some((m, g))];
        self.m = next;
        (Next::Fly(next), is_quadratic)
    }
}

/// Accelerated next masses from the points below the root, rising towards it (m up, g
/// down), best first: inverse quadratic interpolation of m(g) at g = 0 through the last
/// three points, then the secant through the last two (engine.md §8 allows a secant step;
/// the quadratic one is the same idea one order higher and, near the root, lands within
/// the tolerance one flight sooner). `None` where the points do not rise to the root.
fn accelerated(prev: [Option<(f64, f64)>; 2], (m, g): (f64, f64)) -> [Option<f64>; 2] {
    let rising = |(ma, ga): (f64, f64), (mb, gb): (f64, f64)| ga > gb && mb > ma;
    let secant = prev[1]
        .filter(|&b| rising(b, (m, g)))
        .map(|(m0, g0)| m + g * (m - m0) / (g0 - g));
    let quadratic = match prev {
        [Some(a), Some(b)] if rising(a, b) && rising(b, (m, g)) => {
            let ((ma, ga), (mb, gb)) = (a, b);
            Some(
                ma * gb * g / ((ga - gb) * (ga - g))
                    + mb * ga * g / ((gb - ga) * (gb - g))
                    + m * ga * gb / ((g - ga) * (g - gb)),
            )
        }
        _ => None,
    };
    [quadratic, secant]
}

/// Closes the mass of one design; `flight` then holds the flight at the closing mass (or
/// at the maximum takeoff mass when it does not close).
pub fn close(
    grid: &MissionGrid,
    prep: &Prepared,
    ac: &AircraftConst,
    flight: &mut Flight,
) -> Closure {
    let (mut closer, mut m) = Closer::start(ac, prep, grid);
    let mut detail = Detail::Closure;
    loop {
        prep.fly_as(grid, m, flight, detail);
        match closer.after(flight) {
            Next::Fly(next) => {
                m = next;
                detail = closer.detail_next();
            }
            Next::Done(c) => {
                if detail != Detail::Full {
                    prep.fly_as(grid, m, flight, Detail::Full);
                }
                return c;
            }
        }
    }
}

/// Closes the masses of a lockstep group of designs together: each keeps its own
/// closure, and every round flies them all in lockstep (a design already closed flies
/// along unused). Each `flights[l]` then holds design l's final flight, as [`close`]
/// would leave it.
pub fn close_group(
    grid: &MissionGrid,
    group: &Group,
    acs: [&AircraftConst; GROUP],
    flights: &mut [Flight; GROUP],
) -> [Closure; GROUP] {
    #[derive(Clone, Copy)]
    enum Lane {
        Iterating(Detail),
        /// Closed on a closure-only flight: flown once more, in full, at the same mass.
        Refly(Closure),
        Done(Closure),
    }
    let starts: [(Closer, f64); GROUP] =
        std::array::from_fn(|l| Closer::start(acs[l], group.prepared(l), grid));
    let mut closers: [Closer; GROUP] = std::array::from_fn(|l| starts[l].0);
    let mut masses: [f64; GROUP] = std::array::from_fn(|l| starts[l].1);
    let mut lanes = [Lane::Iterating(Detail::Closure); GROUP];
    let mut finals: [Option<Flight>; GROUP] = std::array::from_fn(|_| None);
    let pending = |lanes: &[Lane; GROUP]| lanes.iter().any(|s| !matches!(s, Lane::Done(_)));
    while pending(&lanes) {
        // One lane that needs the full figures makes the round a full one: the closure's
        // numbers are the same in either detail.
        let detail = match lanes
            .iter()
            .any(|s| matches!(s, Lane::Iterating(Detail::Full) | Lane::Refly(_)))
        {
            true => Detail::Full,
            false => Detail::Closure,
        };
        group.fly_as(grid, masses, flights.each_mut(), detail);
        for l in 0..GROUP {
            let finished = match lanes[l] {
                Lane::Done(_) => continue,
                Lane::Refly(c) => c,
                Lane::Iterating(_) => match closers[l].after(&flights[l]) {
                    Next::Fly(m) => {
                        masses[l] = m;
                        lanes[l] = Lane::Iterating(closers[l].detail_next());
                        continue;
                    }
                    Next::Done(c) if detail != Detail::Full => {
                        lanes[l] = Lane::Refly(c);
                        continue;
                    }
                    Next::Done(c) => c,
                },
            };
            lanes[l] = Lane::Done(finished);
            if pending(&lanes) {
                finals[l] = Some(std::mem::take(&mut flights[l]));
            }
        }
    }
    for (f, fin) in flights.iter_mut().zip(finals) {
        if let Some(fin) = fin {
            *f = fin;
        }
    }
    lanes.map(|s| match s {
        Lane::Done(c) => c,
        _ => Closure::default(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A closure over a made-up linear F(m) = 500 kg + 0.3·m (all of it "battery"), so
    /// that the iteration can be followed by hand; the root is 500/0.7 kg.
    fn linear_closer(start_kg: f64, slope: Option<f64>) -> (Closer, impl Fn(f64) -> Flight) {
        let ac = AircraftConst {
            airframe_kg: 400.0,
            payload_kg: 100.0,
            mtom_kg: 1000.0,
            motors: 2.0,
            usable_j_per_kg: 1.0,
            fixed_battery_kg: None,
            inverter_w_per_kg: f64::INFINITY,
            gearbox_nm_per_kg: None,
        };
        let closer = Closer {
            ac,
            motor_kg: 0.0,
            m: start_kg,
            m0: 500.0,
            slope,
            prev: [None; 2],
            evals: 0,
            at_mtom: false,
            last_likely: false,
        };
        let fly = |m: f64| Flight {
            mass_kg: m,
            battery_j: 0.3 * m,
            ..Flight::default()
        };
        (closer, fly)
    }

    fn run(mut closer: Closer, fly: impl Fn(f64) -> Flight) -> (Closure, Vec<f64>) {
        let mut flown = vec![closer.m];
        loop {
            match closer.after(&fly(closer.m)) {
                Next::Fly(m) => flown.push(m),
                Next::Done(c) => return (c, flown),
            }
        }
    }

    #[test]
    fn a_start_above_the_root_starts_over_from_m0_and_still_closes_on_the_root() {
        let (closer, fly) = linear_closer(900.0, Some(0.3));
        let (c, flown) = run(closer, fly);
        assert_eq!(flown[1], 500.0, "second flight at m0: {flown:?}");
        assert!(c.converged);
        assert!((c.takeoff_mass_kg - 500.0 / 0.7).abs() < TOLERANCE_KG);
    }

    #[test]
    fn the_bound_slope_step_lands_on_a_linear_root_in_one_step() {
        // With F's own slope the first step is Newton's: exact for a linear F.
        let (closer, fly) = linear_closer(600.0, Some(0.3));
        let (c, flown) = run(closer, fly);
        assert_eq!(flown.len(), 2, "{flown:?}");
        assert!((c.takeoff_mass_kg - 500.0 / 0.7).abs() < 1e-9);
        // Without it, fixed-point and secant steps: one flight more.
        let (closer, fly) = linear_closer(600.0, None);
        let (c, flown) = run(closer, fly);
        assert_eq!(flown.len(), 3, "{flown:?}");
        assert!((c.takeoff_mass_kg - 500.0 / 0.7).abs() < TOLERANCE_KG);
    }
}
