//! `parhelion` command line: parse, call the library, print, map errors to exit codes
//! (0 success, 1 internal failure, 2 bad input, 3 a `size` target not reachable, 130 stopped by
//! Ctrl-C). `-` as an output path is standard output.

mod cli;

use clap::{Parser, Subcommand};
use parhelion::report::files::{check_output, is_stdout, refuse_input, write_atomic};
use parhelion::{Error, scenario};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

/// Screen solar-heat-driven cooling against a conventional electric chiller, hour by hour.
#[derive(Parser)]
#[command(name = "parhelion", version, about, long_about = None)]
struct Cli {
    #[command(subcommand)]
    verb: Verb,
    /// Print nothing on standard output but what `-` sends there, and no progress or notes on
    /// standard error (files are still written; errors are still reported).
    #[arg(long, global = true)]
    quiet: bool,
}

#[derive(Subcommand)]
enum Verb {
    /// Run the year for every option of a scenario and print the feasibility table.
    Evaluate {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Write hourly records (one row per hour and option) to this CSV file, its
        /// FILE.csv.meta.json sidecar beside it; `-` for standard output (no sidecar).
        #[arg(long, value_name = "FILE.csv|-")]
        hourly: Option<PathBuf>,
        /// Write the JSON summary to this file, or `-` for standard output.
        #[arg(long, value_name = "FILE.json|-")]
        json: Option<PathBuf>,
        /// Write the feasibility tables, assumptions and caution as Markdown to this file, or
        /// `-` for standard output.
        #[arg(long, value_name = "FILE.md|-")]
        markdown: Option<PathBuf>,
        /// Write the spreadsheet (annual, monthly, hourly, assumptions, caution sheets).
        #[arg(long, value_name = "FILE.xlsx")]
        xlsx: Option<PathBuf>,
        /// Write the self-contained HTML report with tables and charts, or `-` for standard
        /// output.
        #[arg(long, value_name = "FILE.html|-")]
        report: Option<PathBuf>,
        /// Also print a monthly table for each option.
        #[arg(long)]
        monthly: bool,
    },
    /// Write a commented starter scenario that runs as is (never overwrites a file).
    Init {
        /// Where to write it, or `-` for standard output.
        #[arg(default_value = "scenario.toml")]
        path: PathBuf,
    },
    /// Monthly summary of the weather a scenario will use.
    Weather {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Also write the summary as CSV to this file, or `-` for standard output (instead of
        /// the table).
        #[arg(long, value_name = "FILE.csv|-")]
        csv: Option<PathBuf>,
    },
    /// Find the value of one scenario quantity that meets a target on an annual figure, or
    /// that minimises (maximises) a figure over one or two quantities.
    Size {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// The option whose figure is targeted.
        #[arg(long)]
        option: String,
        /// FIGURE=VALUE, e.g. solar_share_of_cooling=0.3.
        #[arg(long, conflicts_with = "minimize")]
        target: Option<String>,
        /// FIGURE to minimise (fractions, COPs and yields are maximised).
        #[arg(long)]
        minimize: Option<String>,
        /// KEY[=LO:HI] to vary (default options.OPTION.field.gross_area_m2 from 0.2 to 5
        /// times its value); give two for --minimize over two quantities.
        #[arg(long)]
        vary: Vec<String>,
        /// Solver tolerance on the varied quantity (default 0.1 % of its range).
        #[arg(long)]
        tol: Option<f64>,
    },
    /// Run a full grid of designs over scenario keys; one CSV row per design and option.
    Sweep {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// KEY=START:STOP:STEP (repeat for a grid).
        #[arg(long = "set", required = true)]
        set: Vec<String>,
        /// Simulate only this option.
        #[arg(long)]
        option: Option<String>,
        /// Write the CSV here, or `-` for standard output (the default).
        #[arg(long, value_name = "FILE.csv|-")]
        out: Option<PathBuf>,
    },
    /// One-at-a-time sensitivity of an annual figure to each `[[uncertainty.inputs]]`.
    Sensitivity {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// The option whose figure is studied.
        #[arg(long)]
        option: String,
        /// Annual figure (JSON summary key).
        #[arg(long, default_value = "solar_share_of_cooling")]
        figure: String,
    },
    /// Latin-hypercube uncertainty over the `[[uncertainty.inputs]]`: P10/P50/P90 of each
    /// option's figures and the probability each beats the reference.
    Uncertainty {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Number of Latin-hypercube samples (whole years run per option), at least 1.
        #[arg(long)]
        samples: usize,
        /// Seed of the random draw: the same seed gives the same samples.
        #[arg(long, default_value_t = 1)]
        seed: u64,
        /// Figure on which options are compared with the reference (grid electricity:
        /// an option's own PV counts).
        #[arg(long, default_value = "grid_kwh")]
        figure: String,
        /// Write every sample's figures to this CSV, or `-` for standard output (the summary
        /// table then goes to standard error).
        #[arg(long, value_name = "FILE.csv|-")]
        out: Option<PathBuf>,
    },
    /// Fit each absorption option that names a `datasheet` to it and print the fitted UA
    /// multipliers, SHX effectiveness and the error at every row; exit status 2 when a fit
    /// is beyond its bounds.
    Calibrate {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Only this option.
        #[arg(long)]
        option: Option<String>,
        /// Print JSON (an array, one object per option) instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Print one state point of a working substance, to check by hand.
    State {
        /// The substance.
        #[command(subcommand)]
        substance: Substance,
    },
    /// Print every reference check with value, expected, tolerance, source and pass/fail.
    Checks {
        /// Print as JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
}

#[derive(Subcommand)]
enum Substance {
    /// Humid air (ASHRAE Handbook—Fundamentals 2017 ch. 1): dry-bulb and one humidity measure.
    /// Enthalpy per kg of dry air, referred to dry air and liquid water at 0 °C.
    Air {
        /// Dry-bulb, °C.
        #[arg(long = "t-c", allow_negative_numbers = true)]
        t_c: f64,
        /// Relative humidity in percent, 0–100 (60 for 60 %, not 0.6).
        #[arg(long, group = "hum", allow_negative_numbers = true)]
        rh: Option<f64>,
        /// Humidity ratio, kg/kg.
        #[arg(long, group = "hum")]
        w: Option<f64>,
        /// Wet-bulb, °C.
        #[arg(long = "t-wb-c", group = "hum", allow_negative_numbers = true)]
        t_wb_c: Option<f64>,
        /// Dew point, °C.
        #[arg(long = "t-dp-c", group = "hum", allow_negative_numbers = true)]
        t_dp_c: Option<f64>,
        /// Barometric pressure, kPa (default: from --elevation-m, else 101.325).
        #[arg(long = "p-kpa", conflicts_with = "elevation_m")]
        p_kpa: Option<f64>,
        /// Elevation, m: standard-atmosphere pressure.
        #[arg(long = "elevation-m", allow_negative_numbers = true)]
        elevation_m: Option<f64>,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Water and steam (IAPWS-IF97): temperature or pressure with a quality on the saturation
    /// line, or temperature and pressure for a single phase. Enthalpy and entropy as IF97:
    /// zero internal energy and entropy of saturated liquid at the triple point.
    Water {
        /// Temperature, °C.
        #[arg(long = "t-c")]
        t_c: Option<f64>,
        /// Pressure, kPa.
        #[arg(long = "p-kpa")]
        p_kpa: Option<f64>,
        /// Vapour quality 0..1 (saturated states).
        #[arg(long)]
        q: Option<f64>,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Lithium-bromide–water solution (Pátek & Klomfar 2006, 273–500 K, x 0–0.75): give the
    /// mass fraction with temperature or pressure. Enthalpy and entropy referred as for water
    /// in IAPWS: zero internal energy and entropy of saturated liquid water at the triple point.
    Libr {
        /// LiBr mass fraction, kg LiBr per kg solution.
        #[arg(long)]
        x: f64,
        /// Temperature, °C.
        #[arg(long = "t-c", conflicts_with = "p_kpa")]
        t_c: Option<f64>,
        /// Equilibrium (vapour) pressure, kPa.
        #[arg(long = "p-kpa")]
        p_kpa: Option<f64>,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// A refrigerant, an organic working fluid (Peng–Robinson) or water/steam (IAPWS-IF97):
    /// temperature or pressure with a quality, or pressure with enthalpy or entropy, or
    /// temperature and pressure. Enthalpy and entropy referred to the IIR convention
    /// (h = 200 kJ/kg, s = 1 kJ/(kg·K) for saturated liquid at 0 °C).
    Fluid {
        /// R245fa, n-pentane, R1233zd(E), toluene, R134a, R32, R290, R1234ze(E), water.
        name: String,
        /// Temperature, °C.
        #[arg(long = "t-c", allow_negative_numbers = true)]
        t_c: Option<f64>,
        /// Pressure, kPa.
        #[arg(long = "p-kpa")]
        p_kpa: Option<f64>,
        /// Vapour quality 0..1 (saturated states).
        #[arg(long)]
        q: Option<f64>,
        /// Specific enthalpy, kJ/kg (IIR reference).
        #[arg(long = "h-kj-kg", allow_negative_numbers = true)]
        h_kj_kg: Option<f64>,
        /// Specific entropy, kJ/(kg·K) (IIR reference).
        #[arg(long = "s-kj-kg-k", allow_negative_numbers = true)]
        s_kj_kg_k: Option<f64>,
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
}

/// Refuse a relative humidity outside 0–100 %, with the hint that it is in percent; note on
/// standard error (unless `quiet`) a value that reads like a fraction (0 < RH ≤ 1).
fn check_rh(rh: f64, quiet: bool) -> Result<(), Error> {
    if !(0.0..=100.0).contains(&rh) {
        return Err(Error::input(
            "--rh",
            rh,
            "relative humidity is in percent, 0 to 100 (60 for 60 %)",
        ));
    }
    if rh > 0.0 && rh <= 1.0 && !quiet {
        let pct = (rh * 100.0 * 1e6).round() / 1e6;
        eprintln!(
            "note: --rh is in percent: {rh} means {rh} % relative humidity; if you meant {pct} %, give --rh {pct}"
        );
    }
    Ok(())
}

fn state(s: Substance, quiet: bool) -> Result<String, Error> {
    use parhelion::props::{fluids, libr};
    use parhelion::props::{psychro, water};
    use parhelion::report::state::{Quantity as Q, render_json, render_text};
    match s {
        Substance::Air {
            t_c,
            rh,
            w,
            t_wb_c,
            t_dp_c,
            p_kpa,
            elevation_m,
            json,
        } => {
            let p = p_kpa
                .unwrap_or_else(|| elevation_m.map_or(101.325, psychro::pressure_at_elevation_kpa));
            if let Some(rh) = rh {
                check_rh(rh, quiet)?;
            }
            let a = match (rh, w, t_wb_c, t_dp_c) {
                (Some(rh), ..) => psychro::state_from_rh(t_c, rh, p)?,
                (_, Some(w), ..) => psychro::state_from_ratio(t_c, w, p)?,
                (_, _, Some(wb), _) => psychro::state_from_wet_bulb(t_c, wb, p)?,
                (_, _, _, Some(dp)) => psychro::state_from_dew_point(t_c, dp, p)?,
                _ => {
                    return Err(Error::input(
                        "humidity",
                        "(none given)",
                        "give one of --rh, --w, --t-wb-c or --t-dp-c",
                    ));
                }
            };
            let q = [
                Q {
                    key: "t_c",
                    label: "dry-bulb, °C",
                    value: Some(a.t_c),
                },
                Q {
                    key: "rh_pct",
                    label: "relative humidity, %",
                    value: Some(a.rh_pct),
                },
                Q {
                    key: "w_kg_kg",
                    label: "humidity ratio, kg/kg",
                    value: Some(a.w_kg_kg),
                },
                Q {
                    key: "t_wb_c",
                    label: "wet-bulb, °C",
                    value: Some(a.t_wb_c),
                },
                Q {
                    key: "t_dp_c",
                    label: "dew point, °C",
                    value: Some(a.t_dp_c),
                },
                Q {
                    key: "h_kj_kg",
                    label: "enthalpy, kJ/kg dry air",
                    value: Some(a.h_kj_kg),
                },
                Q {
                    key: "v_m3_kg",
                    label: "specific volume, m³/kg dry air",
                    value: Some(a.v_m3_kg),
                },
                Q {
                    key: "rho_kg_m3",
                    label: "density of moist air, kg/m³",
                    value: Some(a.rho_kg_m3),
                },
                Q {
                    key: "p_kpa",
                    label: "pressure, kPa",
                    value: Some(a.p_kpa),
                },
            ];
            Ok(if json {
                render_json(&[], &q)
            } else {
                render_text("humid air (ASHRAE 2017)", &q)
            })
        }
        Substance::Water {
            t_c,
            p_kpa,
            q,
            json,
        } => {
            let st = match (t_c, p_kpa, q) {
                (Some(t), None, Some(q)) => water::state_tq(t, q)?,
                (None, Some(p), Some(q)) => water::state_pq(p, q)?,
                (Some(t), Some(p), None) => water::state_tp(t, p)?,
                _ => {
                    return Err(Error::input(
                        "arguments",
                        "(this combination)",
                        "give --t-c with --q, --p-kpa with --q, or --t-c with --p-kpa",
                    ));
                }
            };
            let v = [
                Q {
                    key: "t_c",
                    label: "temperature, °C",
                    value: Some(st.t_c),
                },
                Q {
                    key: "p_kpa",
                    label: "pressure, kPa",
                    value: Some(st.p_kpa),
                },
                Q {
                    key: "q",
                    label: "quality",
                    value: st.q,
                },
                Q {
                    key: "h_kj_kg",
                    label: "enthalpy, kJ/kg",
                    value: Some(st.h_kj_kg),
                },
                Q {
                    key: "s_kj_kg_k",
                    label: "entropy, kJ/(kg·K)",
                    value: Some(st.s_kj_kg_k),
                },
                Q {
                    key: "rho_kg_m3",
                    label: "density, kg/m³",
                    value: Some(st.rho_kg_m3),
                },
                Q {
                    key: "cp_kj_kg_k",
                    label: "cp, kJ/(kg·K)",
                    value: st.cp_kj_kg_k,
                },
            ];
            Ok(if json {
                render_json(&[], &v)
            } else {
                render_text("water (IAPWS-IF97)", &v)
            })
        }
        Substance::Libr {
            x,
            t_c,
            p_kpa,
            json,
        } => {
            let st = match (t_c, p_kpa) {
                (Some(t), None) => libr::state_tx(t, x)?,
                (None, Some(p)) => libr::state_px(p, x)?,
                _ => {
                    return Err(Error::input(
                        "arguments",
                        "(neither)",
                        "give --t-c or --p-kpa with --x",
                    ));
                }
            };
            let v = [
                Q {
                    key: "t_c",
                    label: "temperature, °C",
                    value: Some(st.t_c),
                },
                Q {
                    key: "p_kpa",
                    label: "vapour pressure, kPa",
                    value: Some(st.p_kpa),
                },
                Q {
                    key: "x",
                    label: "LiBr mass fraction",
                    value: Some(st.x),
                },
                Q {
                    key: "h_kj_kg",
                    label: "enthalpy, kJ/kg",
                    value: Some(st.h_kj_kg),
                },
                Q {
                    key: "s_kj_kg_k",
                    label: "entropy, kJ/(kg·K)",
                    value: Some(st.s_kj_kgk),
                },
                Q {
                    key: "rho_kg_m3",
                    label: "density, kg/m³",
                    value: Some(st.rho_kg_m3),
                },
                Q {
                    key: "cp_kj_kg_k",
                    label: "cp, kJ/(kg·K)",
                    value: Some(st.cp_kj_kgk),
                },
                Q {
                    key: "t_cryst_c",
                    label: "crystallisation temperature, °C",
                    value: st.t_cryst_c,
                },
            ];
            Ok(if json {
                render_json(&[], &v)
            } else {
                render_text("LiBr–water solution (Pátek & Klomfar 2006)", &v)
            })
        }
        Substance::Fluid {
            name,
            t_c,
            p_kpa,
            q,
            h_kj_kg,
            s_kj_kg_k,
            json,
        } => {
            let f = fluids::Fluid::from_name(&name)?;
            let st = match (t_c, p_kpa, q, h_kj_kg, s_kj_kg_k) {
                (Some(t), None, Some(q), None, None) => fluids::state_tq(f, t, q)?,
                (None, Some(p), Some(q), None, None) => fluids::state_pq(f, p, q)?,
                (None, Some(p), None, Some(h), None) => fluids::state_ph(f, p, h)?,
                (None, Some(p), None, None, Some(s)) => fluids::state_ps(f, p, s)?,
                (Some(t), Some(p), None, None, None) => fluids::state_tp(f, t, p)?,
                _ => {
                    return Err(Error::input(
                        "arguments",
                        "(this combination)",
                        "give --t-c with --q, --p-kpa with --q, --h-kj-kg or --s-kj-kg-k, or --t-c with --p-kpa",
                    ));
                }
            };
            let v = [
                Q {
                    key: "t_c",
                    label: "temperature, °C",
                    value: Some(st.t_c),
                },
                Q {
                    key: "p_kpa",
                    label: "pressure, kPa",
                    value: Some(st.p_kpa),
                },
                Q {
                    key: "q",
                    label: "quality",
                    value: st.q,
                },
                Q {
                    key: "h_kj_kg",
                    label: "enthalpy, kJ/kg (IIR)",
                    value: Some(st.h_kj_kg),
                },
                Q {
                    key: "s_kj_kg_k",
                    label: "entropy, kJ/(kg·K) (IIR)",
                    value: Some(st.s_kj_kg_k),
                },
                Q {
                    key: "rho_kg_m3",
                    label: "density, kg/m³",
                    value: Some(st.rho_kg_m3),
                },
            ];
            let title = format!("{} ({})", f.name(), f.model());
            Ok(if json {
                render_json(&[("fluid", f.name())], &v)
            } else {
                render_text(&title, &v)
            })
        }
    }
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    match run(cli) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("error: {e}");
            if e.is_bad_input() {
                ExitCode::from(2)
            } else {
                ExitCode::from(1)
            }
        }
    }
}

/// Exit status of a `size` whose target is not reachable in the range searched.
const EXIT_UNREACHABLE: u8 = 3;
/// Exit status of a run stopped by Ctrl-C (128 + SIGINT, as shells report it).
const EXIT_INTERRUPTED: u8 = 130;

fn inputs_of(l: &scenario::Loaded) -> Vec<PathBuf> {
    let mut v = vec![l.path.clone()];
    if let Some(f) = &l.scenario.weather.file {
        v.push(l.base_dir.join(&f.path));
    }
    if let Some(f) = &l.scenario.load.file {
        v.push(l.base_dir.join(&f.path));
    }
    for o in l.scenario.options.values() {
        if let Some(d) = o.absorption.as_ref().and_then(|a| a.datasheet.as_ref()) {
            v.push(l.base_dir.join(d));
        }
    }
    v
}

fn print_bytes(b: &[u8]) -> Result<(), Error> {
    let mut out = std::io::stdout().lock();
    // A closed pipe (`| head`) is not a failure of the run.
    match out.write_all(b).and_then(|_| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(Error::Write {
            path: PathBuf::from("(standard output)"),
            source: e,
        }),
        _ => Ok(()),
    }
}

fn print(s: &str) -> Result<(), Error> {
    print_bytes(s.as_bytes())
}

/// Write an output: to standard output for `-`, else whole to the file.
fn emit(path: &Path, bytes: &[u8]) -> Result<(), Error> {
    if is_stdout(path) {
        print_bytes(bytes)
    } else {
        write_atomic(path, bytes)
    }
}

/// Check a verb's output paths before any work: each folder exists, at most one is `-`.
fn check_outputs(outs: &[(&str, Option<&PathBuf>)]) -> Result<(), Error> {
    let to_stdout: Vec<&str> = outs
        .iter()
        .filter(|(_, p)| p.is_some_and(|p| is_stdout(p)))
        .map(|(f, _)| *f)
        .collect();
    if to_stdout.len() > 1 {
        return Err(Error::input(
            to_stdout.join(", "),
            "-",
            "only one output can go to standard output: give the others a file path",
        ));
    }
    for (flag, p) in outs {
        if let Some(p) = p {
            check_output(flag, p)?;
        }
    }
    Ok(())
}

fn run(cli: Cli) -> Result<ExitCode, Error> {
    let quiet = cli.quiet;
    match cli.verb {
        Verb::Evaluate {
            scenario: path,
            hourly,
            json,
            markdown,
            xlsx,
            report,
            monthly,
        } => {
            if xlsx.as_deref().is_some_and(is_stdout) {
                return Err(Error::input(
                    "--xlsx",
                    "-",
                    "a spreadsheet is a binary file: give a FILE.xlsx path",
                ));
            }
            let outs = [
                ("--hourly", hourly.as_ref()),
                ("--json", json.as_ref()),
                ("--markdown", markdown.as_ref()),
                ("--xlsx", xlsx.as_ref()),
                ("--report", report.as_ref()),
            ];
            check_outputs(&outs)?;
            let l = scenario::load(&path)?;
            let inputs = inputs_of(&l);
            for p in outs.iter().filter_map(|(_, p)| *p) {
                refuse_input(p, &inputs)?;
            }
            let hourly_meta = hourly
                .as_deref()
                .filter(|h| !is_stdout(h))
                .map(parhelion::report::hourly::meta_path);
            if let Some(m) = &hourly_meta {
                refuse_input(m, &inputs)?;
            }
            let ev = scenario::build::evaluate(&l)?;
            if let Some(h) = &hourly {
                emit(h, &parhelion::report::hourly::render(&ev)?)?;
            }
            if let Some(m) = &hourly_meta {
                write_atomic(m, &parhelion::report::hourly::render_meta(&ev)?)?;
            }
            if let Some(m) = &markdown {
                let text = parhelion::report::table::markdown(
                    &ev,
                    &parhelion::scenario::assumptions(&l.scenario),
                );
                emit(m, text.as_bytes())?;
            }
            if let Some(x) = &xlsx {
                let bytes = parhelion::report::xlsx::render(
                    &ev,
                    &parhelion::scenario::assumptions(&l.scenario),
                )?;
                write_atomic(x, &bytes)?;
            }
            if let Some(r) = &report {
                let checks = parhelion::checks::run_all()?;
                let html = parhelion::report::html::render(&ev, &l.scenario, &checks)?;
                emit(r, html.as_bytes())?;
            }
            if let Some(j) = &json {
                emit(j, &parhelion::report::json::render(&ev)?)?;
            }
            let stdout_taken = outs.iter().any(|(_, p)| p.is_some_and(|p| is_stdout(p)));
            if !quiet && !stdout_taken {
                let mut s = parhelion::report::table::feasibility(&ev);
                if monthly {
                    for o in &ev.options {
                        s.push('\n');
                        s.push_str(&parhelion::report::table::monthly(&o.option, &o.monthly));
                    }
                }
                print(&s)?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Init { path } => {
            if is_stdout(&path) {
                if !quiet {
                    print(scenario::starter::STARTER)?;
                }
                return Ok(ExitCode::SUCCESS);
            }
            check_output("PATH", &path)?;
            if path.exists() {
                return Err(Error::input(
                    "PATH",
                    path.display(),
                    "already exists: init never overwrites a file; give another path",
                ));
            }
            write_atomic(&path, scenario::starter::STARTER.as_bytes())?;
            if !quiet {
                print(&format!(
                    "wrote {} — run it with: parhelion evaluate {}\n",
                    path.display(),
                    path.display()
                ))?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Weather {
            scenario: path,
            csv,
        } => {
            check_outputs(&[("--csv", csv.as_ref())])?;
            let l = scenario::load(&path)?;
            if let Some(c) = &csv {
                refuse_input(c, &inputs_of(&l))?;
            }
            let p = scenario::build::prepare(&l)?;
            let built = scenario::build::build_options(&l, &p)?;
            let s = scenario::build::weather_summary(&p, &built);
            if let Some(c) = &csv {
                emit(c, &parhelion::report::weather::render_csv(&s)?)?;
            }
            if !quiet && !csv.as_deref().is_some_and(is_stdout) {
                print(&parhelion::report::weather::render(&s))?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Size {
            scenario,
            option,
            target,
            minimize,
            vary,
            tol,
        } => {
            let (text, met) = cli::explore::size(cli::explore::SizeArgs {
                scenario: &scenario,
                option: &option,
                target: target.as_deref(),
                minimize: minimize.as_deref(),
                vary: &vary,
                tol,
            })?;
            if !quiet {
                print(&text)?;
            }
            Ok(if met {
                ExitCode::SUCCESS
            } else {
                ExitCode::from(EXIT_UNREACHABLE)
            })
        }
        Verb::Sweep {
            scenario,
            set,
            option,
            out,
        } => {
            cli::explore::catch_interrupt();
            check_outputs(&[("--out", out.as_ref())])?;
            if let Some(o) = &out {
                refuse_input(o, std::slice::from_ref(&scenario))?;
            }
            let (csv, note) = cli::explore::sweep(cli::explore::SweepArgs {
                scenario: &scenario,
                set: &set,
                option: option.as_deref(),
                quiet,
            })?;
            emit(out.as_deref().unwrap_or(Path::new("-")), &csv)?;
            if !quiet {
                eprint!("{note}");
            }
            Ok(if cli::explore::interrupted() {
                ExitCode::from(EXIT_INTERRUPTED)
            } else {
                ExitCode::SUCCESS
            })
        }
        Verb::Sensitivity {
            scenario,
            option,
            figure,
        } => {
            let text = cli::explore::sensitivity(&scenario, &option, &figure)?;
            if !quiet {
                print(&text)?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Uncertainty {
            scenario,
            samples,
            seed,
            figure,
            out,
        } => {
            cli::explore::catch_interrupt();
            check_outputs(&[("--out", out.as_ref())])?;
            if let Some(o) = &out {
                refuse_input(o, std::slice::from_ref(&scenario))?;
            }
            let (text, csv) = cli::explore::uncertainty(cli::explore::UncertaintyArgs {
                scenario: &scenario,
                samples,
                seed,
                figure: &figure,
                quiet,
            })?;
            if let Some(o) = &out {
                emit(o, &csv)?;
            }
            if !quiet {
                if out.as_deref().is_some_and(is_stdout) {
                    eprint!("{text}");
                } else {
                    print(&text)?;
                }
            }
            Ok(if cli::explore::interrupted() {
                ExitCode::from(EXIT_INTERRUPTED)
            } else {
                ExitCode::SUCCESS
            })
        }
        Verb::State { substance } => {
            let text = state(substance, quiet)?;
            if !quiet {
                print(&text)?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Calibrate {
            scenario: path,
            option,
            json,
        } => {
            let l = scenario::load(&path)?;
            let file = l.file();
            let mut fits = Vec::new();
            for (name, o) in &l.scenario.options {
                if option.as_ref().is_some_and(|n| n != name) {
                    continue;
                }
                let Some(spec) = o.absorption.as_ref().filter(|a| a.datasheet.is_some()) else {
                    continue;
                };
                let prefix = format!("options.{name}");
                let sheet = scenario::build::read_datasheet(&l, spec)
                    .map_err(|e| e.within(&file, &prefix))?
                    .ok_or_else(|| Error::Internal("datasheet checked".into()))?;
                let fit = parhelion::routes::absorption::calibrate(spec, &sheet)
                    .map_err(|e| e.within(&file, &format!("{prefix}.absorption")))?;
                fits.push((name.clone(), fit));
            }
            if fits.is_empty() {
                return Err(Error::Input {
                    file: file.clone(),
                    key: option.map_or("options".into(), |n| format!("options.{n}")),
                    value: "no absorption section with a datasheet".into(),
                    allowed: "an absorption option whose [options.NAME.absorption] names `datasheet = \"FILE.csv\"`".into(),
                });
            }
            if json {
                let v: Vec<_> = fits
                    .iter()
                    .map(|(n, f)| parhelion::report::calibration::json(n, f))
                    .collect();
                let v = serde_json::to_string_pretty(&v)
                    .map_err(|e| Error::Internal(format!("JSON: {e}")))?;
                if !quiet {
                    print(&format!("{v}\n"))?;
                }
            } else if !quiet {
                let text: Vec<String> = fits
                    .iter()
                    .map(|(n, f)| parhelion::report::calibration::render(n, f))
                    .collect();
                print(&text.join("\n"))?;
            }
            for (name, f) in &fits {
                if let Err(e) = f.accept() {
                    let e = e.within(&file, &format!("options.{name}.absorption"));
                    eprintln!("error: {e}");
                    return Ok(ExitCode::from(2));
                }
            }
            Ok(ExitCode::SUCCESS)
        }
        Verb::Checks { json } => {
            let checks = parhelion::checks::run_all()?;
            let failed = checks.iter().filter(|c| !c.passed()).count();
            if json {
                let v = serde_json::to_string_pretty(
                    &checks
                        .iter()
                        .map(|c| {
                            serde_json::json!({
                                "group": c.group, "table": c.table, "case": c.case,
                                "value": c.value, "expected": c.expected,
                                "tolerance": c.tolerance, "source": c.source, "passed": c.passed()
                            })
                        })
                        .collect::<Vec<_>>(),
                )
                .map_err(|e| Error::Internal(format!("JSON: {e}")))?;
                if !quiet {
                    print(&format!("{v}\n"))?;
                }
            } else if !quiet {
                print(&parhelion::report::checks::render(&checks))?;
            }
            if failed > 0 {
                eprintln!("{failed} of {} checks FAILED", checks.len());
                return Ok(ExitCode::from(1));
            }
            Ok(ExitCode::SUCCESS)
        }
    }
}
