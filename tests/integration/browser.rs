//! A real browser (Chromium through chromedriver, WebDriver over plain loopback HTTP):
//! sign in, open the demo study, find its seven candidates. Without the browser the test
//! fails under SHAFTLINE_REQUIRE_BROWSER=1 and otherwise says so and returns.

use std::path::Path;
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

use fantoccini::{ClientBuilder, Locator};
use hyper_util::client::legacy::connect::HttpConnector;
use serde_json::json;

use crate::helpers::{PASSWORD, spawn_app};

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
