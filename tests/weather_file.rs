//! Weather CSV reader: one test per class of bad input, plus unit conversion, instant
//! averaging and Erbs derivation. Files are written into a fresh temporary folder per test.

use parhelion::Error;
use parhelion::sun::geometry as geo;
use parhelion::weather::file::{FileSpec, read};
use parhelion::weather::{HOURS, Humidity, decompose};
use std::path::PathBuf;
use std::sync::atomic::{AtomicUsize, Ordering};

static COUNTER: AtomicUsize = AtomicUsize::new(0);

/// A fresh folder under the system temp dir.
fn temp_dir(name: &str) -> PathBuf {
    let n = COUNTER.fetch_add(1, Ordering::SeqCst);
    let d = std::env::temp_dir().join(format!(
        "parhelion-weather-{}-{name}-{n}",
        std::process::id()
    ));
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// GHI of row `i` (a plain daytime bump, W/m²) and dry-bulb (°C): test patterns only.
fn ghi_of(i: usize) -> f64 {
    let h = (i % 24) as f64 + 0.5;
    if (6.0..18.0).contains(&h) {
        (800.0 * ((h - 6.0) / 12.0 * std::f64::consts::PI).sin()).round()
    } else {
        0.0
    }
}
fn tdb_of(i: usize) -> f64 {
    20.0 + (i % 24) as f64 * 0.25
}

/// A CSV text with header `GHI,DNI,DHI,Tdb,RH` and `rows` rows.
fn csv_text(rows: usize) -> String {
    let mut s = String::from("GHI,DNI,DHI,Tdb,RH\n");
    for i in 0..rows {
        let g = ghi_of(i);
        s.push_str(&format!("{g},{},{},{},55\n", 0.5 * g, 0.4 * g, tdb_of(i)));
    }
    s
}

fn write(dir: &std::path::Path, text: &str) {
    std::fs::write(dir.join("w.csv"), text).unwrap();
}

fn spec(extra: &str) -> FileSpec {
    let t = format!(
        r#"
path = "w.csv"
interval = "ending"
{extra}
[columns]
ghi = "GHI"
dni = "DNI"
dhi = "DHI"
t_db = "Tdb"
rh = "RH"
[units]
ghi = "W/m2"
dni = "W/m2"
dhi = "W/m2"
t_db = "C"
rh = "%"
"#
    );
    toml::from_str(&t).unwrap()
}

/// The error's key, value and allowed text, and that its file is the CSV.
fn input_err(e: Error) -> (String, String, String) {
    match e {
        Error::Input {
            file,
            key,
            value,
            allowed,
        } => {
            assert!(file.ends_with("w.csv"), "file = {file}");
            (key, value, allowed)
        }
        other => panic!("not an input error: {other}"),
    }
}

#[test]
fn good_file_reads_as_given() {
    let d = temp_dir("good");
    write(&d, &csv_text(HOURS));
    let t0 = std::time::Instant::now();
    let y = read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap();
    let ms = t0.elapsed().as_secs_f64() * 1e3;
    eprintln!("read 8760 rows in {ms:.1} ms (debug build)");
    assert_eq!(y.hours.len(), HOURS);
    assert_eq!(y.derived_beam_diffuse, None);
    let h = y.hours[12];
    assert_eq!(h.ghi_w_m2, ghi_of(12));
    assert_eq!(h.dni_w_m2, 0.5 * ghi_of(12));
    assert_eq!(h.dhi_w_m2, 0.4 * ghi_of(12));
    assert_eq!(h.t_db_c, tdb_of(12));
    assert_eq!(h.humidity, Humidity::RhPct(55.0));
    assert!(h.p_kpa.is_none() && h.wind_m_s.is_none());
    // "beginning" is the same data.
    let y2 = read(&spec("").clone_with("beginning"), &d, 30.0, 10.0, 1.0).unwrap();
    assert_eq!(y2.hours[12].ghi_w_m2, h.ghi_w_m2);
}

trait WithInterval {
    fn clone_with(&self, interval: &str) -> FileSpec;
}
impl WithInterval for FileSpec {
    fn clone_with(&self, interval: &str) -> FileSpec {
        let mut s = self.clone();
        s.interval = toml::from_str::<toml::Table>(&format!("i = \"{interval}\""))
            .unwrap()
            .get("i")
            .unwrap()
            .clone()
            .try_into()
            .unwrap();
        s
    }
}

#[test]
fn short_file_names_count_and_last_line() {
    let d = temp_dir("short");
    write(&d, &csv_text(8759));
    let (key, value, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    // Header on line 1, 8759 rows: data ended at line 8760.
    assert_eq!(key, "line 8760");
    assert!(value.contains("8759 data rows"), "{value}");
    assert!(allowed.contains("8760"), "{allowed}");
}

#[test]
fn leap_year_needs_drop_feb29() {
    let d = temp_dir("leap");
    write(&d, &csv_text(8784));
    let (_, value, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert!(value.contains("8784"), "{value}");
    assert!(allowed.contains("drop_feb29 = true"), "{allowed}");
    // With the flag: 1 March 00:00 (hour 1416 of 8760) is file row 1440 (0-based).
    let y = read(&spec("drop_feb29 = true"), &d, 30.0, 10.0, 1.0).unwrap();
    assert_eq!(y.hours.len(), HOURS);
    assert_eq!(y.hours[1416].t_db_c, tdb_of(1440));
    assert_eq!(y.hours[HOURS - 1].t_db_c, tdb_of(8783));
    assert!(y.origin.contains("29 February dropped"));
}

#[test]
fn non_numeric_cell_names_line_and_column() {
    let d = temp_dir("nonnum");
    // Data row 101 is on line 102 (index 101 of the lines).
    let text = csv_text(HOURS);
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    lines[101] = lines[101].replacen(",55", ",n/a", 1);
    write(&d, &(lines.join("\n") + "\n"));
    let (key, value, _) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "line 102, column RH");
    assert_eq!(value, "`n/a`");
    // Non-finite numbers are refused too.
    let text = csv_text(HOURS).replacen("0,0,0,20,55", "0,0,0,NaN,55", 1);
    write(&d, &text);
    let (key, _, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "line 2, column Tdb");
    assert!(allowed.contains("finite"));
}

#[test]
fn duplicated_header_is_an_error() {
    let d = temp_dir("dup");
    write(
        &d,
        &csv_text(HOURS).replacen("GHI,DNI,DHI,Tdb,RH", "GHI,DNI,DHI,Tdb,GHI,RH", 1),
    );
    let (key, value, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "header");
    assert_eq!(value, "GHI");
    assert!(allowed.contains("column 1 and column 5"), "{allowed}");
}

#[test]
fn empty_file_is_an_error() {
    let d = temp_dir("empty");
    write(&d, "\n  \n");
    let (key, value, _) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "header");
    assert_eq!(value, "empty file");
}

#[test]
fn missing_column_lists_headers() {
    let d = temp_dir("missing");
    write(&d, &csv_text(HOURS).replacen("Tdb", "Temp", 1));
    let (key, value, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "header");
    assert_eq!(value, "Tdb");
    assert!(
        allowed.contains("headers found: GHI, DNI, DHI, Temp, RH"),
        "{allowed}"
    );
}

#[test]
fn rh_above_100_is_out_of_range() {
    let d = temp_dir("rh");
    let text = csv_text(HOURS).replacen("0,0,0,20,55", "0,0,0,20,140", 1);
    write(&d, &text);
    let (key, value, allowed) = input_err(read(&spec(""), &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "line 2, column RH");
    assert_eq!(value, "140");
    assert!(allowed.contains("between 0 and 100"), "{allowed}");
    // RH as a fraction above 1 is the same error after conversion.
    let text = csv_text(HOURS).replacen("0,0,0,20,55", "0,0,0,20,1.4", 1);
    write(&d, &text);
    let mut s = spec("");
    s.units.rh = toml::from_str::<toml::Table>("u = \"fraction\"")
        .unwrap()
        .get("u")
        .unwrap()
        .clone()
        .try_into()
        .ok();
    let (key, _, _) = input_err(read(&s, &d, 30.0, 10.0, 1.0).unwrap_err());
    assert_eq!(key, "line 2, column RH");
}

#[test]
fn kw_and_kelvin_are_converted() {
    let d = temp_dir("units");
    let mut text = String::from("G,B,D,T,Tdp,p,v\n");
    for i in 0..HOURS {
        let g = ghi_of(i) / 1000.0;
        text.push_str(&format!(
            "{g},{},{},{},{},1013.0,3.5\n",
            0.5 * g,
            0.4 * g,
            tdb_of(i) + 273.15,
            285.15
        ));
    }
    write(&d, &text);
    let s: FileSpec = toml::from_str(
        r#"
path = "w.csv"
interval = "beginning"
columns = { ghi = "G", dni = "B", dhi = "D", t_db = "T", t_dew = "Tdp", pressure = "p", wind = "v" }
units = { ghi = "kW/m2", dni = "kW/m2", dhi = "kW/m2", t_db = "K", t_dew = "K", pressure = "hPa", wind = "m/s" }
"#,
    )
    .unwrap();
    let y = read(&s, &d, 30.0, 10.0, 1.0).unwrap();
    let h = y.hours[12];
    assert!((h.ghi_w_m2 - ghi_of(12)).abs() < 1e-9);
    assert!((h.dni_w_m2 - 0.5 * ghi_of(12)).abs() < 1e-9);
    assert!((h.t_db_c - tdb_of(12)).abs() < 1e-9);
    match h.humidity {
        Humidity::DewPointC(t) => assert!((t - 12.0).abs() < 1e-9),
        other => panic!("{other:?}"),
    }
    assert!((h.p_kpa.unwrap() - 101.3).abs() < 1e-9);
    assert_eq!(h.wind_m_s, Some(3.5));
    // A unit missing for a named column is a spec error naming the key.
    let s2: FileSpec = toml::from_str(
        r#"
path = "w.csv"
interval = "ending"
columns = { ghi = "G", t_db = "T", t_dew = "Tdp" }
units = { ghi = "kW/m2", t_db = "K" }
"#,
    )
    .unwrap();
    let e = read(&s2, &d, 30.0, 10.0, 1.0).unwrap_err().to_string();
    assert!(e.contains("units.t_dew"), "{e}");
    // An unknown unit string is refused by the spec parser.
    assert!(
        toml::from_str::<FileSpec>(
            r#"
path = "w.csv"
interval = "ending"
columns = { ghi = "G", t_db = "T", t_dew = "Tdp" }
units = { ghi = "W/m^2", t_db = "K", t_dew = "K" }
"#
        )
        .is_err()
    );
}

#[test]
fn instant_samples_are_averaged_pairwise() {
    let d = temp_dir("instant");
    write(&d, &csv_text(HOURS));
    let y = read(&spec("").clone_with("instant"), &d, 30.0, 10.0, 1.0).unwrap();
    // Interval 6 (06:00–07:00) is the mean of the samples at 06:00 and 07:00.
    assert_eq!(y.hours[6].ghi_w_m2, 0.5 * (ghi_of(6) + ghi_of(7)));
    assert_eq!(y.hours[6].t_db_c, 0.5 * (tdb_of(6) + tdb_of(7)));
    // The last interval pairs the last sample with the first (the year wraps).
    assert_eq!(
        y.hours[HOURS - 1].t_db_c,
        0.5 * (tdb_of(HOURS - 1) + tdb_of(0))
    );
}

#[test]
fn missing_beam_is_derived_with_erbs_and_flagged() {
    let d = temp_dir("erbs");
    write(&d, &csv_text(HOURS));
    let mut s = spec("");
    s.columns.dni = None;
    let (lat, lon, utc) = (30.0, 10.0, 1.0);
    let y = read(&s, &d, lat, lon, utc).unwrap();
    assert_eq!(y.derived_beam_diffuse, Some("Erbs et al. 1982"));
    // Hour 4000 (day 167, 16:00–17:00): zenith at 16:30 standard time by the D&B closed forms.
    let i = 4000;
    let (doy, hour) = ((i / 24 + 1) as u32, (i % 24) as f64);
    let solar = geo::solar_time_h(hour + 0.5, doy, lon, utc);
    let cz = geo::cos_zenith(
        lat,
        geo::declination_spencer_deg(doy),
        geo::hour_angle_deg(solar),
    );
    let (dni, dhi) = decompose::erbs(
        ghi_of(i),
        cz.acos().to_degrees(),
        geo::extraterrestrial_normal_w_m2(doy),
    );
    let h = y.hours[i];
    assert!(ghi_of(i) > 0.0);
    assert!((h.dni_w_m2 - dni).abs() < 1e-9 && (h.dhi_w_m2 - dhi).abs() < 1e-9);
    // Closure GHI = DHI + DNI cos z.
    assert!((h.dhi_w_m2 + h.dni_w_m2 * cz - h.ghi_w_m2).abs() < 1e-6);
    // Night: nothing.
    assert_eq!((y.hours[2].dni_w_m2, y.hours[2].dhi_w_m2), (0.0, 0.0));
}

#[test]
fn header_row_skips_preamble() {
    let d = temp_dir("preamble");
    write(
        &d,
        &format!("site: test\nsource: made up\n{}", csv_text(HOURS)),
    );
    let y = read(&spec("header_row = 3"), &d, 30.0, 10.0, 1.0).unwrap();
    assert_eq!(y.hours[12].ghi_w_m2, ghi_of(12));
    let e = read(&spec("header_row = 1"), &d, 30.0, 10.0, 1.0).unwrap_err();
    assert!(e.to_string().contains("GHI"), "{e}");
}
