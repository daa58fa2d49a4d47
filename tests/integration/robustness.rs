//! Ranking robustness through the web: the same seed reproduces the CSV, another seed
//! moves it, the CSV parses with one header row, and bad samples or seeds are refused
//! with a message naming the field and its range.

use crate::helpers::spawn_app;

#[tokio::test]
async fn seeded_robustness_is_reproducible_and_its_csv_parses() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let id = app.demo_id;
    let a = app.get_robustness_csv(&vic, id, "?samples=12&seed=7").await;
    let b = app.get_robustness_csv(&vic, id, "?samples=12&seed=7").await;
    let c = app.get_robustness_csv(&vic, id, "?samples=12&seed=8").await;
    assert_eq!(a.status, 200, "{}", a.body);
    assert_eq!(a.body, b.body, "same seed, same figures");
    assert_ne!(a.body, c.body, "another seed moves the figures");
    let mut r = csv::Reader::from_reader(a.body.as_bytes());
    let head: Vec<String> = r.headers().unwrap().iter().map(String::from).collect();
    assert_eq!(
        head[..5],
        [
            "candidate",
            "nominal_feasible",
            "p_feasible",
            "p_pareto",
            "p_best"
        ]
    );
    let rows: Vec<csv::StringRecord> = r.records().map(|x| x.expect("row parses")).collect();
    assert_eq!(rows.len(), 7, "one row per demo candidate");
    for row in &rows {
        for k in 2..5 {
            let p: f64 = row[k].parse().expect("probability is a number");
            assert!((0.0..=1.0).contains(&p), "{} {}: {p}", &row[0], head[k]);
        }
        assert_eq!(&row[5], "12", "samples column");
    }
    let p = |row: &csv::StringRecord, k: usize| -> f64 { row[k].parse().unwrap() };
    for row in &rows {
        let what = &row[0];
        assert!(
            p(row, 3) <= p(row, 2),
            "{what}: on the front only when feasible"
        );
        assert!(p(row, 4) <= p(row, 2), "{what}: best only when feasible");
    }
    let best: f64 = rows.iter().map(|row| p(row, 4)).sum();
    assert!(
        best <= 1.0 + 1e-9,
        "at most one best candidate per sample: {best}"
    );
}

#[tokio::test]
async fn the_robustness_page_shows_the_chart_ranges_and_caution() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let page = app
        .get_robustness(&vic, app.demo_id, "?samples=5&seed=3")
        .await;
    assert_eq!(page.status, 200, "{}", page.body);
    for want in [
        "id=\"plot-robustness\"",
        "id=\"robustness\"",
        "Battery specific energy",
        "× 0.9 to × 1.1",
        "Not for certification",
        "Engine version",
    ] {
        assert!(page.body.contains(want), "page shows {want}");
    }
}

#[tokio::test]
async fn bad_samples_or_seed_are_refused_naming_the_field() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let cases = [
        (
            "?samples=0",
            "samples: must be a whole number from 1 to 5000",
        ),
        (
            "?samples=5001",
            "samples: must be a whole number from 1 to 5000",
        ),
        (
            "?samples=2.5",
            "samples: must be a whole number from 1 to 5000",
        ),
        (
            "?samples=3&seed=-1",
            "seed: must be a whole number from 0 to",
        ),
        (
            "?samples=3&seed=abc",
            "seed: must be a whole number from 0 to",
        ),
    ];
    for (q, want) in cases {
        let r = app.get_robustness(&vic, app.demo_id, q).await;
        assert_eq!(r.status, 400, "{q}");
        assert!(r.body.contains(want), "{q}: wants '{want}' in {}", r.body);
        let csv = app.get_robustness_csv(&vic, app.demo_id, q).await;
        assert_eq!(csv.status, 400, "CSV {q}");
    }
}
