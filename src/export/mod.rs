//! CSV exports of results over any writer: one header row, units in the column names,
//! RFC 4180 quoting, UTF-8. No database, no HTTP.

use std::io::Write;

use crate::engine::results::{CandidateResult, METRICS, SegmentRow, StudyResults};

fn metric_cell(c: &CandidateResult, name: &str) -> String {
    match name {
        "mass_closure_converged" => c.mass_closure_converged.to_string(),
        "rank" => c.rank.map(|r| r.to_string()).unwrap_or_default(),
        _ => c.metric(name).map(|v| v.to_string()).unwrap_or_default(),
    }
}

/// One row per candidate: identity, verdict, every scalar metric, front membership and the
/// violation messages.
pub fn write_summary_csv(results: &StudyResults, out: impl Write) -> csv::Result<()> {
    let mut w = csv::Writer::from_writer(out);
    let mut header = vec!["name", "kind", "topology", "feasible", "binding_constraint"];
    header.extend(METRICS.iter().map(|(n, _)| *n));
    header.extend(["pareto_optimal", "violations"]);
    w.write_record(&header)?;
    for c in &results.candidates {
        let mut row = vec![
            c.name.clone(),
            c.kind.clone(),
            c.topology.clone(),
            c.feasible.to_string(),
            c.binding_constraint.clone().unwrap_or_default(),
        ];
        row.extend(METRICS.iter().map(|(n, _)| metric_cell(c, n)));
        row.push(c.pareto_optimal.to_string());
        row.push(
            c.violations
                .iter()
                .map(|v| v.message.as_str())
                .collect::<Vec<_>>()
                .join("; "),
        );
        w.write_record(&row)?;
    }
    w.flush()?;
    Ok(())
}

const SEGMENT_COLUMNS: [&str; 20] = [
    "segment",
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

fn segment_cells(r: &SegmentRow) -> Vec<String> {
    let nums = [
        r.duration_s,
        r.shaft_power_kw_per_motor,
        r.motor_speed_rpm,
        r.motor_torque_nm,
        r.peak_torque_nm,
        r.torque_capability_nm,
        r.motor_efficiency,
        r.copper_loss_w,
        r.iron_loss_w,
        r.mechanical_loss_w,
        r.inverter_loss_w,
        r.electric_power_kw,
        r.battery_energy_kwh,
        r.end_winding_temp_c,
        r.peak_winding_temp_c,
        r.end_stator_temp_c,
        r.peak_stator_temp_c,
    ];
    let mut cells = vec![r.name.clone(), r.kind.clone()];
    cells.extend(nums.iter().map(|v| v.to_string()));
    cells.push(
        r.peak_phase_current_a
            .map(|v| v.to_string())
            .unwrap_or_default(),
    );
    cells
}

/// One row per candidate × segment: the nominal mission, or the one-motor-out runs.
pub fn write_segments_csv(results: &StudyResults, oei: bool, out: impl Write) -> csv::Result<()> {
    let mut w = csv::Writer::from_writer(out);
    let mut header = vec!["candidate"];
    header.extend(SEGMENT_COLUMNS);
    w.write_record(&header)?;
    for c in &results.candidates {
        let rows = if oei { &c.oei_segments } else { &c.segments };
        for r in rows {
            let mut row = vec![c.name.clone()];
            row.extend(segment_cells(r));
            w.write_record(&row)?;
        }
    }
    w.flush()?;
    Ok(())
}
