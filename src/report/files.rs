//! Writing output files whole or not at all, and never over an input.

use crate::error::{Error, Result};
use std::io::Write;
use std::path::{Path, PathBuf};

/// Refuse `out` when it is the same file as any of `inputs` (after resolving links).
pub fn refuse_input(out: &Path, inputs: &[PathBuf]) -> Result<()> {
    let Ok(o) = out.canonicalize() else {
        return Ok(()); // does not exist yet: cannot be an input
    };
    for i in inputs {
        if i.canonicalize().is_ok_and(|c| c == o) {
            return Err(Error::input(
                "output file",
                out.display(),
                "is an input of this run: choose another output path (inputs are never overwritten)",
            ));
        }
    }
    Ok(())
}

/// `-` as an output path: standard output.
pub fn is_stdout(path: &Path) -> bool {
    path.as_os_str() == "-"
}

/// Check an output path before any work is done, so a run is not lost to a typo at its end:
/// `-` (standard output) passes; otherwise the folder it goes in must exist and the path must
/// not be a folder. `flag` names the option in the message (`--hourly`).
pub fn check_output(flag: &str, path: &Path) -> Result<()> {
    if is_stdout(path) {
        return Ok(());
    }
    if path.is_dir() {
        return Err(Error::input(
            flag,
            path.display(),
            "is a folder: give a file path (or `-` for standard output)",
        ));
    }
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    if !dir.is_dir() {
        return Err(Error::input(
            flag,
            path.display(),
            format!(
                "the folder `{}` does not exist: create it first, or give `-` for standard output",
                dir.display()
            ),
        ));
    }
    Ok(())
}

/// Write `bytes` to `path` atomically: into a temporary file beside it, flushed, then renamed
/// over the target, so a reader never sees a half-written file.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<()> {
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.{}.partial", std::process::id()));
    let wr = |e| Error::Write {
        path: path.to_path_buf(),
        source: e,
    };
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(wr(e));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn atomic_write_leaves_no_partial_file() {
        let dir = std::env::temp_dir().join(format!("parhelion-files-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let p = dir.join("a.csv");
        write_atomic(&p, b"x,y\n1,2\n").unwrap();
        assert_eq!(std::fs::read_to_string(&p).unwrap(), "x,y\n1,2\n");
        let left: Vec<_> = std::fs::read_dir(&dir)
            .unwrap()
            .filter_map(|e| e.ok())
            .collect();
        assert_eq!(left.len(), 1);
        // A folder that does not exist: error, nothing written.
        assert!(write_atomic(&dir.join("no/such/dir.csv"), b"x").is_err());
        assert!(refuse_input(&p, std::slice::from_ref(&p)).is_err());
        // Output paths checked before a run: `-`, a file in an existing folder pass; a missing
        // folder or a folder as the file are refused, naming the flag and the path.
        assert!(check_output("--x", Path::new("-")).is_ok());
        assert!(check_output("--x", &p).is_ok());
        assert!(check_output("--x", Path::new("bare-name.csv")).is_ok());
        let e = check_output("--x", &dir.join("no/such.csv")).unwrap_err();
        let m = e.to_string();
        assert!(
            e.is_bad_input() && m.contains("--x") && m.contains("no/such.csv"),
            "{m}"
        );
        assert!(check_output("--x", &dir).is_err());
        std::fs::remove_dir_all(&dir).unwrap();
    }
}
