//! The HTML report in a real browser (Debian's headless Chromium): every chart is laid out with
//! a size, the tables are in the DOM, nothing overflows its box, and a screenshot renders.
//! The browser is found as `$PARHELION_CHROMIUM`, else `chromium` or `chromium-browser` on the
//! `PATH`. Without one these tests say on standard error that they are skipped and pass, so
//! `cargo test` runs on a machine with only the Rust toolchain; under `CI=true` a missing browser
//! is a failure (`.ci/run` installs Debian's `chromium`).

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::OnceLock;
use std::sync::atomic::{AtomicUsize, Ordering};

/// The browser to use, if any: `$PARHELION_CHROMIUM`, else the first of `chromium`,
/// `chromium-browser` found on the `PATH`.
fn find_chromium() -> Option<PathBuf> {
    if let Some(p) = std::env::var_os("PARHELION_CHROMIUM").filter(|p| !p.is_empty()) {
        return Some(PathBuf::from(p));
    }
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .flat_map(|d| ["chromium", "chromium-browser"].map(|n| d.join(n)))
        .find(|p| p.is_file())
}

/// The browser, or `None` after saying on standard error that `test` is skipped. Under
/// `CI=true` a missing browser fails the test instead.
fn browser_or_skip(test: &str) -> Option<PathBuf> {
    let found = find_chromium();
    if found.is_none() {
        let why = "no Chromium found (set PARHELION_CHROMIUM, or install `chromium`, \
                   e.g. apt-get install -y chromium)";
        assert!(
            std::env::var("CI").as_deref() != Ok("true"),
            "{test}: {why}; CI=true requires it"
        );
        // Straight to the stream, not `eprintln!`, so the test harness does not swallow it.
        let _ = writeln!(std::io::stderr(), "SKIPPED {test}: {why}");
    }
    found
}

fn chromium(browser: &Path, args: &[&str], page: &Path) -> std::process::Output {
    // A fresh profile per run: two browsers on one profile refuse to start.
    static RUN: AtomicUsize = AtomicUsize::new(0);
    let profile = std::env::temp_dir().join(format!(
        "parhelion-chromium-{}-{}",
        std::process::id(),
        RUN.fetch_add(1, Ordering::SeqCst)
    ));
    let _ = std::fs::remove_dir_all(&profile);
    std::fs::create_dir_all(&profile).unwrap();
    let out = Command::new(browser)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
        ])
        .arg(format!("--user-data-dir={}", profile.display()))
        .args(args)
        .arg(format!("file://{}", page.display()))
        .output()
        .unwrap();
    let _ = std::fs::remove_dir_all(&profile);
    out
}

fn report() -> &'static PathBuf {
    static P: OnceLock<PathBuf> = OnceLock::new();
    P.get_or_init(|| {
        let d =
            std::env::temp_dir().join(format!("parhelion-report-browser-{}", std::process::id()));
        std::fs::create_dir_all(&d).unwrap();
        let p = d.join("report.html");
        let sc = Path::new(env!("CARGO_MANIFEST_DIR")).join("scenarios/port-meridian-clinic.toml");
        let st = Command::new(env!("CARGO_BIN_EXE_parhelion"))
            .arg("evaluate")
            .arg(sc)
            .args(["--quiet", "--report"])
            .arg(&p)
            .output()
            .unwrap();
        assert!(
            st.status.success(),
            "{}",
            String::from_utf8_lossy(&st.stderr)
        );
        p
    })
}

/// Value of attribute `name` in the start tag `tag`.
fn attr<'a>(tag: &'a str, name: &str) -> Option<&'a str> {
    let k = format!(" {name}=\"");
    let p = tag.find(&k)? + k.len();
    Some(&tag[p..p + tag[p..].find('"')?])
}

#[test]
fn dom_has_sized_charts_tables_and_no_overflow() {
    let Some(browser) = browser_or_skip("dom_has_sized_charts_tables_and_no_overflow") else {
        return;
    };
    let out = chromium(
        &browser,
        &["--dump-dom", "--window-size=1200,3000"],
        report(),
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let dom = String::from_utf8_lossy(&out.stdout);
    for id in parhelion::report::html::CHARTS {
        let p = dom
            .find(&format!("<svg id=\"{id}\""))
            .unwrap_or_else(|| panic!("{id} not in DOM"));
        let tag = &dom[p..p + dom[p..].find('>').unwrap()];
        for a in ["width", "height"] {
            let v: f64 = attr(tag, a)
                .unwrap_or_else(|| panic!("{id} {a}"))
                .parse()
                .unwrap();
            assert!(v > 0.0, "{id} {a} = {v}");
        }
    }
    // Four figure tables, the method table and the check counts.
    assert!(
        dom.matches("<table").count() >= 6,
        "{}",
        dom.matches("<table").count()
    );
    assert!(dom.contains("<th>thermal COP</th>"));
    // The page's own layout check ran and found no element wider than its box.
    let body = &dom[dom.find("<body").unwrap()..];
    let body = &body[..body.find('>').unwrap()];
    assert_eq!(
        attr(body, "data-overflow"),
        Some("0"),
        "overflowing elements: {:?}",
        attr(body, "data-overflow-what")
    );
}

#[test]
fn screenshot_renders_at_window_width() {
    let Some(browser) = browser_or_skip("screenshot_renders_at_window_width") else {
        return;
    };
    let png = report().with_file_name("report.png");
    let _ = std::fs::remove_file(&png);
    let out = chromium(
        &browser,
        &[
            &format!("--screenshot={}", png.display()),
            "--window-size=1200,3000",
        ],
        report(),
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let b = std::fs::read(&png).expect("no screenshot written");
    assert!(b.len() > 10_000, "screenshot only {} bytes", b.len());
    // PNG signature, then the IHDR chunk: length 13, type, width, height (big-endian),
    // as in the PNG specification (ISO/IEC 15948, §11.2.2).
    assert_eq!(&b[..8], b"\x89PNG\r\n\x1a\n");
    assert_eq!(&b[12..16], b"IHDR");
    let w = u32::from_be_bytes([b[16], b[17], b[18], b[19]]);
    let h = u32::from_be_bytes([b[20], b[21], b[22], b[23]]);
    assert_eq!((w, h), (1200, 3000));
}
