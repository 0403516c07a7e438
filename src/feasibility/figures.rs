//! The figure registry: every annual and monthly figure the outputs show, once — its key
//! (the JSON key of [`Totals`], the `--figure` name of the exploration verbs), its label, its
//! unit, its formatter and its definition. The terminal and Markdown tables, the HTML report
//! and the spreadsheet read it; README's table of figures is written from the same words.

use super::Totals;

/// How a figure is stored and shown. Stored values are in the unit the key names (kWh, m³,
/// kg, fraction); shown values in the display unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Unit {
    /// kWh stored, MWh shown (one decimal).
    Energy,
    /// A fraction stored, a percentage shown (one decimal).
    Fraction,
    /// A ratio of two energies (COP, PER), two decimals.
    Ratio,
    /// Hours, whole.
    Hours,
    /// A count, whole.
    Count,
    /// m³ of water, whole.
    Water,
    /// kg of CO2 stored, t shown (one decimal).
    Co2,
    /// kW, whole.
    Power,
    /// kWh per m² of collector, whole.
    Yield,
    /// m³ of water per MWh of cooling, two decimals.
    WaterPerMwh,
    /// Money in the scenario's currency, whole.
    Money,
    /// Money per year, whole.
    MoneyPerYear,
    /// Money per MWh of cooling, whole.
    MoneyPerMwh,
    /// Years, one decimal.
    Years,
}

impl Unit {
    /// Unit as shown in a header (`cur`: the currency label).
    pub fn shown(self, cur: &str) -> String {
        match self {
            Unit::Energy => "MWh".into(),
            Unit::Fraction => "%".into(),
            Unit::Ratio => "".into(),
            Unit::Hours => "h".into(),
            Unit::Count => "".into(),
            Unit::Water => "m³".into(),
            Unit::Co2 => "t".into(),
            Unit::Power => "kW".into(),
            Unit::Yield => "kWh/m²".into(),
            Unit::WaterPerMwh => "m³/MWh".into(),
            Unit::Money => cur.into(),
            Unit::MoneyPerYear => format!("{cur}/yr"),
            Unit::MoneyPerMwh => format!("{cur}/MWh"),
            Unit::Years => "yr".into(),
        }
    }

    /// Factor from the stored to the shown value.
    pub fn scale(self) -> f64 {
        match self {
            Unit::Energy | Unit::Co2 => 1e-3,
            Unit::Fraction => 100.0,
            _ => 1.0,
        }
    }

    /// Decimals shown.
    pub fn digits(self) -> usize {
        match self {
            Unit::Energy | Unit::Fraction | Unit::Co2 | Unit::Years => 1,
            Unit::Ratio | Unit::WaterPerMwh => 2,
            _ => 0,
        }
    }

    /// Spreadsheet number format of the shown value.
    pub fn xlsx_format(self) -> &'static str {
        match self.digits() {
            0 => "#,##0",
            1 => "#,##0.0",
            _ => "0.00",
        }
    }
}

/// One figure.
#[derive(Debug, Clone, Copy)]
pub struct Figure {
    /// Key: the JSON key of the annual and monthly figures, and the `--figure` name.
    pub key: &'static str,
    /// Short label for table headers (the unit is added by [`Figure::header`]).
    pub label: &'static str,
    pub unit: Unit,
    /// The value from the totals (`None` where undefined).
    pub get: fn(&Totals) -> Option<f64>,
    /// Shown where a defined-for-others figure is undefined for this option (paybacks and
    /// IRR that never come: `never`), otherwise `–`.
    pub none: &'static str,
    /// What it is, and where the definition comes from (README's table of figures).
    pub definition: &'static str,
}

impl Figure {
    /// Header text: label and shown unit.
    pub fn header(&self, cur: &str) -> String {
        let u = self.unit.shown(cur);
        if u.is_empty() {
            self.label.to_string()
        } else {
            format!("{} {u}", self.label)
        }
    }

    /// The shown value: scaled, rounded to the unit's decimals, no `-0`; `–` (or the
    /// figure's `none` text) where undefined or not finite.
    pub fn format(&self, v: Option<f64>) -> String {
        match v.filter(|v| v.is_finite()) {
            None => self.none.to_string(),
            Some(v) => format_number(v * self.unit.scale(), self.unit.digits()),
        }
    }

    /// The shown value of `t`.
    pub fn show(&self, t: &Totals) -> String {
        self.format((self.get)(t))
    }

    /// The shown value as a number (scaled), for spreadsheets and charts.
    pub fn shown_value(&self, t: &Totals) -> Option<f64> {
        (self.get)(t)
            .filter(|v| v.is_finite())
            .map(|v| v * self.unit.scale())
    }
}

/// `v` with `digits` decimals, never `-0`.
pub fn format_number(v: f64, digits: usize) -> String {
    let s = format!("{v:.digits$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

macro_rules! fig {
    ($key:ident, $label:expr, $unit:ident, $def:expr) => {
        Figure {
            key: stringify!($key),
            label: $label,
            unit: Unit::$unit,
            get: |t| Some(f64::from(t.$key)),
            none: "–",
            definition: $def,
        }
    };
    (opt $key:ident, $label:expr, $unit:ident, $def:expr) => {
        Figure {
            key: stringify!($key),
            label: $label,
            unit: Unit::$unit,
            get: |t| t.$key,
            none: "–",
            definition: $def,
        }
    };
    (never $key:ident, $label:expr, $unit:ident, $def:expr) => {
        Figure {
            key: stringify!($key),
            label: $label,
            unit: Unit::$unit,
            get: |t| t.$key,
            none: "never",
            definition: $def,
        }
    };
}

/// Every figure, in the order README lists them.
pub const FIGURES: &[Figure] = &[
    // Key figures.
    fig!(opt solar_share_of_cooling, "solar share of cooling", Fraction,
        "Cooling made from solar heat or the option's own PV / cooling load. Solar heat's part: the heat-driven machine's cooling times the solar share of the driving heat it was given, hour by hour; PV's part: electric cooling times the PV share of the option's electricity. After the solar fraction of the IEA SHC Task 38/48 key figures (from memory)."),
    fig!(opt primary_energy_savings_fraction, "PE saving", Fraction,
        "Fractional primary-energy saving against the reference, 1 − PE/PE_ref (IEA SHC Task 38/48 f_sav, from memory)."),
    fig!(opt grid_saved_kwh, "grid saved", Energy,
        "Grid electricity of the reference less the option's."),
    fig!(opt fuel_saved_kwh, "fuel saved", Energy,
        "Boiler fuel of the reference less the option's."),
    fig!(opt water_saved_m3, "water saved", Water,
        "Water of the reference less the option's (tower make-up, evaporative coolers)."),
    fig!(opt cop_thermal, "thermal COP", Ratio,
        "Cooling the heat-driven machine made / driving heat given to it (solar + backup heat); no backup-chiller, motor or evaporative cooling in it."),
    fig!(opt thermal_solar_fraction, "route SF", Fraction,
        "Thermal solar fraction of the route: solar heat the route used / (solar + backup heat the route used) (Duffie & Beckman, 4th ed., solar fraction of a thermal system)."),
    fig!(opt seasonal_electric_performance, "SEP", Ratio,
        "Seasonal electric performance: cooling delivered / all electricity of the option (compressors, fans, pumps, collector pump); after the IEA SHC electric SPF (from memory)."),
    // Cooling by source.
    fig!(
        load_kwh,
        "load",
        Energy,
        "Cooling load of the building (sensible + latent)."
    ),
    fig!(
        peak_load_kw,
        "peak load",
        Power,
        "Largest hourly cooling load (kWh in the hour = mean kW); `peak_load_hour` is its hour of the year."
    ),
    fig!(
        cooling_kwh,
        "cooling",
        Energy,
        "Cooling delivered: the sum of the five sources below."
    ),
    fig!(
        cooling_solar_kwh,
        "from solar heat",
        Energy,
        "Cooling the heat-driven machine made from solar heat."
    ),
    fig!(
        cooling_backup_heat_kwh,
        "from backup heat",
        Energy,
        "Cooling the heat-driven machine made from boiler heat."
    ),
    fig!(
        cooling_evaporative_kwh,
        "evaporative",
        Energy,
        "Cooling by evaporation alone (desiccant unit's wheel stopped, or what it would give so): no heat, no compressor."
    ),
    fig!(
        cooling_electric_kwh,
        "electric",
        Energy,
        "Cooling by an electric compressor on grid electricity (the baseline plant, reference or backup)."
    ),
    fig!(
        cooling_pv_kwh,
        "on own PV",
        Energy,
        "Cooling by an electric compressor on the option's own PV."
    ),
    fig!(unmet_kwh, "unmet", Energy, "Cooling load not met."),
    fig!(unmet_hours, "unmet", Hours, "Hours with load not met."),
    // Electricity and water.
    fig!(
        electricity_kwh,
        "electricity",
        Energy,
        "All electricity: the five uses below."
    ),
    fig!(
        elec_compressor_kwh,
        "compressors",
        Energy,
        "Compressors of electric chillers."
    ),
    fig!(
        elec_heat_rejection_kwh,
        "tower/cooler fans",
        Energy,
        "Cooling-tower fans (variable speed, affinity law) and dry-cooler fans."
    ),
    fig!(
        elec_pumps_kwh,
        "pumps",
        Energy,
        "Chilled-, condenser- and hot-water pumps and the absorption solution pump."
    ),
    fig!(
        elec_air_handling_kwh,
        "air handling",
        Energy,
        "Desiccant unit fans, wheel drives and evaporative-cooler pumps."
    ),
    fig!(pump_kwh, "collector pump", Energy, "Collector-loop pump."),
    fig!(
        pv_used_kwh,
        "own PV used",
        Energy,
        "Own PV electricity used by the option."
    ),
    fig!(
        grid_kwh,
        "grid",
        Energy,
        "Grid electricity: all electricity less own PV used."
    ),
    fig!(
        water_m3,
        "water",
        Water,
        "Tower make-up (evaporation, blow-down, drift) and evaporative-cooler water."
    ),
    // Solar heat and backup.
    fig!(
        solar_heat_kwh,
        "solar heat",
        Energy,
        "Heat the collector loop delivered into the store."
    ),
    fig!(opt collector_yield_kwh_m2, "yield", Yield, "Solar heat per m² of gross collector area."),
    fig!(
        heat_to_route_kwh,
        "heat to route",
        Energy,
        "Driving heat given to the route (solar + backup)."
    ),
    fig!(
        route_solar_kwh,
        "solar to route",
        Energy,
        "Of which from the solar store."
    ),
    fig!(
        heat_demand_kwh,
        "heat demand",
        Energy,
        "Hot water and space heating of the building."
    ),
    fig!(opt solar_fraction_heat_demand, "heat-demand SF", Fraction,
        "Solar heat delivered to the heat demand / heat demand (Duffie & Beckman, 4th ed.)."),
    fig!(
        backup_heat_kwh,
        "backup heat",
        Energy,
        "Boiler heat, for the route and the heat demand."
    ),
    fig!(
        fuel_kwh,
        "fuel",
        Energy,
        "Boiler fuel (higher heating value)."
    ),
    fig!(
        stagnation_hours,
        "stagnation",
        Hours,
        "Hours the field could gain heat but the store was at its maximum."
    ),
    fig!(
        machine_starts,
        "starts",
        Count,
        "Starts of the heat-driven machine (an hour with driving heat after one without)."
    ),
    fig!(
        startup_heat_kwh,
        "start-up heat",
        Energy,
        "Driving heat that warmed the machine's thermal mass from the plant room to its drive temperature at each start (thermal mass × rise; part of the heat to the route, so the thermal COP carries it)."
    ),
    // Energy and emissions.
    fig!(opt primary_energy_kwh, "primary energy", Energy,
        "f_el · grid electricity + f_fuel · fuel (the scenario's factors)."),
    fig!(opt primary_energy_ratio, "PER", Ratio,
        "Primary energy ratio: (cooling + heat demand) / primary energy (IEA SHC Task 38/48, from memory)."),
    fig!(opt co2_kg, "CO2", Co2, "Emissions of grid electricity (hourly or annual factor), fuel and refrigerant leakage."),
    fig!(opt co2_savings_fraction, "CO2 saving", Fraction, "1 − CO2/CO2_ref."),
    fig!(opt peak_electric_kw, "peak", Power, "Largest hourly grid electricity."),
    fig!(opt peak_reduction_kw, "peak cut", Power, "Reference's peak less the option's."),
    fig!(opt water_m3_per_mwh_cooling, "water/cooling", WaterPerMwh, "Water per MWh of cooling delivered."),
    // Money.
    fig!(opt capex, "capital", Money, "Capital cost from the scenario's cost functions."),
    fig!(opt annual_energy_cost, "energy bill", MoneyPerYear, "Electricity (with demand charges), fuel and water, less export."),
    fig!(opt annualised_cost, "annualised", MoneyPerYear, "Capital recovered over the lifetime plus the energy bill and upkeep."),
    fig!(opt lcoc_per_mwh, "LCOC", MoneyPerMwh, "Levelised cost of cooling: annualised cost / cooling delivered."),
    fig!(opt npv_vs_reference, "NPV vs ref", Money, "Net present value of the option's savings against the reference."),
    fig!(never simple_payback_years, "payback", Years, "Extra capital / yearly saving; never where the option saves nothing."),
    fig!(never discounted_payback_years, "disc. payback", Years, "Years until the discounted savings repay the extra capital."),
    fig!(never irr, "IRR", Fraction, "Internal rate of return of the extra capital."),
];

/// The figure of `key`.
pub fn by_key(key: &str) -> Option<&'static Figure> {
    FIGURES.iter().find(|f| f.key == key)
}

/// The figures of `keys`, in order (keys not in the registry are a programming error and
/// are left out).
pub fn of(keys: &[&str]) -> Vec<&'static Figure> {
    keys.iter().filter_map(|k| by_key(k)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every registry key is a JSON key of the totals, and every label with its unit is
    /// unique (one figure, one name).
    #[test]
    fn keys_are_json_keys_and_headers_unique() {
        let v = serde_json::to_value(Totals::default()).unwrap();
        let mut headers = std::collections::BTreeSet::new();
        for f in FIGURES {
            assert!(v.get(f.key).is_some(), "{} is not a Totals key", f.key);
            assert!(
                headers.insert(f.header("CU")),
                "duplicate header {}",
                f.header("CU")
            );
        }
    }

    /// README's table of figures is written from the registry: every key with its label,
    /// shown unit and definition (`cargo test --lib figures -- --ignored --nocapture` prints
    /// the table to paste).
    #[test]
    #[ignore]
    fn print_readme_table() {
        println!("| key | label | shown in | definition |");
        println!("|---|---|---|---|");
        for f in FIGURES {
            let u = f.unit.shown("currency");
            println!(
                "| `{}` | {} | {} | {} |",
                f.key,
                f.label,
                if u.is_empty() { "–".into() } else { u },
                f.definition
            );
        }
    }

    /// README lists every figure of the registry by its key.
    #[test]
    fn readme_lists_every_figure() {
        let readme = include_str!("../../README.md");
        for f in FIGURES {
            assert!(
                readme.contains(&format!("| `{}` |", f.key)),
                "README's table of figures lacks `{}`",
                f.key
            );
        }
    }

    #[test]
    fn formatter() {
        let f = by_key("cooling_kwh").unwrap();
        assert_eq!(f.format(Some(437_812.0)), "437.8");
        assert_eq!(f.format(Some(-0.01)), "0.0");
        assert_eq!(f.format(None), "–");
        assert_eq!(f.format(Some(f64::NAN)), "–");
        assert_eq!(by_key("irr").unwrap().format(None), "never");
        assert_eq!(
            by_key("solar_share_of_cooling")
                .unwrap()
                .format(Some(0.2131)),
            "21.3"
        );
        assert_eq!(by_key("cop_thermal").unwrap().header("CU"), "thermal COP");
        assert_eq!(by_key("lcoc_per_mwh").unwrap().header("CU"), "LCOC CU/MWh");
    }
}
