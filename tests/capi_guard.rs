//! Every exported C function runs behind the panic guard.
//!
//! cbindgen cannot see functions defined by a macro, so the guard cannot be
//! forced by construction; this test reads src/capi/ and checks that the body of
//! every `extern "C" fn` starts with `guard(` or `guard_or(`.

use std::path::Path;

#[test]
fn every_extern_c_function_is_guarded() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("src/capi");
    let mut found = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        let text = std::fs::read_to_string(&path).unwrap();
        let mut rest = text.as_str();
        while let Some(at) = rest.find("extern \"C\" fn ") {
            let after = &rest[at..];
            let name: String = after["extern \"C\" fn ".len()..]
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect();
            let body_start = after.find('{').expect("function body");
            let body = after[body_start + 1..].trim_start();
            assert!(
                body.starts_with("guard(") || body.starts_with("guard_or("),
                "{}: `{name}` does not start with the panic guard",
                path.display()
            );
            found += 1;
            rest = &after[body_start..];
        }
    }
    assert!(found >= 14, "found only {found} extern \"C\" functions");
}

#[test]
fn every_exported_function_is_in_the_header() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let header = std::fs::read_to_string(root.join("include/flatray.h")).unwrap();
    for entry in std::fs::read_dir(root.join("src/capi")).unwrap() {
        let text = std::fs::read_to_string(entry.unwrap().path()).unwrap();
        for line in text.lines().filter(|l| l.contains("extern \"C\" fn ")) {
            let name = line.split("fn ").nth(1).unwrap().split('(').next().unwrap();
            assert!(
                header.contains(&format!("{name}(")),
                "{name} missing from include/flatray.h"
            );
        }
    }
}
