//! Money: discounting, annuities, internal rate of return, payback, levelised cost, the
//! yearly energy bill (flat or time-of-use tariff, demand charge, export credit) and the
//! capital cost of an option from its sizes.
//!
//! All rates are REAL (inflation removed) and per year, as fractions (`0.05` = 5 %). Cash flows
//! are yearly, end of year, year 0 being the investment: `flows[t]` happens `t` years from now
//! and is discounted by `(1 + r)^t`. Money is in the scenario's currency units (a label only).
//!
//! Equations are the standard ones of engineering economics (compound interest factors
//! P/F, A/P, P/A): L. G. Newnan, T. G. Eschenbach, J. P. Lavelle, *Engineering Economic
//! Analysis*, Oxford Univ. Press (chs. 3–4, 6–9, compound interest tables in the appendix);
//! W. Short, D. J. Packey, T. Holt, *A Manual for the Economic Evaluation of Energy Efficiency
//! and Renewable Energy Technologies*, NREL/TP-462-5173 (1995), for the levelised cost.
//!
//! Nothing here returns NaN: degenerate rates or lifetimes are errors (they are also rejected
//! by [`EconomicsSpec::validate`]), a ratio without a denominator is `None`.

use crate::error::{Error, Result};
use crate::validate::{count, in_range, positive};
use crate::weather::calendar;
use serde::Deserialize;

// ---------------------------------------------------------------------------------------------
// Compound interest
// ---------------------------------------------------------------------------------------------

fn check_rate(rate: f64) -> Result<()> {
    if rate.is_finite() && rate > -1.0 && rate <= 10.0 {
        Ok(())
    } else {
        Err(Error::input(
            "discount_rate",
            rate,
            "must be > -1 and at most 10 (real discount rate per year, fraction: 0.05 = 5 %)",
        ))
    }
}

/// Discount factor `(1 + r)^-t` (P/F). `r > −1` is assumed (callers check).
fn pf(rate: f64, t: usize) -> f64 {
    (-(t as f64) * rate.ln_1p()).exp()
}

/// Capital recovery factor (A/P): the uniform end-of-year payment over `years` years that
/// repays 1 unit borrowed today at `rate`.
///
/// `CRF = r (1+r)^n / ((1+r)^n − 1)`; for `r = 0` (|r| < 1e-12) `CRF = 1/n`. Evaluated with
/// `expm1`/`ln_1p`, so small rates keep full precision.
///
/// * `rate` – real discount rate per year, fraction, in (−1, 10]
/// * `years` – number of yearly payments, ≥ 1
///
/// Errors: `rate` ≤ −1 or non-finite, `years` = 0 (`Error::Input`, keys `discount_rate`,
/// `lifetime_years`).
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 4 (A/P factor).
pub fn annuity_factor(rate: f64, years: u32) -> Result<f64> {
    check_rate(rate)?;
    count("lifetime_years", years, 1, 1000, "years of yearly payments")?;
    let n = f64::from(years);
    if rate.abs() < 1e-12 {
        return Ok(1.0 / n);
    }
    // (1+r)^n − 1 = expm1(n ln(1+r)); r(1+r)^n/((1+r)^n − 1) = r / (1 − (1+r)^-n)
    let g = (n * rate.ln_1p()).exp_m1();
    Ok(rate * (1.0 + g) / g)
}

/// Net present value of yearly cash flows: `NPV = Σ_t F_t / (1 + r)^t`, `t = 0, 1, …`
/// (`cash_flows[0]` is not discounted; the numpy-financial `npv` convention).
///
/// * `rate` – real discount rate per year, fraction, in (−1, 10]
/// * `cash_flows` – money per year, year 0 first (any sign; non-finite values are errors)
///
/// Empty flows give 0. Errors: bad `rate`, a non-finite flow.
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 5 (present
/// worth analysis).
pub fn npv(rate: f64, cash_flows: &[f64]) -> Result<f64> {
    check_rate(rate)?;
    if let Some((t, v)) = cash_flows.iter().enumerate().find(|(_, v)| !v.is_finite()) {
        return Err(Error::input(
            format!("cash_flows[{t}]"),
            v,
            "must be a finite amount of money",
        ));
    }
    Ok(npv_unchecked(rate, cash_flows))
}

fn npv_unchecked(rate: f64, cash_flows: &[f64]) -> f64 {
    // Horner in v = 1/(1+r): Σ F_t v^t
    let v = 1.0 / (1.0 + rate);
    cash_flows.iter().rev().fold(0.0, |acc, f| acc * v + f)
}

/// Internal rate of return: the rate `r` with `NPV(r) = 0`.
///
/// Searched in (−0.99, 10): NPV is evaluated on a grid of 700 points even in `ln(1 + r)`;
/// every sign change is refined with Brent's method (`crate::num::brent`, tolerance 1e-12)
/// and the root closest to zero is returned (numpy-financial's choice when several exist).
///
/// * `cash_flows` – money per year, year 0 first (usually an outlay then returns)
///
/// Returns `None` when the flows have no sign change, contain a non-finite value, or NPV has
/// no root in the range.
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 7 (rate of
/// return analysis).
pub fn irr(cash_flows: &[f64]) -> Option<f64> {
    if cash_flows.iter().any(|v| !v.is_finite()) {
        return None;
    }
    let has_pos = cash_flows.iter().any(|&v| v > 0.0);
    let has_neg = cash_flows.iter().any(|&v| v < 0.0);
    if !(has_pos && has_neg) {
        return None;
    }
    const N: usize = 700;
    let (x_lo, x_hi) = ((-0.99f64).ln_1p(), 10f64.ln_1p());
    let rate_at = |k: usize| (x_lo + (x_hi - x_lo) * k as f64 / N as f64).exp_m1();
    let f = |r: f64| npv_unchecked(r, cash_flows);
    let mut best: Option<f64> = None;
    let mut keep = |r: f64| {
        if best.is_none_or(|b| r.abs() < b.abs()) {
            best = Some(r);
        }
    };
    let mut r0 = rate_at(0);
    let mut f0 = f(r0);
    for k in 1..=N {
        let r1 = rate_at(k);
        let f1 = f(r1);
        if f0 == 0.0 {
            keep(r0);
        } else if f0.is_finite()
            && f1.is_finite()
            && f0 * f1 < 0.0
            && let Ok(r) = crate::num::brent("irr", r0, r1, 1e-12, f)
        {
            keep(r);
        }
        r0 = r1;
        f0 = f1;
    }
    if f0 == 0.0 {
        keep(r0);
    }
    best
}

/// Simple payback time, years: `extra_capex / annual_saving`.
///
/// * `extra_capex` – extra investment over the reference, money (≤ 0: pays back at once)
/// * `annual_saving` – yearly running-cost saving, money per year
///
/// Returns `Some(0.0)` when there is no extra investment, `None` when the saving is ≤ 0 (never
/// pays back) or an input is non-finite.
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 9 (payback period).
pub fn simple_payback_years(extra_capex: f64, annual_saving: f64) -> Option<f64> {
    if !extra_capex.is_finite() || !annual_saving.is_finite() {
        return None;
    }
    if extra_capex <= 0.0 {
        Some(0.0)
    } else if annual_saving > 0.0 {
        Some(extra_capex / annual_saving)
    } else {
        None
    }
}

/// Discounted payback time, years: the first time the cumulative discounted savings repay the
/// extra investment, `−C + Σ_{t=1}^{T} S_t/(1+r)^t ≥ 0`, with linear interpolation inside the
/// year where the balance turns (a saving arrives evenly over its year for this purpose).
///
/// * `rate` – real discount rate per year, fraction, in (−1, 10]
/// * `extra_capex` – extra investment at year 0, money (≤ 0 gives `Some(0.0)`)
/// * `annual_savings_by_year` – saving in years 1, 2, …, money
///
/// Returns `Ok(None)` when the savings listed never repay the investment (or one is
/// non-finite). Errors: bad `rate`.
///
/// Source: Newnan, Eschenbach & Lavelle, *Engineering Economic Analysis*, ch. 9 (discounted
/// payback).
pub fn discounted_payback_years(
    rate: f64,
    extra_capex: f64,
    annual_savings_by_year: &[f64],
) -> Result<Option<f64>> {
    check_rate(rate)?;
    if !extra_capex.is_finite() {
        return Ok(None);
    }
    if extra_capex <= 0.0 {
        return Ok(Some(0.0));
    }
    let mut balance = -extra_capex;
    for (i, s) in annual_savings_by_year.iter().enumerate() {
        if !s.is_finite() {
            return Ok(None);
        }
        let d = s * pf(rate, i + 1);
        if d > 0.0 && balance + d >= 0.0 {
            return Ok(Some(i as f64 + (-balance) / d));
        }
        balance += d;
    }
    Ok(None)
}

/// Levelised cost per unit of output: the equivalent uniform annual cost over the output of a
/// year, `LC = (capex + Σ_{t=1}^{n} C_t/(1+r)^t) · CRF(r, n) / Q`.
///
/// With constant yearly cost `C` this is `(capex · CRF + C)/Q`. Equal to the present value of
/// costs over the present value of a constant output `Q` each year.
///
/// * `rate` – real discount rate per year, fraction, in (−1, 10]
/// * `years` – lifetime, years, ≥ 1
/// * `capex` – investment at year 0, money
/// * `annual_costs_by_year` – running costs of years 1, 2, …, money; missing years count as 0,
///   entries after `years` are ignored
/// * `annual_output` – output per year in the unit the cost is wanted per (MWh of cooling)
///
/// Returns `Ok(None)` when `annual_output` ≤ 0 or non-finite. Errors: bad `rate` or `years`,
/// a non-finite cost.
///
/// Source: Short, Packey & Holt, NREL/TP-462-5173 (1995), §4 levelised cost of energy;
/// Newnan et al. ch. 6 (equivalent uniform annual cost).
pub fn levelised_cost(
    rate: f64,
    years: u32,
    capex: f64,
    annual_costs_by_year: &[f64],
    annual_output: f64,
) -> Result<Option<f64>> {
    let crf = annuity_factor(rate, years)?;
    if !capex.is_finite() {
        return Err(Error::input(
            "capex",
            capex,
            "must be a finite amount of money",
        ));
    }
    let mut pv = capex;
    for (i, c) in annual_costs_by_year.iter().take(years as usize).enumerate() {
        if !c.is_finite() {
            return Err(Error::input(
                format!("annual_costs_by_year[{i}]"),
                c,
                "must be a finite amount of money",
            ));
        }
        pv += c * pf(rate, i + 1);
    }
    if !(annual_output.is_finite() && annual_output > 0.0) {
        return Ok(None);
    }
    Ok(Some(pv * crf / annual_output))
}

// ---------------------------------------------------------------------------------------------
// Tariff and scenario inputs
// ---------------------------------------------------------------------------------------------

/// Which days a time-of-use period applies to. Scenario names: `all`, `weekdays`, `weekends`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum TouDays {
    /// Every day.
    #[default]
    All,
    /// Monday to Friday.
    Weekdays,
    /// Saturday and Sunday.
    Weekends,
}

/// One period of a time-of-use electricity tariff.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TouPeriod {
    /// `[start, end)` hours of the day, local standard time, 0–24; `start > end` wraps past
    /// midnight (`[22, 6]` is 22:00–06:00).
    pub hours: [u32; 2],
    /// Energy price in this period, money per kWh.
    pub price_per_kwh: f64,
    /// Days it applies to (default all).
    #[serde(default)]
    pub days: TouDays,
}

impl TouPeriod {
    fn covers(&self, h: u32) -> bool {
        let [s, e] = self.hours;
        if s < e {
            s <= h && h < e
        } else {
            h >= s || h < e
        }
    }
}

fn default_currency() -> String {
    "CU".to_string()
}

/// The money side of a scenario. Prices are of the first year, real; escalations are real
/// yearly rates of change on top of general inflation.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EconomicsSpec {
    /// Currency label for the outputs (default `CU`, "currency units"); no conversion is made.
    #[serde(default = "default_currency")]
    pub currency: String,
    /// Real discount rate per year, fraction (0.05 = 5 %), > −1.
    pub discount_rate: f64,
    /// Economic lifetime, years, 1–100.
    pub lifetime_years: u32,
    /// Real escalation of electricity prices per year, fraction (default 0).
    #[serde(default)]
    pub escalation_electricity: f64,
    /// Real escalation of the fuel price per year, fraction (default 0).
    #[serde(default)]
    pub escalation_fuel: f64,
    /// Flat electricity price, money per kWh imported. Give this or `tou`, not both.
    #[serde(default)]
    pub electricity_price_per_kwh: Option<f64>,
    /// Fuel price, money per kWh of fuel (HHV, the basis of the boiler's fuel figure).
    pub fuel_price_per_kwh: f64,
    /// Water price, money per m³ (default 0).
    #[serde(default)]
    pub water_price_per_m3: f64,
    /// Credit for electricity exported, money per kWh (default 0).
    #[serde(default)]
    pub export_price_per_kwh: f64,
    /// Demand charge, money per kW of the month's highest hourly import, per month (default 0).
    #[serde(default)]
    pub demand_charge_per_kw_month: f64,
    /// Time-of-use tariff: periods covering every hour of every day exactly once.
    #[serde(default)]
    pub tou: Option<Vec<TouPeriod>>,
    /// Capital and maintenance cost functions (defaults INDICATIVE, see [`CostFunctions`]).
    #[serde(default)]
    pub costs: CostFunctions,
}

const PRICE_MAX: f64 = 1.0e6;

impl EconomicsSpec {
    /// Check every field. Errors name the key: `discount_rate` ≤ −1 (or > 10), `lifetime_years`
    /// 0 (or > 100), escalations outside [−0.5, 0.5], negative prices, no electricity price or
    /// both a flat price and `tou`, a `tou` table that leaves an hour uncovered or covers one
    /// twice (on weekdays or weekends), and the cost functions.
    pub fn validate(&self) -> Result<()> {
        check_rate(self.discount_rate)?;
        count(
            "lifetime_years",
            self.lifetime_years,
            1,
            100,
            "economic lifetime, years",
        )?;
        in_range(
            "escalation_electricity",
            self.escalation_electricity,
            -0.5,
            0.5,
            "real yearly change of electricity prices, fraction",
        )?;
        in_range(
            "escalation_fuel",
            self.escalation_fuel,
            -0.5,
            0.5,
            "real yearly change of the fuel price, fraction",
        )?;
        let price = |key: &str, v: f64, what: &str| in_range(key, v, 0.0, PRICE_MAX, what);
        price(
            "fuel_price_per_kwh",
            self.fuel_price_per_kwh,
            "money per kWh of fuel",
        )?;
        price(
            "water_price_per_m3",
            self.water_price_per_m3,
            "money per m³ of water",
        )?;
        price(
            "export_price_per_kwh",
            self.export_price_per_kwh,
            "money per kWh exported",
        )?;
        price(
            "demand_charge_per_kw_month",
            self.demand_charge_per_kw_month,
            "money per kW of monthly peak import",
        )?;
        match (&self.electricity_price_per_kwh, &self.tou) {
            (Some(p), None) => price("electricity_price_per_kwh", *p, "money per kWh imported")?,
            (None, Some(tou)) => validate_tou(tou)?,
            (Some(_), Some(_)) => {
                return Err(Error::input(
                    "electricity_price_per_kwh",
                    "given together with tou",
                    "give either a flat electricity_price_per_kwh or a tou table, not both",
                ));
            }
            (None, None) => {
                return Err(Error::input(
                    "electricity_price_per_kwh",
                    "missing",
                    "give a flat electricity_price_per_kwh or a tou table",
                ));
            }
        }
        self.costs.validate().map_err(|e| e.within("", "costs"))
    }

    /// Electricity price by `[weekday, weekend][hour of day]`, money per kWh (flat price in
    /// every cell without a `tou` table). Assumes a validated spec.
    pub fn price_table(&self) -> [[f64; 24]; 2] {
        let mut t = [[self.electricity_price_per_kwh.unwrap_or(0.0); 24]; 2];
        if let Some(tou) = &self.tou {
            for (d, row) in t.iter_mut().enumerate() {
                let skip = if d == 0 {
                    TouDays::Weekends
                } else {
                    TouDays::Weekdays
                };
                for p in tou.iter().filter(|p| p.days != skip) {
                    for (h, cell) in row.iter_mut().enumerate() {
                        if p.covers(h as u32) {
                            *cell = p.price_per_kwh;
                        }
                    }
                }
            }
        }
        t
    }
}

fn validate_tou(tou: &[TouPeriod]) -> Result<()> {
    if tou.is_empty() {
        return Err(Error::input(
            "tou",
            "an empty list",
            "must list periods covering all 24 hours",
        ));
    }
    for (i, p) in tou.iter().enumerate() {
        let [s, e] = p.hours;
        if s > 23 || e > 24 || s == e {
            return Err(Error::input(
                format!("tou[{i}].hours"),
                format!("[{s}, {e}]"),
                "must be [start, end) with start 0–23, end 0–24 and start ≠ end (start > end wraps past midnight)",
            ));
        }
        in_range(
            &format!("tou[{i}].price_per_kwh"),
            p.price_per_kwh,
            0.0,
            PRICE_MAX,
            "money per kWh imported",
        )?;
    }
    for (label, skip) in [
        ("weekdays", TouDays::Weekends),
        ("weekends", TouDays::Weekdays),
    ] {
        for h in 0..24u32 {
            let n = tou.iter().filter(|p| p.days != skip && p.covers(h)).count();
            if n != 1 {
                return Err(Error::input(
                    "tou",
                    format!("hour {h}:00–{}:00 on {label} covered by {n} periods", h + 1),
                    "periods must cover every hour of the day exactly once (no gap, no overlap)",
                ));
            }
        }
    }
    Ok(())
}

/// One year's bill for energy and water, money.
#[derive(Debug, Clone, Copy, Default, PartialEq, serde::Serialize)]
pub struct CostBreakdown {
    /// Electricity imported × its price (flat or time of use).
    pub energy: f64,
    /// Σ over months of (highest hourly import, kW) × demand charge.
    pub demand: f64,
    /// Fuel × fuel price.
    pub fuel: f64,
    /// Water × water price.
    pub water: f64,
    /// Electricity exported × export price (subtracted in `total`).
    pub export_credit: f64,
    /// `energy + demand + fuel + water − export_credit`.
    pub total: f64,
}

/// The first year's energy and water bill from hourly import/export.
///
/// `energy = Σ_i E_imp,i p(day type, hour)`, `demand = Σ_months max_i∈month(E_imp,i / 1 h) · c_d`,
/// `fuel = Q_fuel p_fuel`, `water = V p_w`, `export_credit = Σ_i E_exp,i p_exp`.
///
/// * `import_kwh` – grid electricity imported in each hour of the year, kWh (hour 0 = 1 Jan
///   00:00–01:00); negative or non-finite values count as 0
/// * `export_kwh` – electricity exported each hour, kWh (may be empty or shorter: missing hours 0)
/// * `fuel_kwh` – fuel over the year, kWh (HHV); `water_m3` – water over the year, m³
/// * `spec` – a validated [`EconomicsSpec`]
/// * `jan1_weekday` – weekday of 1 January, 0 = Monday … 6 = Sunday (taken modulo 7);
///   Saturday and Sunday are weekend days, public holidays are not modelled
///
/// The demand charge uses hourly means; a tariff metered on 15-min peaks would bill more.
/// Allocation-free.
pub fn energy_cost(
    import_kwh: &[f64],
    export_kwh: &[f64],
    fuel_kwh: f64,
    water_m3: f64,
    spec: &EconomicsSpec,
    jan1_weekday: u32,
) -> CostBreakdown {
    let clean = |v: f64| if v.is_finite() && v > 0.0 { v } else { 0.0 };
    let prices = spec.price_table();
    let mut energy = 0.0;
    let mut month_peak = [0.0f64; 12];
    for (i, &e) in import_kwh.iter().enumerate() {
        let e = clean(e);
        let (month, _, hour, doy) = calendar(i);
        let weekday = (jan1_weekday % 7 + (doy - 1)) % 7;
        let day_type = usize::from(weekday >= 5);
        energy += e * prices[day_type][hour as usize];
        let m = (month - 1) as usize;
        month_peak[m] = month_peak[m].max(e);
    }
    let demand = month_peak.iter().sum::<f64>() * spec.demand_charge_per_kw_month;
    let export_credit =
        export_kwh.iter().map(|&e| clean(e)).sum::<f64>() * spec.export_price_per_kwh;
    let fuel = clean(fuel_kwh) * spec.fuel_price_per_kwh;
    let water = clean(water_m3) * spec.water_price_per_m3;
    CostBreakdown {
        energy,
        demand,
        fuel,
        water,
        export_credit,
        total: energy + demand + fuel + water - export_credit,
    }
}

// ---------------------------------------------------------------------------------------------
// Capital cost
// ---------------------------------------------------------------------------------------------

/// A priced item of an option. Scenario names: `collector`, `storage`, `pcm`, `chiller`,
/// `thermal-chiller`, `tower`, `boiler`, `pv`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Item {
    Collector,
    Storage,
    Pcm,
    /// Electric vapour-compression chiller.
    Chiller,
    /// Heat-driven chiller (absorption or similar).
    ThermalChiller,
    Tower,
    Boiler,
    Pv,
}

impl Item {
    /// Every item, in the order of [`Capex::by_item`].
    pub const ALL: [Item; 8] = [
        Item::Collector,
        Item::Storage,
        Item::Pcm,
        Item::Chiller,
        Item::ThermalChiller,
        Item::Tower,
        Item::Boiler,
        Item::Pv,
    ];

    fn index(self) -> usize {
        self as usize
    }
}

/// A replacement during the lifetime: `fraction` of the item's equipment cost spent every
/// `after_years` years (at `after_years`, `2·after_years`, … while before the last year).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Replacement {
    pub item: Item,
    pub after_years: u32,
    pub fraction: f64,
}

/// Capital cost functions. Every default is INDICATIVE: an invented round number of the right
/// order for screening, not a quotation; replace them with local prices.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct CostFunctions {
    /// Solar collector field, money per m² gross (INDICATIVE default 300).
    pub collector_per_m2: f64,
    /// Hot-water store, money per m³ (INDICATIVE default 1000).
    pub storage_per_m3: f64,
    /// Phase-change material, money per kg (INDICATIVE default 5).
    pub pcm_per_kg: f64,
    /// Electric chiller, money per kW of cooling at the reference size (INDICATIVE default 300).
    pub chiller_per_kw: f64,
    /// Heat-driven chiller, money per kW of cooling at the reference size (INDICATIVE default 600).
    pub thermal_chiller_per_kw: f64,
    /// Size exponent of both chillers, `cost = c · S_ref · (S/S_ref)^n` (INDICATIVE default 0.7;
    /// economy-of-scale exponents of 0.6–0.8 are common practice).
    pub chiller_size_exponent: f64,
    /// Reference size of the chiller cost, kW (INDICATIVE default 100).
    pub chiller_reference_kw: f64,
    /// Cooling tower, money per kW rejected (INDICATIVE default 80).
    pub tower_per_kw: f64,
    /// Backup boiler, money per kW (INDICATIVE default 100).
    pub boiler_per_kw: f64,
    /// PV array incl. inverter, money per kWp (INDICATIVE default 1000).
    pub pv_per_kwp: f64,
    /// Installation, fraction of equipment (INDICATIVE default 0.25).
    pub installation_fraction: f64,
    /// Design and engineering, fraction of equipment + installation (INDICATIVE default 0.10).
    pub design_fraction: f64,
    /// Contingency, fraction of equipment + installation + design (INDICATIVE default 0.10).
    pub contingency_fraction: f64,
    /// Operation and maintenance per year, fraction of the total capital cost (INDICATIVE
    /// default 0.02).
    pub om_fraction_per_year: f64,
    /// Replacements during the lifetime (default none).
    pub replacements: Vec<Replacement>,
}

impl Default for CostFunctions {
    fn default() -> Self {
        CostFunctions {
            collector_per_m2: 300.0,
            storage_per_m3: 1000.0,
            pcm_per_kg: 5.0,
            chiller_per_kw: 300.0,
            thermal_chiller_per_kw: 600.0,
            chiller_size_exponent: 0.7,
            chiller_reference_kw: 100.0,
            tower_per_kw: 80.0,
            boiler_per_kw: 100.0,
            pv_per_kwp: 1000.0,
            installation_fraction: 0.25,
            design_fraction: 0.10,
            contingency_fraction: 0.10,
            om_fraction_per_year: 0.02,
            replacements: Vec::new(),
        }
    }
}

/// Sizes of an option's priced items (0 = not present).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Sizes {
    pub collector_m2: f64,
    pub storage_m3: f64,
    pub pcm_kg: f64,
    pub chiller_kw: f64,
    pub thermal_chiller_kw: f64,
    pub tower_kw: f64,
    pub boiler_kw: f64,
    pub pv_kwp: f64,
}

/// Capital cost of an option, money.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Capex {
    /// Equipment cost by item, in the order of [`Item::ALL`].
    pub by_item: [f64; 8],
    pub equipment: f64,
    pub installation: f64,
    pub design: f64,
    pub contingency: f64,
    /// `equipment + installation + design + contingency`.
    pub total: f64,
}

impl CostFunctions {
    /// Check the fields: unit costs 0–1e7, size exponent (0, 1.5], reference size (0, 1e6] kW,
    /// fractions 0–2 (O&M 0–0.5 per year), replacements every 1–100 years at a fraction 0–2.
    pub fn validate(&self) -> Result<()> {
        for (key, v) in [
            ("collector_per_m2", self.collector_per_m2),
            ("storage_per_m3", self.storage_per_m3),
            ("pcm_per_kg", self.pcm_per_kg),
            ("chiller_per_kw", self.chiller_per_kw),
            ("thermal_chiller_per_kw", self.thermal_chiller_per_kw),
            ("tower_per_kw", self.tower_per_kw),
            ("boiler_per_kw", self.boiler_per_kw),
            ("pv_per_kwp", self.pv_per_kwp),
        ] {
            in_range(key, v, 0.0, 1.0e7, "money per unit size")?;
        }
        positive(
            "chiller_size_exponent",
            self.chiller_size_exponent,
            1.5,
            "economy-of-scale exponent",
        )?;
        positive(
            "chiller_reference_kw",
            self.chiller_reference_kw,
            1.0e6,
            "size the chiller unit costs refer to, kW",
        )?;
        for (key, v) in [
            ("installation_fraction", self.installation_fraction),
            ("design_fraction", self.design_fraction),
            ("contingency_fraction", self.contingency_fraction),
        ] {
            in_range(key, v, 0.0, 2.0, "fraction of the cost it is added to")?;
        }
        in_range(
            "om_fraction_per_year",
            self.om_fraction_per_year,
            0.0,
            0.5,
            "yearly O&M, fraction of the capital cost",
        )?;
        for (i, r) in self.replacements.iter().enumerate() {
            count(
                &format!("replacements[{i}].after_years"),
                r.after_years,
                1,
                100,
                "years between replacements",
            )?;
            in_range(
                &format!("replacements[{i}].fraction"),
                r.fraction,
                0.0,
                2.0,
                "fraction of the item's equipment cost",
            )?;
        }
        Ok(())
    }

    /// Capital cost of an option of the given sizes.
    ///
    /// Linear items: `cost = unit cost × size`. Chillers: `cost = c · S_ref · (S/S_ref)^n`
    /// (the economy-of-scale power law; Peters, Timmerhaus & West, *Plant Design and Economics
    /// for Chemical Engineers*, 5th ed., ch. 6, the "six-tenths rule" — from memory).
    /// `installation = f_i · equipment`, `design = f_d · (equipment + installation)`,
    /// `contingency = f_c · (equipment + installation + design)`.
    /// Sizes ≤ 0 or non-finite cost nothing. Assumes validated cost functions.
    pub fn capex(&self, s: &Sizes) -> Capex {
        let pos = |v: f64| if v.is_finite() && v > 0.0 { v } else { 0.0 };
        let scaled = |c: f64, size: f64| {
            let size = pos(size);
            if size == 0.0 {
                0.0
            } else {
                c * self.chiller_reference_kw
                    * (size / self.chiller_reference_kw).powf(self.chiller_size_exponent)
            }
        };
        let by_item = [
            self.collector_per_m2 * pos(s.collector_m2),
            self.storage_per_m3 * pos(s.storage_m3),
            self.pcm_per_kg * pos(s.pcm_kg),
            scaled(self.chiller_per_kw, s.chiller_kw),
            scaled(self.thermal_chiller_per_kw, s.thermal_chiller_kw),
            self.tower_per_kw * pos(s.tower_kw),
            self.boiler_per_kw * pos(s.boiler_kw),
            self.pv_per_kwp * pos(s.pv_kwp),
        ];
        let equipment: f64 = by_item.iter().sum();
        let installation = self.installation_fraction * equipment;
        let design = self.design_fraction * (equipment + installation);
        let contingency = self.contingency_fraction * (equipment + installation + design);
        Capex {
            by_item,
            equipment,
            installation,
            design,
            contingency,
            total: equipment + installation + design + contingency,
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Life cycle
// ---------------------------------------------------------------------------------------------

/// Costs of an option over its life, money.
#[derive(Debug, Clone, PartialEq)]
pub struct LifeCycle {
    /// Cost in years 0..=lifetime (year 0 = capital; positive = money spent).
    pub flows: Vec<f64>,
    /// Present value of `flows`.
    pub present_cost: f64,
    /// Present cost × CRF: the equivalent uniform yearly cost.
    pub annualised_cost: f64,
    /// Annualised cost per MWh of cooling delivered (`None` without cooling).
    pub cost_per_mwh_cooling: Option<f64>,
}

/// Yearly costs of an option: year 0 the capital cost; year `t ≥ 1`:
/// `O&M + (energy + demand − export)(1+e_el)^(t−1) + fuel (1+e_f)^(t−1) + water + replacements`,
/// where replacements fall in years `k · after_years < lifetime`. No residual value at the end.
///
/// * `spec` – validated economics; `capex` – from [`CostFunctions::capex`]
/// * `year1` – the first year's bill from [`energy_cost`]
/// * `cooling_kwh` – cooling delivered per year, kWh (for the cost per MWh)
///
/// Errors only for an unvalidated spec (bad rate or lifetime).
///
/// Source: Newnan et al., *Engineering Economic Analysis*, ch. 5–6 (present worth, EUAC);
/// Short, Packey & Holt (1995) §4.
pub fn life_cycle(
    spec: &EconomicsSpec,
    capex: &Capex,
    year1: &CostBreakdown,
    cooling_kwh: f64,
) -> Result<LifeCycle> {
    let n = spec.lifetime_years;
    let crf = annuity_factor(spec.discount_rate, n)?;
    let om = spec.costs.om_fraction_per_year * capex.total;
    let elec = year1.energy + year1.demand - year1.export_credit;
    let mut flows = Vec::with_capacity(n as usize + 1);
    flows.push(capex.total);
    for t in 1..=n {
        let k = f64::from(t - 1);
        let mut c = om
            + elec * (1.0 + spec.escalation_electricity).powf(k)
            + year1.fuel * (1.0 + spec.escalation_fuel).powf(k)
            + year1.water;
        for r in &spec.costs.replacements {
            if r.after_years > 0 && t % r.after_years == 0 && t < n {
                c += r.fraction * capex.by_item[r.item.index()];
            }
        }
        flows.push(c);
    }
    let present_cost = npv(spec.discount_rate, &flows)?;
    let annualised_cost = present_cost * crf;
    let cost_per_mwh_cooling = (cooling_kwh.is_finite() && cooling_kwh > 0.0)
        .then(|| annualised_cost / (cooling_kwh / 1000.0));
    Ok(LifeCycle {
        flows,
        present_cost,
        annualised_cost,
        cost_per_mwh_cooling,
    })
}

/// An option against the reference, money.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Comparison {
    /// Option capital − reference capital.
    pub extra_capex: f64,
    /// Reference cost − option cost in year 1.
    pub first_year_saving: f64,
    /// Present value of (reference − option) flows, year 0 included: > 0 means the option pays.
    pub npv_saving: f64,
    /// Rate at which `npv_saving` is zero.
    pub irr: Option<f64>,
    pub simple_payback_years: Option<f64>,
    pub discounted_payback_years: Option<f64>,
}

/// Compare two life cycles built with the same spec (same lifetime). Savings flows are
/// `reference.flows[t] − option.flows[t]`.
///
/// Errors only for an unvalidated spec.
pub fn compare(
    spec: &EconomicsSpec,
    option: &LifeCycle,
    reference: &LifeCycle,
) -> Result<Comparison> {
    check_rate(spec.discount_rate)?;
    let n = option.flows.len().min(reference.flows.len());
    let saving = |t: usize| reference.flows[t] - option.flows[t];
    let mut npv_saving = 0.0;
    let mut irr_flows = [0.0f64; 101];
    for (t, slot) in irr_flows.iter_mut().enumerate().take(n.min(101)) {
        *slot = saving(t);
        npv_saving += saving(t) * pf(spec.discount_rate, t);
    }
    let extra_capex = if n > 0 { -saving(0) } else { 0.0 };
    let first_year_saving = if n > 1 { saving(1) } else { 0.0 };
    let yearly = &irr_flows[1..n.clamp(1, 101)];
    Ok(Comparison {
        extra_capex,
        first_year_saving,
        npv_saving,
        irr: irr(&irr_flows[..n.min(101)]),
        simple_payback_years: simple_payback_years(extra_capex, first_year_saving),
        discounted_payback_years: discounted_payback_years(
            spec.discount_rate,
            extra_capex,
            yearly,
        )?,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(toml_text: &str) -> EconomicsSpec {
        toml::from_str(toml_text).unwrap()
    }

    const BASE: &str = "discount_rate = 0.05\nlifetime_years = 20\nfuel_price_per_kwh = 0.06\n";

    #[test]
    fn capital_recovery_factor_closed_form() {
        // r = 8 %, n = 10: (1.08)^10 = 2.158924997; CRF = 0.08·2.158925/1.158925 = 0.1490295.
        let g = 1.08f64.powi(10);
        let hand = 0.08 * g / (g - 1.0);
        assert!((hand - 0.149_029_5).abs() < 1e-7);
        assert!((annuity_factor(0.08, 10).unwrap() - hand).abs() < 1e-12);
        // r = 0: 1/n.
        assert_eq!(annuity_factor(0.0, 20).unwrap(), 0.05);
        // tiny rate: continuous with 1/n (series CRF = 1/n + r (n+1)/(2n) + O(r²)).
        let a = annuity_factor(1e-9, 20).unwrap();
        assert!((a - (0.05 + 1e-9 * 21.0 / 40.0)).abs() < 1e-15);
        assert!(annuity_factor(-1.0, 10).is_err());
        assert!(annuity_factor(0.05, 0).is_err());
    }

    #[test]
    fn npv_by_hand() {
        // −1000 + 300/1.1 + 400/1.21 + 500/1.331 = −1000 + 272.7273 + 330.5785 + 375.6574
        let v = npv(0.10, &[-1000.0, 300.0, 400.0, 500.0]).unwrap();
        assert!((v - (-21.036_814)).abs() < 1e-6, "{v}");
        assert_eq!(npv(0.1, &[]).unwrap(), 0.0);
        assert!(npv(-1.5, &[1.0]).is_err());
        assert!(npv(0.05, &[1.0, f64::NAN]).is_err());
    }

    #[test]
    fn irr_by_hand() {
        // −100 + 110/(1+r) = 0 → r = 10 %.
        assert!((irr(&[-100.0, 110.0]).unwrap() - 0.10).abs() < 1e-10);
        // −100 + 60/(1+r) + 60/(1+r)² = 0 → with x = 1/(1+r): 60x² + 60x − 100 = 0,
        // x = (−60 + √(3600 + 24000))/120 = 0.884 437 6 → r = 0.130 662 4.
        let x = (-60.0 + (3600.0f64 + 24000.0).sqrt()) / 120.0;
        let r = irr(&[-100.0, 60.0, 60.0]).unwrap();
        assert!((r - (1.0 / x - 1.0)).abs() < 1e-10, "{r}");
        // no sign change: none
        assert_eq!(irr(&[100.0, 10.0]), None);
        assert_eq!(irr(&[]), None);
        // −100, +230, −132: roots at 10 % and 20 %: the one closest to zero.
        let r = irr(&[-100.0, 230.0, -132.0]).unwrap();
        assert!((r - 0.10).abs() < 1e-10, "{r}");
        // negative IRR: −100 + 50 + 40 → r ≈ −0.0672 (x² term): 40x² + 50x − 100 = 0
        let x = (-50.0 + (2500.0f64 + 16000.0).sqrt()) / 80.0;
        let r = irr(&[-100.0, 50.0, 40.0]).unwrap();
        assert!((r - (1.0 / x - 1.0)).abs() < 1e-10, "{r}");
    }

    #[test]
    fn paybacks() {
        assert_eq!(simple_payback_years(1000.0, 250.0), Some(4.0));
        assert_eq!(simple_payback_years(0.0, -5.0), Some(0.0));
        assert_eq!(simple_payback_years(1000.0, 0.0), None);
        // 0 % discount: 1000 repaid by 300/yr after 3 + 100/300 years.
        let p = discounted_payback_years(0.0, 1000.0, &[300.0; 10])
            .unwrap()
            .unwrap();
        assert!((p - (3.0 + 1.0 / 3.0)).abs() < 1e-12);
        // 10 %: 500/yr; discounted 454.545, 413.223 (sum 867.769), 375.657 → 2 + 132.231/375.657.
        let p = discounted_payback_years(0.10, 1000.0, &[500.0; 5])
            .unwrap()
            .unwrap();
        let hand = 2.0 + (1000.0 - 500.0 / 1.1 - 500.0 / 1.21) / (500.0 / 1.331);
        assert!((p - hand).abs() < 1e-12 && (p - 2.352).abs() < 1e-3, "{p}");
        assert_eq!(
            discounted_payback_years(0.10, 1000.0, &[100.0; 5]).unwrap(),
            None
        );
    }

    #[test]
    fn levelised_cost_by_hand() {
        // capex 10 000, 20 years at 6 %, 500/yr, 40 MWh/yr:
        // CRF = 0.06·1.06^20/(1.06^20 − 1) = 0.087 184 6; LC = (871.846 + 500)/40 = 34.296 /MWh.
        let g = 1.06f64.powi(20);
        let crf = 0.06 * g / (g - 1.0);
        let lc = levelised_cost(0.06, 20, 10_000.0, &[500.0; 20], 40.0)
            .unwrap()
            .unwrap();
        assert!((lc - (10_000.0 * crf + 500.0) / 40.0).abs() < 1e-9);
        assert!((lc - 34.2962).abs() < 1e-3, "{lc}");
        assert_eq!(levelised_cost(0.06, 20, 10_000.0, &[], 0.0).unwrap(), None);
    }

    #[test]
    fn validation_errors() {
        let ok = format!("{BASE}electricity_price_per_kwh = 0.2\n");
        spec(&ok).validate().unwrap();
        let bad_rate = ok.replace("0.05", "-1.0");
        assert!(format!("{}", spec(&bad_rate).validate().unwrap_err()).contains("discount_rate"));
        let zero_life = ok.replace("= 20", "= 0");
        assert!(format!("{}", spec(&zero_life).validate().unwrap_err()).contains("lifetime_years"));
        let neg = ok.replace("0.2", "-0.2");
        assert!(
            format!("{}", spec(&neg).validate().unwrap_err()).contains("electricity_price_per_kwh")
        );
        let neg_fuel = ok.replace("0.06", "-0.06");
        assert!(
            format!("{}", spec(&neg_fuel).validate().unwrap_err()).contains("fuel_price_per_kwh")
        );
        // missing price
        assert!(spec(BASE).validate().is_err());
        // TOU with a gap (19–22 uncovered)
        let gap = format!(
            "{BASE}tou = [{{ hours = [7, 19], price_per_kwh = 0.3 }}, {{ hours = [22, 7], price_per_kwh = 0.1 }}]\n"
        );
        let e = format!("{}", spec(&gap).validate().unwrap_err());
        assert!(e.contains("tou") && e.contains("hour 19"), "{e}");
        // overlap
        let over = format!(
            "{BASE}tou = [{{ hours = [7, 20], price_per_kwh = 0.3 }}, {{ hours = [19, 7], price_per_kwh = 0.1 }}]\n"
        );
        let e = format!("{}", spec(&over).validate().unwrap_err());
        assert!(e.contains("covered by 2"), "{e}");
        // weekday-only peak needs a weekend period too
        let wk = format!(
            "{BASE}tou = [{{ hours = [8, 20], price_per_kwh = 0.3, days = \"weekdays\" }}, {{ hours = [20, 8], price_per_kwh = 0.1 }}]\n"
        );
        assert!(format!("{}", spec(&wk).validate().unwrap_err()).contains("weekends"));
        // negative cost function
        let bad_cost = format!("{ok}[costs]\ncollector_per_m2 = -1\n");
        assert!(
            format!("{}", spec(&bad_cost).validate().unwrap_err())
                .contains("costs.collector_per_m2")
        );
        // unknown key
        assert!(toml::from_str::<EconomicsSpec>(&format!("{ok}interest = 1\n")).is_err());
    }

    #[test]
    fn tou_bill_and_demand() {
        // Weekday peak 08–20 at 0.30, otherwise 0.10; weekends all 0.10. 1 Jan a Monday.
        let s = spec(&format!(
            "{BASE}demand_charge_per_kw_month = 10\nexport_price_per_kwh = 0.05\nwater_price_per_m3 = 2\n\
             tou = [{{ hours = [8, 20], price_per_kwh = 0.3, days = \"weekdays\" }},\
                    {{ hours = [20, 8], price_per_kwh = 0.1, days = \"weekdays\" }},\
                    {{ hours = [0, 24], price_per_kwh = 0.1, days = \"weekends\" }}]\n"
        ));
        s.validate().unwrap();
        // 1 kWh every hour of the first week (Mon–Sun), plus a 5 kWh hour on 6 Jan (Sat) 10:00.
        let mut imp = vec![0.0; 8760];
        for v in imp.iter_mut().take(7 * 24) {
            *v = 1.0;
        }
        imp[5 * 24 + 10] = 5.0;
        // one February hour of 3 kWh
        imp[31 * 24 + 12] = 3.0;
        let exp = [2.0; 10];
        let c = energy_cost(&imp, &exp, 100.0, 4.0, &s, 0);
        // energy: 5 weekdays × (12·0.3 + 12·0.1) = 24; weekend 47 kWh + 4 extra at 0.1 = 4.8
        // (48 kWh of weekend hours, one of them 5 kWh → 52 kWh × 0.1 = 5.2); Feb 1 (Thu) 12:00
        // is weekday peak: 3 × 0.3 = 0.9. Total 24 + 5.2 + 0.9 = 30.1.
        assert!((c.energy - 30.1).abs() < 1e-9, "{c:?}");
        // demand: Jan peak 5 kW, Feb 3 kW → 80
        assert!((c.demand - 80.0).abs() < 1e-9);
        assert!((c.fuel - 6.0).abs() < 1e-12 && (c.water - 8.0).abs() < 1e-12);
        assert!((c.export_credit - 1.0).abs() < 1e-12);
        assert!((c.total - (30.1 + 80.0 + 6.0 + 8.0 - 1.0)).abs() < 1e-9);
        // Same hours with 1 Jan a Saturday (5): days 1–2 weekend, 3–7 weekdays — the 6 Jan
        // 10:00 hour is now a Thursday peak hour.
        let c = energy_cost(&imp, &exp, 0.0, 0.0, &s, 5);
        let hand = 2.0 * 2.4 + 4.0 * 4.8 + (12.0 * 0.3 + 4.0 * 0.3 + 12.0 * 0.1) + 0.9;
        assert!((c.energy - hand).abs() < 1e-9, "{} vs {hand}", c.energy);
    }

    #[test]
    fn capex_and_life_cycle() {
        let s = spec(&format!(
            "{BASE}electricity_price_per_kwh = 0.2\n[costs]\n\
             replacements = [{{ item = \"collector\", after_years = 8, fraction = 0.5 }}]\n"
        ));
        s.validate().unwrap();
        let sizes = Sizes {
            collector_m2: 100.0,
            thermal_chiller_kw: 200.0,
            ..Sizes::default()
        };
        let cx = s.costs.capex(&sizes);
        // collector 30 000; chiller 600·100·2^0.7 = 97 470.29
        let chiller = 600.0 * 100.0 * 2f64.powf(0.7);
        assert!((cx.by_item[4] - chiller).abs() < 1e-9 && (chiller - 97_470.29).abs() < 0.01);
        let eq = 30_000.0 + chiller;
        let total = eq * 1.25 * 1.10 * 1.10;
        assert!((cx.total - total).abs() < 1e-6);
        let bill = CostBreakdown {
            energy: 1000.0,
            fuel: 500.0,
            total: 1500.0,
            ..CostBreakdown::default()
        };
        let lc = life_cycle(&s, &cx, &bill, 100_000.0).unwrap();
        assert_eq!(lc.flows.len(), 21);
        let om = 0.02 * total;
        assert!((lc.flows[1] - (om + 1500.0)).abs() < 1e-9);
        // replacement in years 8 and 16 (not 24 > 20)
        assert!((lc.flows[8] - (om + 1500.0 + 15_000.0)).abs() < 1e-9);
        assert!((lc.flows[16] - lc.flows[8]).abs() < 1e-9);
        let pv = total
            + (om + 1500.0) * (1.0 - 1.05f64.powi(-20)) / 0.05
            + 15_000.0 * (1.05f64.powi(-8) + 1.05f64.powi(-16));
        assert!((lc.present_cost - pv).abs() < 1e-6);
        let crf = annuity_factor(0.05, 20).unwrap();
        assert!((lc.cost_per_mwh_cooling.unwrap() - pv * crf / 100.0).abs() < 1e-9);

        // Reference: no capital, bill 6000/yr → saving 4500 − O&M each year.
        let reference = life_cycle(
            &s,
            &Capex::default(),
            &CostBreakdown {
                energy: 6000.0,
                total: 6000.0,
                ..CostBreakdown::default()
            },
            100_000.0,
        )
        .unwrap();
        let c = compare(&s, &lc, &reference).unwrap();
        assert!((c.extra_capex - total).abs() < 1e-9);
        assert!((c.first_year_saving - (4500.0 - om)).abs() < 1e-9);
        assert!((c.npv_saving - (reference.present_cost - lc.present_cost)).abs() < 1e-6);
        let irr_v = c.irr.unwrap();
        let flows: Vec<f64> = (0..=20).map(|t| reference.flows[t] - lc.flows[t]).collect();
        let resid = npv(irr_v, &flows).unwrap();
        assert!(resid.abs() < 1e-6 * total, "{irr_v} {resid}");
    }
}
