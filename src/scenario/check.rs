//! Range checks of every scenario value and the cross-references between sections.
//! Each error names the file, the full key path, the value and the allowed range.

use super::schema::*;
use crate::error::{Error, Result};
use crate::validate::{count, in_range, list, open_range, positive};

/// Check a parsed scenario; `file` names it in messages.
pub fn check(s: &Scenario, file: &str) -> Result<()> {
    let w = |r: Result<()>, prefix: &str| r.map_err(|e| e.within(file, prefix));
    w(site(&s.site), "site")?;
    w(weather(&s.weather), "weather")?;
    w(load(&s.load), "load")?;
    if let Some(h) = &s.heat_demand {
        w(heat_demand(h, s.load.source), "heat_demand")?;
    }
    w(s.baseline.validate(), "baseline")?;
    for (name, c) in &s.collectors {
        w(c.validate(), &format!("collectors.{name}"))?;
    }
    if s.options.is_empty() {
        return Err(Error::Input {
            file: file.into(),
            key: "options".into(),
            value: "(none)".into(),
            allowed: "at least one [options.NAME] section is required".into(),
        });
    }
    if !s.options.contains_key(&s.reference) {
        let names: Vec<String> = s.options.keys().cloned().collect();
        let hint = super::parse::nearest(&s.reference, &names)
            .map_or(String::new(), |n| format!("did you mean `{n}`? "));
        return Err(Error::Input {
            file: file.into(),
            key: "reference".into(),
            value: format!("\"{}\"", s.reference),
            allowed: format!("{hint}must name one of the options: {}", names.join(", ")),
        });
    }
    for (name, o) in &s.options {
        w(option(s, o), &format!("options.{name}"))?;
    }
    // A ventilation-cycle desiccant unit is credited with the building's outdoor air it
    // replaces, hour by hour: a load file must say how much that is (no guess, no credit).
    if let (LoadSource::File, Some(f)) = (s.load.source, &s.load.file)
        && f.ventilation_column.is_none()
        && let Some((name, _)) = s.options.iter().find(|(_, o)| {
            o.desiccant
                .as_ref()
                .is_some_and(|d| d.cycle == crate::routes::desiccant::Cycle::Ventilation)
        })
    {
        return Err(Error::Input {
            file: file.into(),
            key: "load.file.ventilation_column".into(),
            value: "(missing)".into(),
            allowed: format!(
                "option `{name}` is a desiccant unit with cycle = \"ventilation\", credited with the building's outdoor air it replaces: name the load file's column of mechanical ventilation in m³/h (infiltration excluded), or give the option cycle = \"recirculation\""
            ),
        });
    }
    if let Some(e) = &s.economics {
        w(e.validate(), "economics")?;
    }
    w(s.energy.validate(), "energy")?;
    if let Some(u) = &s.uncertainty {
        for (i, inp) in u.inputs.iter().enumerate() {
            let k = format!("uncertainty.inputs[{i}]");
            if !(inp.low.is_finite() && inp.high.is_finite() && inp.low < inp.high) {
                return Err(Error::Input {
                    file: file.into(),
                    key: format!("{k}.high"),
                    value: inp.high.to_string(),
                    allowed: format!(
                        "low and high must be finite with low < high (low = {})",
                        inp.low
                    ),
                });
            }
            if inp.key.trim().is_empty() {
                return Err(Error::Input {
                    file: file.into(),
                    key: format!("{k}.key"),
                    value: "\"\"".into(),
                    allowed: "a dotted key path of this scenario".into(),
                });
            }
        }
    }
    Ok(())
}

fn site(s: &SiteSection) -> Result<()> {
    in_range(
        "latitude_deg",
        s.latitude_deg,
        -90.0,
        90.0,
        "degrees, north positive",
    )?;
    in_range(
        "longitude_deg",
        s.longitude_deg,
        -180.0,
        180.0,
        "degrees, east positive",
    )?;
    in_range(
        "elevation_m",
        s.elevation_m,
        -400.0,
        5000.0,
        "metres above sea level",
    )?;
    in_range(
        "utc_offset_h",
        s.utc_offset_h,
        -12.0,
        14.0,
        "hours of standard time ahead of UTC",
    )?;
    in_range(
        "ground_albedo",
        s.ground_albedo,
        0.0,
        1.0,
        "ground reflectance, fraction",
    )?;
    in_range(
        "year",
        s.year as f64,
        1950.0,
        2100.0,
        "calendar year for the sun's position",
    )?;
    count(
        "jan1_weekday",
        s.jan1_weekday,
        0,
        6,
        "0 = Monday .. 6 = Sunday",
    )?;
    // The standard-time meridian should be near the longitude; a wrong sign is the classic slip.
    let meridian = 15.0 * s.utc_offset_h;
    if (s.longitude_deg - meridian).abs() > 45.0 {
        return Err(Error::input(
            "utc_offset_h",
            s.utc_offset_h,
            format!(
                "a standard-time meridian of {meridian}° is more than 45° from longitude {}° (east positive): check the sign of longitude_deg or utc_offset_h",
                s.longitude_deg
            ),
        ));
    }
    Ok(())
}

fn weather(s: &WeatherSection) -> Result<()> {
    in_range(
        "irradiation_scale",
        s.irradiation_scale,
        0.5,
        1.5,
        "factor on every irradiance of the year",
    )?;
    in_range(
        "temperature_shift_k",
        s.temperature_shift_k,
        -10.0,
        10.0,
        "shift of every dry-bulb, K",
    )?;
    if let Some(w) = &s.wind_monthly_m_s {
        crate::weather::sky::validate_wind_monthly("wind_monthly_m_s", w)?;
    }
    match s.source {
        WeatherSource::Synthetic => match &s.synthetic {
            Some(n) => n.validate().map_err(|e| e.within("", "synthetic")),
            None => Err(Error::input(
                "synthetic",
                "(missing)",
                "source = \"synthetic\" needs a [weather.synthetic] table of monthly normals",
            )),
        },
        WeatherSource::File => match &s.file {
            Some(_) => Ok(()),
            None => Err(Error::input(
                "file",
                "(missing)",
                "source = \"file\" needs a [weather.file] table (path, interval, columns, units)",
            )),
        },
    }
}

fn load(s: &LoadSection) -> Result<()> {
    match s.source {
        LoadSource::Model => match &s.model {
            Some(b) => b.validate().map_err(|e| e.within("", "model")),
            None => Err(Error::input(
                "model",
                "(missing)",
                "source = \"model\" needs a [load.model] table describing the building",
            )),
        },
        LoadSource::File => match &s.file {
            Some(_) => Ok(()),
            None => Err(Error::input(
                "file",
                "(missing)",
                "source = \"file\" needs a [load.file] table (path, columns, units)",
            )),
        },
    }
}

fn heat_demand(h: &HeatDemandSection, load: LoadSource) -> Result<()> {
    in_range(
        "dhw_l_per_day",
        h.dhw_l_per_day,
        0.0,
        1.0e6,
        "litres of hot water per day",
    )?;
    in_range(
        "dhw_t_c",
        h.dhw_t_c,
        30.0,
        80.0,
        "hot-water delivery temperature, °C",
    )?;
    if h.dhw_l_per_day > 0.0 {
        list(
            "cold_water_c",
            &h.cold_water_c,
            12,
            0.0,
            35.0,
            "monthly mains water temperature, °C",
        )?;
        for (i, t) in h.cold_water_c.iter().enumerate() {
            if *t >= h.dhw_t_c {
                return Err(Error::input(
                    format!("cold_water_c[{i}]"),
                    t,
                    format!("must be below dhw_t_c = {} °C", h.dhw_t_c),
                ));
            }
        }
    }
    if let Some(p) = &h.dhw_profile {
        list(
            "dhw_profile",
            p,
            24,
            0.0,
            1.0,
            "fraction of the daily draw in each hour",
        )?;
        let sum: f64 = p.iter().sum();
        if (sum - 1.0).abs() > 1e-3 {
            return Err(Error::input(
                "dhw_profile",
                format!("values summing to {sum:.4}"),
                "the 24 hourly fractions must sum to 1",
            ));
        }
    }
    if h.space_heating {
        if load != LoadSource::Model {
            return Err(Error::input(
                "space_heating",
                true,
                "space heating comes from the building model: needs [load] source = \"model\"",
            ));
        }
        in_range(
            "sh_supply_c",
            h.sh_supply_c,
            25.0,
            90.0,
            "heating-loop supply, °C",
        )?;
        in_range(
            "sh_return_c",
            h.sh_return_c,
            15.0,
            h.sh_supply_c - 1.0,
            "heating-loop return, °C, below the supply",
        )?;
    }
    Ok(())
}

fn option(s: &Scenario, o: &OptionSection) -> Result<()> {
    open_range(
        "backup.boiler_efficiency",
        o.backup.boiler_efficiency,
        0.0,
        1.1,
        "heat out per fuel in (HHV)",
    )?;
    // Each route reads its own section; a section for another route is a slip worth naming.
    let sections = [
        ("absorption", o.absorption.is_some(), RouteKind::Absorption),
        ("desiccant", o.desiccant.is_some(), RouteKind::Desiccant),
        ("rankine_vc", o.rankine_vc.is_some(), RouteKind::RankineVc),
        ("pv", o.pv.is_some(), RouteKind::PvElectric),
    ];
    for (key, present, kind) in sections {
        if present && o.route != kind {
            return Err(Error::input(
                key,
                "(section given)",
                format!(
                    "belongs to route = \"{}\", but this option has route = \"{}\"",
                    kind.as_str(),
                    o.route.as_str()
                ),
            ));
        }
        if !present && o.route == kind {
            return Err(Error::input(
                key,
                "(missing)",
                format!(
                    "route = \"{}\" needs an [options.NAME.{key}] section",
                    kind.as_str()
                ),
            ));
        }
    }
    if o.route.is_heat_driven() && (o.field.is_none() || o.storage.is_none()) {
        return Err(Error::input(
            "field",
            "(missing)",
            format!(
                "route = \"{}\" is driven by solar heat: it needs [options.NAME.field] and [options.NAME.storage]",
                o.route.as_str()
            ),
        ));
    }
    if let Some(a) = &o.absorption {
        a.validate().map_err(|e| e.within("", "absorption"))?;
    }
    if let Some(d) = &o.desiccant {
        d.validate().map_err(|e| e.within("", "desiccant"))?;
    }
    if let Some(r) = &o.rankine_vc {
        r.validate().map_err(|e| e.within("", "rankine_vc"))?;
    }
    if let Some(pv) = &o.pv {
        in_range(
            "pv.tilt_deg",
            pv.tilt_deg,
            0.0,
            90.0,
            "PV tilt from horizontal, degrees",
        )?;
        in_range(
            "pv.azimuth_deg",
            pv.azimuth_deg,
            0.0,
            360.0,
            "degrees clockwise from north",
        )?;
        in_range(
            "pv.iam_b0",
            pv.iam_b0,
            0.0,
            0.5,
            "one-parameter beam IAM of the module glass",
        )?;
        pv.array.validate().map_err(|e| e.within("", "pv.array"))?;
    }
    if let Some(r) = &o.refrigerant {
        r.validate().map_err(|e| e.within("", "refrigerant"))?;
    }
    match (&o.field, &o.storage) {
        (Some(f), Some(st)) => {
            field(s, f).map_err(|e| e.within("", "field"))?;
            storage(st).map_err(|e| e.within("", "storage"))?;
        }
        (Some(_), None) => {
            return Err(Error::input(
                "storage",
                "(missing)",
                "an option with a collector field needs a [options.NAME.storage] section",
            ));
        }
        (None, Some(_)) => {
            return Err(Error::input(
                "field",
                "(missing)",
                "an option with storage needs a [options.NAME.field] section",
            ));
        }
        (None, None) => {
            if o.serves_heat_demand {
                return Err(Error::input(
                    "serves_heat_demand",
                    true,
                    "serving the heat demand from solar needs a field and storage",
                ));
            }
        }
    }
    if o.serves_heat_demand && s.heat_demand.is_none() {
        return Err(Error::input(
            "serves_heat_demand",
            true,
            "there is no [heat_demand] section to serve",
        ));
    }
    Ok(())
}

fn field(s: &Scenario, f: &FieldSection) -> Result<()> {
    let Some(c) = s.collectors.get(&f.collector) else {
        let names: Vec<String> = s.collectors.keys().cloned().collect();
        let hint = super::parse::nearest(&f.collector, &names)
            .map_or(String::new(), |n| format!("did you mean `{n}`? "));
        return Err(Error::input(
            "collector",
            format!("\"{}\"", f.collector),
            format!(
                "{hint}must name a [collectors.NAME] section; defined: {}",
                if names.is_empty() {
                    "(none)".into()
                } else {
                    names.join(", ")
                }
            ),
        ));
    };
    match (f.modules, f.gross_area_m2) {
        (Some(m), None) => count(
            "modules",
            m,
            0,
            100_000,
            "number of collector modules (0: no field)",
        )?,
        (None, Some(a)) => in_range(
            "gross_area_m2",
            a,
            0.0,
            1.0e6,
            "gross collector area, m² (0: no field)",
        )?,
        _ => {
            return Err(Error::input(
                "modules",
                "(both or neither given)",
                "give exactly one of `modules` or `gross_area_m2`",
            ));
        }
    }
    count("in_series", f.in_series, 1, 50, "modules in series per row")?;
    if let Some(m) = f.modules
        && m % f.in_series != 0
    {
        return Err(Error::input(
            "modules",
            m,
            format!(
                "must be a whole number of rows of in_series = {} modules",
                f.in_series
            ),
        ));
    }
    in_range(
        "tilt_deg",
        f.tilt_deg,
        0.0,
        90.0,
        "collector tilt from horizontal, degrees",
    )?;
    in_range(
        "azimuth_deg",
        f.azimuth_deg,
        0.0,
        360.0,
        "degrees clockwise from north, 180 = south",
    )?;
    positive(
        "flow_kg_s_m2",
        f.flow_kg_s_m2,
        0.2,
        "collector-loop flow per m² of collector, kg/(s·m²)",
    )?;
    in_range(
        "pipe_length_m",
        f.pipe_length_m,
        0.0,
        5000.0,
        "supply + return pipe length, m",
    )?;
    in_range(
        "pipe_loss_w_mk",
        f.pipe_loss_w_mk,
        0.0,
        5.0,
        "pipe heat loss per metre and kelvin, W/(m·K)",
    )?;
    if f.fluid == Fluid::PropyleneGlycol {
        in_range(
            "glycol_mass_fraction",
            f.glycol_mass_fraction,
            0.25,
            0.5,
            "propylene glycol mass fraction of the loop fluid",
        )?;
        if f.hx_effectiveness.is_none() {
            return Err(Error::input(
                "fluid",
                "\"propylene-glycol\"",
                "a glycol loop is separated from the store by a heat exchanger: give hx_effectiveness",
            ));
        }
    }
    if let Some(e) = f.hx_effectiveness {
        open_range(
            "hx_effectiveness",
            e,
            0.0,
            1.0,
            "collector-loop heat-exchanger effectiveness",
        )?;
    }
    in_range(
        "pump_w_m2",
        f.pump_w_m2,
        0.0,
        50.0,
        "pump electric power per m² of collector, W/m²",
    )?;
    in_range(
        "dt_on_k",
        f.dt_on_k,
        0.5,
        30.0,
        "pump start temperature difference, K",
    )?;
    in_range(
        "dt_off_k",
        f.dt_off_k,
        0.0,
        f.dt_on_k,
        "pump stop temperature difference, K, below dt_on_k",
    )?;
    in_range(
        "pipe_heat_capacity_j_mk",
        f.pipe_heat_capacity_j_mk,
        0.0,
        50_000.0,
        "heat capacity of the loop's pipes and fluid per metre, J/(m·K)",
    )?;
    let _ = c;
    Ok(())
}

fn storage(st: &StorageSection) -> Result<()> {
    in_range(
        "ua_w_k",
        st.ua_w_k,
        0.0,
        1.0e5,
        "store loss coefficient to the plant room, W/K",
    )?;
    in_range(
        "t_room_c",
        st.t_room_c,
        -30.0,
        50.0,
        "plant-room temperature, °C",
    )?;
    in_range(
        "t_max_c",
        st.t_max_c,
        40.0,
        200.0,
        "maximum store temperature, °C",
    )?;
    in_range(
        "t_init_c",
        st.t_init_c,
        0.0,
        st.t_max_c,
        "store temperature at the start, °C",
    )?;
    let need = |k: &str, v: Option<f64>| {
        v.ok_or_else(|| {
            Error::input(
                k,
                "(missing)",
                format!("required for kind = \"{}\"", kind_name(st.kind)),
            )
        })
    };
    match st.kind {
        StorageKind::Tank => {
            // Physical floors: a store smaller than a domestic cylinder (50 L, 0.2 m) is a unit
            // slip, and the tank's stable sub-step shrinks with its volume (bounded work).
            in_range(
                "volume_m3",
                need("volume_m3", st.volume_m3)?,
                0.05,
                10_000.0,
                "tank volume, m³ (at least 0.05 m³ = 50 L)",
            )?;
            in_range(
                "height_m",
                need("height_m", st.height_m)?,
                0.2,
                50.0,
                "tank height, m",
            )?;
            count("nodes", st.nodes, 1, 50, "stratification nodes")?;
            in_range(
                "pressure_kpa",
                st.pressure_kpa,
                100.0,
                2000.0,
                "absolute pressure of the tank, kPa",
            )?;
            let t_sat = crate::props::water::saturation_temperature_c(st.pressure_kpa)?;
            if st.t_max_c > 99.0 && st.t_max_c > t_sat - 5.0 {
                return Err(Error::input(
                    "t_max_c",
                    st.t_max_c,
                    format!(
                        "must stay 5 K below saturation at pressure_kpa = {} ({t_sat:.1} °C): raise the pressure or lower the maximum",
                        st.pressure_kpa
                    ),
                ));
            }
        }
        StorageKind::Pcm => {
            in_range(
                "mass_kg",
                need("mass_kg", st.mass_kg)?,
                5.0,
                1.0e7,
                "PCM mass, kg (at least 5 kg)",
            )?;
            positive(
                "cp_solid_j_kgk",
                need("cp_solid_j_kgk", st.cp_solid_j_kgk)?,
                10_000.0,
                "solid specific heat, J/(kg·K)",
            )?;
            positive(
                "cp_liquid_j_kgk",
                need("cp_liquid_j_kgk", st.cp_liquid_j_kgk)?,
                10_000.0,
                "liquid specific heat, J/(kg·K)",
            )?;
            positive(
                "latent_j_kg",
                need("latent_j_kg", st.latent_j_kg)?,
                1.0e6,
                "latent heat of melting, J/kg",
            )?;
            in_range(
                "t_melt_c",
                need("t_melt_c", st.t_melt_c)?,
                0.0,
                200.0,
                "melting temperature, °C",
            )?;
            in_range(
                "melt_range_k",
                st.melt_range_k,
                0.0,
                20.0,
                "melting range, K",
            )?;
            positive(
                "ua_hx_w_k",
                need("ua_hx_w_k", st.ua_hx_w_k)?,
                1.0e6,
                "fluid-to-PCM exchanger UA, W/K",
            )?;
        }
    }
    Ok(())
}

fn kind_name(k: StorageKind) -> &'static str {
    match k {
        StorageKind::Tank => "tank",
        StorageKind::Pcm => "pcm",
    }
}
