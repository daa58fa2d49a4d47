//! The studies list and the study page: new, import, export, duplicate, results.

use crate::helpers::spawn_app;
use axum::http::StatusCode;
use shaftline::engine::study::parse_study_str;
use shaftline::storage::studies::list_studies;

#[tokio::test]
async fn the_demo_study_page_lists_seven_candidates_with_the_caution_and_engine_version() {
    let app = spawn_app().await;
    let vic = app.session("vic").await;
    let page = app.get_study_page(&vic, app.demo_id).await;
    assert_eq!(page.status, StatusCode::OK);
    let table = page
        .body
        .split("id=\"candidates\"")
        .nth(1)
        .unwrap()
        .split("</table>")
        .next()
        .unwrap();
    assert_eq!(table.matches("<tr><td>").count(), 7, "seven candidate rows");
    assert!(
        page.body
            .contains("Not for certification, flight or manufacture.")
    );
    assert!(page.body.contains(&format!(
        "Engine version {}",
        shaftline::engine::ENGINE_VERSION
    )));
}

#[tokio::test]
async fn export_then_import_gives_the_identical_study() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let exported = app.get_export(&eve, app.demo_id).await;
    assert_eq!(exported.status, StatusCode::OK);
    assert!(
        exported
            .headers
            .get("content-disposition")
            .unwrap()
            .to_str()
            .unwrap()
            .contains("attachment")
    );
    let resp = app.post_import(&eve, &exported.body).await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let new_id: i64 = resp
        .location()
        .trim_start_matches("/studies/")
        .parse()
        .unwrap();
    let again = app.get_export(&eve, new_id).await;
    assert_eq!(
        parse_study_str(&again.body).unwrap(),
        parse_study_str(&exported.body).unwrap()
    );
    assert_eq!(again.body, exported.body, "byte-identical export");
}

#[tokio::test]
async fn importing_a_broken_file_names_the_path_and_stores_nothing() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let resp = app
        .post_import(&eve, "{\"format\": \"something-else\"}")
        .await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(resp.body.contains("id=\"err-study_json\""), "{}", resp.body);
    assert!(resp.body.contains("format"), "names the field");
    assert!(resp.body.contains("something-else"), "input kept");
    assert_eq!(list_studies(&app.db, None).await.unwrap().len(), 1);
}

#[tokio::test]
async fn a_new_study_starts_from_the_prefilled_aircraft() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let list = app.get_studies_page(&eve).await;
    assert!(
        list.body
            .contains("name=\"aircraft.payload_kg\" value=\"180\""),
        "aircraft defaults pre-filled"
    );
    let pairs = [
        ("name", "Variant B"),
        ("aircraft.motor_count", "2"),
        ("aircraft.airframe_mass_kg", "330"),
        ("aircraft.payload_kg", "180"),
        ("aircraft.max_takeoff_mass_kg", "950"),
        ("aircraft.battery.mode", "sized"),
        ("aircraft.battery.specific_energy_wh_per_kg", "200"),
    ];
    let resp = app.post_new_study(&eve, &pairs).await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER, "{}", resp.body);
    let page = app.get(resp.location(), Some(&eve)).await;
    assert!(page.body.contains("Variant B"));
    assert!(
        page.body
            .contains("Add at least one mission segment and one candidate")
    );
}

#[tokio::test]
async fn a_bad_motor_count_on_the_aircraft_form_is_shown_and_not_stored() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let page = app.get_study_page(&eve, app.demo_id).await;
    let rev = page
        .body
        .split("name=\"revision\" value=\"")
        .nth(1)
        .unwrap()
        .split('"')
        .next()
        .unwrap()
        .to_string();
    let mut pairs = vec![
        ("revision", rev.as_str()),
        ("name", "Renamed"),
        ("aircraft.motor_count", "40"),
    ];
    for (k, v) in [
        ("aircraft.airframe_mass_kg", "330"),
        ("aircraft.payload_kg", "180"),
        ("aircraft.max_takeoff_mass_kg", "950"),
        ("aircraft.battery.mode", "sized"),
        ("aircraft.battery.specific_energy_wh_per_kg", "200"),
    ] {
        pairs.push((k, v));
    }
    let resp = app.post_study_header(&eve, app.demo_id, &pairs).await;
    assert_eq!(resp.status, StatusCode::UNPROCESSABLE_ENTITY);
    assert!(
        resp.body.contains("id=\"err-aircraft.motor_count\""),
        "{}",
        resp.body
    );
    assert!(resp.body.contains("value=\"40\""));
    let row = shaftline::storage::studies::get_study(&app.db, app.demo_id)
        .await
        .unwrap();
    assert_ne!(row.name, "Renamed");
}

#[tokio::test]
async fn duplicating_a_study_copies_every_row() {
    let app = spawn_app().await;
    let eve = app.session("eve").await;
    let resp = app.post_duplicate(&eve, app.demo_id).await;
    assert_eq!(resp.status, StatusCode::SEE_OTHER);
    let list = list_studies(&app.db, None).await.unwrap();
    assert_eq!(list.len(), 2);
    assert!(
        list.iter()
            .any(|s| s.name.ends_with("(copy)") && s.candidates == 7)
    );
}
