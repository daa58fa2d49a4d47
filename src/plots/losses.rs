//! Losses by mission segment, stacked: copper, iron, mechanical and inverter losses of
//! one motor (segment means), one bar per nominal segment.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::{PlotError, SIZE, finish, palette};
use crate::engine::results::{CandidateResult, SegmentRow};

/// The stacked parts in order from the axis up: name, colour, value of a segment row.
/// A stacked part: name, colour, and its value in a segment row.
pub type Part = (&'static str, RGBColor, fn(&SegmentRow) -> f64);

pub const PARTS: [Part; 4] = [
    ("Copper", palette::ORANGE, |s| s.copper_loss_w),
    ("Iron", palette::BLUE, |s| s.iron_loss_w),
    ("Mechanical", palette::OCHRE, |s| s.mechanical_loss_w),
    ("Inverter", palette::SLATE, |s| s.inverter_loss_w),
];

/// The losses plot as an SVG document.
pub fn plot(r: &CandidateResult) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_into(&root, &r.segments)?;
        root.present()?;
    }
    Ok(finish(svg, "plot-losses", "Losses by segment"))
}

fn total(s: &SegmentRow) -> f64 {
    PARTS.iter().map(|(_, _, f)| f(s).max(0.0)).sum()
}

fn draw_into(root: &Root, segs: &[SegmentRow]) -> Result<(), PlotError> {
    let n = segs.len().max(1) as f64;
    let top = segs.iter().map(total).fold(1.0, f64::max) * 1.1;
    let mut chart = ChartBuilder::on(root)
        .caption(
            "Losses per motor by segment (segment means)",
            draw::caption_font(),
        )
        .margin(12)
        .margin_right(210)
        .x_label_area_size(48)
        .y_label_area_size(72)
        .build_cartesian_2d(0.0..n, 0.0..top)?;
    let name_at = |x: &f64| {
        let i = x.floor() as usize;
        let centred = (x - x.floor() - 0.5).abs() < 1e-6;
        match segs.get(i) {
            Some(s) if centred => s.name.clone(),
            _ => String::new(),
        }
    };
    chart
        .configure_mesh()
        .disable_x_mesh()
        .x_labels(segs.len() * 2 + 1)
        .x_label_formatter(&name_at)
        .x_desc("Mission segment")
        .y_desc("Loss [W]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    for (i, s) in segs.iter().enumerate() {
        let (x0, x1) = (i as f64 + 0.2, i as f64 + 0.8);
        let mut base = 0.0;
        for (_, colour, f) in PARTS {
            let v = f(s).max(0.0);
            chart.draw_series([Rectangle::new(
                [(x0, base), (x1, base + v)],
                colour.filled(),
            )])?;
            base += v;
        }
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    let entries: Vec<(Mark, &str)> = PARTS
        .iter()
        .rev()
        .map(|(name, c, _)| (Mark::Block(*c), *name))
        .collect();
    draw::legend(root, (xr.end + 16, yr.start + 8), &entries)
}
