//! The engine benchmark behind `shaftline bench`: printed figures, never assertions.

use std::time::{Duration, Instant};

use rayon::prelude::*;

use crate::engine::evaluate::{StudyContext, evaluate};
use crate::engine::score_study;
use crate::engine::study::{self, Candidate, SizingMode, Source, Study};

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

pub fn run(runs: usize, designs: usize) {
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
    let feasible = family
        .par_iter()
        .filter(|c| evaluate(&ctx, c).feasible)
        .count();
    let dt = t.elapsed();
    println!(
        "{designs} geometry-mode axial designs (A1, R_o 0.10–0.20 m) in parallel: {:.3} s, {:.0} designs/s ({feasible} feasible)",
        dt.as_secs_f64(),
        designs as f64 / dt.as_secs_f64()
    );
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}
