//! The bad-input suite over HTTP: page forms, the JSON API and the CSV import, each fed
//! from small tables (field × bad value). Every case must be answered 4xx (never 5xx),
//! name the field it is about, and store nothing: all studies and their rows are read
//! back from storage before and after the case and compared.

use axum::body::Body;
use axum::http::{Request, header};
use serde_json::{Value, json};
use shaftline::storage::studies::{self, Item};
use shaftline::web::fields::STUDY_HEADER;
use shaftline::web::forms;

use crate::helpers::{Resp, Session, TestApp, spawn_app};

/// Everything stored about every study: id, name, revision, header and rows with their
/// revisions. Two equal snapshots mean nothing was written.
async fn snapshot(app: &TestApp) -> String {
    let list = studies::list_studies(&app.db, None).await.unwrap();
    let mut out = format!("{} studies\n", list.len());
    for s in list {
        let (row, doc) = studies::load_doc(&app.db, s.id).await.unwrap();
        out.push_str(&format!(
            "{} {} rev {} {}\n",
            s.id,
            s.name,
            row.revision,
            doc.to_file_json()
        ));
        for item in [Item::Segment, Item::Candidate] {
            for r in studies::list_items(&app.db, item, s.id).await.unwrap() {
                out.push_str(&format!("  row {} rev {} {}\n", r.id, r.revision, r.body));
            }
        }
    }
    out
}

/// Percent-encodes every byte, so a value may carry bytes that are not UTF-8.
fn encode(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("%{b:02X}")).collect()
}

/// A form body from pairs, with `field` replaced by `bad` (or left out when `None`).
fn form_with(pairs: &[(&str, &str)], field: &str, bad: Option<&[u8]>, csrf: &str) -> String {
    let mut parts: Vec<String> = pairs
        .iter()
        .filter(|(k, _)| *k != field)
        .map(|(k, v)| format!("{}={}", encode(k.as_bytes()), encode(v.as_bytes())))
        .collect();
    if let Some(bad) = bad {
        parts.push(format!("{}={}", encode(field.as_bytes()), encode(bad)));
    }
    parts.push(format!("csrf_token={}", encode(csrf.as_bytes())));
    parts.join("&")
}

async fn post_raw(app: &TestApp, s: &Session, path: &str, body: String) -> Resp {
    let req = Request::post(path)
        .header(header::CONTENT_TYPE, "application/x-www-form-urlencoded")
        .header(header::COOKIE, &s.cookie)
        .body(Body::from(body))
        .unwrap();
    app.send(req).await
}

/// The text of the element that starts at `marker` up to `end` (empty when absent).
fn region<'a>(body: &'a str, marker: &str, end: &str) -> &'a str {
    body.split_once(marker)
        .and_then(|(_, rest)| rest.split_once(end))
        .map(|(r, _)| r)
        .unwrap_or("")
}

/// Asserts the common contract of a refused case and returns nothing on success.
fn assert_refused(label: &str, resp: &Resp, before: &str, after: &str) {
    assert!(
        resp.status.is_client_error(),
        "{label}: expected a 4xx, got {}\n{}",
        resp.status,
        resp.body
    );
    assert_eq!(before, after, "{label}: something was stored");
}

/// Bad values for a number field: (label, raw bytes as sent).
const BAD_NUMBERS: &[(&str, &[u8])] = &[
    ("NaN text", b"NaN"),
    ("infinity text", b"inf"),
    ("negative infinity text", b"-Infinity"),
    ("overflowing exponent", b"1e400"),
    ("huge", b"1e300"),
    ("negative", b"-5"),
    ("words", b"abc"),
    ("script tag", b"<script>alert(1)</script>"),
    ("SQL-looking", b"1; DROP TABLE studies; --"),
    ("invalid UTF-8", b"\xff\xfe1"),
    ("blank (missing)", b""),
];

/// A page form: its path, good pairs, and the number fields to spoil.
struct PageForm {
    label: &'static str,
    path: String,
    good: Vec<(&'static str, String)>,
    fields: &'static [&'static str],
}

const LOITER: &[(&str, &str)] = &[
    ("name", "Hold"),
    ("kind", "loiter"),
    ("power.rule", "steady"),
    ("power.tas_m_s", "40"),
    ("power.prop_efficiency", "0.8"),
    ("duration_s", "600"),
    ("altitude_start_m", "300"),
    ("prop_speed_rpm", "1900"),
];

const DATASHEET: &[(&str, &str)] = &[
    ("candidate_kind", "datasheet"),
    ("name", "D9 bad-input probe"),
    ("drive.gear_ratio", "1"),
    ("source.topology", "radial"),
    ("source.mass_kg", "20"),
    ("source.continuous_power_kw", "50"),
    ("source.continuous_speed_rpm", "2400"),
    ("source.peak_power_kw", "100"),
    ("source.peak_duration_s", "120"),
    ("source.max_speed_rpm", "3000"),
    ("source.continuous_efficiency", "0.95"),
];

const HEADER: &[(&str, &str)] = &[
    ("name", "Variant B"),
    ("aircraft.motor_count", "2"),
    ("aircraft.airframe_mass_kg", "330"),
    ("aircraft.payload_kg", "180"),
    ("aircraft.max_takeoff_mass_kg", "950"),
    ("aircraft.battery.mode", "sized"),
    ("aircraft.battery.specific_energy_wh_per_kg", "200"),
];

fn owned(pairs: &[(&'static str, &str)]) -> Vec<(&'static str, String)> {
    pairs.iter().map(|(k, v)| (*k, v.to_string())).collect()
}

async fn page_forms(app: &TestApp) -> Vec<PageForm> {
    let id = app.demo_id;
    let seg = studies::list_items(&app.db, Item::Segment, id)
        .await
        .unwrap()[1]
        .clone();
    let study_rev = studies::get_study(&app.db, id).await.unwrap().revision;
    let mut seg_edit = owned(LOITER);
    seg_edit.push(("revision", seg.revision.to_string()));
    // The header form as the study page fills it in, for the demo study.
    let (_, doc) = studies::load_doc(&app.db, id).await.unwrap();
    let shown = forms::values_from_json(STUDY_HEADER, &doc.to_file_json());
    let mut header_edit: Vec<(&'static str, String)> = STUDY_HEADER
        .iter()
        .filter_map(|f| shown.get(f.name).map(|v| (f.name, v.clone())))
        .collect();
    header_edit.push(("revision", study_rev.to_string()));
    vec![
        PageForm {
            label: "new segment",
            path: format!("/studies/{id}/segments"),
            good: owned(LOITER),
            fields: &[
                "power.tas_m_s",
                "power.prop_efficiency",
                "duration_s",
                "prop_speed_rpm",
            ],
        },
        PageForm {
            label: "edit segment",
            path: format!("/studies/{id}/segments/{}", seg.id),
            good: seg_edit,
            fields: &["duration_s", "power.tas_m_s"],
        },
        PageForm {
            label: "new datasheet candidate",
            path: format!("/studies/{id}/candidates"),
            good: owned(DATASHEET),
            fields: &[
                "source.mass_kg",
                "source.continuous_power_kw",
                "source.max_speed_rpm",
                "source.continuous_efficiency",
            ],
        },
        PageForm {
            label: "new study",
            path: "/studies".into(),
            good: owned(HEADER),
            fields: &["aircraft.motor_count", "aircraft.max_takeoff_mass_kg"],
        },
        PageForm {
            label: "edit study header",
            path: format!("/studies/{id}"),
            good: header_edit,
            fields: &["aircraft.motor_count", "aircraft.airframe_mass_kg"],
        },
    ]
}

fn pairs_of(f: &PageForm) -> Vec<(&str, &str)> {
    f.good.iter().map(|(k, v)| (*k, v.as_str())).collect()
}

#[tokio::test]
async fn bad_input_the_good_page_forms_are_accepted_so_the_tables_test_the_bad_value() {
    for i in 0..5 {
        let app = spawn_app().await;
        let eve = app.session("eve").await;
        let form = page_forms(&app).await.remove(i);
        let before = snapshot(&app).await;
        let body = form_with(&pairs_of(&form), "", None, &eve.csrf);
        let resp = post_raw(&app, &eve, &form.path, body).await;
        assert_eq!(resp.status, 303, "{}: {}", form.label, resp.body);
        assert_ne!(snapshot(&app).await, before, "{}: stored", form.label);
    }
}

#[tokio::test]
async fn bad_input_page_forms_refuse_each_bad_number_beside_its_field() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let mut cases = 0;
    for form in page_forms(&app).await {
        for field in form.fields {
            // Every bad value as sent, and the field left out of the form altogether.
            let sends = BAD_NUMBERS
                .iter()
                .map(|(what, bad)| (what.to_string(), Some(*bad)))
                .chain([("left out".to_string(), None)]);
            for (what, value) in sends {
                let label = format!("{} / {field} / {what}", form.label);
                let before = snapshot(&app).await;
                let body = form_with(&pairs_of(&form), field, value, &eve.csrf);
                let resp = post_raw(&app, &eve, &form.path, body).await;
                let after = snapshot(&app).await;
                assert_refused(&label, &resp, &before, &after);
                assert_eq!(resp.status, 422, "{label}: a re-shown form answers 422");
                // Beside the field, or (for a rule across fields of the row, such as
                // "exactly one duration") named in the form's notice.
                let marker = format!("id=\"err-{field}\">");
                let beside = region(&resp.body, &marker, "</span>");
                let notice = region(&resp.body, "role=\"alert\">", "</p>");
                assert!(
                    !beside.trim().is_empty() || notice.contains(field),
                    "{label}: the field is not named\n{}",
                    resp.body
                );
                cases += 1;
            }
        }
    }
    println!("page form cases: {cases}");
}

#[tokio::test]
async fn bad_input_page_forms_refuse_bad_names_beside_the_name_field() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let long = "x".repeat(10_000);
    let names: &[(&str, &[u8])] = &[
        ("blank", b""),
        ("spaces only", b"   "),
        ("over-long", long.as_bytes()),
        ("control character", b"Hold\x07"),
        ("newline", b"Hold\nsecond line"),
    ];
    for form in page_forms(&app).await {
        for (what, bad) in names {
            let label = format!("{} / name / {what}", form.label);
            let before = snapshot(&app).await;
            let body = form_with(&pairs_of(&form), "name", Some(bad), &eve.csrf);
            let resp = post_raw(&app, &eve, &form.path, body).await;
            let after = snapshot(&app).await;
            assert_refused(&label, &resp, &before, &after);
            let beside = region(&resp.body, "id=\"err-name\">", "</span>");
            assert!(
                !beside.trim().is_empty(),
                "{label}: no error beside the name\n{}",
                resp.body
            );
        }
    }
}

// ---- the study file: the import page and the JSON API ----

/// A spoiled study file: (label, JSON pointer, replacement or `None` to remove, the
/// dotted path the error must name).
type Spoil = (&'static str, &'static str, Option<Value>, &'static str);

fn spoils() -> Vec<Spoil> {
    let long = Value::from("y".repeat(10_000));
    vec![
        (
            "motor count as text",
            "/aircraft/motor_count",
            Some(json!("two")),
            "aircraft.motor_count",
        ),
        (
            "motor count negative",
            "/aircraft/motor_count",
            Some(json!(-1)),
            "aircraft.motor_count",
        ),
        (
            "motor count huge",
            "/aircraft/motor_count",
            Some(json!(1e300)),
            "aircraft.motor_count",
        ),
        (
            "motor count fractional",
            "/aircraft/motor_count",
            Some(json!(2.5)),
            "aircraft.motor_count",
        ),
        (
            "motor count null",
            "/aircraft/motor_count",
            Some(Value::Null),
            "aircraft.motor_count",
        ),
        (
            "motor count missing",
            "/aircraft/motor_count",
            None,
            "aircraft.motor_count",
        ),
        (
            "motor count boolean",
            "/aircraft/motor_count",
            Some(json!(true)),
            "aircraft.motor_count",
        ),
        (
            "motor count script",
            "/aircraft/motor_count",
            Some(json!("<script>alert(1)</script>")),
            "aircraft.motor_count",
        ),
        (
            "motor count SQL",
            "/aircraft/motor_count",
            Some(json!("1; DROP TABLE studies; --")),
            "aircraft.motor_count",
        ),
        (
            "payload NaN text",
            "/aircraft/payload_kg",
            Some(json!("NaN")),
            "aircraft.payload_kg",
        ),
        (
            "payload Infinity text",
            "/aircraft/payload_kg",
            Some(json!("Infinity")),
            "aircraft.payload_kg",
        ),
        (
            "payload negative",
            "/aircraft/payload_kg",
            Some(json!(-100)),
            "aircraft.payload_kg",
        ),
        (
            "payload huge",
            "/aircraft/payload_kg",
            Some(json!(1e300)),
            "aircraft.payload_kg",
        ),
        (
            "payload array",
            "/aircraft/payload_kg",
            Some(json!([180])),
            "aircraft.payload_kg",
        ),
        (
            "payload object",
            "/aircraft/payload_kg",
            Some(json!({"kg": 180})),
            "aircraft.payload_kg",
        ),
        (
            "aircraft as text",
            "/aircraft",
            Some(json!("light")),
            "aircraft",
        ),
        (
            "segment duration NaN text",
            "/segments/0/duration_s",
            Some(json!("NaN")),
            "segments[0].duration_s",
        ),
        (
            "segment duration negative",
            "/segments/0/duration_s",
            Some(json!(-600)),
            "segments[0].duration_s",
        ),
        (
            "segment duration huge",
            "/segments/0/duration_s",
            Some(json!(1e300)),
            "segments[0].duration_s",
        ),
        (
            "segment duration as text",
            "/segments/0/duration_s",
            Some(json!("300")),
            "segments[0].duration_s",
        ),
        (
            "segment kind unknown",
            "/segments/0/kind",
            Some(json!("teleport")),
            "segments[0].kind",
        ),
        (
            "segments as object",
            "/segments",
            Some(json!({})),
            "segments",
        ),
        (
            "candidate name missing",
            "/candidates/0/name",
            None,
            "candidates[0].name",
        ),
        (
            "candidate name number",
            "/candidates/0/name",
            Some(json!(5)),
            "candidates[0].name",
        ),
        (
            "candidate name blank",
            "/candidates/0/name",
            Some(json!("")),
            "candidates[0].name",
        ),
        (
            "candidate name over-long",
            "/candidates/0/name",
            Some(long.clone()),
            "candidates[0].name",
        ),
        (
            "candidate name control char",
            "/candidates/0/name",
            Some(json!("R1\u{0}")),
            "candidates[0].name",
        ),
        ("study name over-long", "/name", Some(long), "name"),
        (
            "candidate pole pairs negative",
            "/candidates/0/source/pole_pairs",
            Some(json!(-8)),
            "candidates[0].source.pole_pairs",
        ),
        (
            "candidate loading huge",
            "/candidates/0/source/electric_loading_a_per_m",
            Some(json!(1e300)),
            "candidates[0].source.electric_loading_a_per_m",
        ),
        (
            "candidate cooling SQL",
            "/candidates/0/source/cooling",
            Some(json!("forced_air' OR '1'='1")),
            "candidates[0].source.cooling",
        ),
        (
            "candidate kind script",
            "/candidates/0/source/kind",
            Some(json!("<script>x</script>")),
            "candidates[0].source.kind",
        ),
    ]
}

fn spoiled(base: &Value, pointer: &str, with: &Option<Value>) -> Value {
    let mut v = base.clone();
    let (parent, key) = pointer.rsplit_once('/').unwrap();
    let target = if parent.is_empty() {
        &mut v
    } else {
        v.pointer_mut(parent).expect("pointer's parent exists")
    };
    let obj = target.as_object_mut().expect("parent is an object");
    match with {
        Some(x) => {
            obj.insert(key.to_string(), x.clone());
        }
        None => {
            assert!(obj.remove(key).is_some(), "{pointer} exists");
        }
    }
    v
}

/// Bodies that are not a study file at all: (label, bytes, the path named).
fn bad_bodies() -> Vec<(&'static str, Vec<u8>, &'static str)> {
    let mut oversized = b"{\"name\": \"".to_vec();
    oversized.extend(std::iter::repeat_n(b'z', 2 * 1024 * 1024 + 16));
    oversized.extend(b"\"}");
    vec![
        ("NaN literal", b"{\"format\": NaN}".to_vec(), "body"),
        (
            "Infinity literal",
            b"{\"format\": Infinity}".to_vec(),
            "body",
        ),
        (
            "number out of range",
            b"{\"aircraft\": {\"motor_count\": 1e400}}".to_vec(),
            "body",
        ),
        (
            "invalid UTF-8",
            b"{\"name\": \"\xff\xfe\"}".to_vec(),
            "body",
        ),
        ("truncated", b"{\"name\": ".to_vec(), "body"),
        ("empty", Vec::new(), "body"),
        (
            "SQL instead of JSON",
            b"'; DROP TABLE studies; --".to_vec(),
            "body",
        ),
        ("array instead of object", b"[1, 2, 3]".to_vec(), ""),
        ("string instead of object", b"\"a study\"".to_vec(), ""),
        ("oversized", oversized, "body"),
    ]
}

async fn demo_json(app: &TestApp, token: &str) -> (Value, String) {
    let path = format!("/api/studies/{}", app.demo_id);
    let r = app.api("GET", &path, Some(token), &[], None).await;
    assert_eq!(r.status, 200, "{}", r.body);
    let etag = r.headers[header::ETAG].to_str().unwrap().to_string();
    (serde_json::from_str(&r.body).unwrap(), etag)
}

async fn api_raw(
    app: &TestApp,
    method: &str,
    path: &str,
    token: &str,
    etag: Option<&str>,
    body: Vec<u8>,
) -> Resp {
    let mut b = Request::builder()
        .method(method)
        .uri(path)
        .header(header::AUTHORIZATION, format!("Bearer {token}"))
        .header(header::CONTENT_TYPE, "application/json");
    if let Some(e) = etag {
        b = b.header(header::IF_MATCH, e);
    }
    app.send(b.body(Body::from(body)).unwrap()).await
}

/// The API's error names `path`: as its `path`, or (for a whole-body problem with no
/// path) in its message.
fn assert_api_names(label: &str, resp: &Resp, path: &str) {
    let v: Value = serde_json::from_str(&resp.body)
        .unwrap_or_else(|e| panic!("{label}: error body is not JSON ({e}): {}", resp.body));
    let got = v["error"]["path"]
        .as_str()
        .unwrap_or_else(|| panic!("{label}: no error.path: {v}"));
    let message = v["error"]["message"].as_str().unwrap_or("");
    assert!(!message.is_empty(), "{label}: no message: {v}");
    if path.is_empty() {
        return;
    }
    assert!(
        got == path || got.starts_with(&format!("{path}.")) || got.starts_with(&format!("{path}[")),
        "{label}: expected the error at {path}, got {v}"
    );
}

#[tokio::test]
async fn bad_input_the_api_refuses_spoiled_studies_on_create_and_replace() {
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let (base, etag) = demo_json(&app, &token).await;
    let put_path = format!("/api/studies/{}", app.demo_id);
    // The unspoiled file is accepted by both, so each refusal is the spoil's doing.
    let ok = api_raw(
        &app,
        "PUT",
        &put_path,
        &token,
        Some(&etag),
        base.to_string().into_bytes(),
    )
    .await;
    assert_eq!(ok.status, 200, "control PUT: {}", ok.body);
    let (base, etag) = demo_json(&app, &token).await;
    for (what, pointer, with, path) in spoils() {
        let body = spoiled(&base, pointer, &with).to_string().into_bytes();
        for (method, uri, if_match) in [
            ("POST", "/api/studies", None),
            ("PUT", put_path.as_str(), Some(etag.as_str())),
        ] {
            let label = format!("API {method} / {what}");
            let before = snapshot(&app).await;
            let resp = api_raw(&app, method, uri, &token, if_match, body.clone()).await;
            let after = snapshot(&app).await;
            assert_refused(&label, &resp, &before, &after);
            assert_api_names(&label, &resp, path);
        }
    }
    for (what, body, path) in bad_bodies() {
        for (method, uri, if_match) in [
            ("POST", "/api/studies", None),
            ("PUT", put_path.as_str(), Some(etag.as_str())),
        ] {
            let label = format!("API {method} / {what}");
            let before = snapshot(&app).await;
            let resp = api_raw(&app, method, uri, &token, if_match, body.clone()).await;
            let after = snapshot(&app).await;
            assert_refused(&label, &resp, &before, &after);
            assert_api_names(&label, &resp, path);
            if what == "oversized" {
                assert_eq!(resp.status, 413, "{label}");
            }
        }
    }
}

#[tokio::test]
async fn bad_input_the_import_page_refuses_spoiled_study_files_naming_the_path() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let token = app.token_for("eve").await;
    let (base, _) = demo_json(&app, &token).await;
    for (what, pointer, with, path) in spoils() {
        let label = format!("import page / {what}");
        let before = snapshot(&app).await;
        let text = spoiled(&base, pointer, &with).to_string();
        let resp = app.post_import(&eve, &text).await;
        let after = snapshot(&app).await;
        assert_refused(&label, &resp, &before, &after);
        assert_eq!(resp.status, 422, "{label}");
        let message = region(&resp.body, "id=\"err-study_json\">", "</span>");
        assert!(
            message.contains(path),
            "{label}: the message names {path}: {message}"
        );
    }
}

// ---- the CSV import of datasheet candidates ----

const CSV_HEADER: &str = "name,gear_ratio,topology,mass_kg,continuous_power_kw,continuous_speed_rpm,\
peak_power_kw,peak_duration_s,max_speed_rpm,continuous_efficiency";
const CSV_GOOD: [&str; 10] = [
    "C1 probe", "1", "radial", "20", "50", "2400", "100", "120", "3000", "0.95",
];

fn csv_with(column: usize, bad: &str) -> String {
    let mut cells: Vec<String> = CSV_GOOD.iter().map(|c| c.to_string()).collect();
    cells[column] = bad.to_string();
    let row = cells
        .iter()
        .map(|c| format!("\"{}\"", c.replace('"', "\"\"")))
        .collect::<Vec<_>>()
        .join(",");
    format!("{CSV_HEADER}\n{row}\n")
}

async fn post_csv(app: &TestApp, s: &Session, csv: &[u8]) -> Resp {
    let id = app.demo_id;
    let rev = studies::get_study(&app.db, id)
        .await
        .unwrap()
        .revision
        .to_string();
    let body = format!(
        "revision={}&candidates_csv={}&csrf_token={}",
        encode(rev.as_bytes()),
        encode(csv),
        encode(s.csrf.as_bytes())
    );
    post_raw(app, s, &format!("/studies/{id}/candidates/import"), body).await
}

/// The error part of the import page (the problem notice and the error table), without
/// the echoed CSV text.
fn csv_errors(body: &str) -> String {
    format!(
        "{} {}",
        region(body, "id=\"import-problem\">", "</p>"),
        region(body, "<table id=\"import-errors\">", "</table>")
    )
}

#[tokio::test]
async fn bad_input_the_csv_import_refuses_each_bad_cell_naming_its_column() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let columns: Vec<&str> = CSV_HEADER.split(',').collect();
    let long = "n".repeat(10_000);
    let values: &[(&str, &str)] = &[
        ("NaN text", "NaN"),
        ("infinity text", "inf"),
        ("huge", "1e300"),
        ("negative", "-5"),
        ("words", "abc"),
        ("blank", ""),
        ("script tag", "<script>alert(1)</script>"),
        ("SQL-looking", "1; DROP TABLE studies; --"),
    ];
    let mut table: Vec<(String, String, &str)> = Vec::new();
    for col in [3, 4, 5, 6, 8, 9] {
        for (what, bad) in values {
            table.push((
                format!("CSV / {} / {what}", columns[col]),
                csv_with(col, bad),
                columns[col],
            ));
        }
    }
    table.push((
        "CSV / topology / unknown".into(),
        csv_with(2, "linear"),
        "topology",
    ));
    table.push((
        "CSV / topology / SQL-looking".into(),
        csv_with(2, "radial' OR '1'='1"),
        "topology",
    ));
    table.push((
        "CSV / gear_ratio / negative".into(),
        csv_with(1, "-2"),
        "gear_ratio",
    ));
    table.push((
        "CSV / gear_ratio / words".into(),
        csv_with(1, "direct"),
        "gear_ratio",
    ));
    table.push(("CSV / name / blank".into(), csv_with(0, ""), "name"));
    table.push(("CSV / name / over-long".into(), csv_with(0, &long), "name"));
    // The control: the good row imports, so each refusal is its bad cell's doing.
    let control = spawn_app().await;
    let ceve = control.session("eve").await;
    let ok = post_csv(&control, &ceve, csv_with(0, CSV_GOOD[0]).as_bytes()).await;
    assert_eq!(ok.status, 303, "the good row imports: {}", ok.body);
    for (label, csv, column) in &table {
        let before = snapshot(&app).await;
        let resp = post_csv(&app, &eve, csv.as_bytes()).await;
        let after = snapshot(&app).await;
        assert_refused(label, &resp, &before, &after);
        assert_eq!(resp.status, 422, "{label}");
        let errors = csv_errors(&resp.body);
        assert!(
            errors.contains(column),
            "{label}: the error names {column}: {errors}"
        );
    }
    // Invalid UTF-8 in a cell: the bytes arrive as replacement characters in a number.
    let mut bytes = csv_with(3, "20").into_bytes();
    let at = bytes.windows(4).position(|w| w == b"\"20\"").unwrap();
    bytes.splice(at + 1..at + 3, b"\xff\xfe".iter().copied());
    let before = snapshot(&app).await;
    let resp = post_csv(&app, &eve, &bytes).await;
    let after = snapshot(&app).await;
    assert_refused("CSV / mass_kg / invalid UTF-8", &resp, &before, &after);
    assert!(csv_errors(&resp.body).contains("mass_kg"), "{}", resp.body);
}
