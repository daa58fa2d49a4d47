//! Label placement without overlaps: each label tries a ring of positions around its
//! anchor point and takes the first whose estimated box is free and inside the plot.
//! Text sizes are estimated (no fonts are loaded), so boxes are drawn generously.

/// An axis-aligned box in backend pixels: left, top, right, bottom.
pub type Rect = (i32, i32, i32, i32);

/// Estimated box of `text` at font size `px` with its top-left corner at `(x, y)`.
pub fn text_box(text: &str, px: u32, x: i32, y: i32) -> Rect {
    let w = (text.chars().count() as f64 * px as f64 * 0.62).ceil() as i32;
    let h = (px as f64 * 1.25).ceil() as i32;
    (x, y, x + w, y + h)
}

fn overlaps(a: Rect, b: Rect) -> bool {
    a.0 < b.2 && b.0 < a.2 && a.1 < b.3 && b.1 < a.3
}

fn inside(a: Rect, area: Rect) -> bool {
    a.0 >= area.0 && a.1 >= area.1 && a.2 <= area.2 && a.3 <= area.3
}

/// Places labels one after the other, remembering the boxes already taken.
pub struct Placer {
    area: Rect,
    taken: Vec<Rect>,
    px: u32,
}

impl Placer {
    /// Labels of font size `px` kept inside `area`; `blocked` boxes (markers, legend)
    /// are avoided from the start.
    pub fn new(area: Rect, px: u32, blocked: Vec<Rect>) -> Self {
        Placer {
            area,
            taken: blocked,
            px,
        }
    }

    /// Top-left corner for `text` near the anchor `(x, y)`: the first free spot on
    /// rings of growing distance; when none is free, the nearest spot inside the area.
    pub fn place(&mut self, text: &str, x: i32, y: i32) -> (i32, i32) {
        let (w, h) = {
            let b = text_box(text, self.px, 0, 0);
            (b.2, b.3)
        };
        let mut fallback = None;
        for ring in 1..=6 {
            let d = 4 + 10 * (ring - 1);
            let spots = [
                (x + d, y - h / 2),
                (x - d - w, y - h / 2),
                (x - w / 2, y - d - h),
                (x - w / 2, y + d),
                (x + d, y - d - h),
                (x - d - w, y - d - h),
                (x + d, y + d),
                (x - d - w, y + d),
            ];
            for (sx, sy) in spots {
                let b = text_box(text, self.px, sx, sy);
                if !inside(b, self.area) {
                    continue;
                }
                fallback.get_or_insert(b);
                if self.taken.iter().all(|t| !overlaps(*t, b)) {
                    self.taken.push(b);
                    return (sx, sy);
                }
            }
        }
        let b = fallback.unwrap_or_else(|| text_box(text, self.px, x, y));
        self.taken.push(b);
        (b.0, b.1)
    }
}

/// A small square box around a marker at `(x, y)`, to keep labels off the markers.
pub fn marker_box(x: i32, y: i32, r: i32) -> Rect {
    (x - r, y - r, x + r, y + r)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn labels_at_the_same_point_do_not_overlap() {
        let mut p = Placer::new((0, 0, 400, 300), 12, vec![marker_box(200, 150, 5)]);
        let boxes: Vec<Rect> = ["Climb", "Cruise", "Descent", "Takeoff"]
            .iter()
            .map(|t| {
                let (x, y) = p.place(t, 200, 150);
                text_box(t, 12, x, y)
            })
            .collect();
        for (i, a) in boxes.iter().enumerate() {
            assert!(
                !overlaps(*a, marker_box(200, 150, 5)),
                "label {i} on marker"
            );
            for b in &boxes[i + 1..] {
                assert!(!overlaps(*a, *b), "{a:?} overlaps {b:?}");
            }
        }
    }

    #[test]
    fn a_label_near_the_edge_stays_inside() {
        let mut p = Placer::new((0, 0, 400, 300), 12, Vec::new());
        let (x, y) = p.place("Reserve", 398, 2);
        assert!(inside(text_box("Reserve", 12, x, y), (0, 0, 400, 300)));
    }
}
