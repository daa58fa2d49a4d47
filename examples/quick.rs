fn main() {
    let s = shaftline::engine::study::parse_study_str(shaftline::demo::DEMO_STUDY_JSON).unwrap();
    let t = std::time::Instant::now();
    let r = shaftline::engine::score_study(&s);
    eprintln!("{:?}", t.elapsed());
    for c in &r.candidates {
        println!(
            "{:40} feas={} bind={:?} mot={:.2} prop={:.2} batt={:.1} tom={:.1} E={:.2} res={:.2} eta={:.4} cr={:?} Tw={:.1} Tm={:?} I={:?} Tr={:.1} env=({:?},{:?}) conv={}",
            c.name,
            c.feasible,
            c.binding_constraint,
            c.motor_mass_kg,
            c.propulsion_mass_kg,
            c.battery_mass_kg,
            c.takeoff_mass_kg,
            c.mission_energy_kwh,
            c.reserve_energy_kwh,
            c.mission_motor_efficiency,
            c.cruise_motor_efficiency,
            c.peak_winding_temp_c,
            c.peak_magnet_temp_c,
            c.peak_phase_current_a,
            c.rated_torque_nm,
            c.envelope_diameter_m,
            c.envelope_length_m,
            c.mass_closure_converged
        );
        for v in &c.violations {
            println!("    V {}", v.message);
        }
    }
    if std::env::args().nth(1).is_some() {
        println!("{}", serde_json::to_string_pretty(&r).unwrap());
    }
}
