//! ISA / U.S. Standard Atmosphere 1976.

use shaftline::engine::atmosphere::{R_AIR, air, sutherland_viscosity};

/// U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562), by geopotential altitude:
/// H m, T K, p Pa, ρ kg/m³ (reference-values §1.2, rows computed from the published
/// constants and matching the `ambiance` 1.3.1 library).
const TABLE: [(f64, f64, f64, f64); 7] = [
    (0.0, 288.150, 101_325.00, 1.225000),
    (1000.0, 281.650, 89_874.56, 1.111643),
    (2000.0, 275.150, 79_495.20, 1.006490),
    (3000.0, 268.650, 70_108.53, 0.909122),
    (5000.0, 255.650, 54_019.89, 0.736116),
    (8000.0, 236.150, 35_599.79, 0.525167),
    (11000.0, 216.650, 22_632.04, 0.363918),
];

#[test]
fn isa_matches_the_us_standard_atmosphere_1976_table() {
    for (h, t, p, rho) in TABLE {
        let a = air(h, 0.0);
        assert_close!(a.temperature_k, t, rel = 1e-5);
        assert_close!(a.pressure_pa, p, rel = 1e-5);
        assert_close!(a.density_kg_m3, rho, rel = 1e-5);
    }
}

#[test]
fn above_the_tropopause_the_temperature_stays_at_216_65_k() {
    // US76: isothermal layer 11–20 km at 216.65 K.
    assert_close!(air(15_000.0, 0.0).temperature_k, 216.65, rel = 1e-12);
    assert!(air(15_000.0, 0.0).pressure_pa < air(11_000.0, 0.0).pressure_pa);
}

#[test]
fn an_isa_offset_keeps_pressure_and_changes_density_as_p_over_rt() {
    for h in [0.0, 1500.0, 9000.0] {
        let std = air(h, 0.0);
        let hot = air(h, 20.0);
        assert_eq!(hot.pressure_pa, std.pressure_pa);
        assert_close!(hot.temperature_k, std.temperature_k + 20.0, rel = 1e-12);
        assert_close!(
            hot.density_kg_m3,
            std.pressure_pa / (R_AIR * (std.temperature_k + 20.0)),
            rel = 1e-12
        );
        assert!(hot.density_kg_m3 < std.density_kg_m3);
    }
}

#[test]
fn sea_level_viscosity_follows_sutherland() {
    // μ0 = 1.78938e-5 Pa·s, ν0 = 1.46072e-5 m²/s (reference-values §1.1; ambiance README).
    assert_close!(sutherland_viscosity(288.15), 1.78938e-5, rel = 1e-5);
    assert_close!(
        air(0.0, 0.0).kinematic_viscosity_m2_s(),
        1.46072e-5,
        rel = 1e-5
    );
}
