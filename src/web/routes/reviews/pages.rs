//! The review pages, rendered from the snapshot only: overview (candidate table and
//! decisions), comparison, trade plot, one candidate, one segment; and a study's list
//! of reviews. Every page carries the follow controls, the comments and the caution.

use askama::Template;
use axum::extract::{Path, State};
use axum::response::{IntoResponse, Response};

use super::{Loaded, load, may_lead, view_exists};
use crate::storage::reviews::{self, CommentRow, DecisionRow, ReviewRow};
use crate::storage::studies;
use crate::web::AppState;
use crate::web::auth::{CurrentUser, Viewer};
use crate::web::error::AppError;
use crate::web::html::{HtmlTemplate, Nav};
use crate::web::snapshot::minutes::outcome_label;
use crate::web::snapshot::plot::pareto_svg;
use crate::web::snapshot::tables::{
    self, CandidateDetail, CandidateRow, CompareRow, SEGMENT_COLUMNS,
};

/// A comment or decision as the page shows it.
pub struct Record {
    pub candidate: String,
    pub who: String,
    pub when: String,
    pub label: String,
    pub text: String,
}

fn comment_record(c: &CommentRow) -> Record {
    Record {
        candidate: c.candidate.clone().unwrap_or_default(),
        who: c.created_by.clone(),
        when: c.created_at.clone(),
        label: String::new(),
        text: c.body.clone(),
    }
}

fn decision_record(d: &DecisionRow) -> Record {
    Record {
        candidate: d.candidate.clone(),
        who: d.decided_by.clone(),
        when: d.decided_at.clone(),
        label: outcome_label(&d.outcome).to_string(),
        text: d.rationale.clone(),
    }
}

#[derive(Default)]
pub struct Body {
    pub rows: Vec<CandidateRow>,
    pub headers: Vec<&'static str>,
    pub compare: Vec<CompareRow>,
    pub svg: String,
    pub x: String,
    pub y: String,
    pub detail: Option<CandidateDetail>,
    pub segment: Vec<(String, Vec<String>)>,
}

#[derive(Template)]
#[template(path = "review/page.html")]
struct ReviewPage {
    nav: Nav,
    r: ReviewRow,
    view: String,
    heading: String,
    is_presenter: bool,
    may_lead: bool,
    participants: Vec<String>,
    candidates: Vec<String>,
    screens: Vec<(String, String)>,
    focus: String,
    body: Body,
    segment_columns: Vec<&'static str>,
    comments: Vec<Record>,
    decisions: Vec<Record>,
    in_force: Vec<String>,
    engine_version: String,
}

/// The decision in force for each candidate (its label, or "" when none yet).
fn in_force(names: &[String], decisions: &[DecisionRow]) -> Vec<String> {
    names
        .iter()
        .map(|n| {
            let last = decisions.iter().rev().find(|d| &d.candidate == n);
            last.map(|d| outcome_label(&d.outcome).to_string())
                .unwrap_or_default()
        })
        .collect()
}

/// Every screen of a review in the order the presenter's menu lists them.
fn screens(candidates: &[String], segments: &[String]) -> Vec<(String, String)> {
    let mut out = vec![
        (String::new(), "Candidates".to_string()),
        ("compare".into(), "Comparison".into()),
        ("trade".into(), "Trade plot".into()),
    ];
    for (i, n) in candidates.iter().enumerate() {
        out.push((format!("candidates/{i}"), format!("{}. {n}", i + 1)));
    }
    for (i, n) in segments.iter().enumerate() {
        out.push((format!("segments/{i}"), format!("Segment: {n}")));
    }
    out
}

/// The candidate a view is about, preselected in the comment and decision forms.
fn focus(candidates: &[String], view: &str) -> String {
    view.strip_prefix("candidates/")
        .and_then(|n| n.parse::<usize>().ok())
        .and_then(|n| candidates.get(n).cloned())
        .unwrap_or_default()
}

async fn render(
    state: &AppState,
    user: &CurrentUser,
    loaded: Loaded,
    view: String,
    heading: String,
    body: Body,
) -> Result<Response, AppError> {
    let id = loaded.row.id;
    if loaded.row.is_open() {
        reviews::join_review(&state.db, id, &user.username).await?;
    }
    let decisions = reviews::list_decisions(&state.db, id).await?;
    let names = loaded.snap.candidate_names();
    let page = ReviewPage {
        nav: Nav::of(user),
        is_presenter: loaded.row.is_open() && user.username == loaded.row.presenter,
        may_lead: loaded.row.is_open() && may_lead(user, &loaded.row),
        participants: reviews::list_participants(&state.db, id).await?,
        in_force: in_force(&names, &decisions),
        screens: screens(&names, &loaded.snap.segment_names()),
        focus: focus(&names, &view),
        candidates: names,
        comments: reviews::list_comments(&state.db, id)
            .await?
            .iter()
            .map(comment_record)
            .collect(),
        decisions: decisions.iter().map(decision_record).collect(),
        engine_version: loaded.row.engine_version.clone(),
        segment_columns: SEGMENT_COLUMNS.to_vec(),
        r: loaded.row,
        view,
        heading,
        body,
    };
    Ok(HtmlTemplate(page).into_response())
}

pub async fn overview(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = load(&state.db, id).await?;
    let body = Body {
        rows: tables::candidate_rows(&loaded.snap),
        headers: tables::candidate_headers(),
        ..Body::default()
    };
    render(
        &state,
        &user,
        loaded,
        String::new(),
        "Candidates".into(),
        body,
    )
    .await
}

pub async fn compare(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = load(&state.db, id).await?;
    let body = Body {
        compare: tables::compare_rows(&loaded.snap),
        ..Body::default()
    };
    render(
        &state,
        &user,
        loaded,
        "compare".into(),
        "Comparison".into(),
        body,
    )
    .await
}

pub async fn trade(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let loaded = load(&state.db, id).await?;
    let objectives = loaded.snap.objectives();
    let x = objectives
        .first()
        .cloned()
        .unwrap_or_else(|| "propulsion_mass_kg".into());
    let y = objectives
        .get(1)
        .cloned()
        .unwrap_or_else(|| "mission_energy_kwh".into());
    let body = Body {
        svg: pareto_svg(&loaded.snap, &x, &y),
        rows: tables::candidate_rows(&loaded.snap),
        x,
        y,
        ..Body::default()
    };
    render(
        &state,
        &user,
        loaded,
        "trade".into(),
        "Trade plot".into(),
        body,
    )
    .await
}

pub async fn candidate(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path((id, n)): Path<(i64, usize)>,
) -> Result<Response, AppError> {
    let loaded = load(&state.db, id).await?;
    let detail = tables::candidate_detail(&loaded.snap, n)
        .ok_or_else(|| AppError::NotFound(format!("this review has no candidate {n}")))?;
    let heading = format!("Candidate: {}", detail.name);
    let body = Body {
        detail: Some(detail),
        ..Body::default()
    };
    render(
        &state,
        &user,
        loaded,
        format!("candidates/{n}"),
        heading,
        body,
    )
    .await
}

pub async fn segment(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path((id, n)): Path<(i64, usize)>,
) -> Result<Response, AppError> {
    let loaded = load(&state.db, id).await?;
    let view = format!("segments/{n}");
    if !view_exists(&loaded.snap, &view) {
        return Err(AppError::NotFound(format!(
            "this review has no segment {n}"
        )));
    }
    let heading = format!("Segment: {}", loaded.snap.segment_names()[n]);
    let body = Body {
        segment: tables::segment_rows(&loaded.snap, n),
        ..Body::default()
    };
    render(&state, &user, loaded, view, heading, body).await
}

#[derive(Template)]
#[template(path = "review/list.html")]
struct ListPage {
    nav: Nav,
    study_id: i64,
    study_name: String,
    reviews: Vec<ReviewRow>,
}

pub async fn list_reviews(
    State(state): State<AppState>,
    Viewer(user): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    let study = studies::get_study(&state.db, id).await?;
    let page = ListPage {
        nav: Nav::of(&user),
        study_id: id,
        study_name: study.name,
        reviews: reviews::list_reviews(&state.db, id).await?,
    };
    Ok(HtmlTemplate(page).into_response())
}
