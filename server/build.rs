//! Builds the app's files into the `wrackline` binary: every file of the folder
//! `cargo xtask build` writes (`target/app-dist`, or `WRACKLINE_EMBED_APP_DIR`), with the
//! brotli and gzip copies beside them, listed in `$OUT_DIR/app_files.rs` for
//! `handlers::app_files`. A build with no built app embeds nothing, and the server
//! then answers `/` with a page saying how to build it.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

fn main() {
    println!("cargo:rerun-if-env-changed=WRACKLINE_EMBED_APP_DIR");
    let dist = match std::env::var_os("WRACKLINE_EMBED_APP_DIR") {
        Some(dir) => PathBuf::from(dir),
        None => {
            let manifest =
                PathBuf::from(std::env::var_os("CARGO_MANIFEST_DIR").expect("cargo sets CARGO_MANIFEST_DIR"));
            manifest.parent().expect("the server sits inside the workspace").join("target/app-dist")
        }
    };
    // Cargo runs this again whenever anything in the folder changes; a folder that does
    // not exist would make it run on every build, so an empty one stands in until the
    // app is built.
    if !dist.exists() {
        let _ = std::fs::create_dir_all(&dist);
    }
    println!("cargo:rerun-if-changed={}", dist.display());
    let mut files = Vec::new();
    if dist.join("index.html").is_file() {
        collect(&dist, &dist, &mut files);
    }
    files.sort();
    let mut table = String::from(
        "/// The built app's files: (path under the app's root, bytes).\npub static FILES: &[(&str, &[u8])] = &[\n",
    );
    for (name, path) in &files {
        writeln!(table, "    ({name:?}, include_bytes!({:?})),", path.display().to_string())
            .expect("writing to a String");
    }
    table.push_str("];\n");
    let out = PathBuf::from(std::env::var_os("OUT_DIR").expect("cargo sets OUT_DIR")).join("app_files.rs");
    std::fs::write(&out, table).unwrap_or_else(|err| panic!("writing {}: {err}", out.display()));
}

/// Every file under `dir`, as (path from `root` with `/` separators, absolute path).
fn collect(root: &Path, dir: &Path, files: &mut Vec<(String, PathBuf)>) {
    let entries = std::fs::read_dir(dir).unwrap_or_else(|err| panic!("listing {}: {err}", dir.display()));
    for entry in entries {
        let path = entry.unwrap_or_else(|err| panic!("listing {}: {err}", dir.display())).path();
        if path.is_dir() {
            collect(root, &path, files);
        } else if let Ok(relative) = path.strip_prefix(root) {
            let name: Vec<String> =
                relative.components().map(|c| c.as_os_str().to_string_lossy().into_owned()).collect();
            let absolute = std::fs::canonicalize(&path).unwrap_or(path);
            files.push((name.join("/"), absolute));
        }
    }
}
