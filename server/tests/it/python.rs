//! The reference readers in Python (python-dwca-reader, shapely), found through
//! `WRACKLINE_PYTHON`, which `cargo xtask test` sets after making `target/venv`.
//! A test that needs them fails, with the way to install them, when they are missing.

use std::path::{Path, PathBuf};
use std::process::Command;

use serde_json::Value;

fn workspace() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).parent().unwrap().to_owned()
}

/// The Python that has the reference packages.
pub fn python() -> PathBuf {
    let python = std::env::var_os("WRACKLINE_PYTHON")
        .map(PathBuf::from)
        .unwrap_or_else(|| workspace().join("target/venv/bin/python"));
    assert!(
        python.exists(),
        "{} does not exist. These tests need python-dwca-reader and shapely from PyPI: run `cargo xtask test` \
         (it makes target/venv), or make a venv yourself (`python3 -m venv target/venv && \
         target/venv/bin/pip install python-dwca-reader==0.17.1 shapely==2.2.0`), or set WRACKLINE_PYTHON to a Python that has them",
        python.display()
    );
    python
}

/// Runs one of `server/tests/python/*.py` and reads the JSON it prints.
pub fn run_script(script: &str, args: &[&Path]) -> Value {
    let script = workspace().join("server/tests/python").join(script);
    let output = Command::new(python()).arg(&script).args(args).output().expect("starting the reference Python");
    assert!(output.status.success(), "{} failed:\n{}", script.display(), String::from_utf8_lossy(&output.stderr));
    serde_json::from_slice(&output.stdout).expect("the script prints JSON")
}

/// The TDWG term-list extract committed beside the tests.
pub fn terms_extract() -> PathBuf {
    workspace().join("server/tests/reference/dwc_terms_extract.csv")
}
