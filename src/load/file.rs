//! Hourly load from a CSV file: one row per hour of the year (hour 0 = 1 January
//! 00:00–01:00 local standard time), a header row naming the columns.
//!
//! Row rules (the same as the weather file): lines before `header_row` are skipped
//! (metadata); after the header exactly 8760 data rows (blank lines are ignored); every cell
//! read is a finite number ≥ 0. Errors name the file and `line N, column NAME` (or `header`,
//! `data rows`), the value found and what is allowed.

use super::{LoadHour, LoadYear};
use crate::error::{Error, Result};
use crate::validate;
use crate::weather::HOURS;
use std::path::Path;

/// Unit of the power columns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
pub enum PowerUnit {
    /// Kilowatts (hourly average, = kWh in the hour).
    #[serde(rename = "kW")]
    Kw,
    /// Watts (hourly average, = Wh in the hour).
    #[serde(rename = "W")]
    W,
}

impl PowerUnit {
    fn to_kw(self) -> f64 {
        match self {
            PowerUnit::Kw => 1.0,
            PowerUnit::W => 1e-3,
        }
    }
    fn name(self) -> &'static str {
        match self {
            PowerUnit::Kw => "kW",
            PowerUnit::W => "W",
        }
    }
}

fn default_header_row() -> usize {
    1
}
fn default_t_in() -> f64 {
    24.0
}

/// Where the hourly load file is and which columns to read (section `[load]` with
/// `source = "file"` in a scenario).
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LoadFileSpec {
    /// CSV file; a relative path is taken from the scenario file's folder.
    pub path: String,
    /// Line number (1-based) of the header row; earlier lines are skipped (default 1).
    #[serde(default = "default_header_row")]
    pub header_row: usize,
    /// Column with the sensible cooling load.
    pub sensible_column: String,
    /// Column with the latent cooling load; absent = no latent load.
    #[serde(default)]
    pub latent_column: Option<String>,
    /// Column with the space heating load; absent = no heating.
    #[serde(default)]
    pub heating_column: Option<String>,
    /// Column with the outdoor air of the building's mechanical ventilation in that hour, m³/h
    /// (whatever `units` says; infiltration not included): the flow whose load the load columns
    /// contain. Absent = 0 every hour, and a scenario refuses a desiccant option with
    /// `cycle = "ventilation"` (its credit depends on this flow) until the column is named.
    #[serde(default)]
    pub ventilation_column: Option<String>,
    /// Unit of all load columns: `"kW"` or `"W"`.
    pub units: PowerUnit,
    /// Indoor air temperature reported for every hour, °C (the file carries none; default
    /// 24 °C, a typical cooling set-point, common practice).
    #[serde(default = "default_t_in")]
    pub t_in_c: f64,
}

impl LoadFileSpec {
    /// Range-check the keys (relative to `[load]`): `header_row` 1..=1000, `t_in_c` 10–40 °C,
    /// column names not empty.
    pub fn validate(&self) -> Result<()> {
        validate::count(
            "header_row",
            u32::try_from(self.header_row).unwrap_or(u32::MAX),
            1,
            1000,
            "line number of the header row, 1 = first line",
        )?;
        validate::in_range(
            "t_in_c",
            self.t_in_c,
            10.0,
            40.0,
            "indoor temperature reported with the file's load, °C",
        )?;
        for (k, v) in [
            ("sensible_column", Some(&self.sensible_column)),
            ("latent_column", self.latent_column.as_ref()),
            ("heating_column", self.heating_column.as_ref()),
            ("ventilation_column", self.ventilation_column.as_ref()),
        ] {
            if let Some(v) = v
                && v.trim().is_empty()
            {
                return Err(Error::input(
                    k,
                    "\"\"",
                    "must name a column of the file's header",
                ));
            }
        }
        Ok(())
    }
}

fn bad(
    file: &str,
    key: impl Into<String>,
    value: impl ToString,
    allowed: impl Into<String>,
) -> Error {
    Error::Input {
        file: file.to_string(),
        key: key.into(),
        value: value.to_string(),
        allowed: allowed.into(),
    }
}

/// Read a year of hourly load from a CSV file.
///
/// * `spec` – path, header line, column names, unit, indoor temperature to report
/// * `base_dir` – folder a relative `spec.path` is taken from (the scenario's folder)
///
/// Returns 8760 [`LoadHour`]s in kW (`sensible_kw`, `latent_kw` and `heating_kw`, 0 for a
/// column not given; `t_in_c = spec.t_in_c`; `ventilation_m3_h` in m³/h from
/// `ventilation_column`, 0 without it), origin = the file path.
/// Errors: unreadable file (`Error::Read`); not UTF-8, empty or too short for the header,
/// duplicate or missing column names (key `header`); a row count other than 8760 (key
/// `data rows`, naming the count or the first extra line); a missing, non-numeric, non-finite
/// or negative cell (key `line N, column NAME`).
pub fn read(spec: &LoadFileSpec, base_dir: &Path) -> Result<LoadYear> {
    spec.validate()?;
    let path = if Path::new(&spec.path).is_absolute() {
        Path::new(&spec.path).to_path_buf()
    } else {
        base_dir.join(&spec.path)
    };
    let file = path.display().to_string();
    let bytes = std::fs::read(&path).map_err(|source| Error::Read {
        path: path.clone(),
        source,
    })?;
    let text = String::from_utf8(bytes).map_err(|e| {
        bad(
            &file,
            "file",
            format!("invalid byte at offset {}", e.utf8_error().valid_up_to()),
            "must be UTF-8 text (CSV)",
        )
    })?;
    parse(spec, &file, &text)
}

/// Parse the CSV text of a load file (see [`read`]); `file` names it in errors.
fn parse(spec: &LoadFileSpec, file: &str, text: &str) -> Result<LoadYear> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    // Skip the lines before the header.
    let mut offset = 0;
    for _ in 1..spec.header_row {
        match text[offset..].find('\n') {
            Some(i) => offset += i + 1,
            None => {
                offset = text.len();
                break;
            }
        }
    }
    let skipped = spec.header_row - 1;
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .trim(csv::Trim::All)
        .from_reader(&text.as_bytes()[offset..]);
    let headers = rdr
        .headers()
        .map_err(|e| {
            bad(
                file,
                "header",
                e,
                "must be a CSV header row naming the columns",
            )
        })?
        .clone();
    if headers.iter().all(|h| h.is_empty()) {
        return Err(bad(
            file,
            "header",
            if text.trim().is_empty() {
                "empty file".to_string()
            } else {
                format!("nothing at line {}", spec.header_row)
            },
            format!(
                "must have a header row at line {} naming the columns, then {HOURS} hourly rows",
                spec.header_row
            ),
        ));
    }
    let names: Vec<&str> = headers.iter().collect();
    for (i, n) in names.iter().enumerate() {
        if names[..i].contains(n) {
            return Err(bad(
                file,
                "header",
                format!(
                    "`{n}` (columns {} and {})",
                    names.iter().position(|m| m == n).map_or(0, |p| p + 1),
                    i + 1
                ),
                "column names must be unique",
            ));
        }
    }
    let find = |col: &str| -> Result<usize> {
        names.iter().position(|n| *n == col).ok_or_else(|| {
            let near = names
                .iter()
                .map(|n| (strsim::jaro_winkler(n, col), *n))
                .filter(|(s, _)| *s > 0.8)
                .max_by(|a, b| a.0.total_cmp(&b.0))
                .map(|(_, n)| format!("; did you mean `{n}`?"))
                .unwrap_or_default();
            bad(
                file,
                "header",
                format!("no column `{col}`"),
                format!("must name one of the columns: {}{near}", names.join(", ")),
            )
        })
    };
    let sens = find(&spec.sensible_column)?;
    let lat = spec.latent_column.as_deref().map(find).transpose()?;
    let heat = spec.heating_column.as_deref().map(find).transpose()?;
    let vent = spec.ventilation_column.as_deref().map(find).transpose()?;
    let unit = spec.units;
    let scale = unit.to_kw();

    let mut hours = Vec::with_capacity(HOURS);
    let mut last_line = spec.header_row;
    for rec in rdr.records() {
        let rec = rec.map_err(|e| {
            let line = e.position().map_or(0, |p| p.line() as usize + skipped);
            bad(file, format!("line {line}"), e, "must be a CSV row")
        })?;
        let line = rec.position().map_or(0, |p| p.line() as usize) + skipped;
        if rec.iter().all(|c| c.is_empty()) {
            continue;
        }
        if hours.len() == HOURS {
            return Err(bad(
                file,
                "data rows",
                format!("more than {HOURS}: line {line} is data row {}", HOURS + 1),
                format!(
                    "must have exactly {HOURS} data rows after the header (one per hour of a 365-day year)"
                ),
            ));
        }
        // A cell of column `col`, a finite number ≥ 0 in `unit_name`, times `scale`.
        let read_cell = |col: usize, unit_name: &str, scale: f64| -> Result<f64> {
            let name = names[col];
            let key = || format!("line {line}, column {name}");
            let s = rec.get(col).ok_or_else(|| {
                bad(
                    file,
                    key(),
                    "(missing)",
                    format!("must be a number ≥ 0 in {unit_name}"),
                )
            })?;
            let v: f64 = s.parse().map_err(|_| {
                bad(
                    file,
                    key(),
                    format!("`{s}`"),
                    format!("must be a number ≥ 0 in {unit_name}"),
                )
            })?;
            if !v.is_finite() || v < 0.0 {
                return Err(bad(
                    file,
                    key(),
                    s,
                    format!("must be a finite number ≥ 0 in {unit_name} (a load, not a net flow)"),
                ));
            }
            Ok(v * scale)
        };
        let cell = |col: usize| read_cell(col, unit.name(), scale);
        hours.push(LoadHour {
            sensible_kw: cell(sens)?,
            latent_kw: lat.map(cell).transpose()?.unwrap_or(0.0),
            heating_kw: heat.map(cell).transpose()?.unwrap_or(0.0),
            t_in_c: spec.t_in_c,
            ventilation_m3_h: vent
                .map(|c| read_cell(c, "m³/h", 1.0))
                .transpose()?
                .unwrap_or(0.0),
        });
        last_line = line;
    }
    if hours.len() != HOURS {
        return Err(bad(
            file,
            "data rows",
            format!("{} rows (last at line {last_line})", hours.len()),
            format!(
                "must have exactly {HOURS} data rows after the header (one per hour of a 365-day year)"
            ),
        ));
    }
    Ok(LoadYear {
        hours,
        origin: file.to_string(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec() -> LoadFileSpec {
        toml::from_str(
            r#"
            path = "x.csv"
            sensible_column = "q_sens"
            latent_column = "q_lat"
            units = "W"
            "#,
        )
        .unwrap()
    }

    fn year_text(header: &str, row: impl Fn(usize) -> String) -> String {
        let mut s = String::from(header);
        s.push('\n');
        for i in 0..HOURS {
            s.push_str(&row(i));
            s.push('\n');
        }
        s
    }

    #[test]
    fn watts_to_kilowatts_with_defaults() {
        let s = spec();
        assert_eq!(s.header_row, 1);
        assert_eq!(s.t_in_c, 24.0);
        let text = year_text("hour,q_sens,q_lat", |i| format!("{i},{},250", 1000 + i));
        let y = parse(&s, "x.csv", &text).unwrap();
        assert_eq!(y.hours.len(), HOURS);
        assert_eq!(y.hours[0].sensible_kw, 1.0);
        assert_eq!(y.hours[8759].sensible_kw, 9.759);
        assert_eq!(y.hours[5].latent_kw, 0.25);
        assert_eq!(y.hours[5].heating_kw, 0.0);
        assert_eq!(y.hours[5].t_in_c, 24.0);
    }

    #[test]
    fn header_row_skips_metadata() {
        let mut s = spec();
        s.header_row = 3;
        s.units = PowerUnit::Kw;
        let text = format!(
            "site: demo\n\"exported\",2026\n{}",
            year_text("q_sens,q_lat", |_| "2.5,0.5".into())
        );
        let y = parse(&s, "x.csv", &text).unwrap();
        assert_eq!(y.hours[100].sensible_kw, 2.5);
    }

    #[test]
    fn bad_cell_names_line_and_column() {
        let s = spec();
        // Data row 7 (hour 6) is on line 8 (header on line 1).
        let text = year_text("q_sens,q_lat", |i| {
            if i == 6 {
                "12,abc".into()
            } else {
                "1,1".into()
            }
        });
        let e = parse(&s, "x.csv", &text).unwrap_err().to_string();
        assert!(
            e.contains("line 8, column q_lat") && e.contains("abc"),
            "{e}"
        );
    }

    /// The ventilation column is read in m³/h whatever `units` says; without it the flow is 0.
    #[test]
    fn ventilation_column_in_m3_h() {
        let mut s = spec();
        let text = year_text("q_sens,q_lat,oa", |i| {
            format!("1000,250,{}", if i % 24 < 8 { 0 } else { 4500 })
        });
        assert_eq!(
            parse(&s, "x.csv", &text).unwrap().hours[10].ventilation_m3_h,
            0.0
        );
        s.ventilation_column = Some("oa".into());
        let y = parse(&s, "x.csv", &text).unwrap();
        assert_eq!(y.hours[10].ventilation_m3_h, 4500.0);
        assert_eq!(y.hours[10].sensible_kw, 1.0);
        assert_eq!(y.hours[3].ventilation_m3_h, 0.0);
        let bad = year_text("q_sens,q_lat,oa", |i| {
            if i == 6 {
                "1,1,-5".into()
            } else {
                "1,1,0".into()
            }
        });
        let e = parse(&s, "x.csv", &bad).unwrap_err().to_string();
        assert!(e.contains("line 8, column oa") && e.contains("m³/h"), "{e}");
    }

    #[test]
    fn t_in_out_of_range() {
        let mut s = spec();
        s.t_in_c = 80.0;
        assert!(s.validate().unwrap_err().to_string().contains("t_in_c"));
    }
}
