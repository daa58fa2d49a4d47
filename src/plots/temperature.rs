//! Temperatures through the mission: winding and stator of one candidate with the winding
//! limit, shaded segment bands carrying their names, and the one-motor-out (OEI)
//! excursions as a series of their own; and the winding temperature of several
//! candidates overlaid for the compare page.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::labels::text_box;
use super::{FONT, PlotError, SIZE, finish, padded, palette};
use crate::engine::fly::TracePoint;
use crate::engine::inspect::Inspection;

/// Start and end of each nominal segment in minutes, with its name.
pub fn segment_bands(trace: &[TracePoint], names: &[String]) -> Vec<(f64, f64, String)> {
    let mut bands: Vec<(f64, f64, String)> = Vec::new();
    let mut t_prev = 0.0;
    for p in trace.iter().filter(|p| !p.oei) {
        let t = p.time_s / 60.0;
        match bands.last_mut() {
            Some(b) if b.2 == names.get(p.segment).cloned().unwrap_or_default() => b.1 = t,
            _ => bands.push((t_prev, t, names.get(p.segment).cloned().unwrap_or_default())),
        }
        t_prev = t;
    }
    bands
}

/// The OEI runs of a trace, each as (minutes, °C) of the winding.
pub fn oei_runs(trace: &[TracePoint]) -> Vec<Vec<(f64, f64)>> {
    let mut runs: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut last_t = f64::NEG_INFINITY;
    for p in trace.iter().filter(|p| p.oei) {
        if p.time_s <= last_t || runs.is_empty() {
            runs.push(Vec::new());
        }
        last_t = p.time_s;
        if let Some(run) = runs.last_mut() {
            run.push((p.time_s / 60.0, p.winding_c));
        }
    }
    runs
}

fn nominal(trace: &[TracePoint], f: impl Fn(&TracePoint) -> f64) -> Vec<(f64, f64)> {
    trace
        .iter()
        .filter(|p| !p.oei)
        .map(|p| (p.time_s / 60.0, f(p)))
        .collect()
}

/// The temperature plot of one candidate as an SVG document.
pub fn plot(ins: &Inspection) -> Result<String, PlotError> {
    let names: Vec<String> = ins.result.segments.iter().map(|s| s.name.clone()).collect();
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_one(&root, ins, &names)?;
        root.present()?;
    }
    Ok(finish(
        svg,
        "plot-temperature",
        "Temperatures through the mission",
    ))
}

fn y_range(trace: &[TracePoint], limit: f64) -> (f64, f64) {
    let hi = trace.iter().map(|p| p.winding_c).fold(limit, f64::max);
    let lo = trace
        .iter()
        .map(|p| p.winding_c.min(p.stator_c))
        .fold(f64::INFINITY, f64::min);
    let (y0, y1) = padded(lo.min(hi), hi, 0.06);
    // Headroom above the limit line for the segment names.
    (y0, y1 + 0.16 * (y1 - y0))
}

fn draw_one(root: &Root, ins: &Inspection, names: &[String]) -> Result<(), PlotError> {
    let trace = &ins.trace;
    let limit = ins.model.winding_limit_c;
    let t_end = trace.iter().map(|p| p.time_s / 60.0).fold(1e-3, f64::max);
    let (y0, y1) = y_range(trace, limit);
    let mut chart = ChartBuilder::on(root)
        .caption(
            "Winding and stator temperature through the mission",
            draw::caption_font(),
        )
        .margin(12)
        .margin_top(20)
        .margin_right(210)
        .x_label_area_size(48)
        .y_label_area_size(64)
        .build_cartesian_2d(0.0..t_end, y0..y1)?;
    let bands = segment_bands(trace, names);
    for (k, (a, b, _)) in bands.iter().enumerate() {
        let c = if k % 2 == 0 { palette::BAND } else { WHITE };
        chart.draw_series([Rectangle::new([(*a, y0), (*b, y1)], c.filled())])?;
    }
    chart
        .configure_mesh()
        .disable_x_mesh()
        .x_desc("Mission time [min]")
        .y_desc("Temperature [°C]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    band_names(root, &chart, &bands)?;
    let limit_line = vec![(0.0, limit), (t_end, limit)];
    chart.draw_series(DashedLineSeries::new(
        limit_line,
        8,
        4,
        palette::LIMIT.stroke_width(2),
    ))?;
    chart.draw_series(LineSeries::new(
        nominal(trace, |p| p.stator_c),
        palette::SKY.stroke_width(3),
    ))?;
    chart.draw_series(LineSeries::new(
        nominal(trace, |p| p.winding_c),
        palette::BLUE.stroke_width(3),
    ))?;
    for run in oei_runs(trace) {
        chart.draw_series(LineSeries::new(
            run.clone(),
            palette::ORANGE.stroke_width(3),
        ))?;
        if let Some(peak) = run.iter().copied().max_by(|a, b| a.1.total_cmp(&b.1)) {
            draw::mark(
                root,
                Mark::Triangle(palette::ORANGE),
                chart.backend_coord(&peak),
            )?;
        }
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    draw::legend(
        root,
        (xr.end + 16, yr.start + 8),
        &[
            (Mark::Line(palette::BLUE, 3), "Winding"),
            (Mark::Line(palette::SKY, 3), "Stator"),
            (Mark::Line(palette::ORANGE, 3), "Winding, one motor out"),
            (Mark::Triangle(palette::ORANGE), "OEI peak"),
            (Mark::Line(palette::LIMIT, 2), "Winding limit (dashed)"),
        ],
    )
}

type Chart<'a, 'b> = ChartContext<
    'a,
    SVGBackend<'b>,
    Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
>;

/// Segment names centred over their bands inside the top of the plot, stepped down a
/// row when a name would run into its neighbour.
fn band_names(root: &Root, chart: &Chart, bands: &[(f64, f64, String)]) -> Result<(), PlotError> {
    let font = (FONT, 12).into_font().color(&palette::SLATE);
    let (_, yr) = chart.plotting_area().get_pixel_range();
    let mut row_end = [i32::MIN; 4];
    for (a, b, name) in bands {
        let (xa, _) = chart.backend_coord(&(*a, 0.0));
        let (xb, _) = chart.backend_coord(&(*b, 0.0));
        let w = text_box(name, 12, 0, 0).2;
        let x = (xa + xb) / 2 - w / 2;
        let row = row_end.iter().position(|end| x > *end + 4).unwrap_or(3);
        row_end[row] = x + w;
        let y = yr.start + 3 + 16 * row as i32;
        root.draw(&Text::new(name.clone(), (x, y), font.clone()))?;
    }
    Ok(())
}

/// One candidate's nominal winding temperature for the overlay: name, (minutes, °C).
pub struct Overlay {
    pub name: String,
    pub points: Vec<(f64, f64)>,
}

impl Overlay {
    pub fn of(name: &str, trace: &[TracePoint]) -> Overlay {
        Overlay {
            name: name.to_string(),
            points: nominal(trace, |p| p.winding_c),
        }
    }
}

/// Winding temperature of each compared candidate through the nominal mission.
pub fn overlay(series: &[Overlay]) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_overlay(&root, series)?;
        root.present()?;
    }
    Ok(finish(
        svg,
        "plot-compare-temperature",
        "Winding temperature of the compared candidates",
    ))
}

const MARKS: [fn(RGBColor) -> Mark; 6] = [
    Mark::Circle,
    Mark::Triangle,
    Mark::Square,
    Mark::Diamond,
    Mark::Cross,
    Mark::Circle,
];

fn draw_overlay(root: &Root, series: &[Overlay]) -> Result<(), PlotError> {
    let all = series.iter().flat_map(|s| s.points.iter());
    let t_end = all.clone().map(|p| p.0).fold(1e-3, f64::max);
    let lo = all.clone().map(|p| p.1).fold(f64::INFINITY, f64::min);
    let hi = all.map(|p| p.1).fold(f64::NEG_INFINITY, f64::max);
    let (y0, y1) = if lo.is_finite() {
        padded(lo, hi, 0.06)
    } else {
        (0.0, 1.0)
    };
    let mut chart = ChartBuilder::on(root)
        .caption("Winding temperature, nominal mission", draw::caption_font())
        .margin(12)
        .margin_right(250)
        .x_label_area_size(48)
        .y_label_area_size(64)
        .build_cartesian_2d(0.0..t_end, y0..y1)?;
    chart
        .configure_mesh()
        .x_desc("Mission time [min]")
        .y_desc("Winding temperature [°C]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    let mut entries = Vec::new();
    for (k, s) in series.iter().enumerate() {
        let c = palette::SERIES[k % palette::SERIES.len()];
        chart.draw_series(LineSeries::new(s.points.clone(), c.stroke_width(3)))?;
        let step = (s.points.len() / 8).max(1);
        for p in s.points.iter().skip(step / 2 + k * step / 8).step_by(step) {
            draw::mark(root, MARKS[k % MARKS.len()](c), chart.backend_coord(p))?;
        }
        entries.push((MARKS[k % MARKS.len()](c), s.name.as_str()));
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    draw::legend(root, (xr.end + 16, yr.start + 8), &entries)
}
