//! The route registry: every feature router is built through it, so the application
//! can list its own route patterns (the authorisation matrix test reads that list and
//! fails for any route without a rule).

use axum::Router;
use axum::routing::MethodRouter;

use crate::web::AppState;

/// A router that remembers the path pattern of each route it was given.
#[derive(Default)]
pub struct Routes {
    router: Router<AppState>,
    paths: Vec<&'static str>,
}

impl Routes {
    pub fn new() -> Self {
        Routes::default()
    }

    /// Adds `methods` at `path` (a pattern such as `/studies/{id}`).
    pub fn route(mut self, path: &'static str, methods: MethodRouter<AppState>) -> Self {
        self.router = self.router.route(path, methods);
        if !self.paths.contains(&path) {
            self.paths.push(path);
        }
        self
    }

    pub fn merge(mut self, other: Routes) -> Self {
        self.router = self.router.merge(other.router);
        for p in other.paths {
            if !self.paths.contains(&p) {
                self.paths.push(p);
            }
        }
        self
    }

    /// Every registered path pattern, in registration order.
    pub fn paths(&self) -> &[&'static str] {
        &self.paths
    }

    pub fn into_router(self) -> Router<AppState> {
        self.router
    }
}
