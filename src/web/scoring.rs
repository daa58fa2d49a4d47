//! Results for the pages and the API: scored by the engine off the async reactor and
//! cached by a hash of the study's inputs and the engine version. The cache is only a
//! cache: the stored study inputs are the truth, results are always recomputable.

use std::collections::HashMap;
use std::sync::{Arc, Mutex};

use serde_json::Value;
use sha2::{Digest, Sha256};

use crate::engine::ENGINE_VERSION;
use crate::engine::results::StudyResults;
use crate::engine::study::Study;

use super::error::AppError;

/// Most result sets kept; past this the cache starts afresh.
const CACHE_CAPACITY: usize = 64;

/// One scored study: the engine's results and the same results as result-format JSON
/// (what the API returns and the pages read).
pub struct Scored {
    pub results: StudyResults,
    pub json: Value,
}

#[derive(Default)]
pub struct ResultsCache {
    map: Mutex<HashMap<String, Arc<Scored>>>,
}

/// The cache key: SHA-256 over the canonical study JSON and the engine version.
pub fn cache_key(study: &Study) -> String {
    let mut h = Sha256::new();
    h.update(serde_json::to_vec(study).unwrap_or_default());
    h.update(b"\0engine=");
    h.update(ENGINE_VERSION.as_bytes());
    hex::encode(h.finalize())
}

impl ResultsCache {
    fn get(&self, key: &str) -> Option<Arc<Scored>> {
        self.map
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .get(key)
            .cloned()
    }

    fn put(&self, key: String, value: Arc<Scored>) {
        let mut map = self.map.lock().unwrap_or_else(|e| e.into_inner());
        if map.len() >= CACHE_CAPACITY {
            map.clear();
        }
        map.insert(key, value);
    }

    /// Number of cached result sets (for tests and diagnostics).
    pub fn len(&self) -> usize {
        self.map.lock().unwrap_or_else(|e| e.into_inner()).len()
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The results of `study`, from the cache or freshly scored.
    pub async fn results(&self, study: &Study) -> Result<Arc<Scored>, AppError> {
        let key = cache_key(study);
        if let Some(hit) = self.get(&key) {
            return Ok(hit);
        }
        let owned = study.clone();
        let scored = tokio::task::spawn_blocking(move || {
            let results = crate::engine::score_study(&owned);
            serde_json::to_value(&results).map(|json| Scored { results, json })
        })
        .await
        .map_err(|e| AppError::Internal(format!("scoring task failed: {e}")))?
        .map_err(|e| AppError::Internal(format!("results not serialisable: {e}")))?;
        let scored = Arc::new(scored);
        self.put(key, scored.clone());
        Ok(scored)
    }
}
