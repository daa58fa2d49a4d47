//! Physical consistency of a candidate's inputs, checked at the input boundary so that a
//! design that cannot exist is an input error naming its field (engine.md §3.2, §3.3, §11).

use super::assume::Assumptions;
use super::error::InputError;
use super::materials::insulation_class_temp_c;
use super::motor::Sink;
use super::radial;
use super::reader::join;
use super::sized::SizedContext;
use super::sizing;
use super::study::{InsulationClass, Source, Winding};

/// Checks what the ranges alone cannot: magnet and tooth flux, grade losses, rotor room,
/// the datasheet's rated ambient against its winding limit. `path` is the source's path.
pub fn check_source(source: &Source, path: &str) -> Result<(), InputError> {
    let (common, winding) = match source {
        Source::Datasheet(d) => {
            let class = d.insulation_class.unwrap_or(InsulationClass::H);
            let limit = insulation_class_temp_c(class) - d.hot_spot_allowance_k.unwrap_or(10.0);
            let ambient = d.rated_ambient_c.unwrap_or(40.0);
            if ambient >= limit {
                return Err(InputError::new(
                    join(path, "rated_ambient_c"),
                    format!(
                        "must be below the winding limit of {limit} °C (insulation class less hot-spot allowance), got {ambient}"
                    ),
                ));
            }
            return Ok(());
        }
        Source::RadialSizing(r) => (&r.common, Winding::Distributed),
        Source::AxialSizing(x) => (&x.common, Winding::Concentrated),
    };
    let field = if common.steel_grade.is_some() {
        "steel_grade"
    } else {
        "steel_conductivity_s_per_m"
    };
    let p = sizing::resolve(common, winding, &mut Assumptions::default())
        .map_err(|m| InputError::new(join(path, field), m))?;
    let bm = p.magnet_field();
    if bm >= 0.9 * p.br {
        return Err(InputError::new(
            join(path, "remanence_t"),
            format!(
                "must exceed the gap's flat-top magnet field by 10 %: B_m = {bm:.3} T needs remanence above {:.3} T (got {})",
                bm / 0.9,
                p.br
            ),
        ));
    }
    let ft = p.tooth_fraction();
    if ft >= 0.75 {
        return Err(InputError::new(
            join(path, "tooth_flux_density_t"),
            format!(
                "leaves no room for slots: tooth fraction B_m/(k_Fe·B_t) = {ft:.3} must be below 0.75, so the tooth flux density must exceed {:.3} T",
                bm / (0.75 * p.k_fe)
            ),
        ));
    }
    if let Source::RadialSizing(r) = source
        && let (Some(d), Some(l)) = (r.bore_diameter_m, r.active_length_m)
    {
        let ctx = SizedContext {
            base_speed_rad_s: 1.0,
            dc_bus_v: 400.0,
            sink: Sink::Air,
        };
        radial::build(&p, d, l, &ctx)
            .map_err(|m| InputError::new(join(path, "bore_diameter_m"), m))?;
    }
    Ok(())
}
