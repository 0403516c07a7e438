//! The scenario: one building at one site, and the named options (whole plants) to compare.
//!
//! `schema.rs` holds the TOML layout (units in key names, unknown keys rejected), `parse.rs`
//! turns text into it with precise errors, `check.rs` range-checks every value and the
//! cross-references between sections, and `build.rs` turns a checked scenario into the
//! hourly inputs and component models the plant loop runs.

pub mod build;
pub mod check;
pub mod edit;
pub mod parse;
pub mod schema;
pub mod starter;

pub use schema::Scenario;

use crate::error::{Error, Result};
use std::path::{Path, PathBuf};

/// A scenario read from disk and checked, with the folder its relative paths start from.
#[derive(Debug, Clone)]
pub struct Loaded {
    /// The scenario.
    pub scenario: Scenario,
    /// The scenario file as given (for messages and for refusing to overwrite it).
    pub path: PathBuf,
    /// Folder of the scenario file: weather and load file paths are relative to it.
    pub base_dir: PathBuf,
}

impl Loaded {
    /// The scenario file name as shown in messages.
    pub fn file(&self) -> String {
        self.path.display().to_string()
    }
}

/// Read, parse and check a scenario file.
pub fn load(path: &Path) -> Result<Loaded> {
    let text = std::fs::read_to_string(path).map_err(|source| Error::Read {
        path: path.to_path_buf(),
        source,
    })?;
    let file = path.display().to_string();
    let scenario: Scenario = parse::from_toml(&file, &text)?;
    check::check(&scenario, &file)?;
    let base_dir = path
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("."));
    Ok(Loaded {
        scenario,
        path: path.to_path_buf(),
        base_dir,
    })
}

/// Parse and check scenario text that is not on disk (tests, `init` self-check).
pub fn from_str(file: &str, text: &str) -> Result<Scenario> {
    let scenario: Scenario = parse::from_toml(file, text)?;
    check::check(&scenario, file)?;
    Ok(scenario)
}
