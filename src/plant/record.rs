//! One hour of one option: every figure the outputs show, units in the names.

use crate::routes::Reason;

/// One hour of one option.
#[derive(Debug, Clone, Copy)]
pub struct HourRecord {
    /// Hour of the year, 0..8760.
    pub hour: usize,
    pub t_amb_c: f64,
    pub ghi_w_m2: f64,
    /// Total irradiance on the option's collector plane, W/m² (0 without a field).
    pub poa_w_m2: f64,
    /// Cooling load (sensible + latent), kWh.
    pub load_kwh: f64,
    pub cooling_kwh: f64,
    pub unmet_kwh: f64,
    /// Heat the collector loop delivered into the store, kWh.
    pub solar_heat_kwh: f64,
    /// Driving heat given to the route (solar + backup), kWh.
    pub heat_to_route_kwh: f64,
    /// Of which from the solar store, kWh.
    pub route_solar_kwh: f64,
    /// Boiler heat, for the route and the heat demand together, kWh.
    pub backup_heat_kwh: f64,
    /// Heat demand (hot water + space heating), kWh.
    pub heat_demand_kwh: f64,
    /// Of which from the solar store, kWh.
    pub heat_demand_solar_kwh: f64,
    /// All electricity: route + collector pump, kWh.
    pub electricity_kwh: f64,
    pub route_electricity_kwh: f64,
    pub pump_kwh: f64,
    /// Boiler fuel, kWh (HHV).
    pub fuel_kwh: f64,
    pub heat_rejected_kwh: f64,
    /// Store heat loss to the plant room, kWh.
    pub store_loss_kwh: f64,
    /// Store mean and top temperature at the end of the hour, °C.
    pub t_store_c: Option<f64>,
    pub t_store_top_c: Option<f64>,
    pub cop_thermal: Option<f64>,
    pub cop_electric: Option<f64>,
    /// Store energy balance `in − out − losses − Δstored` over the hour, kWh, and relative to
    /// the energy stored (above 0 °C).
    pub balance_error_kwh: f64,
    pub balance_error_rel: f64,
    /// Collector pump running time, h.
    pub pump_hours: f64,
    /// The field would have gained heat but the store was at its maximum.
    pub stagnation: bool,
    pub reason: Reason,
    /// Water used (cooling-tower make-up, evaporative coolers), m³.
    pub water_m3: f64,
    /// Cooling a backup electric chiller delivered, kWh (part of `cooling_kwh`).
    pub backup_cooling_kwh: f64,
    /// Driving temperature the machine ran at, °C, and the heat-rejection sink it saw.
    pub t_drive_c: Option<f64>,
    pub t_sink_c: Option<f64>,
    /// PV electricity used on site and exported, kWh (pv-electric).
    pub pv_used_kwh: f64,
    pub pv_export_kwh: f64,
    /// Electricity taken from the grid: `electricity_kwh − pv_used_kwh` (negative when the
    /// option's PV also serves the building's other load), kWh.
    pub grid_kwh: f64,
    /// Route-specific figures (name with unit, value).
    pub detail: [(&'static str, f64); 4],
}

impl Default for HourRecord {
    fn default() -> Self {
        HourRecord {
            hour: 0,
            t_amb_c: 0.0,
            ghi_w_m2: 0.0,
            poa_w_m2: 0.0,
            load_kwh: 0.0,
            cooling_kwh: 0.0,
            unmet_kwh: 0.0,
            solar_heat_kwh: 0.0,
            heat_to_route_kwh: 0.0,
            route_solar_kwh: 0.0,
            backup_heat_kwh: 0.0,
            heat_demand_kwh: 0.0,
            heat_demand_solar_kwh: 0.0,
            electricity_kwh: 0.0,
            route_electricity_kwh: 0.0,
            pump_kwh: 0.0,
            fuel_kwh: 0.0,
            heat_rejected_kwh: 0.0,
            store_loss_kwh: 0.0,
            t_store_c: None,
            t_store_top_c: None,
            cop_thermal: None,
            cop_electric: None,
            balance_error_kwh: 0.0,
            balance_error_rel: 0.0,
            pump_hours: 0.0,
            stagnation: false,
            reason: Reason::NoLoad,
            water_m3: 0.0,
            backup_cooling_kwh: 0.0,
            t_drive_c: None,
            t_sink_c: None,
            pv_used_kwh: 0.0,
            pv_export_kwh: 0.0,
            grid_kwh: 0.0,
            detail: [("", 0.0); 4],
        }
    }
}
