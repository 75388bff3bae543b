//! Repository rules as tests: every source file opens with a `//!` doc saying why it
//! exists, and none leaves unfinished work or debugging behind.

use std::fs;
use std::path::Path;

fn rust_files(dir: &Path) -> Vec<std::path::PathBuf> {
    let mut files = Vec::new();
    for entry in fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            files.extend(rust_files(&path));
        } else if path.extension().is_some_and(|e| e == "rs") {
            files.push(path);
        }
    }
    files
}

fn crate_files() -> Vec<std::path::PathBuf> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    ["src", "tests", "benches"].iter().flat_map(|dir| rust_files(&root.join(dir))).collect()
}

#[test]
fn every_module_opens_with_a_doc_comment() {
    for file in crate_files() {
        let text = fs::read_to_string(&file).unwrap();
        assert!(text.starts_with("//!"), "{} does not open with //!", file.display());
    }
}

#[test]
fn no_file_leaves_unfinished_work_behind() {
    let banned = [concat!("todo", "!("), concat!("unimplemented", "!("), concat!("dbg", "!(")];
    for file in crate_files() {
        let text = fs::read_to_string(&file).unwrap();
        for word in banned {
            assert!(!text.contains(word), "{} contains {word}", file.display());
        }
    }
}
