//! Plots: engine results turned into SVG strings with plotters' SVG backend. No database,
//! no HTTP, no files: every function takes values and returns markup for a page.

pub mod draw;
pub mod efficiency;
pub mod family;
pub mod labels;
pub mod losses;
pub mod pareto;
pub mod robustness;
pub mod temperature;
pub mod torque_speed;

use plotters::style::RGBColor;

/// Width and height of a full-width plot, px (the SVG scales down with the page).
pub const SIZE: (u32, u32) = (820, 460);

/// Font family: the browser's own sans-serif (no web fonts).
pub const FONT: &str = "sans-serif";

/// The series palette: hues spaced apart and stepped in lightness so that the series stay
/// apart for the common colour-vision deficiencies and in greyscale print.
pub mod palette {
    use super::RGBColor;
    /// Deep blue.
    pub const BLUE: RGBColor = RGBColor(0x1f, 0x4e, 0x8c);
    /// Burnt orange.
    pub const ORANGE: RGBColor = RGBColor(0xd0, 0x6a, 0x12);
    /// Light sky blue.
    pub const SKY: RGBColor = RGBColor(0x63, 0xa8, 0xdc);
    /// Plum.
    pub const PLUM: RGBColor = RGBColor(0x8e, 0x3b, 0x78);
    /// Slate grey.
    pub const SLATE: RGBColor = RGBColor(0x4a, 0x4f, 0x57);
    /// Ochre.
    pub const OCHRE: RGBColor = RGBColor(0xc3, 0x9a, 0x1f);
    /// Red for limits (always drawn with a label, never the only cue).
    pub const LIMIT: RGBColor = RGBColor(0xb0, 0x1e, 0x2a);
    /// Band shading behind segments.
    pub const BAND: RGBColor = RGBColor(0xee, 0xf0, 0xf3);
    /// Series colours in order for "one line per candidate" plots.
    pub const SERIES: [RGBColor; 6] = [BLUE, ORANGE, SKY, PLUM, SLATE, OCHRE];
}

/// Why a plot could not be drawn (a plotters drawing error, as text).
#[derive(Debug, thiserror::Error)]
#[error("plot could not be drawn: {0}")]
pub struct PlotError(pub String);

impl<E: std::error::Error + Send + Sync> From<plotters::drawing::DrawingAreaErrorKind<E>>
    for PlotError
{
    fn from(e: plotters::drawing::DrawingAreaErrorKind<E>) -> Self {
        PlotError(e.to_string())
    }
}

/// Motor speed in rpm from rad/s.
pub fn rpm(omega_rad_s: f64) -> f64 {
    omega_rad_s * 60.0 / std::f64::consts::TAU
}

/// A range `[lo, hi]` widened by `pad` of its span on both sides (never empty).
pub fn padded(lo: f64, hi: f64, pad: f64) -> (f64, f64) {
    let span = if hi > lo { hi - lo } else { lo.abs().max(1.0) };
    (lo - pad * span, hi + pad * span)
}

/// A value for a hover title: four significant figures or so.
pub fn fmt(x: f64) -> String {
    let a = x.abs();
    let decimals = if a >= 1000.0 {
        0
    } else if a >= 10.0 {
        2
    } else {
        4
    };
    format!("{x:.decimals$}")
}

/// Escapes text for SVG content and attribute values.
pub fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// Inserts raw SVG markup just before the closing `</svg>` (hover titles drawn over a
/// finished plot).
pub fn append_markup(svg: &mut String, markup: &str) {
    if let Some(end) = svg.rfind("</svg>") {
        svg.insert_str(end, markup);
    }
}

/// Sets the root element's accessible name and a class for the stylesheet.
pub fn finish(mut svg: String, id: &str, title: &str) -> String {
    let head = format!(
        "<svg id=\"{}\" class=\"plot\" role=\"img\" aria-label=\"{}\"",
        escape(id),
        escape(title)
    );
    if let Some(rest) = svg.strip_prefix("<svg") {
        svg = format!("{head}{rest}");
    }
    let at = svg.find('>').map_or(0, |i| i + 1);
    svg.insert_str(at, &format!("<title>{}</title>", escape(title)));
    svg
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finish_names_the_plot_and_keeps_one_root() {
        let out = finish("<svg width=\"1\"></svg>".into(), "p", "A & B");
        assert_eq!(
            out,
            "<svg id=\"p\" class=\"plot\" role=\"img\" aria-label=\"A &amp; B\" width=\"1\">\
             <title>A &amp; B</title></svg>"
        );
    }

    #[test]
    fn padded_widens_a_flat_range() {
        assert_eq!(padded(5.0, 5.0, 0.1), (4.5, 5.5));
        assert_eq!(padded(0.0, 10.0, 0.1), (-1.0, 11.0));
    }
}
