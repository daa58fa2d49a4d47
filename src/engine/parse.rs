//! Parsing the study file into validated types: every field is range-checked where it is
//! read, unknown fields are rejected, and every error names its JSON path.

use super::error::InputError;
use super::objectives;
use super::reader::{Obj, Range, fmt_num, join};
use super::steel;
use super::study::*;
use serde_json::Value;
use std::collections::{BTreeMap, HashSet};

use Range::{Closed, ClosedOpen, Open, OpenClosed};

const MAX_NAME: usize = 200;
const MAX_NOTES: usize = 20_000;
const MAX_SEGMENTS: usize = 200;
const MAX_CANDIDATES: usize = 500;
const MAX_POINTS: usize = 200;
const ALTITUDE: Range = Closed(-500.0, 20_000.0);
const TEMP_C: Range = Closed(-80.0, 400.0);

/// Parses a study file from JSON text.
pub fn parse_study_str(text: &str) -> Result<Study, InputError> {
    let value: Value = serde_json::from_str(text)
        .map_err(|e| InputError::new("$", format!("not valid JSON: {e}")))?;
    parse_study(&value)
}

/// Parses and validates a whole study file, including the rules that span rows.
pub fn parse_study(v: &Value) -> Result<Study, InputError> {
    let mut o = Obj::new(v, "")?;
    let format = o.req_str("format", 100)?;
    if format != STUDY_FORMAT {
        return Err(InputError::new(
            "format",
            format!("must be \"{STUDY_FORMAT}\" (got \"{format}\")"),
        ));
    }
    let name = o.req_name("name", MAX_NAME)?;
    let notes = o.opt_str("notes", MAX_NOTES)?;
    let aircraft = parse_aircraft(o.req("aircraft")?, "aircraft")?;
    let installation = o
        .get("installation")
        .map(|v| parse_installation(v, "installation"))
        .transpose()?;
    let integration = o
        .get("integration")
        .map(|v| parse_integration(v, "integration"))
        .transpose()?;
    let segments = parse_list(o.req("segments")?, "segments", MAX_SEGMENTS, parse_segment)?;
    let candidates = parse_list(
        o.req("candidates")?,
        "candidates",
        MAX_CANDIDATES,
        parse_candidate,
    )?;
    let scoring = o
        .get("scoring")
        .map(|v| parse_scoring(v, "scoring"))
        .transpose()?;
    o.finish()?;
    let study = Study {
        format,
        name,
        notes,
        aircraft,
        installation,
        integration,
        segments,
        candidates,
        scoring,
    };
    check_study(&study)?;
    Ok(study)
}

fn parse_list<T>(
    v: &Value,
    path: &str,
    max: usize,
    item: fn(&Value, &str) -> Result<T, InputError>,
) -> Result<Vec<T>, InputError> {
    let Value::Array(items) = v else {
        return Err(InputError::new(path, "must be a list"));
    };
    if items.is_empty() {
        return Err(InputError::new(path, "must have at least one entry"));
    }
    if items.len() > max {
        return Err(InputError::new(
            path,
            format!("must have at most {max} entries (got {})", items.len()),
        ));
    }
    items
        .iter()
        .enumerate()
        .map(|(i, x)| item(x, &format!("{path}[{i}]")))
        .collect()
}

/// Rules that involve more than one row: unique names, aerodynamic data for steady rules.
fn check_study(s: &Study) -> Result<(), InputError> {
    unique(s.segments.iter().map(|x| x.name.as_str()), "segments")?;
    unique(s.candidates.iter().map(|x| x.name.as_str()), "candidates")?;
    let steady = s
        .segments
        .iter()
        .any(|seg| matches!(seg.power, PowerRule::Steady { .. }));
    if steady {
        let a = &s.aircraft;
        for (field, value) in [
            ("wing_area_m2", a.wing_area_m2),
            ("aspect_ratio", a.aspect_ratio),
            ("oswald_efficiency", a.oswald_efficiency),
            ("cd0", a.cd0),
        ] {
            if value.is_none() {
                return Err(InputError::new(
                    join("aircraft", field),
                    "is required because a segment uses the steady power rule",
                ));
            }
        }
    }
    Ok(())
}

fn unique<'a>(names: impl Iterator<Item = &'a str>, path: &str) -> Result<(), InputError> {
    let mut seen = HashSet::new();
    for (i, n) in names.enumerate() {
        if !seen.insert(n.to_lowercase()) {
            return Err(InputError::new(
                format!("{path}[{i}].name"),
                format!("must be unique (\"{n}\" is used twice)"),
            ));
        }
    }
    Ok(())
}

pub fn parse_aircraft(v: &Value, path: &str) -> Result<Aircraft, InputError> {
    let mut o = Obj::new(v, path)?;
    let a = Aircraft {
        motor_count: o.req_u32("motor_count", 1, 16)?,
        airframe_mass_kg: o.req_f64("airframe_mass_kg", OpenClosed(0.0, 1e6))?,
        payload_kg: o.req_f64("payload_kg", Closed(0.0, 1e6))?,
        max_takeoff_mass_kg: o.req_f64("max_takeoff_mass_kg", OpenClosed(0.0, 1e6))?,
        wing_area_m2: o.opt_f64("wing_area_m2", OpenClosed(0.0, 10_000.0))?,
        aspect_ratio: o.opt_f64("aspect_ratio", OpenClosed(0.0, 100.0))?,
        oswald_efficiency: o.opt_f64("oswald_efficiency", OpenClosed(0.0, 1.0))?,
        cd0: o.opt_f64("cd0", Open(0.0, 1.0))?,
        isa_offset_k: o.opt_f64("isa_offset_k", Closed(-80.0, 80.0))?,
        dc_bus_voltage_v: o.opt_f64("dc_bus_voltage_v", OpenClosed(0.0, 20_000.0))?,
        inverter_efficiency: o.opt_f64("inverter_efficiency", OpenClosed(0.0, 1.0))?,
        inverter_specific_power_kw_per_kg: o
            .opt_f64("inverter_specific_power_kw_per_kg", OpenClosed(0.0, 1000.0))?,
        coolant_inlet_temp_c: o.opt_f64("coolant_inlet_temp_c", Closed(-60.0, 150.0))?,
        gearbox_stage_efficiency: o.opt_f64("gearbox_stage_efficiency", OpenClosed(0.0, 1.0))?,
        gearbox_specific_torque_nm_per_kg: o.opt_f64(
            "gearbox_specific_torque_nm_per_kg",
            OpenClosed(0.0, 10_000.0),
        )?,
        battery: parse_battery(o.req("battery")?, &join(path, "battery"))?,
    };
    o.finish()?;
    Ok(a)
}

fn parse_battery(v: &Value, path: &str) -> Result<Battery, InputError> {
    let mut o = Obj::new(v, path)?;
    let mode = match o.req_enum("mode", &["sized", "fixed"])?.as_str() {
        "sized" => BatteryMode::Sized,
        _ => BatteryMode::Fixed,
    };
    let b = Battery {
        mode,
        specific_energy_wh_per_kg: o
            .req_f64("specific_energy_wh_per_kg", OpenClosed(0.0, 5000.0))?,
        mass_kg: match mode {
            BatteryMode::Fixed => Some(o.req_f64("mass_kg", OpenClosed(0.0, 1e6))?),
            BatteryMode::Sized => {
                o.forbid(
                    "mass_kg",
                    "with a sized battery (the engine sizes it); use mode \"fixed\"",
                )?;
                None
            }
        },
        usable_fraction: o.opt_f64("usable_fraction", OpenClosed(0.0, 1.0))?,
        end_of_life_fraction: o.opt_f64("end_of_life_fraction", OpenClosed(0.0, 1.0))?,
        discharge_efficiency: o.opt_f64("discharge_efficiency", OpenClosed(0.0, 1.0))?,
    };
    o.finish()?;
    Ok(b)
}

fn parse_installation(v: &Value, path: &str) -> Result<Installation, InputError> {
    let mut o = Obj::new(v, path)?;
    let i = Installation {
        max_diameter_m: o.opt_f64("max_diameter_m", OpenClosed(0.0, 10.0))?,
        max_length_m: o.opt_f64("max_length_m", OpenClosed(0.0, 10.0))?,
    };
    o.finish()?;
    Ok(i)
}

fn parse_integration(v: &Value, path: &str) -> Result<Integration, InputError> {
    let mut o = Obj::new(v, path)?;
    let i = Integration {
        time_step_s: o.opt_f64("time_step_s", Closed(0.01, 3600.0))?,
        min_steps_per_segment: o.opt_u32("min_steps_per_segment", 1, 10_000)?,
        preflight_temp_c: o.opt_f64("preflight_temp_c", Closed(-60.0, 150.0))?,
    };
    o.finish()?;
    Ok(i)
}

pub fn parse_segment(v: &Value, path: &str) -> Result<Segment, InputError> {
    let mut o = Obj::new(v, path)?;
    let name = o.req_name("name", MAX_NAME)?;
    let kind_name = o.req_enum("kind", &SegmentKind::NAMES)?;
    let kind = SegmentKind::ALL[SegmentKind::NAMES
        .iter()
        .position(|n| *n == kind_name)
        .unwrap_or(0)];
    let power = parse_power(o.req("power")?, &join(path, "power"))?;
    let seg = Segment {
        name,
        kind,
        power,
        duration_s: o.opt_f64("duration_s", OpenClosed(0.0, 1e6))?,
        distance_m: o.opt_f64("distance_m", OpenClosed(0.0, 1e8))?,
        altitude_start_m: o.opt_f64("altitude_start_m", ALTITUDE)?,
        altitude_end_m: o.opt_f64("altitude_end_m", ALTITUDE)?,
        prop_speed_rpm: o.req_f64("prop_speed_rpm", OpenClosed(0.0, 100_000.0))?,
        idle_floor_kw: o.opt_f64("idle_floor_kw", Closed(0.0, 100_000.0))?,
        oei: o.opt_bool("oei")?,
        oei_cd0_increment: o.opt_f64("oei_cd0_increment", ClosedOpen(0.0, 1.0))?,
    };
    o.finish()?;
    check_duration(&seg, path)?;
    Ok(seg)
}

fn parse_power(v: &Value, path: &str) -> Result<PowerRule, InputError> {
    let mut o = Obj::new(v, path)?;
    let rule = o.req_enum("rule", &["steady", "power_loading", "shaft_power"])?;
    let p = match rule.as_str() {
        "steady" => PowerRule::Steady {
            tas_m_s: o.req_f64("tas_m_s", OpenClosed(0.0, 1000.0))?,
            prop_efficiency: o.req_f64("prop_efficiency", OpenClosed(0.0, 1.0))?,
            climb_rate_m_s: o.opt_f64("climb_rate_m_s", Closed(-100.0, 100.0))?,
            cd0_increment: o.opt_f64("cd0_increment", ClosedOpen(0.0, 1.0))?,
        },
        "power_loading" => PowerRule::PowerLoading {
            w_per_kg: o.req_f64("w_per_kg", Closed(0.0, 10_000.0))?,
        },
        _ => PowerRule::ShaftPower {
            kw: o.req_f64("kw", Closed(0.0, 100_000.0))?,
        },
    };
    o.finish()?;
    Ok(p)
}

/// Exactly one duration: `duration_s`, `distance_m` (steady rule), or the altitude change
/// flown at the steady rule's climb rate (engine.md §2).
fn check_duration(seg: &Segment, path: &str) -> Result<(), InputError> {
    if seg.duration_s.is_some() && seg.distance_m.is_some() {
        return Err(InputError::new(
            path,
            "give exactly one of duration_s and distance_m, not both",
        ));
    }
    let climb = match seg.power {
        PowerRule::Steady { climb_rate_m_s, .. } => Some(climb_rate_m_s.unwrap_or(0.0)),
        _ => None,
    };
    if seg.distance_m.is_some() {
        return match climb {
            Some(_) => Ok(()),
            None => Err(InputError::new(
                join(path, "distance_m"),
                "needs the steady power rule (time = distance / tas_m_s)",
            )),
        };
    }
    if seg.duration_s.is_some() {
        return Ok(());
    }
    let dh = seg.altitude_end() - seg.altitude_start();
    match climb {
        Some(roc) if roc != 0.0 && dh != 0.0 && roc.signum() == dh.signum() => Ok(()),
        Some(roc) if roc != 0.0 && dh != 0.0 => Err(InputError::new(
            path,
            format!(
                "the altitude change ({} m) and power.climb_rate_m_s ({} m/s) have opposite signs",
                fmt_num(dh),
                fmt_num(roc)
            ),
        )),
        _ => Err(InputError::new(
            path,
            "needs exactly one duration: duration_s, distance_m, or an altitude change flown with a non-zero power.climb_rate_m_s",
        )),
    }
}

pub fn parse_candidate(v: &Value, path: &str) -> Result<Candidate, InputError> {
    let mut o = Obj::new(v, path)?;
    let name = o.req_name("name", MAX_NAME)?;
    let drive = o
        .get("drive")
        .map(|d| parse_drive(d, &join(path, "drive")))
        .transpose()?;
    let source_path = join(path, "source");
    let source = parse_source(o.req("source")?, &source_path)?;
    o.finish()?;
    super::validate::check_source(&source, &source_path)?;
    Ok(Candidate {
        name,
        drive,
        source,
    })
}

fn parse_drive(v: &Value, path: &str) -> Result<Drive, InputError> {
    let mut o = Obj::new(v, path)?;
    let d = Drive {
        gear_ratio: o.opt_f64("gear_ratio", Closed(0.05, 100.0))?,
        gear_stages: o.opt_u32("gear_stages", 1, 6)?,
    };
    o.finish()?;
    Ok(d)
}

fn parse_source(v: &Value, path: &str) -> Result<Source, InputError> {
    let mut o = Obj::new(v, path)?;
    let kind = o.req_enum("kind", &["datasheet", "radial_sizing", "axial_sizing"])?;
    let s = match kind.as_str() {
        "datasheet" => Source::Datasheet(super::parse_datasheet::parse(&mut o)?),
        "radial_sizing" => Source::RadialSizing(parse_radial(&mut o)?),
        _ => Source::AxialSizing(parse_axial(&mut o)?),
    };
    o.finish()?;
    Ok(s)
}

pub(super) fn insulation(o: &mut Obj) -> Result<Option<InsulationClass>, InputError> {
    Ok(o.opt_enum("insulation_class", &InsulationClass::NAMES)?
        .and_then(|s| InsulationClass::from_name(&s)))
}

pub(super) fn hot_spot(o: &mut Obj) -> Result<Option<f64>, InputError> {
    o.opt_f64("hot_spot_allowance_k", Closed(0.0, 100.0))
}

fn sizing_mode(o: &mut Obj) -> Result<SizingMode, InputError> {
    Ok(
        match o
            .req_enum("mode", &["geometry", "size_to_mission"])?
            .as_str()
        {
            "geometry" => SizingMode::Geometry,
            _ => SizingMode::SizeToMission,
        },
    )
}

fn parse_radial(o: &mut Obj) -> Result<RadialSizing, InputError> {
    let mode = sizing_mode(o)?;
    let (bore, length, aspect) = match mode {
        SizingMode::Geometry => {
            o.forbid(
                "aspect_ratio",
                "in geometry mode (give bore_diameter_m and active_length_m)",
            )?;
            (
                Some(o.req_f64("bore_diameter_m", OpenClosed(0.0, 5.0))?),
                Some(o.req_f64("active_length_m", OpenClosed(0.0, 5.0))?),
                None,
            )
        }
        SizingMode::SizeToMission => {
            o.forbid(
                "bore_diameter_m",
                "in size_to_mission mode (the engine sizes it)",
            )?;
            o.forbid(
                "active_length_m",
                "in size_to_mission mode (the engine sizes it)",
            )?;
            (
                None,
                None,
                Some(o.req_f64("aspect_ratio", Closed(0.05, 10.0))?),
            )
        }
    };
    let common = parse_common(o)?;
    Ok(RadialSizing {
        mode,
        bore_diameter_m: bore,
        active_length_m: length,
        aspect_ratio: aspect,
        common,
    })
}

fn parse_axial(o: &mut Obj) -> Result<AxialSizing, InputError> {
    let variant = match o
        .req_enum("variant", &["double_rotor", "single_sided"])?
        .as_str()
    {
        "double_rotor" => AxialVariant::DoubleRotor,
        _ => AxialVariant::SingleSided,
    };
    let mode = sizing_mode(o)?;
    let outer = match mode {
        SizingMode::Geometry => Some(o.req_f64("outer_radius_m", OpenClosed(0.0, 5.0))?),
        SizingMode::SizeToMission => {
            o.forbid(
                "outer_radius_m",
                "in size_to_mission mode (the engine sizes it)",
            )?;
            None
        }
    };
    let lambda = o.opt_f64("inner_outer_ratio", Closed(0.05, 0.95))?;
    let common = parse_common(o)?;
    Ok(AxialSizing {
        variant,
        mode,
        outer_radius_m: outer,
        inner_outer_ratio: lambda,
        common,
    })
}

fn parse_common(o: &mut Obj) -> Result<SizingCommon, InputError> {
    let winding = o
        .opt_enum("winding", &["distributed", "concentrated"])?
        .map(|w| {
            if w == "distributed" {
                Winding::Distributed
            } else {
                Winding::Concentrated
            }
        });
    let cooling = o.opt_enum("cooling", &Cooling::NAMES)?.and_then(|c| {
        Cooling::NAMES
            .iter()
            .position(|n| *n == c)
            .map(|i| Cooling::ALL[i])
    });
    let steel_grade = o.opt_enum("steel_grade", &steel::grade_names())?;
    let steel_loss = o
        .get("steel_loss")
        .map(|v| parse_steel_loss(v, &o.field_path("steel_loss")))
        .transpose()?;
    if steel_grade.is_some() && steel_loss.is_some() {
        return Err(InputError::new(
            o.field_path("steel_loss"),
            "give either steel_grade or steel_loss, not both",
        ));
    }
    Ok(SizingCommon {
        pole_pairs: o.req_u32("pole_pairs", 1, 100)?,
        slot_count: o.opt_u32("slot_count", 3, 2000)?,
        winding,
        cooling,
        electric_loading_a_per_m: o
            .opt_f64("electric_loading_a_per_m", Closed(1000.0, 500_000.0))?,
        current_density_a_per_mm2: o.opt_f64("current_density_a_per_mm2", Closed(0.5, 60.0))?,
        airgap_flux_density_t: o.opt_f64("airgap_flux_density_t", Closed(0.1, 1.5))?,
        fill_factor: o.opt_f64("fill_factor", Closed(0.1, 0.9))?,
        winding_factor: o.opt_f64("winding_factor", Closed(0.3, 1.0))?,
        tooth_flux_density_t: o.opt_f64("tooth_flux_density_t", Closed(0.5, 2.5))?,
        yoke_flux_density_t: o.opt_f64("yoke_flux_density_t", Closed(0.5, 2.5))?,
        stacking_factor: o.opt_f64("stacking_factor", Closed(0.5, 1.0))?,
        airgap_m: o.opt_f64("airgap_m", Closed(0.0001, 0.05))?,
        carter_factor: o.opt_f64("carter_factor", Closed(1.0, 3.0))?,
        pole_arc_ratio: o.opt_f64("pole_arc_ratio", Closed(0.3, 1.0))?,
        remanence_t: o.opt_f64("remanence_t", Closed(0.2, 1.6))?,
        recoil_permeability: o.opt_f64("recoil_permeability", Closed(1.0, 2.0))?,
        remanence_temp_coeff_per_k: o.opt_f64("remanence_temp_coeff_per_k", Closed(-0.005, 0.0))?,
        magnet_max_temp_c: o.opt_f64("magnet_max_temp_c", Closed(20.0, 400.0))?,
        steel_grade,
        steel_loss,
        insulation_class: insulation(o)?,
        structure_factor: o.opt_f64("structure_factor", Closed(1.0, 10.0))?,
        overload_factor: o.opt_f64("overload_factor", Closed(1.0, 10.0))?,
        tip_speed_limit_m_s: o.opt_f64("tip_speed_limit_m_s", OpenClosed(0.0, 1000.0))?,
        max_speed_rpm: o.opt_f64("max_speed_rpm", OpenClosed(0.0, 200_000.0))?,
        base_speed_rpm: o.opt_f64("base_speed_rpm", OpenClosed(0.0, 200_000.0))?,
        build_factor: o.opt_f64("build_factor", Closed(1.0, 5.0))?,
        steel_conductivity_s_per_m: o.opt_f64("steel_conductivity_s_per_m", Closed(1e5, 1e7))?,
        end_winding_factor: o.opt_f64("end_winding_factor", Closed(0.0, 5.0))?,
        bearing_torque_fraction: o.opt_f64("bearing_torque_fraction", Closed(0.0, 0.1))?,
        emf_bus_fraction: o.opt_f64("emf_bus_fraction", Closed(0.1, 1.0))?,
        convection_w_per_m2k: o.opt_f64("convection_w_per_m2k", Closed(1.0, 100_000.0))?,
        fin_factor: o.opt_f64("fin_factor", Closed(1.0, 20.0))?,
        liner_conductance_w_per_m2k: o
            .opt_f64("liner_conductance_w_per_m2k", Closed(1.0, 100_000.0))?,
        housing_radial_allowance_m: o.opt_f64("housing_radial_allowance_m", Closed(0.0, 1.0))?,
        housing_axial_allowance_m: o.opt_f64("housing_axial_allowance_m", Closed(0.0, 1.0))?,
        hub_inertia_factor: o.opt_f64("hub_inertia_factor", Closed(1.0, 5.0))?,
        hot_spot_allowance_k: hot_spot(o)?,
    })
}

fn parse_steel_loss(v: &Value, path: &str) -> Result<SteelLoss, InputError> {
    let mut o = Obj::new(v, path)?;
    let s = SteelLoss {
        hysteresis_w_per_kg_hz_t2: o.req_f64("hysteresis_w_per_kg_hz_t2", Closed(0.0, 1.0))?,
        eddy_w_per_kg_hz2_t2: o.req_f64("eddy_w_per_kg_hz2_t2", Closed(0.0, 0.01))?,
    };
    o.finish()?;
    if s.hysteresis_w_per_kg_hz_t2 == 0.0 && s.eddy_w_per_kg_hz2_t2 == 0.0 {
        return Err(InputError::new(
            path,
            "at least one loss coefficient must be > 0",
        ));
    }
    Ok(s)
}

pub fn parse_scoring(v: &Value, path: &str) -> Result<Scoring, InputError> {
    let mut o = Obj::new(v, path)?;
    let objectives = match o.opt_array("objectives")? {
        None => None,
        Some(list) => Some(parse_objectives(list, &o.field_path("objectives"))?),
    };
    let weights = match o.get("weights") {
        None => None,
        Some(w) => Some(parse_weights(
            w,
            &o.field_path("weights"),
            objectives.as_deref(),
        )?),
    };
    o.finish()?;
    Ok(Scoring {
        objectives,
        weights,
    })
}

fn parse_objectives(list: &[Value], path: &str) -> Result<Vec<String>, InputError> {
    let allowed = objectives::names();
    if list.len() < 2 {
        return Err(InputError::new(
            path,
            format!("must name two or more objectives (got {})", list.len()),
        ));
    }
    let mut out: Vec<String> = Vec::new();
    for (i, v) in list.iter().enumerate() {
        let p = format!("{path}[{i}]");
        let name = match v {
            Value::String(s) if allowed.contains(&s.as_str()) => s.clone(),
            _ => {
                return Err(InputError::new(
                    p,
                    format!("must be one of {}", allowed.join(", ")),
                ));
            }
        };
        if out.contains(&name) {
            return Err(InputError::new(p, format!("names {name} twice")));
        }
        out.push(name);
    }
    Ok(out)
}

fn parse_weights(
    v: &Value,
    path: &str,
    objectives: Option<&[String]>,
) -> Result<BTreeMap<String, f64>, InputError> {
    let Value::Object(map) = v else {
        return Err(InputError::new(
            path,
            "must be an object of objective name → weight",
        ));
    };
    let names: Vec<String> = match objectives {
        Some(o) => o.to_vec(),
        None => objectives::DEFAULT_OBJECTIVES
            .iter()
            .map(|s| s.to_string())
            .collect(),
    };
    let mut out = BTreeMap::new();
    for (k, w) in map {
        let p = join(path, k);
        if !names.contains(k) {
            return Err(InputError::new(
                p,
                format!(
                    "is not one of the study's objectives ({})",
                    names.join(", ")
                ),
            ));
        }
        let x = w
            .as_f64()
            .filter(|x| x.is_finite() && *x >= 0.0 && *x <= 1e6);
        let x = x.ok_or_else(|| InputError::new(&p, "must be a number from 0 to 1000000"))?;
        out.insert(k.clone(), x);
    }
    for n in &names {
        if !out.contains_key(n) {
            return Err(InputError::new(
                join(path, n),
                "is missing: give a weight for every objective, or no weights at all",
            ));
        }
    }
    if out.values().all(|w| *w == 0.0) {
        return Err(InputError::new(path, "at least one weight must be > 0"));
    }
    Ok(out)
}

pub(super) const PARSE_TEMP_C: Range = TEMP_C;
pub(super) const PARSE_MAX_POINTS: usize = MAX_POINTS;
