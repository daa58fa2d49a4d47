//! Review minutes as Markdown and CSV: who took part, each candidate's key numbers at
//! the snapshot, the decisions with their rationale, the comments, the engine version and
//! the caution. Pure text; the caller supplies every time stamp and name.

use super::{CAUTION, KEY_METRICS, Snapshot, show};
use crate::storage::reviews::{CommentRow, DecisionRow, ReviewRow};

/// Everything the minutes are made of.
pub struct Minutes<'a> {
    pub review: &'a ReviewRow,
    pub participants: &'a [String],
    pub snapshot: &'a Snapshot,
    pub decisions: &'a [DecisionRow],
    pub comments: &'a [CommentRow],
}

/// Display name of a decision outcome.
pub fn outcome_label(outcome: &str) -> &str {
    match outcome {
        "carry_forward" => "carry forward",
        other => other,
    }
}

fn md_cell(s: &str) -> String {
    s.replace('|', "\\|").replace(['\r', '\n'], " ")
}

/// A value for machines: numbers unrounded, booleans `true`/`false`, null empty.
fn raw(v: Option<&serde_json::Value>) -> String {
    use serde_json::Value;
    match v {
        None | Some(Value::Null) => String::new(),
        Some(Value::String(s)) => s.clone(),
        Some(other) => other.to_string(),
    }
}

impl Minutes<'_> {
    fn status_line(&self) -> String {
        let r = self.review;
        match (&r.closed_by, &r.closed_at) {
            (Some(by), Some(at)) => format!("closed by {by} at {at}"),
            _ => "open".into(),
        }
    }

    pub fn markdown(&self) -> String {
        let r = self.review;
        let mut out = format!("# Review minutes: {}\n\n", md_cell(&r.title));
        out += &format!(
            "- Study: {} (revision {})\n",
            md_cell(&show(self.snapshot.study.get("name"))),
            r.study_revision
        );
        out += &format!("- Started by {} at {}\n", r.created_by, r.created_at);
        out += &format!("- Status: {}\n", self.status_line());
        out += &format!("- Participants: {}\n", self.participants.join(", "));
        out += &format!("- Engine version: {}\n\n", r.engine_version);
        out += "## Candidates at the snapshot\n\n| # | Candidate |";
        for (_, label) in KEY_METRICS {
            out += &format!(" {label} |");
        }
        out += &format!("\n|---|---|{}\n", "---|".repeat(KEY_METRICS.len()));
        for (i, c) in self.snapshot.candidates().iter().enumerate() {
            out += &format!("| {} | {} |", i + 1, md_cell(&show(c.get("name"))));
            for (k, _) in KEY_METRICS {
                out += &format!(" {} |", md_cell(&show(c.get(k))));
            }
            out.push('\n');
        }
        out += &self.markdown_records();
        out += &format!("\n## Caution\n\n{CAUTION}\n");
        out
    }

    fn markdown_records(&self) -> String {
        let mut out = String::from("\n## Decisions\n\n");
        if self.decisions.is_empty() {
            out += "No decisions recorded.\n";
        }
        for d in self.decisions {
            out += &format!(
                "- **{}**: {} — {} ({}, {})\n",
                md_cell(&d.candidate),
                outcome_label(&d.outcome),
                md_cell(&d.rationale),
                d.decided_by,
                d.decided_at
            );
        }
        out += "\n## Comments\n\n";
        if self.comments.is_empty() {
            out += "No comments.\n";
        }
        for c in self.comments {
            let on = c.candidate.as_deref().unwrap_or("the review");
            out += &format!(
                "- {} at {} on {}: {}\n",
                c.created_by,
                c.created_at,
                md_cell(on),
                md_cell(&c.body)
            );
        }
        out
    }

    /// One header row; `record` says what each row is (review, candidate, decision,
    /// comment, closed, engine, caution). Key numbers, unrounded, fill candidate rows.
    pub fn csv(&self) -> Result<Vec<u8>, csv::Error> {
        let mut w = csv::Writer::from_writer(Vec::new());
        let mut header = vec!["record", "candidate", "who", "when", "outcome", "text"];
        header.extend(KEY_METRICS.iter().map(|(k, _)| *k));
        w.write_record(&header)?;
        let blank = vec![String::new(); KEY_METRICS.len()];
        let r = self.review;
        let mut row = |cells: [&str; 6], numbers: &[String]| {
            let mut all: Vec<String> = cells.iter().map(|s| s.to_string()).collect();
            all.extend(numbers.iter().cloned());
            w.write_record(&all)
        };
        row(
            [
                "review",
                "",
                &r.created_by,
                &r.created_at,
                &r.status,
                &r.title,
            ],
            &blank,
        )?;
        row(
            ["participants", "", "", "", "", &self.participants.join(" ")],
            &blank,
        )?;
        for c in self.snapshot.candidates() {
            let nums: Vec<String> = KEY_METRICS.iter().map(|(k, _)| raw(c.get(*k))).collect();
            row(["candidate", &show(c.get("name")), "", "", "", ""], &nums)?;
        }
        for d in self.decisions {
            let cells = [
                "decision",
                &d.candidate,
                &d.decided_by,
                &d.decided_at,
                &d.outcome,
                &d.rationale,
            ];
            row(cells, &blank)?;
        }
        for c in self.comments {
            let on = c.candidate.as_deref().unwrap_or("");
            row(
                ["comment", on, &c.created_by, &c.created_at, "", &c.body],
                &blank,
            )?;
        }
        if let (Some(by), Some(at)) = (&r.closed_by, &r.closed_at) {
            row(["closed", "", by, at, "", ""], &blank)?;
        }
        row(["engine", "", "", "", "", &r.engine_version], &blank)?;
        row(["caution", "", "", "", "", CAUTION], &blank)?;
        w.into_inner().map_err(|e| e.into_error().into())
    }
}
