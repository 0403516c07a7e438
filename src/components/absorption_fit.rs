//! Calibration of a sized absorption machine to a manufacturer's performance table.
//!
//! A datasheet is a CSV file, `#` lines are comments, with a header naming the columns
//! `t_hw_in_c, t_cw_in_c, t_chw_out_c, capacity_kw, cop` (any order, other columns ignored):
//! at each row's hot-water inlet, cooling-water inlet and chilled-water outlet temperatures,
//! the cooling capacity and thermal COP the manufacturer states, at the rated flows of the
//! three circuits. At least [`MIN_ROWS`] rows.
//!
//! The fit: five parameters, the multipliers of the four external UAs sized at rating
//! (generator, absorber, condenser, evaporator), each kept in (0.2, 5) by
//! `f = exp(ln 5 · tanh p)`, and the solution heat-exchanger effectiveness, kept in
//! (0.3, 0.98) by a logistic map. For each row the machine is solved with the row's supply
//! temperature fixed ([`Mode::GivenSupply`]); the residuals are the relative capacity error
//! divided by [`BOUND_RMS_CAPACITY`] and the COP error divided by [`BOUND_RMS_COP`], so that
//! each counts in units of its bound. Levenberg–Marquardt (`num::lm`) from the rated machine
//! (multipliers 1, the rated effectiveness).
//!
//! The fit is refused when the RMS relative capacity error exceeds [`BOUND_RMS_CAPACITY`]
//! (5 %) or the RMS COP error exceeds [`BOUND_RMS_COP`] (0.03): beyond that, the model with
//! five adjustable parameters cannot represent the table (a different machine type, a table
//! at other flows, or a typing error), and its hour-by-hour figures would not be those of the
//! machine. Both bounds are this project's choice for screening (about the scatter between a
//! catalogue table and measured performance, common practice).

use super::absorption_cycle::{Calibration, CyclePoint, Machine, Mode};
use crate::error::{Error, Result};
use crate::validate;
use std::path::Path;

/// Fewest datasheet rows accepted (five parameters, two residuals a row: three rows would
/// make the count but not pin the trends; six is this project's choice).
pub const MIN_ROWS: usize = 6;
/// Largest RMS relative capacity error of an accepted fit.
pub const BOUND_RMS_CAPACITY: f64 = 0.05;
/// Largest RMS thermal-COP error of an accepted fit.
pub const BOUND_RMS_COP: f64 = 0.03;

const LN_F_MAX: f64 = 1.609_437_912_434_100_3; // ln 5
const EPS_LO: f64 = 0.3;
const EPS_HI: f64 = 0.98;

/// One row of a datasheet.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DatasheetRow {
    /// Line of the file (1-based) the row came from, for messages.
    pub line: usize,
    pub t_hw_in_c: f64,
    pub t_cw_in_c: f64,
    pub t_chw_out_c: f64,
    pub capacity_kw: f64,
    pub cop: f64,
}

/// A datasheet as read.
#[derive(Debug, Clone)]
pub struct Datasheet {
    /// Where it came from (for messages).
    pub file: String,
    pub rows: Vec<DatasheetRow>,
}

const COLUMNS: [(&str, f64, f64, &str); 5] = [
    ("t_hw_in_c", 40.0, 130.0, "hot water entering, °C"),
    ("t_cw_in_c", 10.0, 45.0, "cooling water entering, °C"),
    ("t_chw_out_c", 3.0, 20.0, "chilled water leaving, °C"),
    ("capacity_kw", 1e-6, 1e5, "cooling capacity, kW (> 0)"),
    (
        "cop",
        1e-6,
        1.5,
        "thermal COP of a single-effect machine (> 0)",
    ),
];

/// Read a datasheet; a relative `path` is taken from `base_dir` (the scenario's folder).
///
/// Errors: unreadable file (`Error::Read`); a missing column (key `header`); a cell that is
/// not a number or outside its range (key `line N, column NAME`); fewer than [`MIN_ROWS`]
/// rows (key `rows`); chilled water not below cooling water below hot water in a row.
pub fn read(path: &str, base_dir: &Path) -> Result<Datasheet> {
    let p = if Path::new(path).is_absolute() {
        Path::new(path).to_path_buf()
    } else {
        base_dir.join(path)
    };
    let text = std::fs::read_to_string(&p).map_err(|source| Error::Read {
        path: p.clone(),
        source,
    })?;
    parse(&p.display().to_string(), &text)
}

/// Parse datasheet text (see [`read`]); `file` names it in errors.
pub fn parse(file: &str, text: &str) -> Result<Datasheet> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(true)
        .flexible(true)
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let headers = rdr
        .headers()
        .map_err(|e| {
            Error::input("header", e, "a CSV header row naming the columns").within(file, "")
        })?
        .clone();
    let mut idx = [0usize; 5];
    for (k, (name, ..)) in COLUMNS.iter().enumerate() {
        idx[k] = headers.iter().position(|h| h == *name).ok_or_else(|| {
            Error::input(
                "header",
                headers.iter().collect::<Vec<_>>().join(","),
                "must name the columns t_hw_in_c, t_cw_in_c, t_chw_out_c, capacity_kw, cop",
            )
            .within(file, "")
        })?;
    }
    let mut rows = Vec::new();
    for rec in rdr.records() {
        let rec =
            rec.map_err(|e| Error::input("rows", e, "CSV rows of numbers").within(file, ""))?;
        let line = rec.position().map(|p| p.line() as usize).unwrap_or(0);
        let mut v = [0.0; 5];
        for (k, (name, lo, hi, meaning)) in COLUMNS.iter().enumerate() {
            let cell = rec.get(idx[k]).unwrap_or("");
            let key = format!("line {line}, column {name}");
            let x: f64 = cell.parse().map_err(|_| {
                Error::input(key.clone(), format!("{cell:?}"), *meaning).within(file, "")
            })?;
            validate::in_range(&key, x, *lo, *hi, meaning).map_err(|e| e.within(file, ""))?;
            v[k] = x;
        }
        let row = DatasheetRow {
            line,
            t_hw_in_c: v[0],
            t_cw_in_c: v[1],
            t_chw_out_c: v[2],
            capacity_kw: v[3],
            cop: v[4],
        };
        if !(row.t_chw_out_c < row.t_cw_in_c && row.t_cw_in_c + 10.0 < row.t_hw_in_c) {
            return Err(Error::input(
                format!("line {line}"),
                format!(
                    "hot {} °C, cooling {} °C, chilled {} °C",
                    row.t_hw_in_c, row.t_cw_in_c, row.t_chw_out_c
                ),
                "chilled water below cooling water, and hot water at least 10 K above it",
            )
            .within(file, ""));
        }
        rows.push(row);
    }
    if rows.len() < MIN_ROWS {
        return Err(Error::input(
            "rows",
            rows.len(),
            format!("at least {MIN_ROWS} performance rows to fit five parameters"),
        )
        .within(file, ""));
    }
    Ok(Datasheet {
        file: file.to_string(),
        rows,
    })
}

/// The model against one datasheet row after the fit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RowFit {
    pub row: DatasheetRow,
    pub capacity_kw: f64,
    pub cop: f64,
}

impl RowFit {
    /// (model − datasheet) / datasheet capacity.
    pub fn capacity_error(&self) -> f64 {
        (self.capacity_kw - self.row.capacity_kw) / self.row.capacity_kw
    }
    /// model − datasheet COP.
    pub fn cop_error(&self) -> f64 {
        self.cop - self.row.cop
    }
}

/// What a fit found.
#[derive(Debug, Clone)]
pub struct FitReport {
    pub file: String,
    pub calibration: Calibration,
    pub rows: Vec<RowFit>,
    /// RMS of the relative capacity errors.
    pub rms_capacity: f64,
    /// RMS of the COP errors.
    pub rms_cop: f64,
    /// Accepted Levenberg–Marquardt steps.
    pub iterations: u32,
    /// The machine with the fitted UAs and effectiveness.
    pub machine: Machine,
}

impl FitReport {
    /// Whether both RMS errors are within their bounds.
    pub fn within_bounds(&self) -> bool {
        self.rms_capacity <= BOUND_RMS_CAPACITY && self.rms_cop <= BOUND_RMS_COP
    }

    /// `Ok` when [`FitReport::within_bounds`]; else an input error on the key `datasheet`
    /// naming the file, the RMS errors, the bounds and the worst row.
    pub fn accept(&self) -> Result<()> {
        if self.within_bounds() {
            return Ok(());
        }
        let worst = self
            .rows
            .iter()
            .max_by(|a, b| {
                let ka = (a.capacity_error() / BOUND_RMS_CAPACITY).powi(2)
                    + (a.cop_error() / BOUND_RMS_COP).powi(2);
                let kb = (b.capacity_error() / BOUND_RMS_CAPACITY).powi(2)
                    + (b.cop_error() / BOUND_RMS_COP).powi(2);
                ka.total_cmp(&kb)
            })
            .copied();
        let worst = worst
            .map(|w| {
                format!(
                    "; worst line {}: capacity {:.2} kW vs {:.2} kW, COP {:.3} vs {:.3}",
                    w.row.line, w.capacity_kw, w.row.capacity_kw, w.cop, w.row.cop
                )
            })
            .unwrap_or_default();
        Err(Error::input(
            "datasheet",
            format!(
                "{} fitted with RMS capacity error {:.1} %, RMS COP error {:.3}{worst}",
                self.file,
                100.0 * self.rms_capacity,
                self.rms_cop
            ),
            format!(
                "a fit within {:.0} % RMS capacity and {:.2} RMS COP: the model cannot represent this table (check its units, flows and machine type)",
                100.0 * BOUND_RMS_CAPACITY,
                BOUND_RMS_COP
            ),
        ))
    }
}

fn logistic(p: f64) -> f64 {
    1.0 / (1.0 + (-p).exp())
}

fn calibration_of(p: &[f64]) -> Calibration {
    let f = |k: usize| (LN_F_MAX * p[k].tanh()).exp();
    Calibration {
        ua_multipliers: [f(0), f(1), f(2), f(3)],
        sol_hx_effectiveness: EPS_LO + (EPS_HI - EPS_LO) * logistic(p[4]),
    }
}

fn solve_row(m: &Machine, r: &DatasheetRow) -> Result<CyclePoint> {
    m.solve(
        Mode::GivenSupply {
            t_hw_in_c: r.t_hw_in_c,
        },
        r.t_cw_in_c,
        r.t_chw_out_c,
        None,
    )
}

/// Fit `rated` (the machine sized at its rating) to `sheet`, from the starting point
/// `start` (`None`: multipliers 1 and the rated effectiveness).
///
/// Returns the report whether or not it is within the bounds (call [`FitReport::accept`]).
/// Errors: `Input` naming the row when the starting machine makes no cooling at a row (a
/// row far outside what the rating implies), `Internal` when the least-squares solve fails.
pub fn fit(rated: &Machine, sheet: &Datasheet, start: Option<Calibration>) -> Result<FitReport> {
    let start = start.unwrap_or(Calibration {
        ua_multipliers: [1.0; 4],
        sol_hx_effectiveness: rated.rating.sol_hx_effectiveness,
    });
    let mut p0 = vec![0.0; 5];
    for (pk, f) in p0.iter_mut().zip(start.ua_multipliers) {
        *pk = (f.clamp(0.21, 4.9).ln() / LN_F_MAX).atanh();
    }
    let e = ((start.sol_hx_effectiveness - EPS_LO) / (EPS_HI - EPS_LO)).clamp(0.01, 0.99);
    p0[4] = (e / (1.0 - e)).ln();

    // A row the starting machine cannot solve cannot be fitted: name it.
    let m0 = rated.calibrated(&calibration_of(&p0))?;
    for r in &sheet.rows {
        solve_row(&m0, r).map_err(|e| {
            Error::input(
                format!("line {}", r.line),
                format!(
                    "hot {} °C, cooling {} °C, chilled {} °C",
                    r.t_hw_in_c, r.t_cw_in_c, r.t_chw_out_c
                ),
                format!("a row where the machine rated here makes cooling ({e})"),
            )
            .within(&sheet.file, "")
        })?;
    }

    let residuals = |p: &[f64]| -> Result<Vec<f64>> {
        let m = rated.calibrated(&calibration_of(p))?;
        let mut out = Vec::with_capacity(2 * sheet.rows.len());
        for r in &sheet.rows {
            let s = solve_row(&m, r)?;
            out.push((s.q_evap_kw - r.capacity_kw) / r.capacity_kw / BOUND_RMS_CAPACITY);
            out.push((s.cop() - r.cop) / BOUND_RMS_COP);
        }
        Ok(out)
    };
    let f = crate::num::lm::levenberg_marquardt_scaled(
        "absorption datasheet fit",
        &p0,
        200,
        1e-5,
        residuals,
    )?;
    let calibration = calibration_of(&f.p);
    let machine = rated.calibrated(&calibration)?;
    let mut rows = Vec::with_capacity(sheet.rows.len());
    for r in &sheet.rows {
        let s = solve_row(&machine, r)?;
        rows.push(RowFit {
            row: *r,
            capacity_kw: s.q_evap_kw,
            cop: s.cop(),
        });
    }
    let n = rows.len() as f64;
    let rms_capacity = (rows.iter().map(|r| r.capacity_error().powi(2)).sum::<f64>() / n).sqrt();
    let rms_cop = (rows.iter().map(|r| r.cop_error().powi(2)).sum::<f64>() / n).sqrt();
    Ok(FitReport {
        file: sheet.file.clone(),
        calibration,
        rows,
        rms_capacity,
        rms_cop,
        iterations: f.iterations,
        machine,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::components::absorption_cycle::Rating;

    fn rated() -> Machine {
        Machine::size(Rating::typical(35.0)).unwrap()
    }

    /// A table made by the model itself at known changes, over the conditions a catalogue
    /// spans (hot water 75–95 °C, cooling water 27–33 °C, chilled water 6–9 °C).
    fn synthetic(truth: &Calibration) -> Datasheet {
        let m = rated().calibrated(truth).unwrap();
        let mut rows = Vec::new();
        for (i, (t_hw, t_cw, t_chw)) in [
            (88.0, 31.0, 7.0),
            (80.0, 31.0, 7.0),
            (95.0, 31.0, 7.0),
            (88.0, 27.0, 7.0),
            (88.0, 33.0, 7.0),
            (88.0, 31.0, 9.0),
            (80.0, 29.0, 6.0),
            (92.0, 29.0, 8.0),
        ]
        .into_iter()
        .enumerate()
        {
            let s = m
                .solve(Mode::GivenSupply { t_hw_in_c: t_hw }, t_cw, t_chw, None)
                .unwrap();
            rows.push(DatasheetRow {
                line: i + 2,
                t_hw_in_c: t_hw,
                t_cw_in_c: t_cw,
                t_chw_out_c: t_chw,
                capacity_kw: s.q_evap_kw,
                cop: s.cop(),
            });
        }
        Datasheet {
            file: "synthetic".into(),
            rows,
        }
    }

    /// Self-recovery: a table made at known multipliers and effectiveness is fitted back to
    /// them from the rated machine.
    #[test]
    fn recovers_known_changes() {
        let truth = Calibration {
            ua_multipliers: [0.8, 1.2, 1.0, 0.9],
            sol_hx_effectiveness: 0.65,
        };
        let sheet = synthetic(&truth);
        let r = fit(&rated(), &sheet, None).unwrap();
        eprintln!("{:?} in {} steps", r.calibration, r.iterations);
        for k in 0..4 {
            assert!(
                (r.calibration.ua_multipliers[k] - truth.ua_multipliers[k]).abs() < 1e-3,
                "multiplier {k}: {:?}",
                r.calibration
            );
        }
        assert!((r.calibration.sol_hx_effectiveness - 0.65).abs() < 1e-3);
        assert!(r.rms_capacity < 1e-5 && r.rms_cop < 1e-6, "{r:?}");
        assert!(r.accept().is_ok());
    }

    /// A table the model cannot follow (capacity rising as the cooling water warms) is
    /// refused, and the message names the datasheet and a line.
    #[test]
    fn refuses_a_table_it_cannot_represent() {
        let mut sheet = synthetic(&Calibration {
            ua_multipliers: [1.0; 4],
            sol_hx_effectiveness: 0.7,
        });
        for r in &mut sheet.rows {
            r.capacity_kw *= 1.0 + 0.08 * (r.t_cw_in_c - 31.0);
            r.cop *= 1.0 + 0.05 * (r.t_hw_in_c - 88.0) / 10.0 * -3.0;
        }
        let r = fit(&rated(), &sheet, None).unwrap();
        assert!(!r.within_bounds(), "{r:?}");
        let msg = r.accept().unwrap_err().to_string();
        assert!(
            msg.contains("synthetic") && msg.contains("worst line"),
            "{msg}"
        );
    }

    #[test]
    fn datasheet_errors_name_the_cell() {
        let head = "# a table\nt_hw_in_c,t_cw_in_c,t_chw_out_c,capacity_kw,cop\n";
        let rows = "88,31,7,35,0.72\n".repeat(6);
        assert!(parse("d.csv", &format!("{head}{rows}")).is_ok());
        let e = parse("d.csv", &format!("{head}{}", "88,31,7,35,0.72\n".repeat(5)))
            .unwrap_err()
            .to_string();
        assert!(e.contains("d.csv: rows = 5"), "{e}");
        let e = parse("d.csv", &format!("{head}{rows}88,31,7,35,abc\n"))
            .unwrap_err()
            .to_string();
        assert!(e.contains("line 9, column cop"), "{e}");
        let e = parse("d.csv", &format!("{head}{rows}88,31,7,-3,0.7\n"))
            .unwrap_err()
            .to_string();
        assert!(e.contains("line 9, column capacity_kw = -3"), "{e}");
        let e = parse("d.csv", "t_hw_in_c,cop\n88,0.7\n")
            .unwrap_err()
            .to_string();
        assert!(e.contains("header"), "{e}");
        let e = parse("d.csv", &format!("{head}{rows}60,55,7,35,0.7\n"))
            .unwrap_err()
            .to_string();
        assert!(e.contains("line 9"), "{e}");
    }
}
