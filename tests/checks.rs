//! Every reference check in `reference/` passes (the same checks `parhelion checks` prints).

#[test]
fn every_reference_check_passes() {
    let checks = parhelion::checks::run_all().expect("check tables parse");
    let failed: Vec<String> = checks
        .iter()
        .filter(|c| !c.passed())
        .map(|c| {
            format!(
                "{} / {}: {} vs {} ± {} ({})",
                c.group, c.case, c.value, c.expected, c.tolerance, c.source
            )
        })
        .collect();
    assert!(
        failed.is_empty(),
        "{} checks failed:\n{}",
        failed.len(),
        failed.join("\n")
    );
    for group in [
        "sun",
        "sky",
        "weather",
        "psychro",
        "chiller",
        "load",
        "collector",
        "storage",
    ] {
        assert!(
            checks.iter().any(|c| c.group == group),
            "no checks in group {group}"
        );
    }
    assert!(
        checks.iter().all(|c| !c.source.trim().is_empty()),
        "every check names its source"
    );
}
