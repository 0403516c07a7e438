//! The conventional chiller plant: the scenario's `[baseline]` electric chiller with its heat
//! rejection and pumps. It is the reference route (`electric`), the chiller beside a PV array
//! (`pv-electric`), and the backup chiller of every heat-driven route — one path, so that the
//! same cooling costs every option the same electricity and water (like for like).
//!
//! Per hour, for a load `Q` (kW averaged over the hour):
//! * water-cooled: a wet tower (sized at the chiller's design heat rejection, capacity ×
//!   (1 + 1/COP_rated)) whose variable-speed fan holds the condenser water at the set-point
//!   `max(MIN_CONDENSER_WATER_C, t_wb + design approach)` (`Tower::run_held`); the chiller is
//!   solved at the set-point, and where full fan speed cannot hold it, solved again at the
//!   warmer water the tower gives (two fixed-point passes on the heat rejected). Tower fan
//!   energy, make-up water and the condenser-water pump (W per kW rejected) are counted;
//! * air-cooled: the chiller at the outdoor dry-bulb; its condenser fans are inside the rated
//!   COP (AHRI 550/590 rates air-cooled chillers with their condenser fans), so nothing is
//!   added;
//! * the chilled-water pump (W per kW of cooling) is counted for every kWh of chilled-water
//!   cooling, by every option.
//!
//! The heat the pumps put into the water is neglected (a few per cent of their small power),
//! for every option alike.

use super::HourConditions;
use crate::components::chiller_electric::{ChillerSpec, Condenser};
use crate::components::cooling_tower::Tower;
use crate::error::Result;

/// Lowest entering condenser-water temperature the tower control holds, °C: towers are
/// commonly controlled to a minimum of about 18 °C to protect the chiller (common practice).
pub const MIN_CONDENSER_WATER_C: f64 = 18.0;

/// The cold-water set-point every tower's variable-speed fan holds, °C: wet-bulb + the
/// tower's design approach, at least [`MIN_CONDENSER_WATER_C`].
pub fn tower_set_point_c(c: &HourConditions, design_approach_k: f64) -> f64 {
    (c.t_wb_c + design_approach_k).max(MIN_CONDENSER_WATER_C)
}

/// The conventional plant: chiller, tower (water-cooled) and pumps.
#[derive(Debug, Clone)]
pub struct Conventional {
    pub chiller: ChillerSpec,
    /// The wet tower of a water-cooled chiller; `None` air-cooled.
    pub tower: Option<Tower>,
}

/// One hour of the conventional plant (energies in kWh over the hour).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct ConventionalHour {
    pub cooling_kwh: f64,
    /// Load beyond the chiller's capacity, kWh.
    pub unmet_kwh: f64,
    /// Compressor electricity, kWh.
    pub compressor_kwh: f64,
    /// Tower fan electricity, kWh.
    pub fan_kwh: f64,
    /// Chilled-water and condenser-water pumps, kWh.
    pub pumps_kwh: f64,
    /// Heat rejected at the condenser (cooling + compressor electricity), kWh.
    pub heat_rejected_kwh: f64,
    /// Tower make-up water, m³.
    pub water_m3: f64,
    /// Condenser-side entering temperature the chiller ran at (water or air), °C.
    pub t_condenser_in_c: f64,
}

impl ConventionalHour {
    /// All electricity, kWh.
    pub fn electricity_kwh(&self) -> f64 {
        self.compressor_kwh + self.fan_kwh + self.pumps_kwh
    }
}

impl Conventional {
    /// The plant for `chiller`: a water-cooled one gets its `[baseline.tower]` sized at the
    /// design heat rejection, capacity × (1 + 1/COP_rated).
    ///
    /// Errors: the tower spec's validation errors (keys relative to `tower`).
    pub fn new(chiller: ChillerSpec) -> Result<Conventional> {
        let tower = match chiller.condenser {
            Condenser::WaterCooled => Some(
                chiller
                    .tower
                    .size(chiller.capacity_kw * (1.0 + 1.0 / chiller.cop_rated))
                    .map_err(|e| e.within("", "tower"))?,
            ),
            Condenser::AirCooled => None,
        };
        Ok(Conventional { chiller, tower })
    }

    /// The tower's cold-water set-point this hour, °C ([`tower_set_point_c`]).
    pub fn t_set_c(&self, c: &HourConditions) -> f64 {
        tower_set_point_c(c, self.chiller.tower.design_approach_k)
    }

    /// Serve `load_kw` (kW averaged over the hour) this hour (module docs). A non-positive or
    /// non-finite load gives an idle hour.
    pub fn serve(&self, c: &HourConditions, load_kw: f64) -> ConventionalHour {
        if !(load_kw.is_finite() && load_kw > 0.0) {
            return ConventionalHour {
                t_condenser_in_c: match self.tower {
                    Some(_) => self.t_set_c(c),
                    None => c.t_db_c,
                },
                ..ConventionalHour::default()
            };
        }
        let t_chw = self.chiller.t_chw_supply_c;
        let Some(tower) = &self.tower else {
            let h = self.chiller.run_hour(load_kw, c.t_db_c, t_chw);
            return ConventionalHour {
                cooling_kwh: h.cooling_kwh,
                unmet_kwh: h.unmet_kwh,
                compressor_kwh: h.electricity_kwh,
                fan_kwh: 0.0,
                pumps_kwh: self.chiller.pump_chw_w_per_kw * h.cooling_kwh / 1000.0,
                heat_rejected_kwh: h.heat_rejected_kwh,
                water_m3: 0.0,
                t_condenser_in_c: c.t_db_c,
            };
        };
        let t_set = self.t_set_c(c);
        let mut t_cw = t_set;
        let mut h = self.chiller.run_hour(load_kw, t_cw, t_chw);
        let mut tw = None;
        for _ in 0..2 {
            match tower.run_held(h.heat_rejected_kwh, c.t_wb_c, c.p_kpa, t_set) {
                Ok(r) => {
                    tw = Some(r);
                    if r.t_cold_c <= t_cw + 1e-9 {
                        break;
                    }
                    t_cw = r.t_cold_c;
                    h = self.chiller.run_hour(load_kw, t_cw, t_chw);
                }
                // Beyond what the tower can reject within 60 K of the wet-bulb (far above its
                // design): the chiller's own condenser limit, held at the set-point here.
                Err(_) => break,
            }
        }
        ConventionalHour {
            cooling_kwh: h.cooling_kwh,
            unmet_kwh: h.unmet_kwh,
            compressor_kwh: h.electricity_kwh,
            fan_kwh: tw.map_or(tower.fan_kw, |t| t.fan_kwh),
            pumps_kwh: (self.chiller.pump_chw_w_per_kw * h.cooling_kwh
                + self.chiller.pump_cw_w_per_kw * h.heat_rejected_kwh)
                / 1000.0,
            heat_rejected_kwh: h.heat_rejected_kwh,
            water_m3: tw.map_or(0.0, |t| t.water_m3),
            t_condenser_in_c: t_cw,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::load::LoadHour;

    fn hour(t_db: f64, t_wb: f64) -> HourConditions {
        HourConditions {
            hour: 0,
            t_db_c: t_db,
            w_kg_kg: 0.015,
            t_wb_c: t_wb,
            p_kpa: 101.325,
            load: LoadHour::default(),
        }
    }

    /// Water-cooled at the tower's design wet-bulb (26 °C) and the chiller's full load: the
    /// tower needs full speed to hold 30 °C, the chiller runs at 30 °C water; first law of the
    /// condenser: rejected = cooling + compressor electricity.
    #[test]
    fn water_cooled_full_load_at_design() {
        let p = Conventional::new(ChillerSpec::typical(Condenser::WaterCooled, 100.0)).unwrap();
        let h = p.serve(&hour(32.0, 26.0), 100.0);
        assert!((h.cooling_kwh - 100.0).abs() < 1e-9 && h.unmet_kwh == 0.0);
        assert!((h.heat_rejected_kwh - h.cooling_kwh - h.compressor_kwh).abs() < 1e-9);
        let cop = p
            .chiller
            .cop_full_load(h.t_condenser_in_c, p.chiller.t_chw_supply_c);
        assert!((h.compressor_kwh - 100.0 / cop).abs() < 1e-9);
        // The design heat (100 × (1 + 1/6.1)) at the set-point: fan near full speed.
        let t = p.tower.unwrap();
        assert!(
            h.fan_kwh > 0.8 * t.fan_kw && h.fan_kwh <= t.fan_kw + 1e-12,
            "{h:?}"
        );
        // Pumps: 15 W/kW on 100 kW of chilled water and on the heat rejected.
        assert!((h.pumps_kwh - 0.015 * (100.0 + h.heat_rejected_kwh)).abs() < 1e-12);
    }

    /// A small night load: the fan slows to hold the set-point, so its energy is a small
    /// fraction of design (the cube law), not the design power.
    #[test]
    fn small_load_slows_the_fan() {
        let p = Conventional::new(ChillerSpec::typical(Condenser::WaterCooled, 160.0)).unwrap();
        let h = p.serve(&hour(27.0, 24.0), 4.1);
        let t = p.tower.unwrap();
        assert!(h.fan_kwh < 0.01 * t.fan_kw, "{h:?}");
        assert!((h.t_condenser_in_c - 28.0).abs() < 1e-9);
    }

    /// Air-cooled: chiller at the dry-bulb, no tower fan or water, chilled-water pump only.
    #[test]
    fn air_cooled_has_no_tower() {
        let p = Conventional::new(ChillerSpec::typical(Condenser::AirCooled, 100.0)).unwrap();
        let h = p.serve(&hour(35.0, 24.0), 50.0);
        assert!(h.water_m3 == 0.0 && h.fan_kwh == 0.0);
        assert!((h.pumps_kwh - 0.015 * 50.0).abs() < 1e-12);
        let direct = p.chiller.run_hour(50.0, 35.0, p.chiller.t_chw_supply_c);
        assert_eq!(h.compressor_kwh, direct.electricity_kwh);
        assert_eq!(p.serve(&hour(35.0, 24.0), 0.0).electricity_kwh(), 0.0);
    }
}
