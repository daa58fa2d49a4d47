//! Drawing helpers shared by the plots: marker shapes, a legend in the right margin, and
//! non-overlapping point labels, all in backend pixels on the root drawing area.

use plotters::coord::Shift;
use plotters::prelude::*;

use super::labels::{Placer, Rect, marker_box};
use super::{FONT, PlotError, palette};

/// The root drawing area every plot draws on.
pub type Root<'a> = DrawingArea<SVGBackend<'a>, Shift>;

/// How a series looks in the plot and in the legend.
#[derive(Debug, Clone, Copy)]
pub enum Mark {
    Line(RGBColor, u32),
    Circle(RGBColor),
    Triangle(RGBColor),
    Square(RGBColor),
    Diamond(RGBColor),
    Cross(RGBColor),
    Block(RGBColor),
}

/// Draws one marker centred on `(x, y)`.
pub fn mark(root: &Root, m: Mark, (x, y): (i32, i32)) -> Result<(), PlotError> {
    match m {
        Mark::Line(c, w) => root.draw(&PathElement::new(
            vec![(x - 12, y), (x + 12, y)],
            c.stroke_width(w),
        ))?,
        Mark::Circle(c) => root.draw(&Circle::new((x, y), 5, c.filled()))?,
        Mark::Triangle(c) => root.draw(&TriangleMarker::new((x, y), 6, c.filled()))?,
        Mark::Square(c) => root.draw(&Rectangle::new(
            [(x - 4, y - 4), (x + 4, y + 4)],
            c.filled(),
        ))?,
        Mark::Diamond(c) => root.draw(&Polygon::new(
            vec![(x, y - 6), (x + 6, y), (x, y + 6), (x - 6, y)],
            c.filled(),
        ))?,
        Mark::Cross(c) => root.draw(&Cross::new((x, y), 5, c.stroke_width(2)))?,
        Mark::Block(c) => root.draw(&Rectangle::new(
            [(x - 9, y - 6), (x + 9, y + 6)],
            c.filled(),
        ))?,
    }
    Ok(())
}

/// A legend as a column of marks and names starting at `(x, y)`.
pub fn legend(root: &Root, (x, y): (i32, i32), entries: &[(Mark, &str)]) -> Result<(), PlotError> {
    let style = (FONT, 13).into_font().color(&palette::SLATE);
    for (i, (m, name)) in entries.iter().enumerate() {
        let row = y + 20 * i as i32;
        mark(root, *m, (x + 12, row + 7))?;
        root.draw(&Text::new(short(name, 30), (x + 30, row), style.clone()))?;
    }
    Ok(())
}

/// `text` cut to `max` characters with an ellipsis (legend room is fixed).
pub fn short(text: &str, max: usize) -> String {
    if text.chars().count() <= max {
        return text.to_string();
    }
    let mut out: String = text.chars().take(max - 1).collect();
    out.push('…');
    out
}

/// Writes each label near its point without covering another label or any marker.
pub fn point_labels(
    root: &Root,
    area: Rect,
    points: &[(String, (i32, i32))],
) -> Result<(), PlotError> {
    let blocked = points
        .iter()
        .map(|(_, (x, y))| marker_box(*x, *y, 6))
        .collect();
    let mut placer = Placer::new(area, 12, blocked);
    let style = (FONT, 12).into_font().color(&BLACK);
    for (text, (x, y)) in points {
        let at = placer.place(text, *x, *y);
        root.draw(&Text::new(text.clone(), at, style.clone()))?;
    }
    Ok(())
}

/// The font of axis titles and tick labels.
pub fn axis_font() -> TextStyle<'static> {
    (FONT, 14).into_font().color(&palette::SLATE)
}

/// The font of a plot's caption.
pub fn caption_font() -> TextStyle<'static> {
    (FONT, 17).into_font().color(&BLACK)
}
