//! The family scatter of a design sweep: propulsion mass against mission energy, feasible
//! and infeasible designs told apart by shape and colour, the Pareto front of the
//! feasible designs drawn as a line over them. Values in, SVG out.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::{PlotError, SIZE, finish, padded, palette};

/// Most points drawn; a larger family is thinned evenly (the front is always drawn).
pub const MAX_POINTS: usize = 4000;

/// One design: propulsion mass [kg], mission energy [kWh], feasibility.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Design {
    pub mass_kg: f64,
    pub energy_kwh: f64,
    pub feasible: bool,
}

const FEASIBLE: Mark = Mark::Circle(palette::SKY);
const INFEASIBLE: Mark = Mark::Cross(palette::PLUM);
const FRONT: Mark = Mark::Diamond(palette::BLUE);

/// Every `step`-th design, so at most `MAX_POINTS` are drawn.
pub fn thinned(designs: &[Design]) -> impl Iterator<Item = &Design> {
    let step = designs.len().div_ceil(MAX_POINTS).max(1);
    designs.iter().step_by(step)
}

fn range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (lo, hi) = values
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
            (lo.min(v), hi.max(v))
        });
    if lo.is_finite() {
        padded(lo, hi, 0.06)
    } else {
        (0.0, 1.0)
    }
}

/// The scatter as an SVG document; `front` holds the front's points ordered by mass.
pub fn plot(designs: &[Design], front: &[Design]) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_into(&root, designs, front)?;
        root.present()?;
    }
    Ok(finish(svg, "plot-family", "Design family"))
}

fn draw_into(root: &Root, designs: &[Design], front: &[Design]) -> Result<(), PlotError> {
    let xr = range(designs.iter().map(|d| d.mass_kg));
    let yr = range(designs.iter().map(|d| d.energy_kwh));
    let mut chart = ChartBuilder::on(root)
        .caption("Design family", draw::caption_font())
        .margin(12)
        .margin_right(190)
        .x_label_area_size(48)
        .y_label_area_size(72)
        .build_cartesian_2d(xr.0..xr.1, yr.0..yr.1)?;
    chart
        .configure_mesh()
        .x_desc("propulsion_mass_kg [kg]")
        .y_desc("mission_energy_kwh [kWh]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    let finite = |d: &&Design| d.mass_kg.is_finite() && d.energy_kwh.is_finite();
    for d in thinned(designs).filter(finite) {
        let m = if d.feasible { FEASIBLE } else { INFEASIBLE };
        draw::mark(root, m, chart.backend_coord(&(d.mass_kg, d.energy_kwh)))?;
    }
    let line: Vec<(f64, f64)> = front.iter().map(|d| (d.mass_kg, d.energy_kwh)).collect();
    chart.draw_series(LineSeries::new(line, palette::BLUE.stroke_width(2)))?;
    for d in front.iter().filter(finite) {
        draw::mark(root, FRONT, chart.backend_coord(&(d.mass_kg, d.energy_kwh)))?;
    }
    let (px, py) = chart.plotting_area().get_pixel_range();
    let entries = [
        (Mark::Line(palette::BLUE, 2), "Front (line)"),
        (FRONT, "Pareto front"),
        (FEASIBLE, "Feasible"),
        (INFEASIBLE, "Infeasible"),
    ];
    draw::legend(root, (px.end + 16, py.start + 8), &entries)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_large_family_is_thinned_to_the_cap() {
        let d = Design {
            mass_kg: 1.0,
            energy_kwh: 1.0,
            feasible: true,
        };
        let many = vec![d; 3 * MAX_POINTS + 1];
        let n = thinned(&many).count();
        assert!(n <= MAX_POINTS && n > MAX_POINTS / 2, "{n} points drawn");
        assert_eq!(
            thinned(&many[..10]).count(),
            10,
            "a small family is drawn whole"
        );
    }
}
