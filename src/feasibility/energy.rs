//! Energy and climate figures of an option: primary energy, primary energy ratio, fractional
//! primary energy savings against the reference, CO₂ (energy and refrigerant leakage), peak
//! electric demand and water use.
//!
//! Definitions (key figures of solar heating and cooling as used in the IEA SHC solar cooling
//! work; H.-M. Henning (ed.), *Solar-Assisted Air-Conditioning in Buildings*, 2nd ed.,
//! Springer 2007, and D. Mugnier, D. Neyer, S. D. White (eds.), *The Solar Cooling Design
//! Guide*, Wiley/Ernst & Sohn 2017, chapter on key figures — both from memory; J. Nowag et al.,
//! "Calculation of performance indicators for solar cooling, heating and domestic hot water
//! systems", Energy Procedia 30 (2012) 937–946, abstract read only):
//!
//! * primary energy `PE = Σ E_el · f_el + Σ Q_fuel · f_fuel`, kWh, over grid electricity
//!   imported and fuel burnt; electricity exported is NOT credited (a credit is a policy
//!   choice; leaving it out is the conservative reading);
//! * primary energy ratio `PER = (Q_cooling + Q_heat) / PE`;
//! * fractional primary energy savings `f_sav = 1 − PE_option / PE_reference`;
//! * CO₂ `m = Σ_i E_el,i · c_el,i + Q_fuel · c_fuel + m_charge · L · GWP100`, kg per year.
//!
//! Fuel figures are on the higher heating value (the boiler's basis, `components::boiler`), so
//! the fuel factors must be too.

use crate::error::{Error, Result};
use crate::validate::{in_range, list};
use crate::weather::HOURS;
use serde::Deserialize;

fn default_pef_el() -> f64 {
    2.5
}
fn default_pef_fuel() -> f64 {
    1.1
}
fn default_co2_el() -> f64 {
    0.4
}
fn default_co2_fuel() -> f64 {
    0.18
}

/// Conversion factors from delivered to primary energy and to CO₂.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EnergySpec {
    /// Primary energy per kWh of grid electricity, kWh/kWh. Default 2.5: the default
    /// coefficient of Directive 2012/27/EU (energy efficiency), Annex IV note 3 (from memory);
    /// grids differ widely (about 1.5–3.5), so set the local value.
    #[serde(default = "default_pef_el")]
    pub pe_factor_electricity: f64,
    /// Primary energy per kWh of fuel, kWh/kWh. Default 1.1, the common-practice
    /// non-renewable factor of natural gas (ISO 52000-1:2017 Annex B style tables — from
    /// memory; INDICATIVE).
    #[serde(default = "default_pef_fuel")]
    pub pe_factor_fuel: f64,
    /// CO₂ per kWh of grid electricity, kg/kWh (default 0.4, INDICATIVE: a fossil-heavy grid).
    #[serde(default = "default_co2_el")]
    pub co2_kg_per_kwh_electricity: f64,
    /// Optional hourly grid CO₂ factors, 8760 values, kg/kWh; replaces the flat factor.
    #[serde(default)]
    pub co2_kg_per_kwh_electricity_hourly: Option<Vec<f64>>,
    /// CO₂ per kWh of fuel (HHV), kg/kWh. Default 0.18: natural gas, IPCC 2006 Guidelines
    /// vol. 2 ch. 2 Table 2.2 default 56 100 kg CO₂/TJ on the net calorific value = 0.202 kg/kWh
    /// NCV, divided by a gross/net ratio of about 1.11 (both from memory).
    #[serde(default = "default_co2_fuel")]
    pub co2_kg_per_kwh_fuel: f64,
}

impl Default for EnergySpec {
    fn default() -> Self {
        EnergySpec {
            pe_factor_electricity: default_pef_el(),
            pe_factor_fuel: default_pef_fuel(),
            co2_kg_per_kwh_electricity: default_co2_el(),
            co2_kg_per_kwh_electricity_hourly: None,
            co2_kg_per_kwh_fuel: default_co2_fuel(),
        }
    }
}

impl EnergySpec {
    /// Check the fields: primary energy factors 0–10 kWh/kWh, CO₂ factors 0–3 kg/kWh, an hourly
    /// profile of exactly 8760 values each 0–3 kg/kWh. Errors name the key.
    pub fn validate(&self) -> Result<()> {
        in_range(
            "pe_factor_electricity",
            self.pe_factor_electricity,
            0.0,
            10.0,
            "primary energy per kWh of grid electricity",
        )?;
        in_range(
            "pe_factor_fuel",
            self.pe_factor_fuel,
            0.0,
            10.0,
            "primary energy per kWh of fuel",
        )?;
        in_range(
            "co2_kg_per_kwh_electricity",
            self.co2_kg_per_kwh_electricity,
            0.0,
            3.0,
            "kg CO2 per kWh of grid electricity",
        )?;
        in_range(
            "co2_kg_per_kwh_fuel",
            self.co2_kg_per_kwh_fuel,
            0.0,
            3.0,
            "kg CO2 per kWh of fuel, HHV",
        )?;
        if let Some(h) = &self.co2_kg_per_kwh_electricity_hourly {
            list(
                "co2_kg_per_kwh_electricity_hourly",
                h,
                HOURS,
                0.0,
                3.0,
                "hourly kg CO2 per kWh of grid electricity, hour 0 = 1 Jan 00:00",
            )?;
        }
        Ok(())
    }

    /// Primary energy, kWh: `PE = E_el f_el + Q_fuel f_fuel`.
    ///
    /// * `import_kwh` – grid electricity imported over the period, kWh
    /// * `fuel_kwh` – fuel burnt, kWh (HHV)
    ///
    /// Negative or non-finite inputs count as 0.
    pub fn primary_energy_kwh(&self, import_kwh: f64, fuel_kwh: f64) -> f64 {
        pos(import_kwh) * self.pe_factor_electricity + pos(fuel_kwh) * self.pe_factor_fuel
    }

    /// CO₂ from energy, kg: `Σ_i E_i c_el,i + Q_fuel c_fuel` with the hourly profile when given
    /// (hour `i` of `hourly_import_kwh` uses profile value `i mod 8760`), else the flat factor.
    ///
    /// * `hourly_import_kwh` – grid import per hour, kWh (negatives/non-finite count as 0)
    /// * `fuel_kwh` – fuel burnt over the period, kWh (HHV)
    ///
    /// Allocation-free.
    pub fn co2_energy_kg(&self, hourly_import_kwh: &[f64], fuel_kwh: f64) -> f64 {
        let el = match &self.co2_kg_per_kwh_electricity_hourly {
            Some(f) if !f.is_empty() => hourly_import_kwh
                .iter()
                .enumerate()
                .map(|(i, &e)| pos(e) * f[i % f.len()])
                .sum::<f64>(),
            _ => {
                hourly_import_kwh.iter().map(|&e| pos(e)).sum::<f64>()
                    * self.co2_kg_per_kwh_electricity
            }
        };
        el + pos(fuel_kwh) * self.co2_kg_per_kwh_fuel
    }
}

fn pos(v: f64) -> f64 {
    if v.is_finite() && v > 0.0 { v } else { 0.0 }
}

/// Refrigerant of a vapour-compression machine, for leakage emissions.
#[derive(Debug, Clone, Copy, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RefrigerantSpec {
    /// Refrigerant charge, kg.
    pub charge_kg: f64,
    /// Share of the charge lost per year, fraction (2–10 %/yr is common practice).
    pub leak_rate_per_year: f64,
    /// 100-year global warming potential, kg CO₂e per kg (e.g. R-134a 1430, IPCC AR4 as
    /// used by EU Regulation 517/2014 Annex I — from memory).
    pub gwp100: f64,
}

impl RefrigerantSpec {
    /// Check: charge 0–1e5 kg, leak rate 0–1 per year, GWP 0–30 000. Errors name the key.
    pub fn validate(&self) -> Result<()> {
        in_range(
            "charge_kg",
            self.charge_kg,
            0.0,
            1.0e5,
            "refrigerant charge, kg",
        )?;
        in_range(
            "leak_rate_per_year",
            self.leak_rate_per_year,
            0.0,
            1.0,
            "share of the charge lost per year",
        )?;
        in_range(
            "gwp100",
            self.gwp100,
            0.0,
            30_000.0,
            "100-year GWP, kg CO2e/kg",
        )
    }

    /// CO₂-equivalent of the yearly leakage, kg/yr: `m = m_charge · L · GWP100`.
    ///
    /// Source: direct-emission term of the TEWI method, EN 378-1:2016 Annex B (from memory).
    pub fn leakage_co2e_kg_per_year(&self) -> f64 {
        pos(self.charge_kg) * pos(self.leak_rate_per_year) * pos(self.gwp100)
    }
}

/// Primary energy ratio `PER = (Q_cooling + Q_heat)/PE`; `None` when `PE` ≤ 0.
///
/// * `cooling_kwh`, `heat_kwh` – useful cooling and heat delivered, kWh
/// * `pe_kwh` – primary energy, kWh ([`EnergySpec::primary_energy_kwh`])
pub fn primary_energy_ratio(cooling_kwh: f64, heat_kwh: f64, pe_kwh: f64) -> Option<f64> {
    (pe_kwh.is_finite() && pe_kwh > 0.0).then(|| (pos(cooling_kwh) + pos(heat_kwh)) / pe_kwh)
}

/// Fractional savings `f_sav = 1 − X_option / X_reference` (primary energy, CO₂, …);
/// `None` when the reference is ≤ 0 or an input non-finite. Negative when the option uses more.
pub fn fractional_savings(option: f64, reference: f64) -> Option<f64> {
    (option.is_finite() && reference.is_finite() && reference > 0.0)
        .then(|| 1.0 - option / reference)
}

/// The highest hourly electric demand of the year.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Peak {
    /// Hour of the year, 0..8760 (the first such hour when tied).
    pub hour: usize,
    /// Mean demand over that hour, kW (= kWh in the hour).
    pub kw: f64,
}

/// Highest hourly demand: `max_i E_i / 1 h`. `None` for an empty series or no positive hour.
pub fn peak_demand(hourly_kwh: &[f64]) -> Option<Peak> {
    let mut best: Option<Peak> = None;
    for (hour, &e) in hourly_kwh.iter().enumerate() {
        let kw = pos(e);
        if kw > 0.0 && best.is_none_or(|b| kw > b.kw) {
            best = Some(Peak { hour, kw });
        }
    }
    best
}

/// What an option uses in a year.
#[derive(Debug, Clone, Copy)]
pub struct EnergyUse<'a> {
    /// Grid electricity imported, per hour, kWh.
    pub hourly_import_kwh: &'a [f64],
    /// Fuel burnt over the year, kWh (HHV).
    pub fuel_kwh: f64,
    /// Useful cooling delivered, kWh.
    pub cooling_kwh: f64,
    /// Useful heat delivered (hot water, space heating), kWh.
    pub heat_kwh: f64,
    /// Water used (cooling tower make-up), m³.
    pub water_m3: f64,
    /// Refrigerant for leakage emissions (`None`: no vapour-compression machine).
    pub refrigerant: Option<RefrigerantSpec>,
}

/// Energy and climate figures of an option over a year.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct EnergyFigures {
    pub import_kwh: f64,
    pub fuel_kwh: f64,
    pub primary_energy_kwh: f64,
    pub primary_energy_ratio: Option<f64>,
    pub co2_energy_kg: f64,
    pub co2_refrigerant_kg: f64,
    pub co2_total_kg: f64,
    pub peak: Option<Peak>,
    pub water_m3: f64,
    /// Water per MWh of cooling, m³/MWh (`None` without cooling).
    pub water_m3_per_mwh_cooling: Option<f64>,
}

/// All figures of one option (see the module definitions). Allocation-free.
pub fn assess(spec: &EnergySpec, u: &EnergyUse) -> EnergyFigures {
    let import_kwh: f64 = u.hourly_import_kwh.iter().map(|&e| pos(e)).sum();
    let fuel_kwh = pos(u.fuel_kwh);
    let pe = spec.primary_energy_kwh(import_kwh, fuel_kwh);
    let co2_energy_kg = spec.co2_energy_kg(u.hourly_import_kwh, fuel_kwh);
    let co2_refrigerant_kg = u.refrigerant.map_or(0.0, |r| r.leakage_co2e_kg_per_year());
    let water_m3 = pos(u.water_m3);
    EnergyFigures {
        import_kwh,
        fuel_kwh,
        primary_energy_kwh: pe,
        primary_energy_ratio: primary_energy_ratio(u.cooling_kwh, u.heat_kwh, pe),
        co2_energy_kg,
        co2_refrigerant_kg,
        co2_total_kg: co2_energy_kg + co2_refrigerant_kg,
        peak: peak_demand(u.hourly_import_kwh),
        water_m3,
        water_m3_per_mwh_cooling: (u.cooling_kwh.is_finite() && u.cooling_kwh > 0.0)
            .then(|| water_m3 / (u.cooling_kwh / 1000.0)),
    }
}

/// An option against the reference.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct EnergySavings {
    /// `1 − PE_option/PE_reference`.
    pub primary_energy_savings: Option<f64>,
    /// `1 − CO2_option/CO2_reference` (totals incl. refrigerant).
    pub co2_savings: Option<f64>,
    /// `CO2_reference − CO2_option`, kg/yr.
    pub co2_saved_kg: f64,
    /// `peak_reference − peak_option`, kW (peaks in whatever hours they fall).
    pub peak_reduction_kw: f64,
    /// `peak_reduction_kw / peak_reference` (`None` without a reference peak).
    pub peak_reduction_fraction: Option<f64>,
}

/// Savings of `option` against `reference`.
pub fn savings(option: &EnergyFigures, reference: &EnergyFigures) -> EnergySavings {
    let p_opt = option.peak.map_or(0.0, |p| p.kw);
    let p_ref = reference.peak.map_or(0.0, |p| p.kw);
    EnergySavings {
        primary_energy_savings: fractional_savings(
            option.primary_energy_kwh,
            reference.primary_energy_kwh,
        ),
        co2_savings: fractional_savings(option.co2_total_kg, reference.co2_total_kg),
        co2_saved_kg: reference.co2_total_kg - option.co2_total_kg,
        peak_reduction_kw: p_ref - p_opt,
        peak_reduction_fraction: (p_ref > 0.0).then(|| (p_ref - p_opt) / p_ref),
    }
}

/// Check an hourly series has 8760 finite values (helper for callers that build profiles).
pub fn check_hourly(key: &str, values: &[f64]) -> Result<()> {
    if values.len() != HOURS {
        return Err(Error::input(
            key,
            format!("{} values", values.len()),
            format!("must have exactly {HOURS} hourly values"),
        ));
    }
    if let Some((i, v)) = values.iter().enumerate().find(|(_, v)| !v.is_finite()) {
        return Err(Error::input(
            format!("{key}[{i}]"),
            v,
            "must be a finite number",
        ));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand-worked example (definitions in the module doc):
    /// reference: electric chiller, 30 000 kWh cooling from 10 000 kWh grid, 5 000 kWh of heat
    /// from 5 555.6 kWh gas; option: solar thermal, 3 000 kWh grid, 2 000 kWh gas, same
    /// useful output; f_el = 2.5, f_fuel = 1.1, 0.4 and 0.18 kg/kWh.
    #[test]
    fn hand_worked_option_against_reference() {
        let spec = EnergySpec::default();
        spec.validate().unwrap();
        let mut ref_h = vec![0.0; HOURS];
        let mut opt_h = vec![0.0; HOURS];
        // 10 000 kWh as 1000 hours of 10 kWh, plus one 30 kWh peak hour
        for v in ref_h.iter_mut().take(1000) {
            *v = 10.0;
        }
        ref_h[4000] = 30.0; // total now 10 030 kWh
        for v in opt_h.iter_mut().take(1000) {
            *v = 3.0;
        }
        opt_h[4001] = 12.0; // total 3 012 kWh
        let r134a = RefrigerantSpec {
            charge_kg: 20.0,
            leak_rate_per_year: 0.05,
            gwp100: 1430.0,
        };
        let reference = assess(
            &spec,
            &EnergyUse {
                hourly_import_kwh: &ref_h,
                fuel_kwh: 5000.0 / 0.9,
                cooling_kwh: 30_000.0,
                heat_kwh: 5000.0,
                water_m3: 0.0,
                refrigerant: Some(r134a),
            },
        );
        let option = assess(
            &spec,
            &EnergyUse {
                hourly_import_kwh: &opt_h,
                fuel_kwh: 2000.0,
                cooling_kwh: 30_000.0,
                heat_kwh: 5000.0,
                water_m3: 150.0,
                refrigerant: None,
            },
        );
        // PE_ref = 10 030·2.5 + 5555.56·1.1 = 25 075 + 6111.11 = 31 186.11 kWh
        let pe_ref = 10_030.0 * 2.5 + 5000.0 / 0.9 * 1.1;
        assert!((reference.primary_energy_kwh - pe_ref).abs() < 1e-9);
        assert!((pe_ref - 31_186.111).abs() < 1e-3);
        // PE_opt = 3012·2.5 + 2000·1.1 = 7530 + 2200 = 9730 kWh
        assert!((option.primary_energy_kwh - 9730.0).abs() < 1e-9);
        // PER_opt = 35 000/9730 = 3.5971
        assert!((option.primary_energy_ratio.unwrap() - 3.597_122).abs() < 1e-6);
        // f_sav = 1 − 9730/31 186.11 = 1 − 0.311 998 = 0.688 002
        let s = savings(&option, &reference);
        assert!((s.primary_energy_savings.unwrap() - (1.0 - 9730.0 / pe_ref)).abs() < 1e-12);
        assert!((s.primary_energy_savings.unwrap() - 0.688_002).abs() < 1e-6);
        // CO2_ref = 10 030·0.4 + 5555.56·0.18 + 20·0.05·1430 = 4012 + 1000 + 1430 = 6442 kg
        assert!((reference.co2_total_kg - 6442.0).abs() < 1e-9);
        assert!((reference.co2_refrigerant_kg - 1430.0).abs() < 1e-12);
        // CO2_opt = 3012·0.4 + 2000·0.18 = 1204.8 + 360 = 1564.8 kg
        assert!((option.co2_total_kg - 1564.8).abs() < 1e-9);
        assert!((s.co2_saved_kg - 4877.2).abs() < 1e-9);
        // peaks: 30 kW at hour 4000, 12 kW at hour 4001 → 18 kW, 60 %
        assert_eq!(
            reference.peak,
            Some(Peak {
                hour: 4000,
                kw: 30.0
            })
        );
        assert_eq!(option.peak.unwrap().hour, 4001);
        assert!((s.peak_reduction_kw - 18.0).abs() < 1e-12);
        assert!((s.peak_reduction_fraction.unwrap() - 0.6).abs() < 1e-12);
        // water: 150 m³ over 30 MWh = 5 m³/MWh
        assert!((option.water_m3_per_mwh_cooling.unwrap() - 5.0).abs() < 1e-12);
    }

    #[test]
    fn hourly_co2_profile() {
        // 0.2 kg/kWh at night (0–6 h), 0.5 otherwise; 1 kWh in hours 0..24 → 6·0.2 + 18·0.5 = 10.2
        let prof: Vec<f64> = (0..HOURS)
            .map(|i| if i % 24 < 6 { 0.2 } else { 0.5 })
            .collect();
        let spec = EnergySpec {
            co2_kg_per_kwh_electricity_hourly: Some(prof),
            ..EnergySpec::default()
        };
        spec.validate().unwrap();
        let e = [1.0; 24];
        assert!((spec.co2_energy_kg(&e, 0.0) - 10.2).abs() < 1e-12);
        // wrong length is an error naming the key
        let bad = EnergySpec {
            co2_kg_per_kwh_electricity_hourly: Some(vec![0.3; 8759]),
            ..EnergySpec::default()
        };
        let msg = format!("{}", bad.validate().unwrap_err());
        assert!(msg.contains("co2_kg_per_kwh_electricity_hourly") && msg.contains("8760"));
        let neg = EnergySpec {
            pe_factor_fuel: -1.0,
            ..EnergySpec::default()
        };
        assert!(format!("{}", neg.validate().unwrap_err()).contains("pe_factor_fuel"));
    }

    #[test]
    fn degenerate_cases_are_none_not_nan() {
        assert_eq!(primary_energy_ratio(100.0, 0.0, 0.0), None);
        assert_eq!(fractional_savings(10.0, 0.0), None);
        assert_eq!(peak_demand(&[]), None);
        assert_eq!(peak_demand(&[0.0, -1.0, f64::NAN]), None);
        assert!(check_hourly("x", &[1.0; 10]).is_err());
        let r = RefrigerantSpec {
            charge_kg: 1.0,
            leak_rate_per_year: 1.5,
            gwp100: 1.0,
        };
        assert!(format!("{}", r.validate().unwrap_err()).contains("leak_rate_per_year"));
    }
}
