//! A real browser (Chromium through chromedriver, WebDriver over plain loopback HTTP):
//! sign in, open the demo study, find its seven candidates; open the trade page and a
//! candidate page and check that every plot renders with a size (screenshots kept under
//! the target directory). Without the browser the test
//! fails under SHAFTLINE_REQUIRE_BROWSER=1 and otherwise says so and returns.

use std::path::Path;
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

use fantoccini::{ClientBuilder, Locator};
use hyper_util::client::legacy::connect::HttpConnector;
use serde_json::json;

use crate::helpers::{PASSWORD, artefact_dir, spawn_app};

const CHROMIUM: &str = "/usr/bin/chromium";
const DRIVER: &str = "/usr/bin/chromedriver";

pub struct Driver(Child);

impl Drop for Driver {
    fn drop(&mut self) {
        let _ = self.0.kill();
        let _ = self.0.wait();
    }
}

fn free_port() -> u16 {
    std::net::TcpListener::bind("127.0.0.1:0")
        .unwrap()
        .local_addr()
        .unwrap()
        .port()
}

pub fn start_driver() -> (Driver, String) {
    let port = free_port();
    let child = Command::new(DRIVER)
        .arg(format!("--port={port}"))
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .expect("chromedriver starts");
    let deadline = Instant::now() + Duration::from_secs(20);
    while std::net::TcpStream::connect(("127.0.0.1", port)).is_err() {
        assert!(
            Instant::now() < deadline,
            "chromedriver did not open port {port}"
        );
        std::thread::sleep(Duration::from_millis(100));
    }
    (Driver(child), format!("http://127.0.0.1:{port}"))
}

pub fn capabilities(profile: &Path) -> fantoccini::wd::Capabilities {
    let args = [
        "--headless=new",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-dev-shm-usage",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--window-size=1280,900",
    ];
    let mut args: Vec<String> = args.iter().map(|s| s.to_string()).collect();
    args.push(format!("--user-data-dir={}", profile.display()));
    let caps = json!({ "goog:chromeOptions": { "binary": CHROMIUM, "args": args } });
    caps.as_object().unwrap().clone()
}

pub fn browser_present() -> bool {
    let present = Path::new(CHROMIUM).exists() && Path::new(DRIVER).exists();
    if !present {
        let required = std::env::var("SHAFTLINE_REQUIRE_BROWSER").is_ok_and(|v| v == "1");
        assert!(
            !required,
            "SHAFTLINE_REQUIRE_BROWSER=1 but {CHROMIUM} or {DRIVER} is missing"
        );
        eprintln!(
            "NOTICE: browser test not run: install chromium and chromium-driver ({CHROMIUM}, {DRIVER})"
        );
    }
    present
}

#[tokio::test]
async fn a_browser_signs_in_and_sees_the_seven_demo_candidates() {
    if !browser_present() {
        return;
    }
    let app = spawn_app().await;
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let base = format!("http://{}", listener.local_addr().unwrap());
    let router = app.router.clone();
    tokio::spawn(async move { axum::serve(listener, router).await.unwrap() });
    let (_driver, driver_url) = start_driver();
    let profile = tempfile::tempdir().unwrap();
    let client = ClientBuilder::new(HttpConnector::new())
        .capabilities(capabilities(profile.path()))
        .connect(&driver_url)
        .await
        .expect("WebDriver session");
    let outcome = drive(&client, &base, app.demo_id).await;
    let _ = client.close().await;
    let rows = outcome.expect("browser steps succeed");
    assert_eq!(rows, 7, "the demo study's candidate table has seven rows");
}

async fn drive(
    client: &fantoccini::Client,
    base: &str,
    demo_id: i64,
) -> Result<usize, fantoccini::error::CmdError> {
    client.goto(&format!("{base}/studies/{demo_id}")).await?;
    client
        .wait()
        .for_element(Locator::Css("input[name=username]"))
        .await?
        .send_keys("vic")
        .await?;
    client
        .find(Locator::Css("input[name=password]"))
        .await?
        .send_keys(PASSWORD)
        .await?;
    client.find(Locator::Css("#sign-in")).await?.click().await?;
    client
        .wait()
        .for_element(Locator::Css("table#candidates"))
        .await?;
    let rows = client
        .find_all(Locator::Css("table#candidates tbody tr"))
        .await?;
    Ok(rows.len())
}

/// Width and height of every `svg.plot` on the page, from `getBoundingClientRect`.
async fn plot_sizes(
    client: &fantoccini::Client,
) -> Result<Vec<(f64, f64)>, fantoccini::error::CmdError> {
    let script = "return Array.from(document.querySelectorAll('svg.plot')).map(e => { const r = e.getBoundingClientRect(); return [r.width, r.height]; });";
    let v = client.execute(script, vec![]).await?;
    let sizes = v
        .as_array()
        .map(|a| {
            a.iter()
                .map(|p| (p[0].as_f64().unwrap_or(0.0), p[1].as_f64().unwrap_or(0.0)))
                .collect()
        })
        .unwrap_or_default();
    Ok(sizes)
}

/// Opens `url`, keeps a screenshot of the window as `NAME.png`, returns the plot sizes.
async fn shoot(
    client: &fantoccini::Client,
    url: &str,
    name: &str,
) -> Result<Vec<(f64, f64)>, fantoccini::error::CmdError> {
    client.goto(url).await?;
    client.wait().for_element(Locator::Css("svg.plot")).await?;
    let sizes = plot_sizes(client).await?;
    let png = client.screenshot().await?;
    std::fs::write(artefact_dir("screenshots").join(format!("{name}.png")), png)
        .expect("screenshot written");
    Ok(sizes)
}

#[tokio::test]
async fn a_browser_renders_the_trade_and_candidate_plots() {
    if !browser_present() {
        return;
    }
    let app = spawn_app().await;
    let candidate = shaftline::storage::studies::list_items(
        &app.db,
        shaftline::storage::studies::Item::Candidate,
        app.demo_id,
    )
    .await
    .unwrap()[0]
        .id;
    let listener = tokio::net::TcpListener::bind("127.0.0.1:0").await.unwrap();
    let base = format!("http://{}", listener.local_addr().unwrap());
    let router = app.router.clone();
    tokio::spawn(async move { axum::serve(listener, router).await.unwrap() });
    let (_driver, driver_url) = start_driver();
    let profile = tempfile::tempdir().unwrap();
    let client = ClientBuilder::new(HttpConnector::new())
        .capabilities(capabilities(profile.path()))
        .connect(&driver_url)
        .await
        .expect("WebDriver session");
    let outcome = async {
        drive(&client, &base, app.demo_id).await?;
        let trade = shoot(
            &client,
            &format!("{base}/studies/{}/trade", app.demo_id),
            "trade",
        )
        .await?;
        let cand = shoot(
            &client,
            &format!("{base}/studies/{}/candidates/{candidate}", app.demo_id),
            "candidate",
        )
        .await?;
        Ok::<_, fantoccini::error::CmdError>((trade, cand))
    }
    .await;
    let _ = client.close().await;
    let (trade, cand) = outcome.expect("browser steps succeed");
    assert_eq!(trade.len(), 1, "one plot on the trade page");
    assert_eq!(cand.len(), 4, "four plots on the candidate page");
    for (w, h) in trade.iter().chain(&cand) {
        assert!(
            *w > 100.0 && *h > 50.0,
            "a plot renders with a size ({w} × {h})"
        );
    }
}
