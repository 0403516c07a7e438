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
    /// The wet cooling tower of a water-cooled chiller (water use and fan electricity), sized
    /// at the chiller's design heat rejection; `None` for air-cooled.
    pub tower: Option<crate::components::cooling_tower::Tower>,
}

impl Electric {
    /// The electric route for a chiller: a water-cooled one gets a tower sized at its design
    /// heat rejection, capacity × (1 + 1/COP).
    pub fn new(chiller: ChillerSpec, tower_approach_k: f64) -> crate::Result<Electric> {
        let tower = match chiller.condenser {
            Condenser::WaterCooled => Some(
                crate::components::cooling_tower::TowerSpec {
                    design_approach_k: tower_approach_k,
                    ..Default::default()
                }
                .size(chiller.capacity_kw * (1.0 + 1.0 / chiller.cop_rated))?,
            ),
            Condenser::AirCooled => None,
        };
        Ok(Electric {
            chiller,
            tower_approach_k,
            tower,
        })
    }
}

impl Electric {
    /// Condenser-side entering temperature this hour, °C.
    ///
    /// Water-cooled with a tower: the tower's cold-water temperature (effectiveness–NTU) for
    /// the heat the chiller rejects at `load_kw` (estimated at the rated COP); without a tower
    /// model, wet-bulb + `tower_approach_k`. Either way no lower than
    /// [`MIN_CONDENSER_WATER_C`]. Air-cooled: the outdoor dry-bulb.
    pub fn t_condenser_in_c(&self, c: &HourConditions, load_kw: f64) -> f64 {
        match self.chiller.condenser {
            Condenser::WaterCooled => {
                let fixed = c.t_wb_c + self.tower_approach_k;
                let t = match &self.tower {
                    Some(t) => t
                        .t_cold_c(
                            load_kw * (1.0 + 1.0 / self.chiller.cop_rated),
                            c.t_wb_c,
                            c.p_kpa,
                        )
                        .unwrap_or(fixed),
                    None => fixed,
                };
                t.max(MIN_CONDENSER_WATER_C)
            }
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

    fn run(&self, c: &HourConditions, _t: Option<f64>, _heat: Option<HeatSupplied>) -> RouteHour {
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
                ..RouteHour::default()
            };
        }
        let h = self.chiller.run_hour(
            load,
            self.t_condenser_in_c(c, load),
            self.chiller.t_chw_supply_c,
        );
        let tower = self
            .tower
            .as_ref()
            .filter(|_| h.heat_rejected_kwh > 0.0)
            .and_then(|t| t.run(h.heat_rejected_kwh, c.t_wb_c, c.p_kpa).ok());
        let electricity_kwh = h.electricity_kwh + tower.map_or(0.0, |t| t.fan_kwh);
        RouteHour {
            cooling_kwh: h.cooling_kwh,
            unmet_kwh: h.unmet_kwh,
            electricity_kwh,
            heat_rejected_kwh: h.heat_rejected_kwh,
            cop_thermal: None,
            cop_electric: (electricity_kwh > 0.0).then(|| h.cooling_kwh / electricity_kwh),
            water_m3: tower.map_or(0.0, |t| t.water_m3),
            t_sink_c: Some(self.t_condenser_in_c(c, load)),
            reason: if h.unmet_kwh > 1e-9 {
                Reason::CapacityLimit
            } else {
                Reason::Ok
            },
            ..RouteHour::default()
        }
    }
}
