//! Ranking robustness as grouped bars: per candidate (by its number on the page) the
//! probability of staying feasible, of lying on the Pareto front and of being best by
//! trade score. Values in, SVG out.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::{PlotError, SIZE, finish, palette};

/// One candidate's three probabilities, each in [0, 1].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bars {
    pub feasible: f64,
    pub pareto: f64,
    pub best: f64,
}

const SERIES: [(RGBColor, &str); 3] = [
    (palette::BLUE, "P(feasible)"),
    (palette::ORANGE, "P(on the front)"),
    (palette::SKY, "P(best score)"),
];

/// The chart as an SVG document; candidate `i` is labelled `i + 1`.
pub fn plot(bars: &[Bars]) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_into(&root, bars)?;
        root.present()?;
    }
    Ok(finish(svg, "plot-robustness", "Ranking robustness"))
}

fn draw_into(root: &Root, bars: &[Bars]) -> Result<(), PlotError> {
    let n = bars.len().max(1);
    let mut chart = ChartBuilder::on(root)
        .caption("Ranking robustness", draw::caption_font())
        .margin(12)
        .margin_right(190)
        .x_label_area_size(48)
        .y_label_area_size(72)
        .build_cartesian_2d(-0.5..n as f64 - 0.5, 0.0..1.0)?;
    chart
        .configure_mesh()
        .x_desc("candidate number")
        .y_desc("probability")
        .x_labels(n + 1)
        .x_label_formatter(&|x| {
            let k = x.round();
            if (x - k).abs() < 1e-6 && k >= 0.0 {
                format!("{}", k as usize + 1)
            } else {
                String::new()
            }
        })
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    for (i, b) in bars.iter().enumerate() {
        for (k, v) in [b.feasible, b.pareto, b.best].into_iter().enumerate() {
            let x0 = i as f64 - 0.39 + 0.26 * k as f64;
            let rect = [(x0, 0.0), (x0 + 0.24, v.clamp(0.0, 1.0))];
            chart.draw_series(std::iter::once(Rectangle::new(rect, SERIES[k].0.filled())))?;
        }
    }
    let (px, py) = chart.plotting_area().get_pixel_range();
    let entries: Vec<(Mark, &str)> = SERIES.iter().map(|(c, n)| (Mark::Block(*c), *n)).collect();
    draw::legend(root, (px.end + 16, py.start + 8), &entries)
}
