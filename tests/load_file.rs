//! The hourly load file reader against good and bad files. Full-year files are written into
//! a temporary folder; small fixtures live in tests/data/load/.

use parhelion::Error;
use parhelion::load::file::{LoadFileSpec, read};
use std::path::{Path, PathBuf};

const HOURS: usize = 8760;

fn spec(path: &str, toml_extra: &str) -> LoadFileSpec {
    toml::from_str(&format!(
        "path = \"{path}\"\nsensible_column = \"sensible\"\nunits = \"kW\"\n{toml_extra}"
    ))
    .unwrap()
}

/// A fresh temporary folder for one test, removed when dropped.
struct Tmp(PathBuf);

impl std::ops::Deref for Tmp {
    type Target = Path;
    fn deref(&self) -> &Path {
        &self.0
    }
}

impl Drop for Tmp {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

fn tmp(name: &str) -> Tmp {
    let d = std::env::temp_dir().join(format!("parhelion-load-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    Tmp(d)
}

/// Write a file with `header` and `rows` data rows made by `row`.
fn write(dir: &Path, file: &str, header: &str, rows: usize, row: impl Fn(usize) -> String) {
    let mut s = format!("{header}\n");
    for i in 0..rows {
        s.push_str(&row(i));
        s.push('\n');
    }
    std::fs::write(dir.join(file), s).unwrap();
}

fn input_error(e: Error) -> (String, String, String, String) {
    match e {
        Error::Input {
            file,
            key,
            value,
            allowed,
        } => (file, key, value, allowed),
        other => panic!("expected an input error, got {other}"),
    }
}

fn fixtures() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/load")
}

#[test]
fn good_file_with_all_columns() {
    let d = tmp("good");
    // Sensible 10 kW + 0.001 kW per hour index, latent 2 kW, heating 0 in summer hours.
    write(&d, "year.csv", "hour,sensible,latent,heating", HOURS, |i| {
        format!(
            "{i},{},{},{}",
            10.0 + 0.001 * i as f64,
            2.0,
            if i < 2000 { 5.0 } else { 0.0 }
        )
    });
    let s = spec(
        "year.csv",
        "latent_column = \"latent\"\nheating_column = \"heating\"\nt_in_c = 25.0",
    );
    let y = read(&s, &d).unwrap();
    assert_eq!(y.hours.len(), HOURS);
    assert!((y.hours[4000].sensible_kw - 14.0).abs() < 1e-12);
    assert_eq!(y.hours[4000].latent_kw, 2.0);
    assert_eq!(y.hours[1999].heating_kw, 5.0);
    assert_eq!(y.hours[2000].heating_kw, 0.0);
    assert_eq!(y.hours[0].t_in_c, 25.0);
    assert!(y.origin.ends_with("year.csv"));
    // Annual sensible: Σ (10 + 0.001 i) = 87 600 + 0.001 × 8759 × 8760 / 2 = 125 964.42 kWh.
    let total: f64 = y.hours.iter().map(|h| h.sensible_kw).sum();
    assert!((total - 125_964.42).abs() < 1e-6, "{total}");
}

#[test]
fn watts_are_converted() {
    let d = tmp("watts");
    write(&d, "w.csv", "sensible", HOURS, |_| "1500".into());
    let s: LoadFileSpec =
        toml::from_str("path = \"w.csv\"\nsensible_column = \"sensible\"\nunits = \"W\"").unwrap();
    assert_eq!(read(&s, &d).unwrap().hours[10].sensible_kw, 1.5);
}

#[test]
fn short_year_names_the_count() {
    let d = tmp("short");
    write(&d, "short.csv", "sensible", HOURS - 1, |_| "1".into());
    let (file, key, value, allowed) = input_error(read(&spec("short.csv", ""), &d).unwrap_err());
    assert!(file.ends_with("short.csv"));
    assert_eq!(key, "data rows");
    assert!(
        value.starts_with("8759 rows") && value.contains("line 8760"),
        "{value}"
    );
    assert!(allowed.contains("exactly 8760"), "{allowed}");
}

#[test]
fn long_year_names_the_first_extra_line() {
    let d = tmp("long");
    write(&d, "long.csv", "sensible", HOURS + 1, |_| "1".into());
    let (_, key, value, _) = input_error(read(&spec("long.csv", ""), &d).unwrap_err());
    assert_eq!(key, "data rows");
    assert!(value.contains("line 8762"), "{value}");
}

#[test]
fn non_numeric_cell() {
    let d = tmp("nonnum");
    write(&d, "bad.csv", "hour,sensible", HOURS, |i| {
        if i == 99 {
            format!("{i},n/a")
        } else {
            format!("{i},3")
        }
    });
    let (_, key, value, allowed) = input_error(read(&spec("bad.csv", ""), &d).unwrap_err());
    // Hour 99 is data row 100, on line 101.
    assert_eq!(key, "line 101, column sensible");
    assert_eq!(value, "`n/a`");
    assert!(allowed.contains("kW"), "{allowed}");
}

#[test]
fn infinite_cell() {
    let d = tmp("inf");
    write(&d, "inf.csv", "sensible", HOURS, |i| {
        if i == 0 { "inf".into() } else { "1".into() }
    });
    let (_, key, _, _) = input_error(read(&spec("inf.csv", ""), &d).unwrap_err());
    assert_eq!(key, "line 2, column sensible");
}

#[test]
fn negative_load() {
    let d = tmp("neg");
    write(&d, "neg.csv", "sensible", HOURS, |i| {
        if i == 5000 { "-0.5".into() } else { "1".into() }
    });
    let (_, key, value, allowed) = input_error(read(&spec("neg.csv", ""), &d).unwrap_err());
    assert_eq!(key, "line 5002, column sensible");
    assert_eq!(value, "-0.5");
    assert!(allowed.contains("≥ 0"), "{allowed}");
}

#[test]
fn missing_column_suggests_a_name() {
    let d = tmp("missing");
    write(&d, "m.csv", "hour,sensible_kw", HOURS, |i| format!("{i},1"));
    let (_, key, value, allowed) = input_error(read(&spec("m.csv", ""), &d).unwrap_err());
    assert_eq!(key, "header");
    assert_eq!(value, "no column `sensible`");
    assert!(
        allowed.contains("hour, sensible_kw") && allowed.contains("did you mean `sensible_kw`"),
        "{allowed}"
    );
}

#[test]
fn missing_cell_in_short_row() {
    let d = tmp("cell");
    write(&d, "c.csv", "hour,sensible", HOURS, |i| {
        if i == 3 { "3".into() } else { format!("{i},1") }
    });
    let (_, key, value, _) = input_error(read(&spec("c.csv", ""), &d).unwrap_err());
    assert_eq!(key, "line 5, column sensible");
    assert_eq!(value, "(missing)");
}

#[test]
fn duplicate_header_fixture() {
    let (file, key, value, allowed) =
        input_error(read(&spec("duplicate_header.csv", ""), &fixtures()).unwrap_err());
    assert!(file.ends_with("duplicate_header.csv"));
    assert_eq!(key, "header");
    assert!(
        value.contains("`q_sens`") && value.contains("columns 2 and 4"),
        "{value}"
    );
    assert!(allowed.contains("unique"));
}

#[test]
fn empty_file_fixture() {
    let (_, key, value, _) = input_error(read(&spec("empty.csv", ""), &fixtures()).unwrap_err());
    assert_eq!(key, "header");
    assert_eq!(value, "empty file");
}

#[test]
fn missing_file_is_a_read_error() {
    let e = read(&spec("nowhere.csv", ""), &fixtures()).unwrap_err();
    assert!(matches!(e, Error::Read { .. }), "{e}");
    assert!(e.is_bad_input());
}

#[test]
fn unknown_key_and_unit_rejected() {
    assert!(
        toml::from_str::<LoadFileSpec>("path = \"a\"\nsensible_column = \"s\"\nunits = \"MW\"")
            .is_err()
    );
    assert!(
        toml::from_str::<LoadFileSpec>(
            "path = \"a\"\nsensible_column = \"s\"\nunits = \"kW\"\nsensibel = 1"
        )
        .is_err()
    );
}
