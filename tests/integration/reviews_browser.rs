//! Two real browser sessions in one review: the presenter moves, the participant's page
//! follows; the participant stops following, the presenter moves on, and "Follow again"
//! brings the participant to the presenter's screen. Fails under
//! SHAFTLINE_REQUIRE_BROWSER=1 when the browser is missing.

use std::time::Duration;

use fantoccini::{Client, ClientBuilder, Locator};
use hyper_util::client::legacy::connect::HttpConnector;

use crate::browser::{browser_present, capabilities, start_driver};
use crate::helpers::PASSWORD;
use crate::helpers::spawn_app;

type Step<T> = Result<T, fantoccini::error::CmdError>;

async fn session(driver_url: &str, profile: &std::path::Path) -> Client {
    ClientBuilder::new(HttpConnector::new())
        .capabilities(capabilities(profile))
        .connect(driver_url)
        .await
        .expect("WebDriver session")
}

async fn sign_in(c: &Client, base: &str, user: &str, then: &str) -> Step<()> {
    c.goto(&format!("{base}/login?next={}", then.replace('/', "%2F")))
        .await?;
    c.wait()
        .for_element(Locator::Css("input[name=username]"))
        .await?
        .send_keys(user)
        .await?;
    c.find(Locator::Css("input[name=password]"))
        .await?
        .send_keys(PASSWORD)
        .await?;
    c.find(Locator::Css("#sign-in")).await?.click().await?;
    c.wait().for_element(Locator::Css("#review")).await?;
    Ok(())
}

/// Waits (bounded, 10 s) until the page shows the screen `view`; returns the URL path.
async fn wait_for_screen(c: &Client, view: &str) -> Step<String> {
    let css = format!("#review[data-view=\"{view}\"]");
    c.wait()
        .at_most(Duration::from_secs(10))
        .for_element(Locator::Css(&css))
        .await?;
    Ok(c.current_url().await?.path().to_string())
}

async fn present(c: &Client, view: &str) -> Step<()> {
    let css = format!("button.present[data-screen=\"{view}\"]");
    c.find(Locator::Css(&css)).await?.click().await?;
    wait_for_screen(c, view).await.map(drop)
}

async fn follow_through(p: &Client, f: &Client, base: &str, id: i64) -> Step<Vec<String>> {
    let page = format!("/reviews/{id}");
    sign_in(p, base, "eve", &page).await?;
    sign_in(f, base, "vic", &page).await?;
    f.wait()
        .for_element(Locator::Css("#stop-following:not([hidden])"))
        .await?;
    let mut seen = Vec::new();
    present(p, "candidates/2").await?;
    seen.push(wait_for_screen(f, "candidates/2").await?);
    present(p, "trade").await?;
    seen.push(wait_for_screen(f, "trade").await?);
    f.find(Locator::Css("#stop-following"))
        .await?
        .click()
        .await?;
    present(p, "compare").await?;
    tokio::time::sleep(Duration::from_millis(1500)).await;
    seen.push(f.current_url().await?.path().to_string());
    f.find(Locator::Css("#follow-again")).await?.click().await?;
    seen.push(wait_for_screen(f, "compare").await?);
    Ok(seen)
}

#[tokio::test]
async fn a_participants_browser_follows_the_presenters_browser() {
    if !browser_present() {
        return;
    }
    let app = spawn_app().await;
    let token = app.token_for("eve").await;
    let id = app.start_demo_review(&token, "Browser review").await;
    let base = app.serve().await;
    let (_driver, driver_url) = start_driver();
    let (pp, fp) = (tempfile::tempdir().unwrap(), tempfile::tempdir().unwrap());
    let presenter = session(&driver_url, pp.path()).await;
    let follower = session(&driver_url, fp.path()).await;
    let outcome = follow_through(&presenter, &follower, &base, id).await;
    let _ = presenter.close().await;
    let _ = follower.close().await;
    let seen = outcome.expect("browser steps succeed");
    let want = [
        format!("/reviews/{id}/candidates/2"),
        format!("/reviews/{id}/trade"),
        format!("/reviews/{id}/trade"),
        format!("/reviews/{id}/compare"),
    ];
    assert_eq!(
        seen, want,
        "followed twice, stayed put while not following, then caught up"
    );
}
