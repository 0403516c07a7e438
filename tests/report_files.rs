//! `evaluate --report` and `--xlsx`: the files are written, the HTML has every section and
//! chart and references nothing on the network, the spreadsheet is a zip with its five sheets,
//! and the cash-flow chart's numbers end at the money table's NPV.

use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::OnceLock;

const BIN: &str = env!("CARGO_BIN_EXE_parhelion");

fn clinic() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("scenarios/port-meridian-clinic.toml")
}

fn tmp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!(
        "parhelion-report-files-{}-{name}",
        std::process::id()
    ));
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// One CLI run writing both files (the slow part: a debug-build year and an 8760 × 6-row sheet).
fn outputs() -> &'static (String, Vec<u8>) {
    static OUT: OnceLock<(String, Vec<u8>)> = OnceLock::new();
    OUT.get_or_init(|| {
        let d = tmp("run");
        let (html, xlsx) = (d.join("r.html"), d.join("r.xlsx"));
        let st = Command::new(BIN)
            .arg("evaluate")
            .arg(clinic())
            .arg("--quiet")
            .arg("--report")
            .arg(&html)
            .arg("--xlsx")
            .arg(&xlsx)
            .output()
            .unwrap();
        assert!(
            st.status.success(),
            "{}",
            String::from_utf8_lossy(&st.stderr)
        );
        let out = (
            std::fs::read_to_string(&html).unwrap(),
            std::fs::read(&xlsx).unwrap(),
        );
        // Written atomically: nothing but the two files is left in the folder.
        let left = std::fs::read_dir(&d).unwrap().count();
        assert_eq!(left, 2, "partial files left behind");
        std::fs::remove_dir_all(&d).unwrap();
        out
    })
}

/// Every `src=`, `href=` and CSS `url(` / `@import` value that points to the network.
fn network_references(html: &str) -> Vec<String> {
    let lower = html.to_ascii_lowercase();
    let mut bad = Vec::new();
    for key in ["src=", "href=", "url(", "@import", "srcset="] {
        let mut from = 0;
        while let Some(p) = lower[from..].find(key) {
            let start = from + p + key.len();
            let v: String = lower[start..]
                .trim_start_matches(['"', '\'', ' '])
                .chars()
                .take(12)
                .collect();
            if v.starts_with("http://") || v.starts_with("https://") || v.starts_with("//") {
                bad.push(format!("{key}{v}"));
            }
            from = start;
        }
    }
    if lower.contains("<link") {
        bad.push("<link".into());
    }
    bad
}

#[test]
fn network_check_can_fail() {
    assert_eq!(
        network_references("<p>x</p><svg xmlns=\"http://www.w3.org/2000/svg\"></svg>").len(),
        0
    );
    assert_eq!(
        network_references("<script src=\"https://cdn.example/x.js\"></script>").len(),
        1
    );
    assert_eq!(
        network_references("<a HREF='//cdn.example/a.css'>").len(),
        1
    );
    assert_eq!(
        network_references("<style>@import \"http://x/y.css\";</style>").len(),
        1
    );
}

#[test]
fn html_has_every_section_and_chart_and_no_network() {
    let (html, _) = outputs();
    for id in parhelion::report::html::SECTIONS
        .iter()
        .chain(&parhelion::report::html::CHARTS)
    {
        assert!(
            html.contains(&format!("id=\"{id}\"")),
            "missing section {id}"
        );
    }
    assert!(html.matches("<svg").count() >= 5);
    assert!(html.contains("<title>Port Meridian clinic (demo) — parhelion "));
    assert!(html.contains(env!("CARGO_PKG_VERSION")));
    // The caution near the top and at the end.
    let caution = "Screening estimate only, not a plant design.";
    let first = html.find(caution).unwrap();
    let last = html.rfind(caution).unwrap();
    assert!(first < html.find("id=\"tables\"").unwrap());
    assert!(last > html.find("id=\"checks\"").unwrap());
    // The tables carry the registry's figures as the library computes them: the reference's
    // cooling and the absorption option's thermal COP and solar share of cooling appear as
    // cells, formatted by the one formatter.
    let l = parhelion::scenario::load(&clinic()).unwrap();
    let ev = parhelion::scenario::build::evaluate(&l).unwrap();
    let fig = |o: &str, key: &str| {
        let o = ev.options.iter().find(|x| x.option == o).unwrap();
        parhelion::feasibility::figures::by_key(key)
            .unwrap()
            .show(&o.annual)
    };
    for (o, key) in [
        ("grid-chiller", "cooling_kwh"),
        ("solar-absorption", "cop_thermal"),
        ("solar-absorption", "solar_share_of_cooling"),
    ] {
        let cell = format!("<td class=\"num\">{}</td>", fig(o, key));
        assert!(html.contains(&cell), "{o} {key}: no cell {cell}");
    }
    assert!(html.contains("@media print"));
    assert!(html.contains("table-layout:fixed"));
    // Money bars and the heat-map caption name what they show.
    assert!(html.contains("annualised cost, CU/yr"));
    assert!(html.contains("Heat map of option <code>solar-absorption</code>"));
    // 8760 heat-map cells.
    let hm = &html[html.find("id=\"chart-heat-map\"").unwrap()..];
    let hm = &hm[..hm.find("</svg>").unwrap()];
    assert_eq!(
        hm.matches("<rect").count(),
        8760 + 20,
        "cells + 20 key swatches"
    );
    let bad = network_references(html);
    assert!(bad.is_empty(), "network references: {bad:?}");
    // The check summary says every check passed.
    assert!(html.contains("reference checks pass"));
}

/// Names and uncompressed sizes of the entries of a zip, from its central directory
/// (PKWARE APPNOTE 6.3: end record signature 0x06054b50, central headers 0x02014b50).
fn zip_entries(b: &[u8]) -> Vec<(String, u32, u16)> {
    let u16le = |p: usize| u16::from_le_bytes([b[p], b[p + 1]]);
    let u32le = |p: usize| u32::from_le_bytes([b[p], b[p + 1], b[p + 2], b[p + 3]]);
    let eocd = (0..=b.len() - 22)
        .rev()
        .find(|&p| u32le(p) == 0x0605_4b50)
        .expect("no end of central directory");
    let n = u16le(eocd + 10) as usize;
    let mut p = u32le(eocd + 16) as usize;
    let mut out = Vec::new();
    for _ in 0..n {
        assert_eq!(u32le(p), 0x0201_4b50, "central header at {p}");
        let method = u16le(p + 10);
        let size = u32le(p + 24);
        let (nl, el, cl) = (
            u16le(p + 28) as usize,
            u16le(p + 30) as usize,
            u16le(p + 32) as usize,
        );
        out.push((
            String::from_utf8_lossy(&b[p + 46..p + 46 + nl]).into_owned(),
            size,
            method,
        ));
        p += 46 + nl + el + cl;
    }
    out
}

#[test]
fn xlsx_is_a_zip_with_the_five_sheets() {
    let (_, x) = outputs();
    assert_eq!(&x[..4], b"PK\x03\x04");
    let e = zip_entries(x);
    let names: Vec<&str> = e.iter().map(|(n, _, _)| n.as_str()).collect();
    for n in [
        "[Content_Types].xml",
        "xl/workbook.xml",
        "xl/sharedStrings.xml",
    ] {
        assert!(names.contains(&n), "{n} missing in {names:?}");
    }
    for i in 1..=5 {
        assert!(names.contains(&format!("xl/worksheets/sheet{i}.xml").as_str()));
    }
    assert!(!names.contains(&"xl/worksheets/sheet6.xml"));
    // The hourly sheet (third) holds 6 options × 8760 rows: its XML is tens of megabytes,
    // at least 52 560 `<row` elements of ≥ 200 bytes each.
    let hourly = e
        .iter()
        .find(|(n, _, _)| n == "xl/worksheets/sheet3.xml")
        .unwrap();
    assert!(
        hourly.1 > 52_560 * 200,
        "hourly sheet only {} bytes",
        hourly.1
    );
    let annual = e
        .iter()
        .find(|(n, _, _)| n == "xl/worksheets/sheet1.xml")
        .unwrap();
    assert!(annual.1 < hourly.1 / 100);
}

#[test]
fn report_and_xlsx_refuse_to_overwrite_the_scenario() {
    let d = tmp("refuse");
    let sc = d.join("s.toml");
    std::fs::copy(clinic(), &sc).unwrap();
    let before = std::fs::read(&sc).unwrap();
    for flag in ["--report", "--xlsx"] {
        let st = Command::new(BIN)
            .arg("evaluate")
            .arg(&sc)
            .arg(flag)
            .arg(&sc)
            .output()
            .unwrap();
        assert_eq!(st.status.code(), Some(2), "{flag}");
        assert!(String::from_utf8_lossy(&st.stderr).contains("is an input of this run"));
        assert_eq!(std::fs::read(&sc).unwrap(), before);
    }
    std::fs::remove_dir_all(&d).unwrap();
}

#[test]
fn cash_flow_chart_ends_at_the_npv_and_starts_at_the_extra_capital() {
    let l = parhelion::scenario::load(&clinic()).unwrap();
    let ev = parhelion::scenario::build::evaluate(&l).unwrap();
    let cum = parhelion::report::html::cumulative_discounted_savings(&l.scenario, &ev)
        .unwrap()
        .unwrap();
    let r = ev
        .options
        .iter()
        .find(|o| o.option == ev.reference)
        .unwrap();
    assert_eq!(cum.len(), ev.options.len() - 1);
    let years = l.scenario.economics.as_ref().unwrap().lifetime_years as usize;
    for (name, v) in &cum {
        let o = ev.options.iter().find(|o| &o.option == name).unwrap();
        assert_eq!(v.len(), years + 1);
        // Year 0: minus the extra capital (table: e.g. pv-chiller 171 480 − 80 730).
        let extra = o.annual.capex.unwrap() - r.annual.capex.unwrap();
        assert!(
            (v[0] + extra).abs() < 1e-6,
            "{name}: {} vs {}",
            v[0],
            -extra
        );
        // Last year: the NPV of the money table (metrics.rs computes it independently).
        let npv = o.annual.npv_vs_reference.unwrap();
        assert!(
            (v[years] - npv).abs() < 1e-6 * npv.abs().max(1.0),
            "{name}: {} vs {npv}",
            v[years]
        );
    }
    // No economics: no cash flow.
    let mut s = l.scenario.clone();
    s.economics = None;
    assert!(
        parhelion::report::html::cumulative_discounted_savings(&s, &ev)
            .unwrap()
            .is_none()
    );
    let html = parhelion::report::html::render(&ev, &s, &[]).unwrap();
    assert!(html.contains("no [economics] section"));
}
