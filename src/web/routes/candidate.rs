//! The candidate page: inputs with their defaults, verdict and violations, key
//! results, geometry and mass by part, assumptions, and the per-segment tables.

use askama::Template;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};
use serde_json::Value;

use super::common::{load_study, text};
use crate::engine::ENGINE_VERSION;
use crate::storage::studies::{self, Item};
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::fields::candidate_fields;
use crate::web::forms;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::plots::{Figure, candidate_figures};

/// Key result metrics shown in order: JSON key and label with unit.
const METRICS: &[(&str, &str)] = &[
    ("motor_mass_kg", "Motor mass [kg]"),
    ("propulsion_mass_kg", "Propulsion mass, all motors [kg]"),
    ("battery_mass_kg", "Battery mass [kg]"),
    ("takeoff_mass_kg", "Takeoff mass [kg]"),
    ("mission_energy_kwh", "Mission energy [kWh]"),
    ("reserve_energy_kwh", "Reserve energy [kWh]"),
    ("mission_motor_efficiency", "Mission motor efficiency"),
    ("cruise_motor_efficiency", "Cruise motor efficiency"),
    ("mission_drive_efficiency", "Mission drive efficiency"),
    ("rated_torque_nm", "Rated torque [N·m]"),
    ("peak_torque_nm", "Peak torque [N·m]"),
    ("base_speed_rpm", "Base speed [rpm]"),
    ("max_speed_rpm", "Max speed [rpm]"),
    ("peak_winding_temp_c", "Peak winding temperature [°C]"),
    ("peak_magnet_temp_c", "Peak magnet temperature [°C]"),
    ("winding_margin_k", "Winding margin [K]"),
    ("magnet_margin_k", "Magnet margin [K]"),
    ("torque_margin", "Torque margin"),
    ("specific_power_kw_per_kg", "Specific power [kW/kg]"),
    (
        "peak_specific_power_kw_per_kg",
        "Peak specific power [kW/kg]",
    ),
    ("torque_density_nm_per_kg", "Torque density [N·m/kg]"),
    ("rotor_inertia_kg_m2", "Rotor inertia [kg·m²]"),
    ("peak_phase_current_a", "Peak phase current [A]"),
    ("envelope_diameter_m", "Envelope diameter [m]"),
    ("envelope_length_m", "Envelope length [m]"),
    ("energy_margin_kwh", "Energy margin [kWh]"),
    ("energy_margin_pct", "Energy margin [%]"),
    ("mass_closure_converged", "Mass closure converged"),
    ("pareto_optimal", "Pareto optimal"),
    ("trade_score", "Trade score"),
    ("rank", "Rank"),
];

/// Per-segment columns: JSON key of a segment result row.
const SEGMENT_COLUMNS: &[&str] = &[
    "name",
    "duration_s",
    "shaft_power_kw_per_motor",
    "motor_speed_rpm",
    "motor_torque_nm",
    "motor_efficiency",
    "copper_loss_w",
    "iron_loss_w",
    "mechanical_loss_w",
    "electric_power_kw",
    "battery_energy_kwh",
    "end_winding_temp_c",
    "peak_winding_temp_c",
];

type SegmentTable = (&'static str, &'static str, Vec<Vec<String>>);

#[derive(Template)]
#[template(path = "study/candidate.html")]
struct CandidatePage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    id: i64,
    name: String,
    kind_title: String,
    sweepable: bool,
    problem: Option<String>,
    feasible: Option<bool>,
    binding: String,
    violations: Vec<String>,
    inputs: Vec<(String, String, String)>,
    metrics: Vec<(String, String)>,
    geometry: Vec<(String, String)>,
    assumptions: Vec<String>,
    segment_columns: Vec<&'static str>,
    segment_tables: Vec<SegmentTable>,
    figures: Vec<Figure>,
    engine_version: &'static str,
}

fn inputs(body: &Value) -> (String, Vec<(String, String, String)>) {
    let kind = body
        .pointer("/source/kind")
        .and_then(Value::as_str)
        .unwrap_or("");
    let Some((title, fields)) = candidate_fields(kind) else {
        return (kind.to_string(), Vec::new());
    };
    let values = forms::values_from_json(fields, body);
    let rows = fields
        .iter()
        .map(|f| {
            let v = values.get(f.name).cloned().filter(|v| !v.is_empty());
            let unit = if f.unit.is_empty() {
                String::new()
            } else {
                format!(" [{}]", f.unit)
            };
            (
                format!("{}{unit}", f.label),
                v.unwrap_or_else(|| "(engine default)".into()),
                f.hint.to_string(),
            )
        })
        .collect();
    (title.to_string(), rows)
}

fn segment_rows(r: &Value, key: &str) -> Vec<Vec<String>> {
    let rows = r
        .get(key)
        .and_then(Value::as_array)
        .cloned()
        .unwrap_or_default();
    rows.iter()
        .map(|row| {
            SEGMENT_COLUMNS
                .iter()
                .map(|c| row.get(*c).map(text).unwrap_or_else(|| "–".into()))
                .collect()
        })
        .collect()
}

fn fill_results(page: &mut CandidatePage, r: &Value) {
    page.feasible = r.get("feasible").and_then(Value::as_bool);
    page.binding = r
        .get("binding_constraint")
        .and_then(Value::as_str)
        .unwrap_or("")
        .to_string();
    let list = |k: &str| {
        r.get(k)
            .and_then(Value::as_array)
            .cloned()
            .unwrap_or_default()
    };
    page.violations = list("violations")
        .iter()
        .map(|v| {
            v.get("message")
                .and_then(Value::as_str)
                .map(str::to_string)
                .unwrap_or_else(|| v.to_string())
        })
        .collect();
    page.metrics = METRICS
        .iter()
        .filter_map(|(k, label)| r.get(*k).map(|v| (label.to_string(), text(v))))
        .collect();
    if let Some(Value::Object(g)) = r.get("geometry") {
        page.geometry = g.iter().map(|(k, v)| (k.clone(), text(v))).collect();
    }
    page.assumptions = list("assumptions").iter().map(text).collect();
    page.segment_tables = vec![
        (
            "Mission segments",
            "segment-results",
            segment_rows(r, "segments"),
        ),
        (
            "Mission segments, one motor inoperative",
            "oei-results",
            segment_rows(r, "oei_segments"),
        ),
    ];
}

pub async fn show_candidate(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path((id, row)): Path<(i64, i64)>,
) -> Result<Response, AppError> {
    let stored = studies::get_item(&state.db, Item::Candidate, id, row).await?;
    let rows = studies::list_items(&state.db, Item::Candidate, id).await?;
    let index = rows.iter().position(|r| r.id == row).unwrap_or(0);
    let loaded = load_study(&state, id).await?;
    let body = stored.json()?;
    let (kind_title, inputs) = inputs(&body);
    let mut page = CandidatePage {
        nav: Nav::of(&user),
        study_id: id,
        study_name: loaded.row.name.clone(),
        id: row,
        name: body
            .get("name")
            .and_then(Value::as_str)
            .unwrap_or("")
            .to_string(),
        kind_title,
        sweepable: matches!(
            body.pointer("/source/kind").and_then(Value::as_str),
            Some("radial_sizing" | "axial_sizing")
        ),
        problem: loaded.problem.clone(),
        feasible: None,
        binding: String::new(),
        violations: Vec::new(),
        inputs,
        metrics: Vec::new(),
        geometry: Vec::new(),
        assumptions: Vec::new(),
        segment_columns: SEGMENT_COLUMNS.to_vec(),
        segment_tables: Vec::new(),
        figures: Vec::new(),
        engine_version: ENGINE_VERSION,
    };
    if let Some(study) = &loaded.study {
        let results = state.results.results(study).await?;
        if let Some(r) = results.json.get("candidates").and_then(|c| c.get(index)) {
            fill_results(&mut page, r);
        }
        page.figures = candidate_figures(study, index).await?;
    }
    Ok(HtmlTemplate(page).into_response())
}
