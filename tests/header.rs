//! The committed C header must equal what cbindgen makes from the sources now.
//!
//! Regenerate it with `FLATRAY_BLESS=1 cargo test --test header`.

use std::path::Path;

/// The header cbindgen produces from the current sources and `cbindgen.toml`,
/// with the version defines taken from Cargo.toml.
fn generate() -> String {
    let crate_dir = env!("CARGO_MANIFEST_DIR");
    let mut config = cbindgen::Config::from_file(Path::new(crate_dir).join("cbindgen.toml"))
        .expect("cbindgen.toml parses");
    config.after_includes = Some(format!(
        "\n#define FLATRAY_VERSION_MAJOR {}\n#define FLATRAY_VERSION_MINOR {}\n#define FLATRAY_VERSION_PATCH {}\n#define FLATRAY_VERSION_STRING \"{}\"",
        env!("CARGO_PKG_VERSION_MAJOR"),
        env!("CARGO_PKG_VERSION_MINOR"),
        env!("CARGO_PKG_VERSION_PATCH"),
        env!("CARGO_PKG_VERSION"),
    ));
    let bindings = cbindgen::Builder::new()
        .with_crate(crate_dir)
        .with_config(config)
        .generate()
        .expect("cbindgen generates the header");
    let mut out = Vec::new();
    bindings.write(&mut out);
    let text = String::from_utf8(out).expect("header is UTF-8");
    coefficient_arrays(&plain_type_names(&text))
}

/// Fixed-length array parameters, spelled as the issues write them
/// (`const double b[3]`, `double out_covariance[9]`, ...). C reads an array
/// parameter exactly as cbindgen's pointer (`const double *b`), so the spelling
/// changes and the ABI does not. Each entry names one parameter (with the
/// separator after it) that no other function uses.
const ARRAY_PARAMETERS: &[(&str, &str)] = &[
    ("const double *b,", "const double b[3],"),
    ("const double *c_um2,", "const double c_um2[3],"),
    ("double *out_d_offset,", "double out_d_offset[3],"),
    ("double *out_d_n_object,", "double out_d_n_object[3],"),
    ("double *out_d_observer,", "double out_d_observer[9],"),
    ("double *out_d_apparent)", "double out_d_apparent[9])"),
    ("double *out_covariance)", "double out_covariance[9])"),
    ("const double *b_to_a,", "const double b_to_a[12],"),
];

fn coefficient_arrays(header: &str) -> String {
    ARRAY_PARAMETERS
        .iter()
        .fold(header.to_string(), |text, (pointer, array)| {
            text.replace(pointer, array)
        })
}

/// cbindgen's `style = "both"` writes tagged typedefs (`typedef struct
/// FlatrayVec3 {...} FlatrayVec3;`, as DESIGN.md does) but then spells every use
/// `struct FlatrayVec3`; rewrite the uses to the typedef names so prototypes
/// read exactly as in DESIGN.md. Only uses change, never a definition.
fn plain_type_names(header: &str) -> String {
    let mut out = String::with_capacity(header.len());
    for line in header.split_inclusive('\n') {
        if line.starts_with("typedef ") {
            out.push_str(line);
            continue;
        }
        out.push_str(
            &line
                .replace("struct Flatray", "Flatray")
                .replace("enum FlatrayStatus", "FlatrayStatus"),
        );
    }
    out
}

#[test]
fn committed_header_is_current() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("include/flatray.h");
    let fresh = generate();
    if std::env::var_os("FLATRAY_BLESS").is_some() {
        std::fs::write(&path, &fresh).expect("write include/flatray.h");
        return;
    }
    let committed = std::fs::read_to_string(&path).unwrap_or_default();
    assert!(
        committed == fresh,
        "include/flatray.h is stale: run `FLATRAY_BLESS=1 cargo test --test header` and commit it"
    );
}

/// The contract's names appear in the header exactly as DESIGN.md spells them.
#[test]
fn header_spells_the_contract_names() {
    let header = generate();
    for needle in [
        "#define FLATRAY_MAX_LAYERS 8",
        "FLATRAY_OK = 0",
        "FLATRAY_ERR_INTERNAL = 9",
        "FLATRAY_IMAGE_TANGENTIAL = 1",
        "typedef struct FlatrayVec3",
        "typedef struct FlatrayRay",
        "typedef struct FlatrayStack",
        "typedef struct FlatrayFresnel",
        "typedef struct FlatrayPath",
        "double thickness[FLATRAY_MAX_LAYERS];",
        "const char *flatray_version(void);",
        "const char *flatray_status_message(int32_t status);",
        "FlatrayStatus flatray_true_positions(const FlatrayStack *stack,",
        "FlatrayStatus flatray_refract(FlatrayVec3 direction,",
        "size_t observer_count,",
        "FLATRAY_MATERIAL_FUSED_SILICA = 0",
        "FLATRAY_MATERIAL_SAPPHIRE_ORDINARY = 1",
        "FLATRAY_MATERIAL_PMMA = 2",
        "FLATRAY_MATERIAL_POLYCARBONATE = 3",
        "FLATRAY_MATERIAL_SODA_LIME_GLASS = 4",
        "} FlatrayMaterial;",
        "FlatrayStatus flatray_index_pure_water(double temperature_c,",
        "FlatrayStatus flatray_index_seawater(double temperature_c,",
        "FlatrayStatus flatray_index_material(int32_t material, double wavelength_nm, double *out_n);",
        "FlatrayStatus flatray_index_sellmeier(const double b[3],",
        "const double c_um2[3],",
        "FlatrayStatus flatray_index_cauchy(double a,",
        "FlatrayStatus flatray_index_air(double temperature_c,",
        "FlatrayStatus flatray_group_index_pure_water(double temperature_c,",
        "FlatrayStatus flatray_group_index_seawater(double temperature_c,",
        &format!(
            "#define FLATRAY_VERSION_STRING \"{}\"",
            env!("CARGO_PKG_VERSION")
        ),
    ] {
        assert!(header.contains(needle), "header lacks `{needle}`");
    }
}
