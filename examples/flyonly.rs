use shaftline::engine::evaluate::{StudyContext, evaluate};
use shaftline::engine::fly::{Flight, Prepared};
fn main() {
    let which = std::env::args().nth(1).unwrap_or_default();
    let s = shaftline::engine::study::parse_study_str(shaftline::demo::DEMO_STUDY_JSON).unwrap();
    let ctx = StudyContext::new(&s);
    let c = shaftline::bench::a1_geometry(&s, 0.15);
    let (_, model, drive) = shaftline::engine::evaluate::evaluate_full(&ctx, &c);
    let model = model.unwrap();
    let prep = Prepared::new(&model, drive, &ctx.grid);
    let mut f = Flight::default();
    if which == "fly" {
        for _ in 0..200 {
            prep.fly(&ctx.grid, 800.0, &mut f, None);
        }
    }
    if which == "eval" {
        for _ in 0..200 {
            std::hint::black_box(evaluate(&ctx, &c));
        }
    }
    if which == "lean" {
        for _ in 0..200 {
            std::hint::black_box(shaftline::engine::evaluate::evaluate_lean(&ctx, &c));
        }
    }
}
