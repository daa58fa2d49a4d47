//! The trade plot of a snapshot: two objectives as an inline SVG scatter. Pareto-front,
//! dominated and infeasible candidates differ in shape as well as colour, each point has
//! a `<title>` (hover text) and a number label matching the candidate table.

use std::fmt::Write;

use serde_json::Value;

use super::{Snapshot, format_number, name_of};
use crate::web::error::escape;

const W: f64 = 640.0;
const H: f64 = 420.0;
const LEFT: f64 = 70.0;
const RIGHT: f64 = 20.0;
const TOP: f64 = 20.0;
const BOTTOM: f64 = 50.0;

/// How a candidate stands in the trade.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Standing {
    Front,
    Dominated,
    Infeasible,
}

impl Standing {
    fn of(c: &Value) -> Self {
        let flag = |k: &str| c.get(k).and_then(Value::as_bool) == Some(true);
        match (flag("feasible"), flag("pareto_optimal")) {
            (false, _) => Standing::Infeasible,
            (true, true) => Standing::Front,
            (true, false) => Standing::Dominated,
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            Standing::Front => "Pareto front",
            Standing::Dominated => "dominated",
            Standing::Infeasible => "infeasible",
        }
    }
}

struct Point {
    number: usize,
    name: String,
    x: f64,
    y: f64,
    standing: Standing,
}

fn points(snap: &Snapshot, x: &str, y: &str) -> Vec<Point> {
    snap.candidates()
        .iter()
        .enumerate()
        .filter_map(|(i, c)| {
            Some(Point {
                number: i + 1,
                name: name_of(c),
                x: c.get(x)?.as_f64()?,
                y: c.get(y)?.as_f64()?,
                standing: Standing::of(c),
            })
        })
        .collect()
}

/// Axis range padded by 8 % (a flat range gets ±1).
fn range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (lo, hi) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
        (a.min(v), b.max(v))
    });
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    let pad = if hi > lo { (hi - lo) * 0.08 } else { 1.0 };
    (lo - pad, hi + pad)
}

fn marker(out: &mut String, p: &Point, px: f64, py: f64) {
    let _ = match p.standing {
        Standing::Front => write!(
            out,
            r##"<circle class="pt-front" cx="{px:.1}" cy="{py:.1}" r="6" fill="#1f5f8b"/>"##
        ),
        Standing::Dominated => write!(
            out,
            r##"<rect class="pt-dominated" x="{:.1}" y="{:.1}" width="11" height="11" fill="white" stroke="#b35806" stroke-width="2"/>"##,
            px - 5.5,
            py - 5.5
        ),
        Standing::Infeasible => write!(
            out,
            r##"<path class="pt-infeasible" d="M{:.1},{:.1}l10,10m0,-10l-10,10" stroke="#5b6472" stroke-width="2.5"/>"##,
            px - 5.0,
            py - 5.0
        ),
    };
}

/// The SVG document of the trade plot of objectives `x` against `y`.
pub fn pareto_svg(snap: &Snapshot, x: &str, y: &str) -> String {
    let pts = points(snap, x, y);
    let (x0, x1) = range(pts.iter().map(|p| p.x));
    let (y0, y1) = range(pts.iter().map(|p| p.y));
    let sx = |v: f64| LEFT + (v - x0) / (x1 - x0) * (W - LEFT - RIGHT);
    let sy = |v: f64| H - BOTTOM - (v - y0) / (y1 - y0) * (H - TOP - BOTTOM);
    let mut out = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" class="trade-plot" viewBox="0 0 {W} {H}" role="img" aria-label="Trade plot: {} against {}">"#,
        escape(y),
        escape(x)
    );
    axes(&mut out, x, y, (x0, x1), (y0, y1));
    let mut front: Vec<&Point> = pts
        .iter()
        .filter(|p| p.standing == Standing::Front)
        .collect();
    front.sort_by(|a, b| a.x.total_cmp(&b.x));
    if front.len() > 1 {
        let d: Vec<String> = front
            .iter()
            .map(|p| format!("{:.1},{:.1}", sx(p.x), sy(p.y)))
            .collect();
        let _ = write!(
            out,
            r##"<polyline class="front-line" points="{}" fill="none" stroke="#1f5f8b" stroke-dasharray="5 3"/>"##,
            d.join(" ")
        );
    }
    for p in &pts {
        let (px, py) = (sx(p.x), sy(p.y));
        let _ = write!(
            out,
            "<g class=\"point\" data-standing=\"{}\"><title>{} — {}: {}; {} = {}, {} = {}</title>",
            p.standing.label(),
            p.number,
            escape(&p.name),
            p.standing.label(),
            escape(x),
            format_number(p.x),
            escape(y),
            format_number(p.y)
        );
        marker(&mut out, p, px, py);
        let _ = write!(
            out,
            r#"<text x="{:.1}" y="{:.1}" font-size="12">{}</text></g>"#,
            px + 8.0,
            py - 6.0,
            p.number
        );
    }
    out.push_str("</svg>");
    out
}

fn axes(out: &mut String, x: &str, y: &str, (x0, x1): (f64, f64), (y0, y1): (f64, f64)) {
    let (bx, by) = (LEFT, H - BOTTOM);
    let _ = write!(
        out,
        r##"<rect x="{LEFT}" y="{TOP}" width="{}" height="{}" fill="#f5f6f8"/>"##,
        W - LEFT - RIGHT,
        H - TOP - BOTTOM
    );
    let _ = write!(
        out,
        r##"<path d="M{bx},{TOP}V{by}H{}" stroke="#1d2430" fill="none"/>"##,
        W - RIGHT
    );
    for (v, anchor_x) in [(x0, LEFT), (x1, W - RIGHT)] {
        let _ = write!(
            out,
            r#"<text x="{anchor_x}" y="{}" font-size="11" text-anchor="middle">{}</text>"#,
            by + 16.0,
            format_number(v)
        );
    }
    for (v, anchor_y) in [(y0, by), (y1, TOP + 10.0)] {
        let _ = write!(
            out,
            r#"<text x="{}" y="{anchor_y}" font-size="11" text-anchor="end">{}</text>"#,
            LEFT - 6.0,
            format_number(v)
        );
    }
    let _ = write!(
        out,
        r#"<text x="{}" y="{}" font-size="13" text-anchor="middle">{}</text>"#,
        (LEFT + W - RIGHT) / 2.0,
        H - 12.0,
        escape(x)
    );
    let _ = write!(
        out,
        r#"<text x="16" y="{}" font-size="13" text-anchor="middle" transform="rotate(-90 16 {})">{}</text>"#,
        (TOP + by) / 2.0,
        (TOP + by) / 2.0,
        escape(y)
    );
}
