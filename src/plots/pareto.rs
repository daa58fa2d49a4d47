//! Pareto plot for two chosen metrics: the front of feasible candidates that no other
//! feasible candidate beats in both metrics, drawn as a line; front, dominated and
//! infeasible points told apart by shape and colour; each point numbered, with a hover
//! title carrying the candidate's name and values.

use plotters::prelude::*;

use super::draw::{self, Mark, Root};
use super::{PlotError, SIZE, append_markup, escape, finish, padded, palette};
use crate::engine::objectives::Direction;

/// Where a point stands for the chosen pair of metrics.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Class {
    Front,
    Dominated,
    Infeasible,
    /// Feasible, for a pair with no front (a metric without a better direction).
    Feasible,
}

impl Class {
    pub fn mark(self) -> Mark {
        match self {
            Class::Front => Mark::Circle(palette::BLUE),
            Class::Dominated => Mark::Triangle(palette::ORANGE),
            Class::Infeasible => Mark::Cross(palette::PLUM),
            Class::Feasible => Mark::Square(palette::SLATE),
        }
    }

    pub fn name(self) -> &'static str {
        match self {
            Class::Front => "Pareto front",
            Class::Dominated => "Dominated",
            Class::Infeasible => "Infeasible",
            Class::Feasible => "Feasible",
        }
    }
}

/// One candidate on the plot: its number on the page, its name and values.
#[derive(Debug, Clone, PartialEq)]
pub struct Point {
    pub number: usize,
    pub name: String,
    pub x: f64,
    pub y: f64,
    pub feasible: bool,
}

fn better_or_equal(a: f64, b: f64, d: Direction) -> bool {
    match d {
        Direction::Minimise => a <= b,
        Direction::Maximise => a >= b,
    }
}

/// Classes of the points; with no direction for one of the metrics there is no front
/// and feasible points are `Feasible`.
pub fn classify(points: &[Point], dirs: Option<(Direction, Direction)>) -> Vec<Class> {
    points
        .iter()
        .map(|p| {
            if !p.feasible {
                return Class::Infeasible;
            }
            let Some((dx, dy)) = dirs else {
                return Class::Feasible;
            };
            let beaten = points.iter().any(|q| {
                q.feasible
                    && better_or_equal(q.x, p.x, dx)
                    && better_or_equal(q.y, p.y, dy)
                    && (q.x != p.x || q.y != p.y)
            });
            if beaten {
                Class::Dominated
            } else {
                Class::Front
            }
        })
        .collect()
}

/// Axis titles of the plot.
pub struct Axes<'a> {
    pub x: &'a str,
    pub y: &'a str,
}

/// The Pareto plot as an SVG document.
pub fn plot(points: &[Point], classes: &[Class], axes: &Axes) -> Result<String, PlotError> {
    let mut svg = String::new();
    let mut titles = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, SIZE).into_drawing_area();
        root.fill(&WHITE)?;
        titles = draw_into(&root, points, classes, axes, titles)?;
        root.present()?;
    }
    append_markup(&mut svg, &titles);
    Ok(finish(svg, "plot-pareto", "Pareto plot"))
}

fn draw_into(
    root: &Root,
    points: &[Point],
    classes: &[Class],
    axes: &Axes,
    mut titles: String,
) -> Result<String, PlotError> {
    let fold = |f: fn(&Point) -> f64| {
        let lo = points.iter().map(f).fold(f64::INFINITY, f64::min);
        let hi = points.iter().map(f).fold(f64::NEG_INFINITY, f64::max);
        if lo.is_finite() {
            padded(lo, hi, 0.08)
        } else {
            (0.0, 1.0)
        }
    };
    let ((x0, x1), (y0, y1)) = (fold(|p| p.x), fold(|p| p.y));
    let mut chart = ChartBuilder::on(root)
        .caption("Trade between the two chosen metrics", draw::caption_font())
        .margin(12)
        .margin_right(190)
        .x_label_area_size(48)
        .y_label_area_size(72)
        .build_cartesian_2d(x0..x1, y0..y1)?;
    chart
        .configure_mesh()
        .x_desc(axes.x)
        .y_desc(axes.y)
        .label_style(draw::axis_font())
        .axis_desc_style(draw::axis_font())
        .light_line_style(palette::BAND)
        .draw()?;
    let mut front: Vec<(f64, f64)> = points
        .iter()
        .zip(classes)
        .filter(|(_, c)| **c == Class::Front)
        .map(|(p, _)| (p.x, p.y))
        .collect();
    front.sort_by(|a, b| a.0.total_cmp(&b.0));
    chart.draw_series(LineSeries::new(front, palette::BLUE.stroke_width(2)))?;
    let mut labelled = Vec::new();
    for (p, c) in points.iter().zip(classes) {
        let at = chart.backend_coord(&(p.x, p.y));
        draw::mark(root, c.mark(), at)?;
        labelled.push((p.number.to_string(), at));
        titles.push_str(&format!(
            "<circle cx=\"{}\" cy=\"{}\" r=\"9\" fill=\"#fff\" fill-opacity=\"0\"><title>{}. {} ({}): {} = {}, {} = {}</title></circle>",
            at.0,
            at.1,
            p.number,
            escape(&p.name),
            c.name(),
            escape(axes.x),
            super::fmt(p.x),
            escape(axes.y),
            super::fmt(p.y)
        ));
    }
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    draw::point_labels(root, (xr.start, yr.start, xr.end, yr.end), &labelled)?;
    let mut entries = vec![(Mark::Line(palette::BLUE, 2), "Front (line)")];
    for c in [
        Class::Front,
        Class::Dominated,
        Class::Infeasible,
        Class::Feasible,
    ] {
        if classes.contains(&c) {
            entries.push((c.mark(), c.name()));
        }
    }
    draw::legend(root, (xr.end + 16, yr.start + 8), &entries)?;
    Ok(titles)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn p(number: usize, x: f64, y: f64, feasible: bool) -> Point {
        Point {
            number,
            name: format!("c{number}"),
            x,
            y,
            feasible,
        }
    }

    #[test]
    fn the_front_holds_the_points_no_feasible_point_beats_in_both() {
        let pts = [
            p(1, 1.0, 5.0, true),
            p(2, 2.0, 2.0, true),
            p(3, 3.0, 3.0, true),
            p(4, 0.5, 0.5, false),
        ];
        let min = Some((Direction::Minimise, Direction::Minimise));
        assert_eq!(
            classify(&pts, min),
            [
                Class::Front,
                Class::Front,
                Class::Dominated,
                Class::Infeasible
            ]
        );
        let max_y = Some((Direction::Minimise, Direction::Maximise));
        assert_eq!(
            classify(&pts, max_y),
            [
                Class::Front,
                Class::Dominated,
                Class::Dominated,
                Class::Infeasible
            ]
        );
        assert_eq!(classify(&pts, None)[0], Class::Feasible);
    }
}
