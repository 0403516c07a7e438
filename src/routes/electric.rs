//! Route `electric`: the conventional vapour-compression chiller on grid electricity — the
//! `[baseline]` chiller plant of [`super::conventional`] serving the whole load. It is what
//! every heat-driven route's backup chiller also is.

use super::conventional::Conventional;
use super::{HeatRequest, HeatSupplied, HourConditions, Reason, Route, RouteHour};
use crate::components::chiller_electric::ChillerSpec;

pub use super::conventional::MIN_CONDENSER_WATER_C;

/// The electric route.
#[derive(Debug, Clone)]
pub struct Electric {
    pub plant: Conventional,
}

impl Electric {
    /// The electric route for the baseline chiller (its tower sized as
    /// [`Conventional::new`] does).
    pub fn new(chiller: ChillerSpec) -> crate::Result<Electric> {
        Ok(Electric {
            plant: Conventional::new(chiller)?,
        })
    }
}

impl Route for Electric {
    fn kind(&self) -> &'static str {
        "electric"
    }

    fn heat_request(&self, _c: &HourConditions, _t: Option<f64>) -> Option<HeatRequest> {
        None
    }

    fn run(&self, c: &HourConditions, _t: Option<f64>, _heat: Option<HeatSupplied>) -> RouteHour {
        let load = c.load.cooling_kw();
        if load.is_nan() || load <= 0.0 {
            return RouteHour::no_load();
        }
        let h = self.plant.serve(c, load);
        let reason = if h.unmet_kwh > 1e-9 {
            Reason::CapacityLimit
        } else {
            Reason::Ok
        };
        RouteHour::from_conventional(&h, reason)
    }
}
