//! Parsing a datasheet candidate's source (format.md, engine.md §3.1).

use super::error::InputError;
use super::parse::{PARSE_MAX_POINTS, PARSE_TEMP_C, hot_spot, insulation};
use super::reader::{Obj, Range, fmt_num};
use super::study::*;
use serde_json::Value;

use Range::{Closed, Open, OpenClosed};

pub(super) fn parse(o: &mut Obj) -> Result<DatasheetSource, InputError> {
    let topology = match o.req_enum("topology", &["radial", "axial"])?.as_str() {
        "radial" => Topology::Radial,
        _ => Topology::Axial,
    };
    let d = DatasheetSource {
        topology,
        mass_kg: o.req_f64("mass_kg", OpenClosed(0.0, 10_000.0))?,
        continuous_power_kw: o.req_f64("continuous_power_kw", OpenClosed(0.0, 100_000.0))?,
        continuous_speed_rpm: o.req_f64("continuous_speed_rpm", OpenClosed(0.0, 200_000.0))?,
        peak_power_kw: o.req_f64("peak_power_kw", OpenClosed(0.0, 100_000.0))?,
        peak_duration_s: o.req_f64("peak_duration_s", Closed(0.0, 1e6))?,
        max_speed_rpm: o.req_f64("max_speed_rpm", OpenClosed(0.0, 200_000.0))?,
        continuous_efficiency: o.req_f64("continuous_efficiency", Open(0.0, 1.0))?,
        efficiency_points: parse_points(o)?,
        data_winding_temp_c: o.opt_f64("data_winding_temp_c", PARSE_TEMP_C)?,
        insulation_class: insulation(o)?,
        thermal_time_constant_s: o.opt_f64("thermal_time_constant_s", OpenClosed(0.0, 1e6))?,
        rated_ambient_c: o.opt_f64("rated_ambient_c", Closed(-60.0, 150.0))?,
        peak_torque_nm: o.opt_f64("peak_torque_nm", OpenClosed(0.0, 1e6))?,
        rotor_inertia_kg_m2: o.opt_f64("rotor_inertia_kg_m2", OpenClosed(0.0, 1e4))?,
        envelope_diameter_m: o.opt_f64("envelope_diameter_m", OpenClosed(0.0, 10.0))?,
        envelope_length_m: o.opt_f64("envelope_length_m", OpenClosed(0.0, 10.0))?,
        torque_constant_nm_per_a: o.opt_f64("torque_constant_nm_per_a", OpenClosed(0.0, 1000.0))?,
        loss_split: o
            .get("loss_split")
            .map(|v| parse_split(v, &o.field_path("loss_split")))
            .transpose()?,
        hot_spot_allowance_k: hot_spot(o)?,
    };
    check_consistency(&d, o)?;
    Ok(d)
}

fn check_consistency(d: &DatasheetSource, o: &Obj) -> Result<(), InputError> {
    if d.peak_power_kw < d.continuous_power_kw {
        return Err(InputError::new(
            o.field_path("peak_power_kw"),
            format!(
                "must be ≥ continuous_power_kw ({})",
                fmt_num(d.continuous_power_kw)
            ),
        ));
    }
    if d.max_speed_rpm < d.continuous_speed_rpm {
        return Err(InputError::new(
            o.field_path("max_speed_rpm"),
            format!(
                "must be ≥ continuous_speed_rpm ({})",
                fmt_num(d.continuous_speed_rpm)
            ),
        ));
    }
    let omega = d.continuous_speed_rpm * std::f64::consts::PI / 30.0;
    let rated = d.continuous_power_kw * 1000.0 / omega;
    if let Some(tp) = d.peak_torque_nm
        && tp < rated
    {
        return Err(InputError::new(
            o.field_path("peak_torque_nm"),
            format!("must be ≥ the continuous torque ({:.1} N·m)", rated),
        ));
    }
    Ok(())
}

fn parse_points(o: &mut Obj) -> Result<Option<Vec<EfficiencyPoint>>, InputError> {
    let path = o.field_path("efficiency_points");
    let Some(list) = o.opt_array("efficiency_points")? else {
        return Ok(None);
    };
    if list.len() > PARSE_MAX_POINTS {
        return Err(InputError::new(
            path,
            format!("must have at most {PARSE_MAX_POINTS} points"),
        ));
    }
    let points = list
        .iter()
        .enumerate()
        .map(|(i, v)| parse_point(v, &format!("{path}[{i}]")))
        .collect::<Result<Vec<_>, _>>()?;
    Ok(Some(points))
}

fn parse_point(v: &Value, path: &str) -> Result<EfficiencyPoint, InputError> {
    let mut o = Obj::new(v, path)?;
    let p = EfficiencyPoint {
        speed_rpm: o.req_f64("speed_rpm", OpenClosed(0.0, 200_000.0))?,
        torque_nm: o.req_f64("torque_nm", OpenClosed(0.0, 1e6))?,
        efficiency: o.req_f64("efficiency", Open(0.0, 1.0))?,
    };
    o.finish()?;
    Ok(p)
}

fn parse_split(v: &Value, path: &str) -> Result<LossSplit, InputError> {
    let mut o = Obj::new(v, path)?;
    let s = LossSplit {
        copper: o.req_f64("copper", Closed(0.0, 1.0))?,
        iron_linear: o.req_f64("iron_linear", Closed(0.0, 1.0))?,
        iron_quadratic: o.req_f64("iron_quadratic", Closed(0.0, 1.0))?,
        constant: o.req_f64("constant", Closed(0.0, 1.0))?,
    };
    o.finish()?;
    let sum = s.copper + s.iron_linear + s.iron_quadratic + s.constant;
    if (sum - 1.0).abs() > 1e-6 {
        return Err(InputError::new(
            path,
            format!("fractions must sum to 1 (got {})", fmt_num(sum)),
        ));
    }
    Ok(s)
}
