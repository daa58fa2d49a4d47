//! `segments.csv` (the nominal mission) and `oei_segments.csv` (the one-motor-out runs):
//! one row per candidate × segment, every column of the result format's segment rows.

use std::io::Write;

use super::{as_object, field, writer};
use crate::engine::results::StudyResults;

/// The segment-row fields of the result format, in the order the CSV lists them after
/// the `candidate` column (`name` and `kind` are the segment's).
pub const SEGMENT_COLUMNS: [&str; 20] = [
    "name",
    "kind",
    "duration_s",
    "shaft_power_kw_per_motor",
    "motor_speed_rpm",
    "motor_torque_nm",
    "peak_torque_nm",
    "torque_capability_nm",
    "motor_efficiency",
    "copper_loss_w",
    "iron_loss_w",
    "mechanical_loss_w",
    "inverter_loss_w",
    "electric_power_kw",
    "battery_energy_kwh",
    "end_winding_temp_c",
    "peak_winding_temp_c",
    "end_stator_temp_c",
    "peak_stator_temp_c",
    "peak_phase_current_a",
];

/// The header as written: the segment's `name` and `kind` are renamed so that no
/// column is mistaken for the candidate's.
fn header() -> Vec<&'static str> {
    let mut h = vec!["candidate", "segment", "segment_kind"];
    h.extend(&SEGMENT_COLUMNS[2..]);
    h
}

/// Writes the nominal segment rows (`oei` false) or the one-motor-out rows (`oei` true)
/// of every candidate to `out`.
pub fn write_segments_csv(results: &StudyResults, oei: bool, out: impl Write) -> csv::Result<()> {
    let mut w = writer(out);
    w.write_record(header())?;
    for c in &results.candidates {
        let rows = if oei { &c.oei_segments } else { &c.segments };
        for seg in rows {
            let obj = as_object(seg)?;
            let mut row = vec![c.name.clone()];
            for key in SEGMENT_COLUMNS {
                row.push(field(&obj, key)?);
            }
            w.write_record(&row)?;
        }
    }
    w.flush()?;
    Ok(())
}
