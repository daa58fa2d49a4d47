//! Torque–speed capability of one motor: the continuous and the peak torque curves up to
//! the maximum speed, with the mission's operating points (nominal and one motor out)
//! labelled by segment. Each point's whisker reaches up to the segment's peak torque.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::{PlotError, SIZE, finish, palette, rpm};
use crate::engine::inspect::Inspection;
use crate::engine::results::CandidateResult;

/// One operating point of a mission segment.
#[derive(Debug, Clone, PartialEq)]
pub struct OpPoint {
    pub label: String,
    pub speed_rpm: f64,
    pub torque_nm: f64,
    pub peak_torque_nm: f64,
    pub oei: bool,
}

/// The nominal and one-motor-out operating points of a result (segments with no torque
/// or no speed are left out: they have no place on a torque–speed plane).
pub fn mission_points(r: &CandidateResult) -> Vec<OpPoint> {
    let nominal = r.segments.iter().map(|s| (s, false));
    let oei = r.oei_segments.iter().map(|s| (s, true));
    nominal
        .chain(oei)
        .filter(|(s, _)| s.motor_torque_nm > 0.0 && s.motor_speed_rpm > 0.0)
        .map(|(s, oei)| OpPoint {
            label: if oei {
                format!("{} (OEI)", s.name)
            } else {
                s.name.clone()
            },
            speed_rpm: s.motor_speed_rpm,
            torque_nm: s.motor_torque_nm,
            peak_torque_nm: s.peak_torque_nm.max(s.motor_torque_nm),
            oei,
        })
        .collect()
}

pub const NOMINAL: Mark = Mark::Circle(palette::BLUE);
pub const OEI: Mark = Mark::Triangle(palette::ORANGE);

/// Curve samples (speed rpm, torque N·m) of `f` from 0 to the maximum speed.
fn curve(ins: &Inspection, f: impl Fn(f64) -> f64) -> Vec<(f64, f64)> {
    let max = ins.model.max_speed_rad_s;
    (0..=200)
        .map(|i| {
            let w = max * i as f64 / 200.0;
            (rpm(w), f(w))
        })
        .collect()
}

/// The torque–speed plot as an SVG document.
pub fn plot(ins: &Inspection) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_into(&root, ins)?;
        root.present()?;
    }
    Ok(finish(svg, "plot-torque-speed", "Torque–speed capability"))
}

fn draw_into(root: &Root, ins: &Inspection) -> Result<(), PlotError> {
    let m = &ins.model;
    let points = mission_points(&ins.result);
    let x_max = rpm(m.max_speed_rad_s) * 1.04;
    let y_max = points
        .iter()
        .map(|p| p.peak_torque_nm)
        .fold(m.peak_torque_nm, f64::max)
        * 1.12;
    let mut chart = ChartBuilder::on(root)
        .caption(
            "Torque–speed capability and mission points",
            draw::caption_font(),
        )
        .margin(12)
        .margin_right(210)
        .x_label_area_size(48)
        .y_label_area_size(64)
        .build_cartesian_2d(0.0..x_max, 0.0..y_max)?;
    chart
        .configure_mesh()
        .x_desc("Motor speed [rpm]")
        .y_desc("Torque [N·m]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    let peak = curve(ins, |w| m.torque_capability(w));
    let cont = curve(ins, |w| m.continuous_torque(w));
    chart.draw_series(LineSeries::new(peak, palette::PLUM.stroke_width(3)))?;
    chart.draw_series(DashedLineSeries::new(
        cont,
        9,
        5,
        palette::SLATE.stroke_width(3),
    ))?;
    let mut labelled = Vec::new();
    for p in &points {
        let low = chart.backend_coord(&(p.speed_rpm, p.torque_nm));
        let high = chart.backend_coord(&(p.speed_rpm, p.peak_torque_nm));
        let colour = if p.oei {
            palette::ORANGE
        } else {
            palette::BLUE
        };
        root.draw(&PathElement::new(vec![low, high], colour.stroke_width(1)))?;
        draw::mark(root, if p.oei { OEI } else { NOMINAL }, low)?;
        labelled.push((p.label.clone(), low));
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    draw::point_labels(root, (xr.start, yr.start, xr.end, yr.end), &labelled)?;
    draw::legend(
        root,
        (xr.end + 16, yr.start + 8),
        &[
            (Mark::Line(palette::PLUM, 3), "Peak torque"),
            (Mark::Line(palette::SLATE, 3), "Continuous (dashed)"),
            (NOMINAL, "Mission point"),
            (OEI, "One motor out (OEI)"),
            (Mark::Line(palette::BLUE, 1), "Up to segment peak"),
        ],
    )
}
