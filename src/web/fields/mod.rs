//! The form fields of each study-format object: labels, units, defaults pre-filled on
//! new forms (engine defaults, or the demo aircraft's values for required inputs) and
//! typical ranges. Field names are the objects' JSON paths. Only descriptions live
//! here; parsing form values into JSON is `forms`' job, validation the engine's.

mod datasheet;
mod segment;
mod sizing;
mod study;

pub use datasheet::DATASHEET;
pub use segment::SEGMENT;
pub use sizing::{AXIAL, RADIAL};
pub use study::STUDY_HEADER;

use super::forms::{Field, Kind};

/// An optional field.
pub(super) const fn f(
    path: &'static str,
    label: &'static str,
    unit: &'static str,
    kind: Kind,
    default: &'static str,
    hint: &'static str,
) -> Field {
    Field {
        name: path,
        path,
        label,
        unit,
        kind,
        default,
        hint,
        required: false,
    }
}

/// A required field.
pub(super) const fn req(
    path: &'static str,
    label: &'static str,
    unit: &'static str,
    kind: Kind,
    default: &'static str,
    hint: &'static str,
) -> Field {
    Field {
        name: path,
        path,
        label,
        unit,
        kind,
        default,
        hint,
        required: true,
    }
}

/// Insulation classes, shared by every candidate kind.
pub(super) const INSULATION: &[&str] = &["B", "F", "H", "N", "R"];

/// The three candidate kinds: value of `source.kind`, title, fields.
pub const CANDIDATE_KINDS: [(&str, &str, &[Field]); 3] = [
    ("datasheet", "Datasheet motor", DATASHEET),
    ("radial_sizing", "Radial-flux motor (sized)", RADIAL),
    ("axial_sizing", "Axial-flux motor (sized)", AXIAL),
];

/// The fields of a candidate kind, if it is one.
pub fn candidate_fields(kind: &str) -> Option<(&'static str, &'static [Field])> {
    CANDIDATE_KINDS
        .iter()
        .find(|(k, _, _)| *k == kind)
        .map(|(_, t, f)| (*t, *f))
}
