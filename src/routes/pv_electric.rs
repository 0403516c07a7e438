//! Route `pv-electric`: the `[baseline]` electric chiller with the option's own PV array —
//! the competitor a solar-thermal route must beat on the same roof.
//!
//! The array's AC output for every hour is computed once when the option is built (plane
//! irradiance from the shared sky models, beam IAM, cell temperature and PVWatts-style DC
//! power and inverter of `components::pv`). Each hour the PV serves the chiller and the rest
//! leaves the plant's account as export (credited at the export price; a building that uses
//! it itself would value it higher — a stated simplification).

use super::electric::Electric;
use super::{HeatRequest, HeatSupplied, HourConditions, Route, RouteHour};

/// The pv-electric route.
#[derive(Debug, Clone)]
pub struct PvElectric {
    pub chiller: Electric,
    /// AC output of the array, kWh, one per hour of the year.
    pub pv_ac_kwh: Vec<f64>,
}

impl Route for PvElectric {
    fn kind(&self) -> &'static str {
        "pv-electric"
    }

    fn heat_request(&self, _c: &HourConditions, _t: Option<f64>) -> Option<HeatRequest> {
        None
    }

    fn run(&self, c: &HourConditions, t: Option<f64>, heat: Option<HeatSupplied>) -> RouteHour {
        let mut h = self.chiller.run(c, t, heat);
        let pv = self.pv_ac_kwh.get(c.hour).copied().unwrap_or(0.0).max(0.0);
        let used = pv.min(h.electricity_kwh());
        h.pv_used_kwh = used;
        h.pv_export_kwh = pv - used;
        h
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::chiller_electric::{ChillerSpec, Condenser};
    use crate::load::LoadHour;

    fn hour(i: usize, load_kw: f64) -> HourConditions {
        HourConditions {
            hour: i,
            t_db_c: 32.0,
            w_kg_kg: 0.015,
            t_wb_c: 25.0,
            p_kpa: 101.325,
            load: LoadHour {
                sensible_kw: load_kw,
                latent_kw: 0.0,
                heating_kw: 0.0,
                t_in_c: 24.0,
                ventilation_m3_h: 0.0,
            },
        }
    }

    /// Energy bookkeeping: PV used + exported = PV made; used never exceeds what the chiller
    /// takes.
    #[test]
    fn pv_is_used_then_exported() {
        let chiller = Electric::new(ChillerSpec::typical(Condenser::AirCooled, 100.0)).unwrap();
        let r = PvElectric {
            chiller,
            pv_ac_kwh: vec![0.0, 30.0, 5.0],
        };
        let h = r.run(&hour(1, 50.0), None, None);
        assert!((h.pv_used_kwh + h.pv_export_kwh - 30.0).abs() < 1e-12);
        assert!(h.pv_used_kwh <= h.electricity_kwh() + 1e-12);
        let h = r.run(&hour(2, 50.0), None, None);
        assert!((h.pv_used_kwh - 5.0).abs() < 1e-12 && h.pv_export_kwh == 0.0);
        let h = r.run(&hour(0, 0.0), None, None);
        assert_eq!(h.pv_used_kwh + h.pv_export_kwh, 0.0);
    }
}
