//! One hour of one option: every figure the outputs show, units in the names.

use crate::routes::Reason;

/// One hour of one option.
#[derive(Debug, Clone, Copy)]
pub struct HourRecord {
    /// Hour of the year, 0..8760.
    pub hour: usize,
    /// Outdoor dry-bulb, °C.
    pub t_amb_c: f64,
    /// Outdoor wet-bulb, °C, and humidity ratio, kg/kg dry air (the hour's air state).
    pub t_wb_c: f64,
    pub w_kg_kg: f64,
    /// Global horizontal, direct normal and diffuse horizontal irradiance, W/m².
    pub ghi_w_m2: f64,
    pub dni_w_m2: f64,
    pub dhi_w_m2: f64,
    /// Total irradiance on the option's collector plane, W/m² (0 without a field).
    pub poa_w_m2: f64,
    /// Of which beam, and diffuse (sky + ground-reflected), W/m² (0 without a field).
    pub poa_beam_w_m2: f64,
    pub poa_diffuse_w_m2: f64,
    /// Cooling load (sensible + latent), kWh.
    pub load_kwh: f64,
    /// Cooling delivered, kWh: the sum of the five `cooling_*` sources below.
    pub cooling_kwh: f64,
    /// Of which: by the heat-driven machine from solar heat (its heat-driven cooling times
    /// the solar share of the driving heat it was given), kWh.
    pub cooling_solar_kwh: f64,
    /// By the heat-driven machine from backup (boiler) heat, kWh.
    pub cooling_backup_heat_kwh: f64,
    /// By evaporative cooling alone (no driving heat, no compressor), kWh.
    pub cooling_evaporative_kwh: f64,
    /// By an electric compressor on grid electricity, kWh.
    pub cooling_electric_kwh: f64,
    /// By an electric compressor on the option's own PV (electric cooling times the PV share
    /// of the option's electricity), kWh.
    pub cooling_pv_kwh: f64,
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
    /// All electricity, kWh: the sum of the five uses below.
    pub electricity_kwh: f64,
    /// Compressors of electric chillers, kWh.
    pub elec_compressor_kwh: f64,
    /// Cooling-tower and dry-cooler fans, kWh.
    pub elec_heat_rejection_kwh: f64,
    /// The route's pumps (chilled, condenser, hot water, solution), kWh.
    pub elec_pumps_kwh: f64,
    /// Desiccant unit fans, wheel drives and evaporative-cooler pumps, kWh.
    pub elec_air_handling_kwh: f64,
    /// Collector-loop pump, kWh.
    pub pump_kwh: f64,
    /// Boiler fuel, kWh (HHV).
    pub fuel_kwh: f64,
    pub heat_rejected_kwh: f64,
    /// Store heat loss to the plant room, kWh.
    pub store_loss_kwh: f64,
    /// Change of the energy stored over the hour, kWh.
    pub store_delta_kwh: f64,
    /// 1 in an hour the heat-driven machine started (it had no driving heat the hour before).
    pub machine_starts: u32,
    /// Driving heat that warmed the machine's thermal mass at a start (lost to the plant
    /// room as it cools down later), kWh.
    pub startup_heat_kwh: f64,
    /// Plant first law over the hour, kWh: solar heat + fuel + electricity + cooling (heat
    /// removed from the building) − heat rejected − store loss − Δstored − heat delivered to
    /// the heat demand − boiler loss − collector-pump electricity − start-up heat. Zero but
    /// for round-off.
    pub plant_balance_kwh: f64,
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
    /// Driving temperature the machine ran at, °C, and the heat-rejection sink it saw.
    pub t_drive_c: Option<f64>,
    pub t_sink_c: Option<f64>,
    /// Chilled water the heat-driven machine made, °C.
    pub t_chw_c: Option<f64>,
    /// PV electricity used on site and exported, kWh (pv-electric).
    pub pv_used_kwh: f64,
    pub pv_export_kwh: f64,
    /// Electricity taken from the grid: `electricity_kwh − pv_used_kwh` (negative when the
    /// option's PV also serves the building's other load), kWh.
    pub grid_kwh: f64,
    /// Route-specific figures (name with unit, value).
    pub detail: [(&'static str, f64); 4],
}

impl HourRecord {
    /// The plant's first-law residual relative to the hour's largest flow (0 in an idle hour).
    pub fn plant_balance_rel(&self) -> f64 {
        let scale = [
            self.solar_heat_kwh,
            self.fuel_kwh,
            self.electricity_kwh,
            self.cooling_kwh,
            self.heat_rejected_kwh,
            self.store_loss_kwh,
            self.store_delta_kwh,
            self.heat_demand_kwh,
        ]
        .iter()
        .fold(0.0f64, |m, v| m.max(v.abs()));
        if scale > 0.0 {
            self.plant_balance_kwh.abs() / scale
        } else {
            0.0
        }
    }
}

impl Default for HourRecord {
    fn default() -> Self {
        HourRecord {
            hour: 0,
            t_amb_c: 0.0,
            t_wb_c: 0.0,
            w_kg_kg: 0.0,
            ghi_w_m2: 0.0,
            dni_w_m2: 0.0,
            dhi_w_m2: 0.0,
            poa_w_m2: 0.0,
            poa_beam_w_m2: 0.0,
            poa_diffuse_w_m2: 0.0,
            load_kwh: 0.0,
            cooling_kwh: 0.0,
            cooling_solar_kwh: 0.0,
            cooling_backup_heat_kwh: 0.0,
            cooling_evaporative_kwh: 0.0,
            cooling_electric_kwh: 0.0,
            cooling_pv_kwh: 0.0,
            unmet_kwh: 0.0,
            solar_heat_kwh: 0.0,
            heat_to_route_kwh: 0.0,
            route_solar_kwh: 0.0,
            backup_heat_kwh: 0.0,
            heat_demand_kwh: 0.0,
            heat_demand_solar_kwh: 0.0,
            electricity_kwh: 0.0,
            elec_compressor_kwh: 0.0,
            elec_heat_rejection_kwh: 0.0,
            elec_pumps_kwh: 0.0,
            elec_air_handling_kwh: 0.0,
            pump_kwh: 0.0,
            fuel_kwh: 0.0,
            heat_rejected_kwh: 0.0,
            store_loss_kwh: 0.0,
            store_delta_kwh: 0.0,
            machine_starts: 0,
            startup_heat_kwh: 0.0,
            plant_balance_kwh: 0.0,
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
            t_drive_c: None,
            t_sink_c: None,
            t_chw_c: None,
            pv_used_kwh: 0.0,
            pv_export_kwh: 0.0,
            grid_kwh: 0.0,
            detail: [("", 0.0); 4],
        }
    }
}
