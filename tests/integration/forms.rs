//! Form values <-> study JSON: what an engineer types comes back unchanged on the edit
//! form, for any number (property test), and blank optional fields leave no trace.

use proptest::prelude::*;
use shaftline::web::fields::SEGMENT;
use shaftline::web::forms::{Values, build_json, values_from_json};

fn values(pairs: &[(&str, String)]) -> Values {
    pairs
        .iter()
        .map(|(k, v)| (k.to_string(), v.clone()))
        .collect()
}

proptest! {
    #[test]
    fn any_typed_number_comes_back_as_the_same_number(x in proptest::num::f64::NORMAL) {
        let typed = values(&[
            ("name", "Hold".into()),
            ("kind", "loiter".into()),
            ("power.tas_m_s", x.to_string()),
        ]);
        let json = build_json(SEGMENT, &typed, None).expect("a finite number is accepted");
        prop_assert_eq!(json["power"]["tas_m_s"].as_f64(), Some(x));
        let shown = values_from_json(SEGMENT, &json);
        let back: f64 = shown["power.tas_m_s"].parse().unwrap();
        prop_assert_eq!(back, x);
    }
}

#[test]
fn blank_optional_fields_leave_no_empty_objects_behind() {
    let typed = values(&[
        ("name", "Taxi".into()),
        ("kind", "taxi".into()),
        ("power.tas_m_s", "  ".into()),
    ]);
    let json = build_json(SEGMENT, &typed, None).unwrap();
    assert!(json.get("power").is_none(), "{json}");
    assert_eq!(json["kind"], "taxi");
}

#[test]
fn text_in_a_number_field_is_an_error_naming_the_field() {
    let typed = values(&[("name", "X".into()), ("prop_speed_rpm", "fast".into())]);
    let errors = build_json(SEGMENT, &typed, None).unwrap_err();
    assert_eq!(
        errors["prop_speed_rpm"],
        "prop_speed_rpm: must be a number (got 'fast')"
    );
}
