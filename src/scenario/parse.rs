//! TOML text → typed scenario, with errors that name the file, the key path, the line and,
//! for a misspelt key, the nearest allowed key.

use crate::error::Error;
use serde::de::DeserializeOwned;

/// Parse `text` (the contents of `file`) into `T`.
pub fn from_toml<T: DeserializeOwned>(file: &str, text: &str) -> Result<T, Error> {
    if text.trim().is_empty() {
        return Err(Error::Input {
            file: file.to_string(),
            key: "(whole file)".into(),
            value: "empty".into(),
            allowed: "a scenario needs at least [site], [weather], [load], [baseline] and one [options.NAME] section (run `parhelion init` for a starter)".into(),
        });
    }
    let de = toml::Deserializer::parse(text).map_err(|e| syntax_error(file, text, &e))?;
    serde_path_to_error::deserialize(de).map_err(|e| {
        let path = e.path().to_string();
        let inner = e.into_inner();
        schema_error(file, text, &path, &inner)
    })
}

fn line_of(text: &str, span: Option<std::ops::Range<usize>>) -> Option<usize> {
    span.map(|s| text[..s.start.min(text.len())].matches('\n').count() + 1)
}

fn syntax_error(file: &str, text: &str, e: &toml::de::Error) -> Error {
    let line = line_of(text, e.span()).map_or(String::new(), |l| format!("line {l}"));
    Error::Input {
        file: file.to_string(),
        key: line,
        value: "(not valid TOML)".into(),
        allowed: e.message().trim().to_string(),
    }
}

fn schema_error(file: &str, text: &str, path: &str, e: &toml::de::Error) -> Error {
    let msg = e.message().trim().to_string();
    let line = line_of(text, e.span());
    let at = |key: String| match line {
        Some(l) => format!("{key} (line {l})"),
        None => key,
    };
    let path = if path == "." {
        String::new()
    } else {
        path.to_string()
    };
    // serde: "unknown field `x`, expected one of `a`, `b`" / "expected `a` or `b`" /
    // "unknown variant `x`, expected ..."
    for what in ["unknown field", "unknown variant"] {
        if let Some(rest) = msg.strip_prefix(what) {
            let found = between_ticks(rest).into_iter().next().unwrap_or_default();
            let allowed = rest
                .split_once("expected")
                .map_or(Vec::new(), |(_, e)| between_ticks(e));
            let hint = nearest(&found, &allowed)
                .map_or(String::new(), |n| format!("did you mean `{n}`? "));
            // serde_path_to_error already ends the path with the unknown key.
            let key = if what == "unknown field" {
                if path.is_empty() {
                    found.clone()
                } else if path == found || path.ends_with(&format!(".{found}")) {
                    path.clone()
                } else {
                    format!("{path}.{found}")
                }
            } else {
                path.clone()
            };
            return Error::Input {
                file: file.to_string(),
                key: at(key),
                value: if what == "unknown field" {
                    "(unknown key)".into()
                } else {
                    format!("\"{found}\"")
                },
                allowed: format!(
                    "{hint}allowed here: {}",
                    allowed
                        .iter()
                        .map(|a| format!("`{a}`"))
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            };
        }
    }
    if let Some(rest) = msg.strip_prefix("missing field") {
        let field = between_ticks(rest).into_iter().next().unwrap_or_default();
        let key = if path.is_empty() {
            field.clone()
        } else {
            format!("{path}.{field}")
        };
        return Error::Input {
            file: file.to_string(),
            key: at(key),
            value: "(missing)".into(),
            allowed: "this key or section is required (see `parhelion init` for every key with its unit and range)".into(),
        };
    }
    Error::Input {
        file: file.to_string(),
        key: at(if path.is_empty() {
            "(top level)".into()
        } else {
            path
        }),
        value: "(wrong type or value)".into(),
        allowed: msg,
    }
}

fn between_ticks(s: &str) -> Vec<String> {
    s.split('`')
        .skip(1)
        .step_by(2)
        .map(str::to_string)
        .collect()
}

/// The allowed name nearest to `found` (Levenshtein distance ≤ 3, or a common prefix),
/// for a "did you mean" hint.
pub fn nearest(found: &str, allowed: &[String]) -> Option<String> {
    allowed
        .iter()
        .map(|a| (strsim::levenshtein(found, a), a))
        .filter(|(d, a)| {
            *d <= 3.max(found.len() / 3) || a.starts_with(found) || found.starts_with(a.as_str())
        })
        .min_by_key(|(d, _)| *d)
        .map(|(_, a)| a.clone())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Debug, serde::Deserialize)]
    #[serde(deny_unknown_fields)]
    #[allow(dead_code)]
    struct Site {
        latitude_deg: f64,
        longitude_deg: f64,
    }
    #[derive(Debug, serde::Deserialize)]
    #[serde(deny_unknown_fields)]
    #[allow(dead_code)]
    struct Top {
        site: Site,
    }

    #[test]
    fn unknown_key_suggests_nearest() {
        let e =
            from_toml::<Top>("s.toml", "[site]\nlatitud_deg = 3\nlongitude_deg = 2\n").unwrap_err();
        let m = e.to_string();
        assert!(m.contains("s.toml: site.latitud_deg (line 2)"), "{m}");
        assert!(m.contains("did you mean `latitude_deg`"), "{m}");
    }

    #[test]
    fn missing_section_is_named() {
        let e = from_toml::<Top>("s.toml", "x = 1\n")
            .unwrap_err()
            .to_string();
        assert!(e.contains("unknown key") || e.contains("site"), "{e}");
        let e = from_toml::<Top>("s.toml", "[other]\n")
            .unwrap_err()
            .to_string();
        assert!(e.contains("s.toml"), "{e}");
    }

    #[test]
    fn wrong_type_names_key_and_line() {
        let e = from_toml::<Top>(
            "s.toml",
            "[site]\nlatitude_deg = \"north\"\nlongitude_deg = 2\n",
        )
        .unwrap_err()
        .to_string();
        assert!(
            e.contains("site.latitude_deg") && e.contains("line 2"),
            "{e}"
        );
    }
}
