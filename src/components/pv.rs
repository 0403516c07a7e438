//! Photovoltaic array with its inverter: PVWatts-style DC power with a linear temperature
//! coefficient, cell temperature by the Faiman or the NOCT model, flat or PVWatts inverter.
//!
//! * DC power (A. P. Dobos, *PVWatts Version 5 Manual*, NREL/TP-6A20-62641, 2014, eq. for
//!   `P_dc`): `P_dc = P_stc · G_eff/1000 · (1 + γ (T_cell − 25 °C))`, then DC losses
//!   `P_dc,net = P_dc (1 − L_dc)` (PVWatts applies its system losses to the DC output).
//! * Cell temperature, Faiman: `T_c = T_a + G/(U0 + U1 v)` (D. Faiman, "Assessing the outdoor
//!   operating temperature of photovoltaic modules", Prog. Photovolt. 16 (2008) 307–315;
//!   the model of IEC 61853-2).
//! * Cell temperature, NOCT: `T_c = T_a + (G/800)(T_NOCT − 20)(1 − η/τα) · 9.5/(5.7 + 3.8 v_a)`,
//!   Duffie & Beckman, *Solar Engineering of Thermal Processes*, 4th ed., §23.3 (eq. 23.3.3
//!   with the wind-dependent loss coefficient 5.7 + 3.8 v, W/m²K, and 9.5 W/m²K at NOCT's 1 m/s);
//!   `v_a = 0.51 v₁₀` takes a 10 m wind to an array less than one storey high (Gilman et al.,
//!   *SAM Photovoltaic Model Technical Reference Update*, NREL/TP-6A20-67399, 2018, §10.6, as in
//!   pvlib `temperature.noct_sam` with `array_height = 1`, `mount_standoff` ≥ 3.5 in).
//! * Inverter, PVWatts: `η = η_nom/η_ref · (−0.0162 ζ − 0.0059/ζ + 0.9858)`, `ζ = P_dc/P_dc0`,
//!   `P_dc0 = P_ac0/η_nom`, `η_ref = 0.9637`, `P_ac = clip(η P_dc, 0, P_ac0)` (Dobos 2014,
//!   inverter model; as pvlib `inverter.pvwatts`). Flat: `P_ac = min(η_nom P_dc, P_ac0)`.
//!
//! Checked against pvlib 0.16.1 in `reference/pv_pvlib.csv`. The temperature models are fed
//! the same (effective) irradiance as the power model when called through
//! [`PvSpec::dc_power_kw`]: strictly they take the plane irradiance before reflection losses,
//! so cells come out slightly cooler (by the IAM loss, a few percent of the temperature rise).
//! Steady state each hour; no spectral, low-light or degradation model.

use crate::error::{Error, Result};
use crate::validate::{in_range, positive};
use serde::Deserialize;

/// PVWatts reference inverter efficiency, Dobos 2014 (and pvlib `inverter.pvwatts`).
const ETA_INV_REF: f64 = 0.9637;

/// Cell temperature model. Scenario: `cell_temp = { model = "faiman", u0 = 25.0, u1 = 6.84 }`
/// or `{ model = "noct", noct_c = 45.0 }`.
#[derive(Debug, Clone, Copy, PartialEq, Deserialize)]
#[serde(tag = "model", rename_all = "lowercase", deny_unknown_fields)]
pub enum CellTemp {
    /// Faiman (2008): `U0` W/m²K, `U1` W·s/m³K. Defaults 25.0 and 6.84, the defaults of pvlib
    /// 0.16.1 `temperature.faiman` (typical of glass-backsheet modules, open rack).
    Faiman {
        #[serde(default = "default_u0")]
        u0: f64,
        #[serde(default = "default_u1")]
        u1: f64,
    },
    /// NOCT model (D&B §23.3): nominal operating cell temperature, °C (default 45, typical of
    /// crystalline modules — common practice); `tau_alpha` default 0.9 (D&B, as pvlib).
    Noct {
        #[serde(default = "default_noct")]
        noct_c: f64,
        #[serde(default = "default_tau_alpha")]
        tau_alpha: f64,
    },
}

fn default_u0() -> f64 {
    25.0
}
fn default_u1() -> f64 {
    6.84
}
fn default_noct() -> f64 {
    45.0
}
fn default_tau_alpha() -> f64 {
    0.9
}

impl Default for CellTemp {
    fn default() -> Self {
        CellTemp::Faiman {
            u0: default_u0(),
            u1: default_u1(),
        }
    }
}

/// Inverter efficiency curve. Scenario names: `flat`, `pvwatts`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum InverterCurve {
    /// Constant efficiency `η_nom`.
    Flat,
    /// PVWatts part-load curve (Dobos 2014).
    #[default]
    Pvwatts,
}

fn default_eta_mod() -> f64 {
    0.20
}
fn default_gamma() -> f64 {
    -0.0037
}
fn default_eta_inv() -> f64 {
    0.96
}
fn default_dc_ac() -> f64 {
    1.2
}
fn default_losses() -> f64 {
    0.14
}

/// A PV array and its inverter. Demo defaults are typical of the class, not a product.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PvSpec {
    /// DC rating at STC (1000 W/m², 25 °C cell), kWp.
    pub kwp: f64,
    /// Module efficiency at STC, for the area and the NOCT model (default 0.20, typical of
    /// crystalline silicon modules).
    #[serde(default = "default_eta_mod")]
    pub module_efficiency: f64,
    /// Power temperature coefficient γ, 1/K (default −0.0037; PVWatts v5 lists −0.0047
    /// standard, −0.0035 premium, −0.0020 thin film — Dobos 2014 Table 3, from memory).
    #[serde(default = "default_gamma")]
    pub temp_coeff_per_k: f64,
    /// Cell temperature model (default Faiman with pvlib's defaults).
    #[serde(default)]
    pub cell_temp: CellTemp,
    /// Nominal inverter efficiency η_nom (default 0.96, the PVWatts v5 default).
    #[serde(default = "default_eta_inv")]
    pub inverter_efficiency: f64,
    /// Inverter curve (default `pvwatts`).
    #[serde(default)]
    pub inverter_curve: InverterCurve,
    /// Array DC rating over inverter AC rating, `kwp / P_ac0` (default 1.2, common practice).
    #[serde(default = "default_dc_ac")]
    pub dc_ac_ratio: f64,
    /// DC losses (soiling, wiring, mismatch, ...), fraction (default 0.14, the PVWatts v5
    /// default system losses — Dobos 2014, from memory).
    #[serde(default = "default_losses")]
    pub dc_losses_fraction: f64,
    /// Module area, m² (default `kwp / (η_mod · 1 kW/m²)`).
    #[serde(default)]
    pub area_m2: Option<f64>,
}

impl PvSpec {
    /// Check the fields: `kwp` (0, 1e6], module efficiency (0, 0.5), γ in [−0.01, 0] 1/K,
    /// Faiman `u0` (0, 100] W/m²K and `u1` [0, 50] W·s/m³K, NOCT 25–80 °C, τα (0, 1] and > η_mod,
    /// inverter efficiency (0, 1], DC/AC ratio 0.5–3, DC losses [0, 0.9], area (0, 1e7] m².
    /// Errors name the key.
    pub fn validate(&self) -> Result<()> {
        positive("kwp", self.kwp, 1.0e6, "DC rating at STC, kWp")?;
        crate::validate::open_range(
            "module_efficiency",
            self.module_efficiency,
            0.0,
            0.5,
            "module efficiency at STC",
        )?;
        in_range(
            "temp_coeff_per_k",
            self.temp_coeff_per_k,
            -0.01,
            0.0,
            "power temperature coefficient, 1/K",
        )?;
        match self.cell_temp {
            CellTemp::Faiman { u0, u1 } => {
                positive(
                    "cell_temp.u0",
                    u0,
                    100.0,
                    "constant heat loss factor, W/m2K",
                )?;
                in_range(
                    "cell_temp.u1",
                    u1,
                    0.0,
                    50.0,
                    "wind heat loss factor, W s/m3K",
                )?;
            }
            CellTemp::Noct { noct_c, tau_alpha } => {
                in_range(
                    "cell_temp.noct_c",
                    noct_c,
                    25.0,
                    80.0,
                    "nominal operating cell temperature, °C",
                )?;
                positive(
                    "cell_temp.tau_alpha",
                    tau_alpha,
                    1.0,
                    "transmittance-absorptance product",
                )?;
                if tau_alpha <= self.module_efficiency {
                    return Err(Error::input(
                        "cell_temp.tau_alpha",
                        tau_alpha,
                        "must exceed module_efficiency (the heat left in the cell is 1 − η/τα)",
                    ));
                }
            }
        }
        positive(
            "inverter_efficiency",
            self.inverter_efficiency,
            1.0,
            "nominal inverter efficiency",
        )?;
        in_range(
            "dc_ac_ratio",
            self.dc_ac_ratio,
            0.5,
            3.0,
            "array kWp over inverter AC kW",
        )?;
        in_range(
            "dc_losses_fraction",
            self.dc_losses_fraction,
            0.0,
            0.9,
            "share of DC output lost",
        )?;
        if let Some(a) = self.area_m2 {
            positive("area_m2", a, 1.0e7, "module area, m2")?;
        }
        Ok(())
    }

    /// Module area, m²: `area_m2` when given, else `kwp / (η_mod · 1 kW/m²)`.
    pub fn area_m2(&self) -> f64 {
        self.area_m2.unwrap_or(self.kwp / self.module_efficiency)
    }

    /// Inverter AC rating `P_ac0 = kwp / dc_ac_ratio`, kW.
    pub fn inverter_ac_kw(&self) -> f64 {
        self.kwp / self.dc_ac_ratio
    }

    /// Cell temperature, °C, by the configured model (module doc for the equations).
    ///
    /// * `poa_w_m2` – irradiance on the plane, W/m² (≤ 0 or non-finite: cell at ambient)
    /// * `t_amb_c` – ambient dry-bulb, °C
    /// * `wind_m_s` – wind speed, m/s: for Faiman as given (the speed its U1 was fitted with),
    ///   for NOCT a 10 m wind, reduced ×0.51 to array height (negatives count as 0)
    pub fn cell_temp_c(&self, poa_w_m2: f64, t_amb_c: f64, wind_m_s: f64) -> f64 {
        let g = pos(poa_w_m2);
        let v = pos(wind_m_s);
        match self.cell_temp {
            CellTemp::Faiman { u0, u1 } => t_amb_c + g / (u0 + u1 * v),
            CellTemp::Noct { noct_c, tau_alpha } => {
                let v_array = 0.51 * v;
                t_amb_c
                    + g / 800.0 * (noct_c - 20.0) * (1.0 - self.module_efficiency / tau_alpha) * 9.5
                        / (5.7 + 3.8 * v_array)
            }
        }
    }

    /// DC power before losses, kW: `P = kwp · G_eff/1000 · (1 + γ (T_c − 25))`, at least 0.
    ///
    /// * `poa_eff_w_m2` – effective irradiance on the cells (after IAM), W/m² (≤ 0: 0)
    /// * `t_cell_c` – cell temperature, °C
    ///
    /// Source: Dobos, PVWatts Version 5 Manual (2014); pvlib `pvsystem.pvwatts_dc`.
    pub fn dc_gross_kw(&self, poa_eff_w_m2: f64, t_cell_c: f64) -> f64 {
        let p = self.kwp * pos(poa_eff_w_m2) / 1000.0
            * (1.0 + self.temp_coeff_per_k * (t_cell_c - 25.0));
        pos(p)
    }

    /// DC power delivered to the inverter, kW: [`dc_gross_kw`](Self::dc_gross_kw) at the cell
    /// temperature of [`cell_temp_c`](Self::cell_temp_c), times `1 − L_dc`.
    ///
    /// * `poa_w_m2` – effective plane irradiance (after IAM), W/m²
    /// * `t_amb_c` – ambient dry-bulb, °C; `wind_m_s` – wind speed, m/s
    ///
    /// Always finite and ≥ 0 for finite `t_amb_c`. Allocation-free.
    pub fn dc_power_kw(&self, poa_w_m2: f64, t_amb_c: f64, wind_m_s: f64) -> f64 {
        let t_c = self.cell_temp_c(poa_w_m2, t_amb_c, wind_m_s);
        self.dc_gross_kw(poa_w_m2, t_c) * (1.0 - self.dc_losses_fraction)
    }

    /// AC output for a DC input, kW (module doc: flat or PVWatts curve), clipped to
    /// `[0, P_ac0]`; `dc_kw` ≤ 0 or non-finite gives 0. For the PVWatts curve the efficiency
    /// is negative below ζ ≈ 0.006, where the output is 0 (as pvlib).
    pub fn inverter_output_kw(&self, dc_kw: f64) -> f64 {
        let pdc = pos(dc_kw);
        if pdc == 0.0 {
            return 0.0;
        }
        let pac0 = self.inverter_ac_kw();
        let eta_nom = self.inverter_efficiency;
        let eta = match self.inverter_curve {
            InverterCurve::Flat => eta_nom,
            InverterCurve::Pvwatts => {
                let zeta = pdc / (pac0 / eta_nom);
                eta_nom / ETA_INV_REF * (-0.0162 * zeta - 0.0059 / zeta + 0.9858)
            }
        };
        (eta * pdc).clamp(0.0, pac0)
    }

    /// AC power of the array, kW: `inverter_output_kw(dc_power_kw(G, T_a, v))`.
    ///
    /// * `poa_w_m2` – effective plane irradiance (after IAM), W/m²
    /// * `t_amb_c` – ambient, °C; `wind_m_s` – wind speed, m/s
    pub fn ac_power_kw(&self, poa_w_m2: f64, t_amb_c: f64, wind_m_s: f64) -> f64 {
        self.inverter_output_kw(self.dc_power_kw(poa_w_m2, t_amb_c, wind_m_s))
    }
}

fn pos(v: f64) -> f64 {
    if v.is_finite() && v > 0.0 { v } else { 0.0 }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo(cell_temp: CellTemp, curve: InverterCurve) -> PvSpec {
        PvSpec {
            kwp: 10.0,
            module_efficiency: 0.20,
            temp_coeff_per_k: -0.0037,
            cell_temp,
            inverter_efficiency: 0.96,
            inverter_curve: curve,
            dc_ac_ratio: 1.2,
            dc_losses_fraction: 0.14,
            area_m2: None,
        }
    }

    #[test]
    fn stc_and_noct_conditions() {
        // At STC-like conditions with the cell held at 25 °C, P = kwp exactly.
        let pv = demo(CellTemp::default(), InverterCurve::Flat);
        pv.validate().unwrap();
        assert!((pv.dc_gross_kw(1000.0, 25.0) - 10.0).abs() < 1e-12);
        // 800 W/m², cell 45 °C: 10·0.8·(1 − 0.0037·20) = 7.408 kW
        assert!((pv.dc_gross_kw(800.0, 45.0) - 7.408).abs() < 1e-12);
        assert!((pv.area_m2() - 50.0).abs() < 1e-12);
        // NOCT model at NOCT conditions (800 W/m², 20 °C, 1 m/s at array height, η → 0):
        // T = 20 + 25·(1 − 0)·9.5/9.5 = 45 °C. With the 0.51 reduction a 10 m wind of 1/0.51.
        let noct = PvSpec {
            module_efficiency: 1e-9,
            ..demo(
                CellTemp::Noct {
                    noct_c: 45.0,
                    tau_alpha: 0.9,
                },
                InverterCurve::Flat,
            )
        };
        assert!((noct.cell_temp_c(800.0, 20.0, 1.0 / 0.51) - 45.0).abs() < 1e-6);
        // Faiman, 1000 W/m², 25 °C, 1 m/s: T = 25 + 1000/31.84 = 56.407 °C
        assert!((pv.cell_temp_c(1000.0, 25.0, 1.0) - (25.0 + 1000.0 / 31.84)).abs() < 1e-12);
    }

    #[test]
    fn inverter_flat_and_clipping() {
        let pv = demo(CellTemp::default(), InverterCurve::Flat);
        // AC limit 10/1.2 = 8.333 kW; 5 kW DC → 4.8 kW; 9.5 kW DC → clipped to 8.333
        assert!((pv.inverter_output_kw(5.0) - 4.8).abs() < 1e-12);
        assert!((pv.inverter_output_kw(9.5) - 10.0 / 1.2).abs() < 1e-12);
        assert_eq!(pv.inverter_output_kw(-1.0), 0.0);
        assert_eq!(pv.inverter_output_kw(f64::NAN), 0.0);
        // PVWatts curve at ζ = 1: η = 0.96/0.9637·(0.9858 − 0.0162 − 0.0059) = 0.96 exactly
        // (0.9637 is the curve's value at ζ = 1).
        let pw = demo(CellTemp::default(), InverterCurve::Pvwatts);
        let pdc0 = (10.0 / 1.2) / 0.96;
        assert!((pw.inverter_output_kw(pdc0) - 0.96 * pdc0).abs() < 1e-12);
        // tiny input: negative efficiency → 0
        assert_eq!(pw.inverter_output_kw(0.004), 0.0);
    }

    #[test]
    fn dark_hours_and_validation() {
        let pv = demo(CellTemp::default(), InverterCurve::Pvwatts);
        assert_eq!(pv.ac_power_kw(0.0, 10.0, 2.0), 0.0);
        assert_eq!(pv.ac_power_kw(f64::NAN, 10.0, 2.0), 0.0);
        assert_eq!(pv.cell_temp_c(-5.0, 10.0, 2.0), 10.0);
        let bad = PvSpec {
            kwp: 0.0,
            ..pv.clone()
        };
        assert!(format!("{}", bad.validate().unwrap_err()).contains("kwp"));
        let bad = PvSpec {
            temp_coeff_per_k: 0.01,
            ..pv.clone()
        };
        assert!(format!("{}", bad.validate().unwrap_err()).contains("temp_coeff_per_k"));
        let bad = PvSpec {
            cell_temp: CellTemp::Faiman { u0: 0.0, u1: 6.84 },
            ..pv.clone()
        };
        assert!(format!("{}", bad.validate().unwrap_err()).contains("cell_temp.u0"));
        // TOML form with defaults and an unknown key
        let s: PvSpec =
            toml::from_str("kwp = 5\ncell_temp = { model = \"noct\", noct_c = 47 }\n").unwrap();
        assert_eq!(
            s.cell_temp,
            CellTemp::Noct {
                noct_c: 47.0,
                tau_alpha: 0.9
            }
        );
        s.validate().unwrap();
        assert!(
            toml::from_str::<PvSpec>("kwp = 5\ncell_temp = { model = \"noct\", u0 = 1 }\n")
                .is_err()
        );
        assert!(toml::from_str::<PvSpec>("kwp = 5\nsize = 1\n").is_err());
    }
}
