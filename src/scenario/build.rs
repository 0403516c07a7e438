//! From a checked scenario to the year's hourly inputs and the options' plant models, and the
//! whole evaluation.
//!
//! `prepare` does everything that is common to all options once per scenario (weather, sun,
//! psychrometrics, building load, heat demand); `build_options` sizes each option's plant
//! from its section; `evaluate` runs them.

use super::Loaded;
use super::schema::*;
use crate::components::boiler::Boiler;
use crate::components::collector::Ambient;
use crate::components::field::Field;
use crate::components::pcm::{Pcm, PcmSpec};
use crate::components::pipe::Pipe;
use crate::components::tank::{Tank, TankSpec};
use crate::error::{Error, Result};
use crate::feasibility::{Evaluation, OptionResult};
use crate::load::{BuildingHourInput, LoadYear};
use crate::plant::store::Store;
use crate::plant::{HeatDemandHour, PlantOption, SolarLoop, YearInputs};
use crate::props::{psychro, water};
use crate::routes::electric::Electric;
use crate::routes::{HourConditions, Route};
use crate::sun::incidence::{Plane, track};
use crate::sun::position::{Site, SunPosition, year_positions};
use crate::sun::sky::{SkyModel, plane_irradiance};
use crate::weather::{Humidity, WeatherYear, calendar};

/// Hot-water draw profile used when the scenario gives none: fraction of the day's draw in
/// each hour, morning and evening peaks (common practice; invented for the project, not a
/// published profile).
pub const DEFAULT_DHW_PROFILE: [f64; 24] = [
    0.005, 0.005, 0.005, 0.005, 0.01, 0.03, 0.08, 0.10, 0.08, 0.06, 0.05, 0.05, //
    0.05, 0.04, 0.04, 0.04, 0.05, 0.06, 0.08, 0.07, 0.05, 0.035, 0.02, 0.01,
];

/// Everything common to all options of a scenario, computed once.
#[derive(Debug, Clone)]
pub struct Prepared {
    pub site: Site,
    pub weather: WeatherYear,
    pub sun: Vec<SunPosition>,
    pub conditions: Vec<HourConditions>,
    /// What the collectors see each hour besides the sun: air temperature, wind speed and
    /// long-wave irradiance (`weather::sky`), the same for every option.
    pub ambient: Vec<Ambient>,
    /// The (scaled) weather year's global, direct normal and diffuse horizontal irradiance, W/m².
    pub ghi_w_m2: Vec<f64>,
    pub dni_w_m2: Vec<f64>,
    pub dhi_w_m2: Vec<f64>,
    pub heat_demand: Vec<HeatDemandHour>,
    pub load_origin: String,
}

/// Weather, sun, air states, building load and heat demand for the year.
pub fn prepare(l: &Loaded) -> Result<Prepared> {
    let s = &l.scenario;
    let file = l.file();
    let site = Site {
        latitude_deg: s.site.latitude_deg,
        longitude_deg: s.site.longitude_deg,
        elevation_m: s.site.elevation_m,
        utc_offset_h: s.site.utc_offset_h,
    };
    let mut weather = load_weather(l, &site)?;
    scale_weather(
        &mut weather,
        s.weather.irradiation_scale,
        s.weather.temperature_shift_k,
    );
    let sun = year_positions(&site, s.site.year).map_err(|e| e.within(&file, "site"))?;
    let p_site = psychro::pressure_at_elevation_kpa(s.site.elevation_m);

    // Air states: humidity ratio and wet-bulb at the hour's pressure.
    let mut air = Vec::with_capacity(weather.hours.len());
    for (i, h) in weather.hours.iter().enumerate() {
        let p = h.p_kpa.unwrap_or(p_site);
        let w = match h.humidity {
            Humidity::RatioKgKg(w) => Ok(w),
            Humidity::RhPct(rh) => psychro::ratio_from_rh(h.t_db_c, rh, p),
            Humidity::DewPointC(td) => psychro::ratio_from_dew_point(td.min(h.t_db_c), p),
        };
        let w = w.and_then(|w| {
            let ws = psychro::saturation_ratio(h.t_db_c, p)?;
            Ok(w.min(ws))
        });
        let w = w.map_err(|e| weather_hour_error(&weather, i, e))?;
        let t_wb =
            psychro::wet_bulb_c(h.t_db_c, w, p).map_err(|e| weather_hour_error(&weather, i, e))?;
        air.push((h.t_db_c, w, t_wb, p));
    }

    let load = load_year(l, &weather, &sun, &air, p_site)?;
    let conditions: Vec<HourConditions> = air
        .iter()
        .zip(&load.hours)
        .enumerate()
        .map(
            |(hour, (&(t_db_c, w_kg_kg, t_wb_c, p_kpa), &load))| HourConditions {
                hour,
                t_db_c,
                w_kg_kg,
                t_wb_c,
                p_kpa,
                load,
            },
        )
        .collect();
    let heat_demand = heat_demand(s, &load, &file)?;
    let ambient = crate::weather::sky::outdoor_year(
        &weather,
        site.latitude_deg,
        s.weather.wind_monthly_m_s.as_deref(),
    )
    .iter()
    .zip(&conditions)
    .map(|(o, c)| Ambient {
        t_air_c: c.t_db_c,
        wind_m_s: o.wind_m_s,
        long_wave_w_m2: o.long_wave_w_m2,
    })
    .collect();
    Ok(Prepared {
        site,
        ambient,
        ghi_w_m2: weather.hours.iter().map(|h| h.ghi_w_m2).collect(),
        dni_w_m2: weather.hours.iter().map(|h| h.dni_w_m2).collect(),
        dhi_w_m2: weather.hours.iter().map(|h| h.dhi_w_m2).collect(),
        weather,
        sun,
        conditions,
        heat_demand,
        load_origin: load.origin,
    })
}

/// Scale irradiance and shift dry-bulb for sensitivity studies (identity at 1 and 0).
fn scale_weather(w: &mut WeatherYear, scale: f64, shift_k: f64) {
    if scale == 1.0 && shift_k == 0.0 {
        return;
    }
    for h in &mut w.hours {
        h.ghi_w_m2 *= scale;
        h.dni_w_m2 *= scale;
        h.dhi_w_m2 *= scale;
        h.t_db_c += shift_k;
    }
    w.origin = format!("{}, irradiance × {scale}, dry-bulb {shift_k:+} K", w.origin);
}

fn weather_hour_error(w: &WeatherYear, i: usize, e: Error) -> Error {
    let (m, d, h, _) = calendar(i);
    Error::Input {
        file: w.origin.clone(),
        key: format!("hour {i} (month {m}, day {d}, hour {h})"),
        value: "humidity".into(),
        allowed: e.to_string(),
    }
}

fn load_weather(l: &Loaded, site: &Site) -> Result<WeatherYear> {
    let s = &l.scenario;
    let file = l.file();
    match s.weather.source {
        WeatherSource::Synthetic => {
            let n = s
                .weather
                .synthetic
                .as_ref()
                .ok_or_else(|| Error::Internal("checked: synthetic".into()))?;
            crate::weather::synthetic::synthesize(
                n,
                site.latitude_deg,
                site.longitude_deg,
                site.utc_offset_h,
                site.elevation_m,
            )
            .map_err(|e| e.within(&file, "weather.synthetic"))
        }
        WeatherSource::File => {
            let f = s
                .weather
                .file
                .as_ref()
                .ok_or_else(|| Error::Internal("checked: file".into()))?;
            crate::weather::file::read(
                f,
                &l.base_dir,
                site.latitude_deg,
                site.longitude_deg,
                site.utc_offset_h,
            )
            .map_err(|e| e.within(&file, "weather.file"))
        }
    }
}

/// Irradiance on the building's four vertical façades and the roof, by the Perez model.
fn facade_irradiance(w: &WeatherYear, sun: &[SunPosition], albedo: f64) -> Vec<[f64; 5]> {
    let planes = [0.0, 90.0, 180.0, 270.0].map(|az| Plane {
        tilt_deg: 90.0,
        azimuth_deg: az,
    });
    w.hours
        .iter()
        .zip(sun)
        .map(|(h, s)| {
            let mut out = [0.0; 5];
            for (k, p) in planes.iter().enumerate() {
                let (plane, aoi) = track(crate::sun::incidence::Tracking::Fixed, *p, s);
                out[k] = plane_irradiance(
                    SkyModel::Perez1990,
                    plane,
                    aoi,
                    s,
                    h.ghi_w_m2,
                    h.dni_w_m2,
                    h.dhi_w_m2,
                    albedo,
                )
                .total_w_m2();
            }
            out[4] = h.ghi_w_m2;
            out
        })
        .collect()
}

fn load_year(
    l: &Loaded,
    w: &WeatherYear,
    sun: &[SunPosition],
    air: &[(f64, f64, f64, f64)],
    p_site: f64,
) -> Result<LoadYear> {
    let s = &l.scenario;
    let file = l.file();
    match s.load.source {
        LoadSource::Model => {
            let b = s
                .load
                .model
                .as_ref()
                .ok_or_else(|| Error::Internal("checked: model".into()))?;
            let solar = facade_irradiance(w, sun, s.site.ground_albedo);
            let inputs: Vec<BuildingHourInput> = (0..w.hours.len())
                .map(|i| {
                    let (_, _, hour_of_day, doy) = calendar(i);
                    BuildingHourInput {
                        t_out_c: air[i].0,
                        w_out_kg_kg: air[i].1,
                        solar_w_m2: solar[i],
                        hour_of_day,
                        weekday: (s.site.jan1_weekday + doy - 1) % 7,
                    }
                })
                .collect();
            let w_in = psychro::ratio_from_rh(b.t_cool_setpoint_c, b.rh_setpoint_pct, p_site)
                .map_err(|e| e.within(&file, "load.model"))?;
            crate::load::rc5::simulate(b, &inputs, w_in).map_err(|e| e.within(&file, "load.model"))
        }
        LoadSource::File => {
            let f = s
                .load
                .file
                .as_ref()
                .ok_or_else(|| Error::Internal("checked: load file".into()))?;
            crate::load::file::read(f, &l.base_dir).map_err(|e| e.within(&file, "load.file"))
        }
    }
}

fn heat_demand(s: &Scenario, load: &LoadYear, file: &str) -> Result<Vec<HeatDemandHour>> {
    let n = load.hours.len();
    let Some(h) = &s.heat_demand else {
        return Ok(vec![HeatDemandHour::default(); n]);
    };
    let profile: Vec<f64> = h
        .dhw_profile
        .clone()
        .unwrap_or_else(|| DEFAULT_DHW_PROFILE.to_vec());
    let mut out = Vec::with_capacity(n);
    for (i, lh) in load.hours.iter().enumerate() {
        let (month, _, hour, _) = calendar(i);
        let t_cold = h
            .cold_water_c
            .get(month as usize - 1)
            .copied()
            .unwrap_or(15.0);
        let dhw_kwh = if h.dhw_l_per_day > 0.0 {
            let t_mean = 0.5 * (t_cold + h.dhw_t_c);
            let rho = water::liquid_density_kg_m3(t_mean, 300.0)
                .map_err(|e| e.within(file, "heat_demand"))?;
            let cp =
                water::liquid_cp_j_kgk(t_mean, 300.0).map_err(|e| e.within(file, "heat_demand"))?;
            h.dhw_l_per_day / 1000.0 * profile[hour as usize] * rho * cp * (h.dhw_t_c - t_cold)
                / 3.6e6
        } else {
            0.0
        };
        out.push(HeatDemandHour {
            dhw_kwh,
            t_cold_c: t_cold,
            t_dhw_c: h.dhw_t_c,
            sh_kwh: if h.space_heating { lh.heating_kw } else { 0.0 },
            t_sh_supply_c: h.sh_supply_c,
            t_sh_return_c: h.sh_return_c,
        });
    }
    Ok(out)
}

/// An option ready to run and what the outputs say of it.
pub struct BuiltOption {
    pub plant: PlantOption,
    pub route: &'static str,
    pub description: Option<String>,
    pub gross_m2: f64,
    pub store_m3: Option<f64>,
}

/// Irradiance on a (fixed or tracking) plane for every hour of the prepared year.
fn plane_year(
    p: &Prepared,
    tracking: crate::sun::incidence::Tracking,
    fixed: Plane,
    sky: SkyModel,
    albedo: f64,
) -> Vec<crate::sun::sky::PlaneIrradiance> {
    p.weather
        .hours
        .iter()
        .zip(&p.sun)
        .map(|(h, sun)| {
            let (plane, aoi) = track(tracking, fixed, sun);
            plane_irradiance(
                sky, plane, aoi, sun, h.ghi_w_m2, h.dni_w_m2, h.dhi_w_m2, albedo,
            )
        })
        .collect()
}

fn missing(key: &str, route: RouteKind) -> Error {
    Error::input(
        key,
        "(missing)",
        format!(
            "route = \"{}\" needs an [options.NAME.{key}] section",
            route.as_str()
        ),
    )
}

/// The datasheet an absorption section names, read (errors name the datasheet file; a
/// missing file names the key `absorption.datasheet`).
pub fn read_datasheet(
    l: &Loaded,
    spec: &crate::routes::absorption::AbsorptionSpec,
) -> Result<Option<crate::components::absorption_fit::Datasheet>> {
    let Some(path) = &spec.datasheet else {
        return Ok(None);
    };
    crate::components::absorption_fit::read(path, &l.base_dir)
        .map(Some)
        .map_err(|e| match e {
            Error::Read { path: p, source } => Error::Input {
                file: String::new(),
                key: "absorption.datasheet".into(),
                value: format!("{path:?}"),
                allowed: format!("a readable CSV file ({}: {source})", p.display()),
            },
            e => e,
        })
}

/// The cooling route of one option, sized from its section (keys relative to the option).
fn build_route(l: &Loaded, o: &OptionSection, p: &Prepared) -> Result<Box<dyn Route>> {
    let s = &l.scenario;
    let base = &s.baseline;
    Ok(match o.route {
        RouteKind::Electric => {
            Box::new(Electric::new(base.clone()).map_err(|e| e.within("", "baseline"))?)
        }
        RouteKind::Absorption => {
            let spec = o
                .absorption
                .clone()
                .ok_or_else(|| missing("absorption", o.route))?;
            let sheet = read_datasheet(l, &spec)?;
            Box::new(
                crate::routes::absorption::build(spec, base, sheet.as_ref())
                    .map_err(|e| e.within("", "absorption"))?,
            )
        }
        RouteKind::Desiccant => {
            let mut spec = o
                .desiccant
                .clone()
                .ok_or_else(|| missing("desiccant", o.route))?;
            // The room humidity the air handler must hold is the building's set-point.
            if let Some(b) = &s.load.model {
                let p_site = psychro::pressure_at_elevation_kpa(s.site.elevation_m);
                spec.w_room_kg_kg =
                    psychro::ratio_from_rh(b.t_cool_setpoint_c, b.rh_setpoint_pct, p_site)?;
            }
            Box::new(
                crate::routes::desiccant::build(&spec, base)
                    .map_err(|e| e.within("", "desiccant"))?,
            )
        }
        RouteKind::RankineVc => {
            let spec = o
                .rankine_vc
                .as_ref()
                .ok_or_else(|| missing("rankine_vc", o.route))?;
            Box::new(
                crate::routes::rankine_vc::build(spec, base)
                    .map_err(|e| e.within("", "rankine_vc"))?,
            )
        }
        RouteKind::PvElectric => {
            let pv = o.pv.as_ref().ok_or_else(|| missing("pv", o.route))?;
            pv.array.validate().map_err(|e| e.within("", "pv.array"))?;
            let fixed = Plane {
                tilt_deg: pv.tilt_deg,
                azimuth_deg: pv.azimuth_deg,
            };
            let pv_ac_kwh = plane_year(p, pv.tracking, fixed, pv.sky_model, s.site.ground_albedo)
                .iter()
                .zip(&p.weather.hours)
                .map(|(g, h)| {
                    let aoi = g.aoi_deg;
                    // Beam through the glass by the one-parameter IAM (ASHRAE form).
                    let k = if aoi < 90.0 {
                        (1.0 - pv.iam_b0 * (1.0 / aoi.to_radians().cos() - 1.0)).clamp(0.0, 1.0)
                    } else {
                        0.0
                    };
                    let poa_eff = g.beam_w_m2 * k + g.diffuse_w_m2();
                    // Wind at 1 m/s when the weather gives none (common practice for still air).
                    pv.array
                        .ac_power_kw(poa_eff, h.t_db_c, h.wind_m_s.unwrap_or(1.0))
                })
                .collect();
            Box::new(crate::routes::pv_electric::PvElectric {
                chiller: Electric::new(base.clone()).map_err(|e| e.within("", "baseline"))?,
                pv_ac_kwh,
            })
        }
    })
}

/// Size each option's plant from its section.
pub fn build_options(l: &Loaded, p: &Prepared) -> Result<Vec<BuiltOption>> {
    let s = &l.scenario;
    let file = l.file();
    let mut out = Vec::with_capacity(s.options.len());
    for (name, o) in &s.options {
        let prefix = format!("options.{name}");
        let route = build_route(l, o, p).map_err(|e| e.within(&file, &prefix))?;
        let (solar, gross_m2, store_m3) = match (&o.field, &o.storage) {
            // A field of zero area is no field: the option runs without a solar loop (and
            // without its store), so it can be set against the reference with no sun.
            (Some(f), Some(_)) if f.modules == Some(0) || f.gross_area_m2 == Some(0.0) => {
                (None, 0.0, None)
            }
            (Some(f), Some(st)) => {
                let (loop_, gross, m3) =
                    solar_loop(s, f, st, p).map_err(|e| e.within(&file, &prefix))?;
                (Some(loop_), gross, m3)
            }
            _ => (None, 0.0, None),
        };
        out.push(BuiltOption {
            plant: PlantOption {
                name: name.clone(),
                route,
                solar,
                boiler: Boiler {
                    efficiency: o.backup.boiler_efficiency,
                    capacity_kw: None,
                },
                serves_heat_demand: o.serves_heat_demand,
            },
            route: o.route.as_str(),
            description: o.description.clone(),
            gross_m2,
            store_m3,
        });
    }
    Ok(out)
}

fn solar_loop(
    s: &Scenario,
    f: &FieldSection,
    st: &StorageSection,
    p: &Prepared,
) -> Result<(SolarLoop, f64, Option<f64>)> {
    let collector = s
        .collectors
        .get(&f.collector)
        .ok_or_else(|| Error::Internal(format!("checked: collector {}", f.collector)))?
        .clone();
    let modules = match (f.modules, f.gross_area_m2) {
        (Some(m), _) => m,
        (None, Some(a)) => {
            let per_row = collector.gross_m2 * f.in_series as f64;
            ((a / per_row).ceil().max(1.0) as u32) * f.in_series
        }
        (None, None) => return Err(Error::Internal("checked: modules or area".into())),
    };
    // Water properties once per store, at its mean working temperature (IAPWS-IF97).
    let t_design = 0.5 * (st.t_init_c + st.t_max_c);
    let cp =
        water::liquid_cp_j_kgk(t_design, st.pressure_kpa).map_err(|e| e.within("", "storage"))?;
    let rho = water::liquid_density_kg_m3(t_design, st.pressure_kpa)
        .map_err(|e| e.within("", "storage"))?;
    // Loop fluid at the store's mean working temperature (glycol data reach 100 °C).
    let cp_loop = match f.fluid {
        Fluid::Water => cp,
        Fluid::PropyleneGlycol => {
            crate::props::glycol::properties(t_design.min(100.0), f.glycol_mass_fraction)
                .map_err(|e| e.within("", "field"))?
                .1
        }
    };
    let field = Field {
        collector,
        in_series: f.in_series,
        rows: modules / f.in_series,
        flow_kg_s_m2: f.flow_kg_s_m2,
        cp_j_kgk: cp_loop,
        pipe: Pipe {
            length_m: f.pipe_length_m,
            ua_w_mk: f.pipe_loss_w_mk,
        },
    };
    let (store, m3) = match st.kind {
        StorageKind::Tank => {
            let gross_m2 = f64::from(modules) * field.collector.gross_m2;
            let spec = TankSpec {
                volume_m3: st
                    .volume_m3
                    .unwrap_or_else(|| st.volume_l_per_m2.unwrap_or(0.0) * gross_m2 / 1000.0),
                height_m: st.height_m.unwrap_or(0.0),
                ua_w_k: st.ua_w_k,
                nodes: st.nodes as usize,
                t_init_c: st.t_init_c,
                cp_j_kgk: cp,
                rho_kg_m3: rho,
            };
            spec.validate().map_err(|e| e.within("", "storage"))?;
            (
                Store::Tank(Box::new(Tank::new(&spec))),
                Some(spec.volume_m3),
            )
        }
        StorageKind::Pcm => {
            let spec = PcmSpec {
                mass_kg: st.mass_kg.unwrap_or(0.0),
                cp_solid_j_kgk: st.cp_solid_j_kgk.unwrap_or(0.0),
                cp_liquid_j_kgk: st.cp_liquid_j_kgk.unwrap_or(0.0),
                latent_j_kg: st.latent_j_kg.unwrap_or(0.0),
                t_melt_c: st.t_melt_c.unwrap_or(0.0),
                melt_range_k: st.melt_range_k,
                ua_loss_w_k: st.ua_w_k,
                ua_hx_w_k: st.ua_hx_w_k.unwrap_or(0.0),
                t_init_c: st.t_init_c,
            };
            spec.validate().map_err(|e| e.within("", "storage"))?;
            (Store::Pcm(Pcm::new(&spec)), None)
        }
    };
    let fixed = Plane {
        tilt_deg: f.tilt_deg,
        azimuth_deg: f.azimuth_deg,
    };
    let poa = plane_year(p, f.tracking, fixed, f.sky_model, s.site.ground_albedo);
    let gross = field.gross_m2();
    // The field's heat capacity: the collectors' effective capacity (ISO 9806 c5, or the
    // class default) on their area basis, plus the pipes and their fluid.
    let field_capacity_j_k =
        field.heat_capacity_j_k() + f.pipe_heat_capacity_j_mk * f.pipe_length_m;
    Ok((
        SolarLoop {
            pump_w: f.pump_w_m2 * gross,
            field_capacity_j_k,
            field,
            poa,
            hx_effectiveness: f.hx_effectiveness,
            dt_on_k: f.dt_on_k,
            dt_off_k: f.dt_off_k,
            t_max_c: st.t_max_c,
            t_room_c: st.t_room_c,
            cp_j_kgk: cp,
            cp_loop_j_kgk: cp_loop,
            store,
        },
        gross,
        m3,
    ))
}

/// What the hour loop reads that every option shares, from a prepared scenario.
pub fn year_inputs<'a>(l: &Loaded, p: &'a Prepared, substeps: usize) -> YearInputs<'a> {
    YearInputs {
        conditions: &p.conditions,
        ambient: &p.ambient,
        ghi_w_m2: &p.ghi_w_m2,
        dni_w_m2: &p.dni_w_m2,
        dhi_w_m2: &p.dhi_w_m2,
        heat_demand: &p.heat_demand,
        priority: l.scenario.heat_priority,
        substeps,
    }
}

/// Run every option of a prepared scenario.
pub fn run(l: &Loaded, p: &Prepared, built: &[BuiltOption]) -> Result<Evaluation> {
    run_with_substeps(l, p, built, crate::plant::SUBSTEPS)
}

/// [`run`] with another number of plant sub-steps per hour (to show results do not depend on
/// it).
pub fn run_with_substeps(
    l: &Loaded,
    p: &Prepared,
    built: &[BuiltOption],
    substeps: usize,
) -> Result<Evaluation> {
    let y = year_inputs(l, p, substeps);
    let options = built
        .iter()
        .map(|b| {
            OptionResult::new(
                b.plant.name.clone(),
                b.route,
                b.description.clone(),
                b.gross_m2,
                b.store_m3,
                crate::plant::simulate(&b.plant, &y),
            )
        })
        .collect();
    let mut ev = Evaluation {
        scenario: l.scenario.name.clone(),
        currency: l
            .scenario
            .economics
            .as_ref()
            .map_or_else(String::new, |e| e.currency.clone()),
        reference: l.scenario.reference.clone(),
        options,
        weather_origin: match p.weather.derived_beam_diffuse {
            Some(m) => format!(
                "{} (beam and diffuse derived from GHI by {m})",
                p.weather.origin
            ),
            None => p.weather.origin.clone(),
        },
        load_origin: p.load_origin.clone(),
    };
    // Figures against the reference need every option; a subset (one option of a sweep) gets
    // what it can: its own energy and cost, no comparison.
    crate::feasibility::metrics::apply(&l.scenario, &mut ev)?;
    crate::feasibility::check_finite(&ev)?;
    Ok(ev)
}

/// Prepare, build and run a loaded scenario.
pub fn evaluate(l: &Loaded) -> Result<Evaluation> {
    let p = prepare(l)?;
    let built = build_options(l, &p)?;
    run(l, &p, &built)
}

/// Monthly weather summary of a prepared scenario, with the irradiation on each option's
/// collector plane.
pub fn weather_summary(
    p: &Prepared,
    built: &[BuiltOption],
) -> crate::report::weather::WeatherSummary {
    use crate::report::weather::{CDH_BASE_C, WeatherMonth, WeatherSummary};
    let planes: Vec<(String, &Vec<crate::sun::sky::PlaneIrradiance>)> = built
        .iter()
        .filter_map(|b| {
            b.plant
                .solar
                .as_ref()
                .map(|s| (b.plant.name.clone(), &s.poa))
        })
        .collect();
    let summarize = |month: u32, hours: &[usize]| {
        let n = hours.len().max(1) as f64;
        let mut m = WeatherMonth {
            month,
            poa_kwh_m2: vec![0.0; planes.len()],
            t_max_c: f64::MIN,
            ..Default::default()
        };
        for &i in hours {
            let h = &p.weather.hours[i];
            let c = &p.conditions[i];
            m.ghi_kwh_m2 += h.ghi_w_m2 / 1000.0;
            m.dni_kwh_m2 += h.dni_w_m2 / 1000.0;
            m.dhi_kwh_m2 += h.dhi_w_m2 / 1000.0;
            for (k, (_, poa)) in planes.iter().enumerate() {
                m.poa_kwh_m2[k] += poa[i].total_w_m2() / 1000.0;
            }
            m.t_mean_c += c.t_db_c / n;
            m.t_max_c = m.t_max_c.max(c.t_db_c);
            m.w_mean_g_kg += 1000.0 * c.w_kg_kg / n;
            m.rh_mean_pct +=
                psychro::rh_from_ratio(c.t_db_c, c.w_kg_kg, c.p_kpa).unwrap_or(0.0) / n;
            m.t_wb_mean_c += c.t_wb_c / n;
            m.cooling_degree_hours_kh += (c.t_db_c - CDH_BASE_C).max(0.0);
        }
        m
    };
    let mut by_month: Vec<Vec<usize>> = vec![Vec::new(); 12];
    for i in 0..p.conditions.len() {
        by_month[calendar(i).0 as usize - 1].push(i);
    }
    let all: Vec<usize> = (0..p.conditions.len()).collect();
    WeatherSummary {
        origin: match p.weather.derived_beam_diffuse {
            Some(m) => format!("{} — DNI and DHI DERIVED from GHI by {m}", p.weather.origin),
            None => p.weather.origin.clone(),
        },
        planes: planes.iter().map(|(n, _)| n.clone()).collect(),
        months: by_month
            .iter()
            .enumerate()
            .map(|(k, h)| summarize(k as u32 + 1, h))
            .collect(),
        year: summarize(0, &all),
    }
}
