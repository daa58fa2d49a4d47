//! Efficiency map of one motor over its torque–speed range: shaded cells of motor
//! efficiency at fixed winding and magnet temperatures, iso-efficiency lines traced by
//! marching squares, the capability curve and the mission points on top.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::torque_speed::{NOMINAL, OEI, mission_points};
use super::{FONT, PlotError, SIZE, finish, palette, rpm};
use crate::engine::inspect::Inspection;
use crate::engine::motor::MotorModel;

/// Temperatures the map is evaluated at (the page's caption says so), °C.
pub const WINDING_C: f64 = 100.0;
pub const MAGNET_C: f64 = 80.0;
/// Iso-efficiency lines drawn.
pub const LEVELS: [f64; 3] = [0.90, 0.94, 0.96];
/// Shading bands: lower bound of each band and its colour, pale (low) to deep (high).
const BANDS: [(f64, RGBColor); 7] = [
    (0.00, RGBColor(0xf4, 0xf1, 0xe8)),
    (0.80, RGBColor(0xdd, 0xe8, 0xf0)),
    (0.86, RGBColor(0xbc, 0xd4, 0xe6)),
    (0.90, RGBColor(0x93, 0xbb, 0xd9)),
    (0.93, RGBColor(0x6a, 0x9f, 0xc9)),
    (0.95, RGBColor(0x45, 0x80, 0xb5)),
    (0.97, RGBColor(0x2a, 0x5f, 0x95)),
];
const NX: usize = 56;
const NY: usize = 36;

fn band(eta: f64) -> usize {
    BANDS.iter().rposition(|(lo, _)| eta >= *lo).unwrap_or(0)
}

/// Efficiency sampled on a regular grid of `(nx+1) × (ny+1)` nodes over speed [rad/s]
/// and torque [N·m]; `None` outside the capability.
pub struct Grid {
    pub speed_max_rad_s: f64,
    pub torque_max_nm: f64,
    pub values: Vec<Vec<Option<f64>>>,
}

impl Grid {
    pub fn sample(m: &MotorModel, nx: usize, ny: usize, offset: f64) -> Grid {
        let (ws, ts) = (m.max_speed_rad_s, m.peak_torque_nm);
        let values = (0..=nx)
            .map(|i| {
                (0..=ny)
                    .map(|j| {
                        let w = ws * (i as f64 + offset) / nx as f64;
                        let t = ts * (j as f64 + offset) / ny as f64;
                        m.efficiency_at(t, w, WINDING_C, MAGNET_C)
                    })
                    .collect()
            })
            .collect();
        Grid {
            speed_max_rad_s: ws,
            torque_max_nm: ts,
            values,
        }
    }

    fn node(&self, i: usize, j: usize) -> (f64, f64) {
        let nx = (self.values.len() - 1) as f64;
        let ny = (self.values[0].len() - 1) as f64;
        (
            rpm(self.speed_max_rad_s * i as f64 / nx),
            self.torque_max_nm * j as f64 / ny,
        )
    }
}

/// Line pieces where the efficiency crosses `level`, in (rpm, N·m).
pub fn contour(g: &Grid, level: f64) -> Vec<[(f64, f64); 2]> {
    let mut out = Vec::new();
    for i in 0..g.values.len() - 1 {
        for j in 0..g.values[0].len() - 1 {
            let corners = [(i, j), (i + 1, j), (i + 1, j + 1), (i, j + 1)];
            let vals: Option<Vec<f64>> = corners.iter().map(|&(a, b)| g.values[a][b]).collect();
            let Some(v) = vals else { continue };
            let mut hits = Vec::new();
            for k in 0..4 {
                let (a, b) = (v[k], v[(k + 1) % 4]);
                if (a >= level) != (b >= level) {
                    let f = (level - a) / (b - a);
                    let (pa, pb) = (g.node(corners[k].0, corners[k].1), {
                        let c = corners[(k + 1) % 4];
                        g.node(c.0, c.1)
                    });
                    hits.push((pa.0 + f * (pb.0 - pa.0), pa.1 + f * (pb.1 - pa.1)));
                }
            }
            for pair in hits.chunks_exact(2) {
                out.push([pair[0], pair[1]]);
            }
        }
    }
    out
}

/// The efficiency map as an SVG document.
pub fn plot(ins: &Inspection) -> Result<String, PlotError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        draw_into(&root, ins)?;
        root.present()?;
    }
    Ok(finish(svg, "plot-efficiency", "Efficiency map"))
}

fn draw_into(root: &Root, ins: &Inspection) -> Result<(), PlotError> {
    let m = &ins.model;
    let (x_max, y_max) = (rpm(m.max_speed_rad_s), m.peak_torque_nm);
    let mut chart = ChartBuilder::on(root)
        .caption(
            "Motor efficiency over torque and speed",
            draw::caption_font(),
        )
        .margin(12)
        .margin_right(210)
        .x_label_area_size(48)
        .y_label_area_size(64)
        .build_cartesian_2d(0.0..x_max * 1.02, 0.0..y_max * 1.05)?;
    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc("Motor speed [rpm]")
        .y_desc("Torque [N·m]")
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .draw()?;
    let cells = Grid::sample(m, NX, NY, 0.5);
    let (dx, dy) = (x_max / NX as f64, y_max / NY as f64);
    for (i, col) in cells.values.iter().enumerate().take(NX) {
        let mut j = 0;
        while j < NY {
            let Some(b) = col[j].map(band) else {
                j += 1;
                continue;
            };
            let start = j;
            while j < NY && col[j].map(band) == Some(b) {
                j += 1;
            }
            let (x0, y0) = (i as f64 * dx, start as f64 * dy);
            let rect = [(x0, y0), (x0 + dx, j as f64 * dy)];
            chart.draw_series([Rectangle::new(rect, BANDS[b].1.filled())])?;
        }
    }
    let curve: Vec<(f64, f64)> = (0..=120)
        .map(|k| m.max_speed_rad_s * k as f64 / 120.0)
        .map(|w| (rpm(w), m.torque_capability(w)))
        .collect();
    chart.draw_series(LineSeries::new(curve, palette::PLUM.stroke_width(3)))?;
    draw_contours(root, &chart, &Grid::sample(m, NX, NY, 0.0))?;
    let mut labelled = Vec::new();
    for p in mission_points(&ins.result) {
        let at = chart.backend_coord(&(p.speed_rpm, p.torque_nm));
        draw::mark(root, if p.oei { OEI } else { NOMINAL }, at)?;
        labelled.push((p.label, at));
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    draw::point_labels(root, (xr.start, yr.start, xr.end, yr.end), &labelled)?;
    let mut entries: Vec<(Mark, String)> = vec![
        (Mark::Line(palette::PLUM, 3), "Peak torque".into()),
        (Mark::Line(BLACK, 1), "Iso-efficiency line".into()),
        (NOMINAL, "Mission point".into()),
        (OEI, "One motor out (OEI)".into()),
    ];
    for (k, (lo, c)) in BANDS.iter().enumerate().rev() {
        let text = match BANDS.get(k + 1) {
            Some((hi, _)) if k == 0 => format!("η below {hi:.2}"),
            Some((hi, _)) => format!("η {lo:.2} – {hi:.2}"),
            None => format!("η ≥ {lo:.2}"),
        };
        entries.push((Mark::Block(*c), text));
    }
    let refs: Vec<(Mark, &str)> = entries.iter().map(|(m, s)| (*m, s.as_str())).collect();
    draw::legend(root, (xr.end + 16, yr.start + 8), &refs)
}

type Chart<'a, 'b> = ChartContext<
    'a,
    SVGBackend<'b>,
    Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
>;

fn draw_contours(root: &Root, chart: &Chart, nodes: &Grid) -> Result<(), PlotError> {
    let font = (FONT, 12).into_font().color(&BLACK);
    for level in LEVELS {
        let pieces = contour(nodes, level);
        for [a, b] in &pieces {
            let (pa, pb) = (chart.backend_coord(a), chart.backend_coord(b));
            root.draw(&PathElement::new(vec![pa, pb], BLACK.stroke_width(1)))?;
        }
        let Some(mid) = pieces.get(pieces.len() / 2) else {
            continue;
        };
        let (x, y) = chart.backend_coord(&mid[0]);
        let text = format!("{level:.2}");
        root.draw(&Rectangle::new(
            [(x - 2, y - 9), (x + 30, y + 7)],
            WHITE.mix(0.85).filled(),
        ))?;
        root.draw(&Text::new(text, (x, y - 8), font.clone()))?;
    }
    Ok(())
}
