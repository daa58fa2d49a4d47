//! Live review events: one broadcast channel per review, created on first use. Handlers
//! publish after their change is committed; each server-sent-event stream subscribes.
//! Nothing here is the truth: a late joiner reads the stored state first.

use std::collections::HashMap;
use std::sync::Mutex;

use serde_json::Value;
use tokio::sync::broadcast;

/// Events a slow follower may fall behind by before it skips ahead.
const CHANNEL_CAPACITY: usize = 64;

/// One thing that happened in a review: an SSE event name and its JSON data.
#[derive(Debug, Clone, PartialEq)]
pub struct ReviewEvent {
    /// `view`, `comment`, `decision`, `presenter` or `closed`.
    pub kind: &'static str,
    pub data: Value,
}

#[derive(Default)]
pub struct ReviewHub {
    channels: Mutex<HashMap<i64, broadcast::Sender<ReviewEvent>>>,
}

impl ReviewHub {
    fn sender(&self, review: i64) -> broadcast::Sender<ReviewEvent> {
        self.channels
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .entry(review)
            .or_insert_with(|| broadcast::channel(CHANNEL_CAPACITY).0)
            .clone()
    }

    pub fn subscribe(&self, review: i64) -> broadcast::Receiver<ReviewEvent> {
        self.sender(review).subscribe()
    }

    /// Sends to everyone following `review` (no one following is not an error).
    pub fn publish(&self, review: i64, kind: &'static str, data: Value) {
        let _ = self.sender(review).send(ReviewEvent { kind, data });
    }
}
