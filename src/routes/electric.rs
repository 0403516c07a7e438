//! Route `electric`: the conventional vapour-compression chiller on grid electricity.
//!
//! It meets the hour's whole cooling load (sensible + latent at the chilled-water coil) up to
//! its capacity. Its condenser sees entering condenser water from a wet cooling tower at
//! the wet-bulb plus the tower approach (water-cooled), or the outdoor dry-bulb (air-cooled).

use super::{HeatRequest, HeatSupplied, HourConditions, Reason, Route, RouteHour};
use crate::components::chiller_electric::{ChillerSpec, Condenser};

/// Lowest entering condenser-water temperature the tower control holds, °C: towers are
/// commonly controlled to a minimum of about 18 °C to protect the chiller (common practice).
pub const MIN_CONDENSER_WATER_C: f64 = 18.0;

/// The electric route.
#[derive(Debug, Clone)]
pub struct Electric {
    pub chiller: ChillerSpec,
    /// Cooling-tower approach to wet-bulb, K (water-cooled only).
    pub tower_approach_k: f64,
}

impl Electric {
    /// Condenser-side entering temperature this hour, °C.
    pub fn t_condenser_in_c(&self, c: &HourConditions) -> f64 {
        match self.chiller.condenser {
            Condenser::WaterCooled => (c.t_wb_c + self.tower_approach_k).max(MIN_CONDENSER_WATER_C),
            Condenser::AirCooled => c.t_db_c,
        }
    }
}

impl Route for Electric {
    fn kind(&self) -> &'static str {
        "electric"
    }

    fn heat_request(&self, _c: &HourConditions, _t: Option<f64>) -> Option<HeatRequest> {
        None
    }

    fn run(&self, c: &HourConditions, _heat: Option<HeatSupplied>) -> RouteHour {
        let load = c.load.cooling_kw();
        if load <= 0.0 {
            return RouteHour {
                cooling_kwh: 0.0,
                unmet_kwh: 0.0,
                electricity_kwh: 0.0,
                heat_rejected_kwh: 0.0,
                cop_thermal: None,
                cop_electric: None,
                reason: Reason::NoLoad,
            };
        }
        let h = self
            .chiller
            .run_hour(load, self.t_condenser_in_c(c), self.chiller.t_chw_supply_c);
        RouteHour {
            cooling_kwh: h.cooling_kwh,
            unmet_kwh: h.unmet_kwh,
            electricity_kwh: h.electricity_kwh,
            heat_rejected_kwh: h.heat_rejected_kwh,
            cop_thermal: None,
            cop_electric: (h.electricity_kwh > 0.0).then(|| h.cooling_kwh / h.electricity_kwh),
            reason: if h.unmet_kwh > 1e-9 {
                Reason::CapacityLimit
            } else {
                Reason::Ok
            },
        }
    }
}
