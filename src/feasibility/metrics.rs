//! Year figures against the reference option: primary energy, CO2, water, peak demand and
//! money (capital, annual energy bill, annualised cost, levelised cost of cooling, NPV,
//! paybacks, IRR). They are written into each option's annual [`Totals`](super::Totals).
//!
//! Definitions: primary energy `PE = f_el·E_grid + f_fuel·Q_fuel` and fractional primary
//! energy savings `1 − PE/PE_ref` (`energy.rs`, with its sources); money by the life-cycle
//! method of `economics.rs`. Grid electricity is the option's electricity less its own PV
//! used; PV beyond the chiller's use counts as export.

use super::economics::{self, Sizes};
use super::energy::{self, EnergyUse};
use super::{Evaluation, OptionResult};
use crate::error::Result;
use crate::scenario::schema::Scenario;

/// Sizes of an option from its results and scenario section: collectors, store, the baseline
/// chiller (kept as backup in every option, common practice in solar-cooling screening), the
/// heat-driven machine at the peak cooling it delivered itself, a tower at the peak heat
/// rejected (water-cooled plants), a boiler at the peak backup heat, PV at its kWp.
pub fn sizes_of(s: &Scenario, o: &OptionResult) -> Sizes {
    let sec = &s.options[&o.option];
    let peak =
        |f: &dyn Fn(&crate::plant::HourRecord) -> f64| o.hours.iter().map(f).fold(0.0, f64::max);
    let heat_driven = sec.route.is_heat_driven();
    let wet = sec.route.is_heat_driven()
        || matches!(
            s.baseline.condenser,
            crate::components::chiller_electric::Condenser::WaterCooled
        );
    let pcm_kg = sec
        .storage
        .as_ref()
        .filter(|st| st.kind == crate::scenario::schema::StorageKind::Pcm)
        .and_then(|st| st.mass_kg)
        .unwrap_or(0.0);
    Sizes {
        collector_m2: o.gross_m2,
        storage_m3: o.store_m3.unwrap_or(0.0),
        pcm_kg,
        chiller_kw: s.baseline.capacity_kw,
        thermal_chiller_kw: if heat_driven {
            peak(&|r| r.cooling_solar_kwh + r.cooling_backup_heat_kwh)
        } else {
            0.0
        },
        tower_kw: if wet {
            peak(&|r| r.heat_rejected_kwh)
        } else {
            0.0
        },
        boiler_kw: peak(&|r| r.backup_heat_kwh),
        pv_kwp: sec.pv.as_ref().map_or(0.0, |p| p.array.kwp),
    }
}

/// Fill the year figures of every option of `ev` (in place).
pub fn apply(s: &Scenario, ev: &mut Evaluation) -> Result<()> {
    let mut figs = Vec::with_capacity(ev.options.len());
    for o in &ev.options {
        let import: Vec<f64> = o.hours.iter().map(|r| r.grid_kwh.max(0.0)).collect();
        let f = energy::assess(
            &s.energy,
            &EnergyUse {
                hourly_import_kwh: &import,
                fuel_kwh: o.annual.fuel_kwh,
                cooling_kwh: o.annual.cooling_kwh,
                heat_kwh: o.annual.heat_demand_kwh,
                water_m3: o.annual.water_m3,
                refrigerant: s.options[&o.option].refrigerant,
            },
        );
        let money = match &s.economics {
            Some(e) => {
                let export: Vec<f64> = o
                    .hours
                    .iter()
                    .map(|r| r.pv_export_kwh + (-r.grid_kwh).max(0.0))
                    .collect();
                let bill = economics::energy_cost(
                    &import,
                    &export,
                    o.annual.fuel_kwh,
                    o.annual.water_m3,
                    e,
                    s.site.jan1_weekday,
                );
                let capex = e.costs.capex(&sizes_of(s, o));
                let lc = economics::life_cycle(e, &capex, &bill, o.annual.cooling_kwh)?;
                Some((capex.total, bill.total, lc))
            }
            None => None,
        };
        figs.push((f, money));
    }
    let r = ev.options.iter().position(|o| o.option == ev.reference);
    for i in 0..ev.options.len() {
        let (f, money) = &figs[i];
        let reference = r.map(|r| &figs[r]);
        let a = &mut ev.options[i].annual;
        a.primary_energy_kwh = Some(f.primary_energy_kwh);
        a.primary_energy_ratio = f.primary_energy_ratio;
        a.co2_kg = Some(f.co2_total_kg);
        a.peak_electric_kw = f.peak.map(|p| p.kw);
        a.peak_hour = f.peak.map(|p| p.hour as f64);
        a.water_m3_per_mwh_cooling = f.water_m3_per_mwh_cooling;
        if let Some(ri) = r {
            let (g, fu, w) = {
                let ra = &ev.options[ri].annual;
                (ra.grid_kwh, ra.fuel_kwh, ra.water_m3)
            };
            let a = &mut ev.options[i].annual;
            a.grid_saved_kwh = Some(g - a.grid_kwh);
            a.fuel_saved_kwh = Some(fu - a.fuel_kwh);
            a.water_saved_m3 = Some(w - a.water_m3);
        }
        let a = &mut ev.options[i].annual;
        if let Some((rf, rmoney)) = reference {
            let sv = energy::savings(f, rf);
            a.primary_energy_savings_fraction = sv.primary_energy_savings;
            a.co2_savings_fraction = sv.co2_savings;
            a.peak_reduction_kw = Some(sv.peak_reduction_kw);
            if let (Some((capex, bill, lc)), Some((_, _, rlc)), Some(e)) =
                (money, rmoney, &s.economics)
            {
                let c = economics::compare(e, lc, rlc)?;
                a.npv_vs_reference = Some(c.npv_saving);
                a.simple_payback_years = c.simple_payback_years;
                a.discounted_payback_years = c.discounted_payback_years;
                a.irr = c.irr;
                let _ = (capex, bill);
            }
        }
        if let Some((capex, bill, lc)) = money {
            a.capex = Some(*capex);
            a.annual_energy_cost = Some(*bill);
            a.annualised_cost = Some(lc.annualised_cost);
            a.lcoc_per_mwh = lc.cost_per_mwh_cooling;
        }
    }
    Ok(())
}
