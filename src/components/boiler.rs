//! Fuel-fired backup boiler: a constant efficiency and an optional capacity limit.
//!
//! Efficiency is heat delivered per fuel energy on the fuel's HIGHER heating value (gross
//! calorific value), the basis of the scenario's `backup.boiler_efficiency` and of fuel bought
//! by gross energy. A condensing gas boiler is typically 0.85–0.95 on this basis (common
//! practice); values up to 1.1 are accepted so that an LHV-rated figure entered by mistake is
//! still plausible, but above 1.0 it cannot be HHV and the caller should say so.

use crate::error::Result;
use crate::validate::positive;

/// A backup boiler.
#[derive(Debug, Clone, Copy)]
pub struct Boiler {
    /// Heat delivered per fuel energy (HHV basis), dimensionless, in (0, 1.1].
    pub efficiency: f64,
    /// Largest heat output, kW (`None` = unlimited).
    pub capacity_kw: Option<f64>,
}

impl Boiler {
    /// Check the fields: efficiency in (0, 1.1] (HHV basis), capacity (0, 1e6] kW when given.
    /// Errors name the key `efficiency` or `capacity_kw`.
    pub fn validate(&self) -> Result<()> {
        positive(
            "efficiency",
            self.efficiency,
            1.1,
            "heat out per fuel in, HHV basis",
        )?;
        if let Some(c) = self.capacity_kw {
            positive("capacity_kw", c, 1.0e6, "boiler heat output, kW")?;
        }
        Ok(())
    }

    /// Fuel energy (HHV) to deliver `heat_kwh`, kWh: `fuel = heat / η`.
    ///
    /// * `heat_kwh` – heat delivered, kWh (≤ 0 or non-finite gives 0)
    ///
    /// Source: definition of boiler efficiency, HHV basis.
    pub fn fuel_kwh(&self, heat_kwh: f64) -> f64 {
        if heat_kwh.is_finite() && heat_kwh > 0.0 && self.efficiency > 0.0 {
            heat_kwh / self.efficiency
        } else {
            0.0
        }
    }

    /// Heat actually delivered and fuel burnt over one hour when `heat_wanted_kwh` is asked
    /// for, kWh: `delivered = min(wanted, capacity · 1 h)`, `fuel = delivered / η`.
    ///
    /// * `heat_wanted_kwh` – heat asked for during the hour, kWh (≤ 0 or non-finite gives 0)
    ///
    /// Returns `(delivered_kwh, fuel_kwh)`; with `capacity_kw = None` all is delivered.
    pub fn deliver(&self, heat_wanted_kwh: f64) -> (f64, f64) {
        let wanted = if heat_wanted_kwh.is_finite() && heat_wanted_kwh > 0.0 {
            heat_wanted_kwh
        } else {
            0.0
        };
        let delivered = match self.capacity_kw {
            Some(c) if c.is_finite() && c >= 0.0 => wanted.min(c),
            _ => wanted,
        };
        (delivered, self.fuel_kwh(delivered))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fuel_and_capacity() {
        // 90 % (HHV) boiler: 45 kWh of heat burns 50 kWh of fuel.
        let b = Boiler {
            efficiency: 0.9,
            capacity_kw: Some(30.0),
        };
        assert!((b.fuel_kwh(45.0) - 50.0).abs() < 1e-12);
        // Capacity 30 kW over one hour: 45 kWh wanted, 30 delivered, 33.33 fuel.
        let (d, f) = b.deliver(45.0);
        assert_eq!(d, 30.0);
        assert!((f - 30.0 / 0.9).abs() < 1e-12);
        let (d, f) = Boiler {
            capacity_kw: None,
            ..b
        }
        .deliver(45.0);
        assert_eq!((d, f), (45.0, 50.0));
        assert_eq!(b.deliver(f64::NAN), (0.0, 0.0));
    }

    #[test]
    fn efficiency_range() {
        for bad in [0.0, -0.5, 1.2, f64::NAN] {
            assert!(
                Boiler {
                    efficiency: bad,
                    capacity_kw: None
                }
                .validate()
                .is_err(),
                "{bad}"
            );
        }
        for ok in [0.5, 1.0, 1.1] {
            assert!(
                Boiler {
                    efficiency: ok,
                    capacity_kw: None
                }
                .validate()
                .is_ok(),
                "{ok}"
            );
        }
        assert!(
            Boiler {
                efficiency: 0.9,
                capacity_kw: Some(-1.0)
            }
            .validate()
            .is_err()
        );
    }
}
