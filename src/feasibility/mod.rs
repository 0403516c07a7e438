//! From hourly records to monthly and annual figures, defined once and used everywhere
//! (the registry of keys, labels, units and definitions is [`figures`]).
//!
//! Key figures (definitions after the key figures the IEA Solar Heating and Cooling
//! programme uses for monitored solar cooling plants, Tasks 38 and 48 — from memory, not read
//! here; the solar fraction as Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th
//! ed., define it for a thermal system):
//! * solar share of cooling = (cooling made from solar heat + cooling made on the option's own
//!   PV) / cooling load;
//! * thermal solar fraction of the route = solar heat the route used / (solar + backup heat
//!   the route used); the heat demand's own solar fraction separately;
//! * thermal COP = cooling the heat-driven machine made / driving heat given to it;
//! * seasonal electric performance = cooling delivered / all electricity of the option;
//! * primary energy ratio and fractional primary-energy saving (`energy.rs`).
//!
//! Seasonal ratios are ratios of sums over the same hours, never means of hourly ratios.

pub mod economics;
pub mod energy;
pub mod explore;
pub mod figures;
pub mod metrics;

use crate::plant::HourRecord;
use crate::weather::calendar;
use serde::Serialize;

/// Sums and ratios over a set of hours (a month or the year). Keys match the hourly CSV.
#[derive(Debug, Clone, Default, Serialize)]
pub struct Totals {
    pub load_kwh: f64,
    /// Largest hourly cooling load, kW, and the hour of the year it falls in.
    pub peak_load_kw: f64,
    pub peak_load_hour: u32,
    pub cooling_kwh: f64,
    /// Cooling by source (the hourly record's `cooling_*`), kWh.
    pub cooling_solar_kwh: f64,
    pub cooling_backup_heat_kwh: f64,
    pub cooling_evaporative_kwh: f64,
    pub cooling_electric_kwh: f64,
    pub cooling_pv_kwh: f64,
    pub unmet_kwh: f64,
    pub solar_heat_kwh: f64,
    pub heat_to_route_kwh: f64,
    pub route_solar_kwh: f64,
    pub backup_heat_kwh: f64,
    pub heat_demand_kwh: f64,
    pub heat_demand_solar_kwh: f64,
    pub electricity_kwh: f64,
    /// Electricity by use (the hourly record's `elec_*`; `pump_kwh` is the collector pump), kWh.
    pub elec_compressor_kwh: f64,
    pub elec_heat_rejection_kwh: f64,
    pub elec_pumps_kwh: f64,
    pub elec_air_handling_kwh: f64,
    pub pump_kwh: f64,
    pub fuel_kwh: f64,
    pub heat_rejected_kwh: f64,
    pub store_loss_kwh: f64,
    /// Solar share of cooling: (cooling from solar heat + cooling on own PV) / cooling load.
    pub solar_share_of_cooling: Option<f64>,
    /// Thermal solar fraction of the route: solar heat used / (solar + backup heat used).
    pub thermal_solar_fraction: Option<f64>,
    /// Solar fraction of the heat demand alone.
    pub solar_fraction_heat_demand: Option<f64>,
    /// Seasonal thermal COP: cooling the heat-driven machine made / driving heat given to it.
    pub cop_thermal: Option<f64>,
    /// Seasonal electric performance: cooling delivered / all electricity of the option.
    pub seasonal_electric_performance: Option<f64>,
    /// Heat collected per m² of gross collector area, kWh/m².
    pub collector_yield_kwh_m2: Option<f64>,
    pub stagnation_hours: u32,
    /// Starts of the heat-driven machine, and the driving heat they took, kWh.
    pub machine_starts: u32,
    pub startup_heat_kwh: f64,
    pub unmet_hours: u32,
    pub pump_hours: f64,
    /// Largest hourly store balance error relative to the energy stored.
    pub max_balance_error_rel: f64,
    /// Largest hourly plant first-law residual relative to the hour's largest flow.
    pub max_plant_balance_rel: f64,
    /// Water used, m³.
    pub water_m3: f64,
    /// PV electricity used on site and exported, kWh.
    pub pv_used_kwh: f64,
    pub pv_export_kwh: f64,
    /// Electricity from the grid (all electricity less own PV used), kWh.
    pub grid_kwh: f64,
    /// Hours by reason code (only codes that occurred).
    pub reason_hours: std::collections::BTreeMap<&'static str, u32>,
    // Year-only figures (`metrics.rs`; `None` in months and where undefined).
    pub primary_energy_kwh: Option<f64>,
    pub primary_energy_ratio: Option<f64>,
    pub primary_energy_savings_fraction: Option<f64>,
    /// Against the reference: its grid electricity, fuel and water less the option's.
    pub grid_saved_kwh: Option<f64>,
    pub fuel_saved_kwh: Option<f64>,
    pub water_saved_m3: Option<f64>,
    pub co2_kg: Option<f64>,
    pub co2_savings_fraction: Option<f64>,
    pub peak_electric_kw: Option<f64>,
    pub peak_hour: Option<f64>,
    pub peak_reduction_kw: Option<f64>,
    pub water_m3_per_mwh_cooling: Option<f64>,
    pub capex: Option<f64>,
    pub annual_energy_cost: Option<f64>,
    pub annualised_cost: Option<f64>,
    pub lcoc_per_mwh: Option<f64>,
    pub npv_vs_reference: Option<f64>,
    pub simple_payback_years: Option<f64>,
    pub discounted_payback_years: Option<f64>,
    pub irr: Option<f64>,
}

fn ratio(num: f64, den: f64) -> Option<f64> {
    (den > 1e-9).then(|| num / den)
}

impl Totals {
    /// Sum `records`; `gross_m2` is the option's gross collector area (0 without a field).
    pub fn of(records: &[HourRecord], gross_m2: f64) -> Totals {
        let mut t = Totals::default();
        for r in records {
            t.load_kwh += r.load_kwh;
            t.cooling_kwh += r.cooling_kwh;
            t.cooling_solar_kwh += r.cooling_solar_kwh;
            t.cooling_backup_heat_kwh += r.cooling_backup_heat_kwh;
            t.cooling_evaporative_kwh += r.cooling_evaporative_kwh;
            t.cooling_electric_kwh += r.cooling_electric_kwh;
            t.cooling_pv_kwh += r.cooling_pv_kwh;
            t.unmet_kwh += r.unmet_kwh;
            t.solar_heat_kwh += r.solar_heat_kwh;
            t.heat_to_route_kwh += r.heat_to_route_kwh;
            t.route_solar_kwh += r.route_solar_kwh;
            t.backup_heat_kwh += r.backup_heat_kwh;
            t.heat_demand_kwh += r.heat_demand_kwh;
            t.heat_demand_solar_kwh += r.heat_demand_solar_kwh;
            t.electricity_kwh += r.electricity_kwh;
            t.elec_compressor_kwh += r.elec_compressor_kwh;
            t.elec_heat_rejection_kwh += r.elec_heat_rejection_kwh;
            t.elec_pumps_kwh += r.elec_pumps_kwh;
            t.elec_air_handling_kwh += r.elec_air_handling_kwh;
            t.pump_kwh += r.pump_kwh;
            t.fuel_kwh += r.fuel_kwh;
            t.heat_rejected_kwh += r.heat_rejected_kwh;
            t.store_loss_kwh += r.store_loss_kwh;
            t.stagnation_hours += u32::from(r.stagnation);
            t.machine_starts += r.machine_starts;
            t.startup_heat_kwh += r.startup_heat_kwh;
            t.unmet_hours += u32::from(r.unmet_kwh > 1e-6);
            if r.load_kwh > t.peak_load_kw {
                t.peak_load_kw = r.load_kwh;
                t.peak_load_hour = r.hour as u32;
            }
            t.pump_hours += r.pump_hours;
            t.max_balance_error_rel = t.max_balance_error_rel.max(r.balance_error_rel);
            t.max_plant_balance_rel = t.max_plant_balance_rel.max(r.plant_balance_rel());
            t.water_m3 += r.water_m3;
            t.pv_used_kwh += r.pv_used_kwh;
            t.pv_export_kwh += r.pv_export_kwh;
            t.grid_kwh += r.grid_kwh;
            *t.reason_hours.entry(r.reason.as_str()).or_insert(0) += 1;
        }
        t.solar_share_of_cooling = ratio(t.cooling_solar_kwh + t.cooling_pv_kwh, t.load_kwh);
        t.thermal_solar_fraction = ratio(t.route_solar_kwh, t.heat_to_route_kwh);
        t.solar_fraction_heat_demand = ratio(t.heat_demand_solar_kwh, t.heat_demand_kwh);
        t.cop_thermal = ratio(
            t.cooling_solar_kwh + t.cooling_backup_heat_kwh,
            t.heat_to_route_kwh,
        );
        t.seasonal_electric_performance = ratio(t.cooling_kwh, t.electricity_kwh);
        t.collector_yield_kwh_m2 = ratio(t.solar_heat_kwh, gross_m2);
        t
    }
}

/// The guard that keeps non-finite numbers out of every output: every figure of the registry,
/// for the year and each month of each option, is finite where defined.
///
/// Errors: `Internal` naming the figure, the option and the month (a bug to report: accepted
/// input must never produce one).
pub fn check_finite(ev: &Evaluation) -> crate::Result<()> {
    for o in &ev.options {
        let periods = std::iter::once(("the year".to_string(), &o.annual)).chain(
            o.monthly
                .iter()
                .enumerate()
                .map(|(m, t)| (format!("month {}", m + 1), t)),
        );
        for (when, t) in periods {
            for f in figures::FIGURES {
                if let Some(v) = (f.get)(t)
                    && !v.is_finite()
                {
                    return Err(crate::Error::Internal(format!(
                        "{} = {v} for option {} over {when} (a bug: please report it with the scenario)",
                        f.key, o.option
                    )));
                }
            }
        }
    }
    Ok(())
}

/// What a study must not miss about an evaluation: a reference chiller that leaves load unmet
/// (every option is then compared with a plant that does less than the building needs).
pub fn warnings(ev: &Evaluation) -> Vec<String> {
    let mut w = Vec::new();
    if let Some(r) = ev.options.iter().find(|o| o.option == ev.reference) {
        let a = &r.annual;
        if a.unmet_hours > 0 {
            w.push(format!(
                "the reference `{}` leaves {:.1} MWh of cooling unmet in {} h (peak load {:.0} kW at hour {} of the year): its chiller is smaller than the building's peak, so every option is compared with a plant that does less than the building needs — size `[baseline] capacity_kw` to the peak",
                r.option,
                a.unmet_kwh / 1000.0,
                a.unmet_hours,
                a.peak_load_kw,
                a.peak_load_hour
            ));
        }
    }
    w
}

/// Monthly totals, January first.
pub fn monthly(records: &[HourRecord], gross_m2: f64) -> Vec<Totals> {
    let mut out = Vec::with_capacity(12);
    let mut start = 0;
    for m in 1..=12u32 {
        let end = records[start..]
            .iter()
            .position(|r| calendar(r.hour).0 != m)
            .map_or(records.len(), |p| start + p);
        out.push(Totals::of(&records[start..end], gross_m2));
        start = end;
    }
    out
}

/// An option's results.
#[derive(Debug, Clone)]
pub struct OptionResult {
    pub option: String,
    pub route: &'static str,
    pub description: Option<String>,
    pub gross_m2: f64,
    pub store_m3: Option<f64>,
    pub annual: Totals,
    pub monthly: Vec<Totals>,
    pub hours: Vec<HourRecord>,
}

impl OptionResult {
    /// Aggregate one option's hours.
    pub fn new(
        option: String,
        route: &'static str,
        description: Option<String>,
        gross_m2: f64,
        store_m3: Option<f64>,
        hours: Vec<HourRecord>,
    ) -> OptionResult {
        OptionResult {
            annual: Totals::of(&hours, gross_m2),
            monthly: monthly(&hours, gross_m2),
            option,
            route,
            description,
            gross_m2,
            store_m3,
            hours,
        }
    }
}

/// The whole evaluation of a scenario.
#[derive(Debug, Clone)]
pub struct Evaluation {
    pub scenario: String,
    /// Currency label for money figures.
    pub currency: String,
    pub reference: String,
    pub options: Vec<OptionResult>,
    /// Where the weather came from, and whether beam/diffuse were derived.
    pub weather_origin: String,
    pub load_origin: String,
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The guard names the figure, the option and the period of a non-finite value.
    #[test]
    fn non_finite_figures_are_refused() {
        let mut t = Totals::default();
        let ok = Evaluation {
            scenario: "s".into(),
            currency: "CU".into(),
            reference: "a".into(),
            options: vec![OptionResult::new(
                "a".into(),
                "electric",
                None,
                0.0,
                None,
                Vec::new(),
            )],
            weather_origin: String::new(),
            load_origin: String::new(),
        };
        assert!(check_finite(&ok).is_ok());
        t.cop_thermal = Some(f64::INFINITY);
        let mut bad = ok.clone();
        bad.options[0].annual = t;
        let e = check_finite(&bad).unwrap_err().to_string();
        assert!(
            e.contains("cop_thermal") && e.contains("option a") && e.contains("the year"),
            "{e}"
        );
    }
}
