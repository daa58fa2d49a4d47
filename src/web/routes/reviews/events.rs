//! `GET /reviews/{id}/events`: the review's live channel as server-sent events. The
//! stream opens with the presenter's current screen (so late joiners land there), then
//! relays every view change, comment, decision, handover and close.

use std::convert::Infallible;
use std::time::Duration;

use axum::extract::{Path, State};
use axum::response::sse::{Event, KeepAlive, Sse};
use axum::response::{IntoResponse, Response};
use futures_util::stream::{self, Stream};
use tokio::sync::broadcast::Receiver;
use tokio::sync::broadcast::error::RecvError;

use super::{load, view_event};
use crate::web::AppState;
use crate::web::auth::Viewer;
use crate::web::error::AppError;
use crate::web::live::ReviewEvent;

fn sse_event(ev: &ReviewEvent) -> Event {
    Event::default().event(ev.kind).data(ev.data.to_string())
}

/// The first event, then whatever the channel carries until it closes.
fn relay(
    first: ReviewEvent,
    rx: Receiver<ReviewEvent>,
) -> impl Stream<Item = Result<Event, Infallible>> {
    stream::unfold((Some(first), rx), |(first, mut rx)| async move {
        if let Some(ev) = first {
            return Some((Ok(sse_event(&ev)), (None, rx)));
        }
        loop {
            match rx.recv().await {
                Ok(ev) => return Some((Ok(sse_event(&ev)), (None, rx))),
                // A follower that fell behind skips ahead; the next view event sets it right.
                Err(RecvError::Lagged(_)) => continue,
                Err(RecvError::Closed) => return None,
            }
        }
    })
}

pub async fn review_events(
    State(state): State<AppState>,
    Viewer(_): Viewer,
    Path(id): Path<i64>,
) -> Result<Response, AppError> {
    // Subscribe before reading the stored view so no move between the two is missed.
    let rx = state.reviews.subscribe(id);
    let loaded = load(&state.db, id).await?;
    let first = ReviewEvent {
        kind: "view",
        data: view_event(&loaded.row, &loaded.row.current_view),
    };
    let keep = KeepAlive::new().interval(Duration::from_secs(15));
    Ok(Sse::new(relay(first, rx)).keep_alive(keep).into_response())
}
