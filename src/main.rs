//! `parhelion` command line: parse, call the library, print, map errors to exit codes
//! (0 success, 2 bad input, 1 internal failure).

use clap::{Parser, Subcommand};
use parhelion::report::files::{refuse_input, write_atomic};
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
}

#[derive(Subcommand)]
enum Verb {
    /// Run the year for every option of a scenario and print the feasibility table.
    Evaluate {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Write hourly records (one row per hour and option) to this CSV file.
        #[arg(long, value_name = "FILE.csv")]
        hourly: Option<PathBuf>,
        /// Write the JSON summary to this file, or `-` for standard output.
        #[arg(long, value_name = "FILE|-")]
        json: Option<String>,
        /// Also print a monthly table for each option.
        #[arg(long)]
        monthly: bool,
        /// Print nothing on success (files are still written).
        #[arg(long)]
        quiet: bool,
    },
    /// Write a commented starter scenario that runs as is (never overwrites a file).
    Init {
        /// Where to write it.
        #[arg(default_value = "scenario.toml")]
        path: PathBuf,
    },
    /// Monthly summary of the weather a scenario will use.
    Weather {
        /// Scenario file (TOML).
        scenario: PathBuf,
        /// Also write the summary as CSV.
        #[arg(long, value_name = "FILE.csv")]
        csv: Option<PathBuf>,
    },
    /// Print every reference check with value, expected, tolerance, source and pass/fail.
    Checks {
        /// Print as JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
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

fn inputs_of(l: &scenario::Loaded) -> Vec<PathBuf> {
    let mut v = vec![l.path.clone()];
    if let Some(f) = &l.scenario.weather.file {
        v.push(l.base_dir.join(&f.path));
    }
    if let Some(f) = &l.scenario.load.file {
        v.push(l.base_dir.join(&f.path));
    }
    v
}

fn print(s: &str) -> Result<(), Error> {
    let mut out = std::io::stdout().lock();
    // A closed pipe (`| head`) is not a failure of the run.
    match out.write_all(s.as_bytes()).and_then(|_| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(Error::Write {
            path: PathBuf::from("(standard output)"),
            source: e,
        }),
        _ => Ok(()),
    }
}

fn run(cli: Cli) -> Result<ExitCode, Error> {
    match cli.verb {
        Verb::Evaluate {
            scenario: path,
            hourly,
            json,
            monthly,
            quiet,
        } => {
            let l = scenario::load(&path)?;
            let inputs = inputs_of(&l);
            if let Some(h) = &hourly {
                refuse_input(h, &inputs)?;
            }
            if let Some(j) = json.as_deref().filter(|j| *j != "-") {
                refuse_input(Path::new(j), &inputs)?;
            }
            let ev = scenario::build::evaluate(&l)?;
            if let Some(h) = &hourly {
                write_atomic(h, &parhelion::report::hourly::render(&ev)?)?;
            }
            match json.as_deref() {
                Some("-") => print(&String::from_utf8_lossy(&parhelion::report::json::render(
                    &ev,
                )?))?,
                Some(j) => write_atomic(Path::new(j), &parhelion::report::json::render(&ev)?)?,
                None => {}
            }
            if !quiet && json.as_deref() != Some("-") {
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
            if path.exists() {
                return Err(Error::input(
                    "PATH",
                    path.display(),
                    "already exists: init never overwrites a file; give another path",
                ));
            }
            write_atomic(&path, scenario::starter::STARTER.as_bytes())?;
            print(&format!(
                "wrote {} — run it with: parhelion evaluate {}\n",
                path.display(),
                path.display()
            ))?;
            Ok(ExitCode::SUCCESS)
        }
        Verb::Weather {
            scenario: path,
            csv,
        } => {
            let l = scenario::load(&path)?;
            if let Some(c) = &csv {
                refuse_input(c, &inputs_of(&l))?;
            }
            let p = scenario::build::prepare(&l)?;
            let built = scenario::build::build_options(&l, &p)?;
            let s = scenario::build::weather_summary(&p, &built);
            if let Some(c) = &csv {
                write_atomic(c, &parhelion::report::weather::render_csv(&s)?)?;
            }
            print(&parhelion::report::weather::render(&s))?;
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
                print(&format!("{v}\n"))?;
            } else {
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
