use shaftline::engine::evaluate::{StudyContext, evaluate};
use shaftline::engine::fly::{Flight, Prepared};
use std::time::Instant;
fn main() {
    let s = shaftline::engine::study::parse_study_str(shaftline::demo::DEMO_STUDY_JSON).unwrap();
    let ctx = StudyContext::new(&s);
    let c = shaftline::bench::a1_geometry(&s, 0.15);
    let (r, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, &c);
    let model = model.unwrap();
    println!(
        "steps {} feasible {} mass {}",
        ctx.grid.total_steps(),
        r.feasible,
        r.takeoff_mass_kg
    );
    let n = 20000;
    let t = Instant::now();
    for _ in 0..n {
        std::hint::black_box(evaluate(&ctx, &c));
    }
    println!(
        "evaluate: {:.2} us",
        t.elapsed().as_secs_f64() / n as f64 * 1e6
    );
    let prep = Prepared::new(&model, drive, &ctx.grid);
    let mut f = Flight::default();
    let t = Instant::now();
    for _ in 0..n {
        prep.fly(&ctx.grid, 800.0, &mut f, None);
    }
    println!("fly: {:.2} us", t.elapsed().as_secs_f64() / n as f64 * 1e6);
    let t = Instant::now();
    for _ in 0..n {
        std::hint::black_box(Prepared::new(&model, drive, &ctx.grid));
    }
    println!(
        "prepare: {:.2} us",
        t.elapsed().as_secs_f64() / n as f64 * 1e6
    );
    let ac = shaftline::engine::closure::AircraftConst::new(&s, false);
    let cl = shaftline::engine::closure::close(&ctx.grid, &prep, &ac, &mut f);
    println!("closure iterations {}", cl.iterations);
}
