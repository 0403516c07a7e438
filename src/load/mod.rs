//! The building's hourly load: cooling at the terminals (sensible and latent) and space
//! heating, from a file or from the ISO 13790 simple hourly (5R1C) model.

pub mod file;
pub mod rc5;
pub mod schedule;

/// One hour of building load, kW averaged over the hour (= kWh in that hour).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct LoadHour {
    /// Sensible cooling the plant must remove, kW (≥ 0).
    pub sensible_kw: f64,
    /// Latent cooling (moisture removal), kW (≥ 0).
    pub latent_kw: f64,
    /// Space heating the plant must supply, kW (≥ 0).
    pub heating_kw: f64,
    /// Indoor air temperature, °C (set-point when conditioned, free-floating otherwise).
    pub t_in_c: f64,
    /// Outdoor air of the building's mechanical ventilation this hour, m³/h (≥ 0): the flow
    /// whose load is inside `sensible_kw`/`latent_kw` and that an outdoor-air unit can replace.
    /// Infiltration is not in it. 0 when the building does not ventilate (unoccupied hours).
    pub ventilation_m3_h: f64,
}

impl LoadHour {
    /// Total cooling load, kW.
    pub fn cooling_kw(&self) -> f64 {
        self.sensible_kw + self.latent_kw
    }
}

/// What the building model needs of the hour, prepared by the caller from weather and sun.
#[derive(Debug, Clone, Copy, Default)]
pub struct BuildingHourInput {
    /// Outdoor dry-bulb, °C.
    pub t_out_c: f64,
    /// Outdoor humidity ratio, kg/kg.
    pub w_out_kg_kg: f64,
    /// Total irradiance on vertical planes facing north, east, south, west, and on the
    /// horizontal, W/m², in that order.
    pub solar_w_m2: [f64; 5],
    /// Hour of day 0..=23 (local standard time).
    pub hour_of_day: u32,
    /// Day of week 0 = Monday ..= 6 = Sunday.
    pub weekday: u32,
}

/// A year of load.
#[derive(Debug, Clone)]
pub struct LoadYear {
    /// 8760 hours.
    pub hours: Vec<LoadHour>,
    /// Where it came from (file path or "ISO 13790 5R1C model").
    pub origin: String,
}
