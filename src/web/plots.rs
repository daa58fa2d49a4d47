//! Plots for the pages: the engine's closer look at candidates runs off the reactor
//! (`spawn_blocking`, it is CPU-heavy) and its SVGs come back as strings.

use crate::engine::inspect::inspect_candidate;
use crate::engine::study::Study;
use crate::plots::temperature::{self, Overlay};
use crate::plots::{efficiency, losses, torque_speed};

use super::error::AppError;

/// A plot for a template: heading, caption and the SVG markup (trusted: made here, every
/// text in it escaped by the SVG backend or `plots::escape`).
pub struct Figure {
    pub title: &'static str,
    pub caption: String,
    pub svg: String,
}

fn figure(
    title: &'static str,
    caption: &str,
    svg: Result<String, crate::plots::PlotError>,
) -> Figure {
    let svg = svg.unwrap_or_else(|e| format!("<p class=\"notice\">{e}</p>"));
    Figure {
        title,
        caption: caption.to_string(),
        svg,
    }
}

/// The four plots of one candidate, or none when the motor cannot be built.
pub async fn candidate_figures(study: &Study, index: usize) -> Result<Vec<Figure>, AppError> {
    let study = study.clone();
    tokio::task::spawn_blocking(move || {
        let Some(ins) = inspect_candidate(&study, index) else {
            return Vec::new();
        };
        let eff = format!(
            "Motor efficiency at {} °C winding and {} °C magnets, sea-level air; \
             blank cells lie outside the torque capability.",
            efficiency::WINDING_C,
            efficiency::MAGNET_C
        );
        vec![
            figure("Torque–speed capability", "Mission points at each segment's mean torque; the thin line reaches up to its peak torque.", torque_speed::plot(&ins)),
            figure("Efficiency map", &eff, efficiency::plot(&ins)),
            figure("Temperatures", "Nominal mission with segment bands; each one-motor-out run starts from the nominal state at its first segment.", temperature::plot(&ins)),
            figure("Losses by segment", "Mean losses of one motor and its inverter in each nominal segment.", losses::plot(&ins.result)),
        ]
    })
    .await
    .map_err(|e| AppError::Internal(format!("plot task failed: {e}")))
}

/// The winding temperature of the candidates at `indices`, overlaid.
pub async fn compare_figure(study: &Study, indices: Vec<usize>) -> Result<Figure, AppError> {
    let study = study.clone();
    tokio::task::spawn_blocking(move || {
        let series: Vec<Overlay> = indices
            .iter()
            .filter_map(|&i| inspect_candidate(&study, i))
            .map(|ins| Overlay::of(&ins.result.name, &ins.trace))
            .collect();
        figure(
            "Winding temperature",
            "Winding temperature of each compared candidate through the nominal mission.",
            temperature::overlay(&series),
        )
    })
    .await
    .map_err(|e| AppError::Internal(format!("plot task failed: {e}")))
}
