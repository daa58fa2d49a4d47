//! The engine benchmark behind `shaftline bench`: printed figures, never assertions.

use std::time::{Duration, Instant};

use rayon::prelude::*;

use crate::engine::evaluate::{StudyContext, evaluate, evaluate_lean_group};
use crate::engine::study::{self, Candidate, SizingMode, Source, Study};
use crate::engine::{robust, score_study, sweep};
use std::sync::atomic::{AtomicBool, AtomicUsize};

fn median(mut v: Vec<Duration>) -> Duration {
    v.sort();
    v[v.len() / 2]
}

fn time<F: FnMut()>(runs: usize, mut f: F) -> Duration {
    median(
        (0..runs)
            .map(|_| {
                let t = Instant::now();
                f();
                t.elapsed()
            })
            .collect(),
    )
}

fn demo() -> Study {
    study::parse_study_str(crate::demo::DEMO_STUDY_JSON).expect("the demo study is valid")
}

fn find<'a>(s: &'a Study, prefix: &str) -> &'a Candidate {
    s.candidates
        .iter()
        .find(|c| c.name.starts_with(prefix))
        .expect("demo candidate")
}

/// The demo's A1 in geometry mode at outer radius `r_o`.
pub fn a1_geometry(s: &Study, r_o: f64) -> Candidate {
    let mut c = find(s, "A1").clone();
    if let Source::AxialSizing(x) = &mut c.source {
        x.mode = SizingMode::Geometry;
        x.outer_radius_m = Some(r_o);
    }
    c
}

pub fn run(runs: usize, designs: usize, sweep_designs: usize) {
    let s = demo();
    println!(
        "shaftline bench (engine {}, {} threads)",
        crate::engine::ENGINE_VERSION,
        rayon::current_num_threads()
    );
    let whole = time(runs, || {
        std::hint::black_box(score_study(&s));
    });
    println!(
        "demo study, 7 candidates:            median {:>9.3} ms",
        ms(whole)
    );
    let ctx = StudyContext::new(&s);
    for (label, prefix) in [
        ("datasheet (DS-2)", "DS-2"),
        ("geometry sizing (A3)", "A3"),
        ("size-to-mission (A1)", "A1"),
    ] {
        let c = find(&s, prefix);
        let t = time(runs, || {
            std::hint::black_box(evaluate(&ctx, c));
        });
        println!("one candidate, {label:<22} median {:>9.3} ms", ms(t));
    }
    let family: Vec<Candidate> = (0..designs)
        .map(|i| a1_geometry(&s, 0.10 + 0.10 * i as f64 / designs.max(2) as f64))
        .collect();
    let t = Instant::now();
    // Scored as a sweep scores them: every metric, lockstep groups of designs per worker.
    let feasible: usize = family
        .par_chunks(32)
        .map(|g| {
            evaluate_lean_group(&ctx, g)
                .iter()
                .filter(|r| r.feasible)
                .count()
        })
        .sum();
    let dt = t.elapsed();
    println!(
        "{designs} geometry-mode axial designs (A1, R_o 0.10–0.20 m) in parallel: {:.3} s, {:.0} designs/s ({feasible} feasible)",
        dt.as_secs_f64(),
        designs as f64 / dt.as_secs_f64()
    );
    kernel_figures(&s, &ctx, runs);
    sweep_figures(&s, sweep_designs);
    process_figures(&s, sweep_designs);
    robustness_figures(&s);
    match peak_memory_kib() {
        Some(kib) => println!(
            "peak resident memory of this process: {:.1} MiB",
            kib as f64 / 1024.0
        ),
        None => println!("peak resident memory: not available on this system"),
    }
}

/// The step kernel alone: one lockstep group of A1 geometry designs flown at a fixed mass,
/// one thread, in ns per design and step.
fn kernel_figures(s: &Study, ctx: &StudyContext, runs: usize) {
    use crate::engine::evaluate::evaluate_full;
    use crate::engine::fly::{Flight, GROUP, Group, Prepared};
    let built: Vec<_> = (0..GROUP)
        .map(|l| {
            let c = a1_geometry(s, 0.12 + 0.005 * l as f64);
            let (_, model, drive) = evaluate_full(ctx, &c);
            (model.expect("A1 geometry builds"), drive)
        })
        .collect();
    let preps: Vec<Prepared> = built
        .iter()
        .map(|(m, d)| Prepared::new(m, *d, &ctx.grid))
        .collect();
    let group = Group::new(std::array::from_fn(|l| &preps[l]));
    let mut flights: [Flight; GROUP] = std::array::from_fn(|_| Flight::default());
    let steps: usize = ctx
        .grid
        .segments
        .iter()
        .map(|g| g.steps.len())
        .sum::<usize>()
        + ctx
            .grid
            .oei_runs
            .iter()
            .map(|&(a, b)| {
                (a..=b)
                    .map(|i| ctx.grid.segments[i].steps.len())
                    .sum::<usize>()
            })
            .sum::<usize>();
    let flights_per_run = 50;
    let t = time(runs, || {
        for _ in 0..flights_per_run {
            group.fly(&ctx.grid, [800.0; GROUP], flights.each_mut());
        }
        std::hint::black_box(&flights);
    });
    let per = t.as_secs_f64() / (flights_per_run * GROUP * steps) as f64;
    let mut one = Flight::default();
    let t1 = time(runs, || {
        for _ in 0..flights_per_run {
            preps[0].fly(&ctx.grid, 800.0, &mut one, None);
        }
        std::hint::black_box(&one);
    });
    let per1 = t1.as_secs_f64() / (flights_per_run * steps) as f64;
    println!(
        "step kernel, one thread ({steps} steps per flight): lockstep {:.2} ns, alone {:.2} ns per design-step",
        per * 1e9,
        per1 * 1e9
    );
}

/// The demo's A1 over R_o 0.10–0.20 m × λ 0.50–0.70 through the sweep path (rows
/// streamed and dropped), whole-process designs/s.
fn sweep_figures(s: &Study, designs: usize) {
    let side = (designs as f64).sqrt().round().max(2.0) as usize;
    let axes = vec![
        sweep::parse_axis(&format!("outer_radius_m=0.10:0.20:{side}")).expect("axis"),
        sweep::parse_axis(&format!("inner_outer_ratio=0.50:0.70:{side}")).expect("axis"),
    ];
    let name = find(s, "A1").name.clone();
    let sw = sweep::Sweep::new(s, &name, axes).expect("sweep");
    let (done, cancel) = (AtomicUsize::new(0), AtomicBool::new(false));
    let t = Instant::now();
    let mut feasible = 0usize;
    let n = sweep::run(s, &sw, &done, &cancel, |_, _, r| {
        feasible += r.feasible as usize
    });
    let dt = t.elapsed().as_secs_f64();
    println!(
        "sweep of A1, {side} × {side} = {n} designs (R_o × λ, OEI and mass closure): {dt:.3} s, {:.0} designs/s ({feasible} feasible)",
        n as f64 / dt
    );
}

/// How many times the whole-process sweep is run.
const PROCESS_RUNS: usize = 5;

/// The same sweep as a separate `shaftline sweep` process, from start to exit, writing
/// every CSV row (to the null device): the whole-process figure.
fn process_figures(s: &Study, designs: usize) {
    let side = (designs as f64).sqrt().round().max(2.0) as usize;
    let file =
        std::env::temp_dir().join(format!("shaftline-bench-{}.study.json", std::process::id()));
    let run = || -> anyhow::Result<f64> {
        std::fs::write(&file, crate::demo::DEMO_STUDY_JSON)?;
        let t = Instant::now();
        let status = std::process::Command::new(std::env::current_exe()?)
            .arg("sweep")
            .arg(&file)
            .args(["--candidate", &find(s, "A1").name])
            .args(["--vary", &format!("outer_radius_m=0.10:0.20:{side}")])
            .args(["--vary", &format!("inner_outer_ratio=0.50:0.70:{side}")])
            .stdout(std::process::Stdio::null())
            .stderr(std::process::Stdio::null())
            .status()?;
        let dt = t.elapsed().as_secs_f64();
        anyhow::ensure!(status.success(), "shaftline sweep exited with {status}");
        Ok(dt)
    };
    // Several runs, as this figure moves with whatever else the machine is doing.
    let result: anyhow::Result<Vec<f64>> = (0..PROCESS_RUNS).map(|_| run()).collect();
    let _ = std::fs::remove_file(&file);
    match result {
        Ok(mut dts) => {
            dts.sort_by(f64::total_cmp);
            let (best, median) = (dts[0], dts[dts.len() / 2]);
            let per_s = |dt: f64| (side * side) as f64 / dt;
            println!(
                "the same sweep as a process (shaftline sweep, CSV rows to the null device), {PROCESS_RUNS} runs: median {median:.3} s, {:.0} designs/s; best {best:.3} s, {:.0} designs/s",
                per_s(median),
                per_s(best)
            )
        }
        Err(e) => println!("the same sweep as a process: not measured ({e})"),
    }
}

fn robustness_figures(s: &Study) {
    let mut x: u64 = 1;
    let mut uniform = move || {
        // SplitMix64 (Steele, Lea & Flood 2014), seeded: the bench is reproducible.
        x = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = x;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    };
    let t = Instant::now();
    let r = robust::run(s, &robust::Uncertainty::default(), 1000, &mut uniform);
    println!(
        "robustness, {} samples × {} candidates: {:.3} s",
        r.samples,
        r.candidates.len(),
        t.elapsed().as_secs_f64()
    );
}

/// Peak resident set size from the kernel's process status (Linux), KiB.
fn peak_memory_kib() -> Option<u64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    line.split_whitespace().nth(1)?.parse().ok()
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}
