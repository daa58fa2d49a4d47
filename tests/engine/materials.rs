//! Insulation classes, copper, magnets and electrical steel.

use shaftline::engine::materials::{copper_resistivity, insulation_class_temp_c, remanence_at};
use shaftline::engine::steel::{
    GRADES, classical_eddy_coefficient, find_grade, grade_coefficients,
};
use shaftline::engine::study::InsulationClass;

#[test]
fn insulation_classes_follow_iec_60085() {
    // IEC 60085:2007 thermal classes: B 130, F 155, H 180, N 200, R 220 °C.
    for (class, t) in [
        (InsulationClass::B, 130.0),
        (InsulationClass::F, 155.0),
        (InsulationClass::H, 180.0),
        (InsulationClass::N, 200.0),
        (InsulationClass::R, 220.0),
    ] {
        assert_eq!(insulation_class_temp_c(class), t, "{class:?}");
    }
}

#[test]
fn copper_resistivity_follows_iacs_with_its_temperature_coefficient() {
    // IACS 1.7241e-8 Ω·m at 20 °C (copper.org), α20 = 0.00393/K (IEC 60028);
    // computed check values of reference-values §4.1.
    assert_close!(copper_resistivity(20.0), 1.7241e-8, rel = 1e-12);
    assert_close!(copper_resistivity(100.0), 2.2662e-8, rel = 1e-4);
    assert_close!(copper_resistivity(155.0), 2.6388e-8, rel = 1e-4);
}

#[test]
fn magnet_remanence_falls_with_temperature() {
    // Br(T) = Br20·(1 + αBr(T − 20)); 1.30 T at 120 °C with −0.12 %/K → 1.144 T
    // (reference-values §4.2, computed).
    assert_close!(remanence_at(1.30, -0.0012, 120.0), 1.144, rel = 1e-9);
}

#[test]
fn every_built_in_50_hz_grade_reproduces_its_designation_loss() {
    // EN 10106 designation rule: M ppp-tt A loses ppp/100 W/kg at 1.5 T, 50 Hz.
    for g in GRADES.iter().filter(|g| g.ref_freq_hz == 50.0) {
        let k = grade_coefficients(g, 1.9e6).expect("classical loss below the grade's loss");
        let digits: f64 = g.name[1..4].parse().unwrap();
        assert_close!(k.specific_loss(1.5, 50.0), digits / 100.0, rel = 1e-9);
        let thickness: f64 = g.name[5..7].parse().unwrap();
        assert_close!(g.thickness_m, thickness * 1e-5, rel = 1e-12);
    }
}

#[test]
fn the_thin_grade_reproduces_its_high_frequency_point() {
    // thin-020: 15 W/kg at 1.0 T, 400 Hz (engine.md §4 assumption).
    let g = find_grade("thin-020").unwrap();
    let k = grade_coefficients(g, 1.9e6).unwrap();
    assert_close!(k.specific_loss(1.0, 400.0), 15.0, rel = 1e-9);
}

#[test]
fn classical_eddy_coefficient_of_a_0_35_mm_lamination() {
    // k_e = π²σd²/(6ρ) = 5.06e-5 W/(kg·Hz²·T²) for 0.35 mm, 1.92e6 S/m, 7650 kg/m³
    // (reference-values §12, computed; Bertotti 1988).
    assert_close!(
        classical_eddy_coefficient(1.92e6, 0.35e-3, 7650.0),
        5.06e-5,
        rel = 0.01
    );
}
