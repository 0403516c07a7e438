//! Changing a scenario's numbers by dotted key path (`options.solar.field.gross_area_m2`) for
//! sizing, sweeps and uncertainty runs.
//!
//! The scenario's TOML tree is edited and then parsed and checked exactly as a file is, so a
//! key path that does not exist in the schema is refused with the same message (and "did you
//! mean") that a misspelt key in a file gets.

use super::Loaded;
use crate::error::{Error, Result};
use std::path::{Path, PathBuf};

/// A scenario held as its TOML tree.
#[derive(Debug, Clone)]
pub struct Editable {
    table: toml::Table,
    path: PathBuf,
    base_dir: PathBuf,
}

/// Key paths whose change leaves the weather, sun, building load and heat demand as they
/// are: the prepared year can be reused.
pub fn is_plant_only(key: &str) -> bool {
    [
        "options.",
        "collectors.",
        "baseline.",
        "economics.",
        "energy.",
        "costs.",
    ]
    .iter()
    .any(|p| key.starts_with(p))
        || key == "heat_priority"
        || key == "reference"
}

impl Editable {
    /// Read a scenario file (it is parsed and checked once, so a broken file fails here).
    pub fn read(path: &Path) -> Result<Editable> {
        let loaded = super::load(path)?;
        let text = std::fs::read_to_string(path).map_err(|source| Error::Read {
            path: path.to_path_buf(),
            source,
        })?;
        let table: toml::Table = text.parse().map_err(|e: toml::de::Error| Error::Input {
            file: path.display().to_string(),
            key: "(whole file)".into(),
            value: "(not valid TOML)".into(),
            allowed: e.message().to_string(),
        })?;
        Ok(Editable {
            table,
            path: path.to_path_buf(),
            base_dir: loaded.base_dir,
        })
    }

    /// The number at `key`, if the file gives it.
    pub fn get(&self, key: &str) -> Option<f64> {
        let mut t = &self.table;
        let parts: Vec<&str> = key.split('.').collect();
        for p in &parts[..parts.len() - 1] {
            t = t.get(*p)?.as_table()?;
        }
        match t.get(*parts.last()?)? {
            toml::Value::Float(f) => Some(*f),
            toml::Value::Integer(i) => Some(*i as f64),
            _ => None,
        }
    }

    /// True when the file gives `key` as a whole number.
    pub fn is_integer(&self, key: &str) -> bool {
        let mut t = &self.table;
        let parts: Vec<&str> = key.split('.').collect();
        for p in &parts[..parts.len() - 1] {
            match t.get(*p).and_then(|v| v.as_table()) {
                Some(n) => t = n,
                None => return false,
            }
        }
        parts
            .last()
            .and_then(|k| t.get(*k))
            .is_some_and(|v| v.is_integer())
    }

    /// Set the number at `key`. The tables along the path must exist (they name sections and
    /// options); the last key may be new (a key left at its default). Whole-number keys stay
    /// whole numbers. Whether the key exists in the schema, and its range, are checked when
    /// the scenario is built ([`Editable::loaded`]).
    pub fn set(&mut self, key: &str, value: f64) -> Result<()> {
        if !value.is_finite() {
            return Err(Error::input(key, value, "must be a finite number"));
        }
        let parts: Vec<&str> = key.split('.').collect();
        if parts.iter().any(|p| p.is_empty()) {
            return Err(Error::input(
                "key",
                key,
                "a dotted key path such as options.NAME.field.gross_area_m2",
            ));
        }
        let mut t = &mut self.table;
        let mut walked = String::new();
        for p in &parts[..parts.len() - 1] {
            let names: Vec<String> = t
                .iter()
                .filter(|(_, v)| v.is_table())
                .map(|(k, _)| k.clone())
                .collect();
            let here = if walked.is_empty() {
                "the top level".to_string()
            } else {
                format!("[{walked}]")
            };
            match t.get_mut(*p) {
                Some(toml::Value::Table(next)) => t = next,
                _ => {
                    let hint = super::parse::nearest(p, &names)
                        .map_or(String::new(), |n| format!("did you mean `{n}`? "));
                    return Err(Error::input(
                        "key",
                        key,
                        format!(
                            "{hint}no table `{p}` in {here}; tables there: {}",
                            names.join(", ")
                        ),
                    ));
                }
            }
            if !walked.is_empty() {
                walked.push('.');
            }
            walked.push_str(p);
        }
        let last = parts[parts.len() - 1];
        let v = match t.get(last) {
            Some(toml::Value::Integer(_)) => {
                if value.fract() != 0.0 {
                    return Err(Error::input(key, value, "must be a whole number"));
                }
                toml::Value::Integer(value as i64)
            }
            Some(toml::Value::Float(_)) => toml::Value::Float(value),
            // A key left at its default: a whole number goes in as an integer (a float key
            // reads it as a float; an integer key such as `nodes` needs it whole).
            None if value.fract() == 0.0 && value.abs() < 9.0e15 => {
                toml::Value::Integer(value as i64)
            }
            None => toml::Value::Float(value),
            Some(other) => {
                return Err(Error::input(
                    key,
                    value,
                    format!(
                        "is not a number in the scenario (it is {})",
                        other.type_str()
                    ),
                ));
            }
        };
        t.insert(last.to_string(), v);
        Ok(())
    }

    /// Parse and check the edited scenario, as if it were the file.
    pub fn loaded(&self) -> Result<Loaded> {
        let text =
            toml::to_string(&self.table).map_err(|e| Error::Internal(format!("TOML: {e}")))?;
        let file = self.path.display().to_string();
        Ok(Loaded {
            scenario: super::from_str(&file, &text)?,
            path: self.path.clone(),
            base_dir: self.base_dir.clone(),
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo() -> Editable {
        Editable::read(Path::new(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/scenarios/port-meridian-clinic.toml"
        )))
        .unwrap()
    }

    #[test]
    fn set_and_get() {
        let mut e = demo();
        e.set("options.grid-chiller-solar-dhw.storage.volume_m3", 6.0)
            .unwrap();
        assert_eq!(
            e.get("options.grid-chiller-solar-dhw.storage.volume_m3"),
            Some(6.0)
        );
        let l = e.loaded().unwrap();
        let st = l.scenario.options["grid-chiller-solar-dhw"]
            .storage
            .as_ref()
            .unwrap();
        assert_eq!(st.volume_m3, Some(6.0));
        // Whole-number keys stay whole.
        e.set("site.jan1_weekday", 3.0).unwrap();
        assert!(e.is_integer("site.jan1_weekday"));
        assert!(e.loaded().is_ok());
        assert!(e.set("site.jan1_weekday", 3.5).is_err());
    }

    #[test]
    fn unknown_paths_are_refused_with_a_suggestion() {
        let mut e = demo();
        let err = e
            .set("options.grid-chiller-solar-dwh.storage.volume_m3", 6.0)
            .unwrap_err()
            .to_string();
        assert!(
            err.contains("did you mean `grid-chiller-solar-dhw`"),
            "{err}"
        );
        e.set("options.grid-chiller-solar-dhw.storage.volum_m3", 6.0)
            .unwrap();
        let err = e.loaded().unwrap_err().to_string();
        assert!(err.contains("did you mean `volume_m3`"), "{err}");
        let mut e = demo();
        e.set("site.latitude_deg", 120.0).unwrap();
        assert!(
            e.loaded()
                .unwrap_err()
                .to_string()
                .contains("between -90 and 90")
        );
    }
}
