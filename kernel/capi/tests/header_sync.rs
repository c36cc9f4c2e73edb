//! The hand-written `include/calor.h` declares exactly what `src/lib.rs` exports.
//!
//! Reads the Rust source's `pub const CALOR_*: i32`, `#[repr(C)] pub struct`
//! and `pub extern "C" fn` items, turns each into the C declaration it must
//! have, and compares with the header's `#define`s, `typedef struct`s and
//! prototypes after normalising whitespace: same names, same values, same
//! fields and parameters in the same order, nothing missing, nothing extra.
//! No code generator is needed, so this runs offline in CI.

use std::collections::BTreeMap;
use std::fs;
use std::path::Path;

#[derive(Debug, Default, PartialEq)]
struct Api {
    constants: BTreeMap<String, String>,
    structs: BTreeMap<String, Vec<String>>,
    functions: BTreeMap<String, String>,
}

/// The C spelling of a Rust type of the ABI.
fn c_type(rust: &str) -> String {
    let rust = rust.trim();
    if let Some(target) = rust.strip_prefix("*const ") {
        return format!("const {}*", c_type(target));
    }
    if let Some(target) = rust.strip_prefix("*mut ") {
        return format!("{}*", c_type(target));
    }
    match rust {
        "f64" => "double",
        "i32" => "int32_t",
        "usize" => "size_t",
        "c_char" => "char",
        other if other.starts_with("Calor") => other,
        other => panic!("no C spelling for Rust type `{other}`: extend c_type"),
    }
    .to_string()
}

/// Collapses whitespace and drops it next to punctuation, so that
/// `double *price` and `double* price` compare equal.
fn normalise(declaration: &str) -> String {
    let collapsed = declaration.split_whitespace().collect::<Vec<_>>().join(" ");
    let mut out = String::new();
    for ch in collapsed.chars() {
        if "*(),".contains(ch) && out.ends_with(' ') {
            out.pop();
        }
        if ch == ' ' && out.ends_with(['*', '(', ',']) {
            continue;
        }
        out.push(ch);
    }
    out
}

/// `name: type` to `ctype name`.
fn c_binding(rust: &str) -> String {
    let (name, ty) = rust
        .split_once(':')
        .unwrap_or_else(|| panic!("not `name: type`: {rust}"));
    normalise(&format!("{} {}", c_type(ty), name.trim()))
}

fn rust_api(source: &str) -> Api {
    let mut api = Api::default();
    for line in source.lines() {
        if let Some(rest) = line.trim().strip_prefix("pub const CALOR_") {
            let (name, value) = rest.split_once(": i32 = ").expect("an i32 constant");
            api.constants.insert(
                format!("CALOR_{name}"),
                value.trim_end_matches(';').to_string(),
            );
        }
    }
    let mut rest = source;
    while let Some(at) = rest.find("\n#[repr(C)]\n") {
        rest = &rest[at..];
        let open = rest.find('{').expect("struct body");
        let head = &rest[..open];
        let name = head
            .split("pub struct ")
            .nth(1)
            .expect("#[repr(C)] on a pub struct")
            .trim()
            .to_string();
        let close = rest.find('}').expect("end of struct");
        let fields = rest[open + 1..close]
            .lines()
            .map(str::trim)
            .filter_map(|l| l.strip_prefix("pub "))
            .map(|l| c_binding(l.trim_end_matches(',')))
            .collect();
        api.structs.insert(name, fields);
        rest = &rest[close..];
    }
    let mut rest = source;
    while let Some(at) = rest.find("\npub extern \"C\" fn ") {
        rest = &rest[at + "\npub extern \"C\" fn ".len()..];
        let body = rest.find('{').expect("function body");
        let signature = &rest[..body];
        let (name, after) = signature.split_once('(').expect("parameter list");
        let (params, ret) = after.rsplit_once(')').expect("end of parameters");
        let params: Vec<String> = params
            .split(',')
            .map(str::trim)
            .filter(|p| !p.is_empty())
            .map(c_binding)
            .collect();
        let ret = ret.trim().strip_prefix("->").map_or("void".into(), c_type);
        let declaration = normalise(&format!("{ret} {name}({})", params.join(", ")));
        api.functions.insert(name.trim().to_string(), declaration);
        rest = &rest[body..];
    }
    api
}

/// The header without its comments.
fn strip_comments(header: &str) -> String {
    let mut text = String::new();
    let mut rest = header;
    while let Some(start) = rest.find("/*") {
        text.push_str(&rest[..start]);
        let end = rest[start..].find("*/").expect("closed comment");
        rest = &rest[start + end + 2..];
    }
    text.push_str(rest);
    text
}

/// The header without comments, preprocessor lines and the C++ guard's braces.
fn header_text(header: &str) -> String {
    strip_comments(header)
        .lines()
        .filter(|l| !l.trim_start().starts_with('#'))
        .filter(|l| !matches!(l.trim(), "extern \"C\" {" | "}"))
        .collect::<Vec<_>>()
        .join("\n")
}

fn header_api(header: &str) -> Api {
    let mut api = Api::default();
    for line in strip_comments(header).lines() {
        let words: Vec<&str> = line.split_whitespace().collect();
        if let ["#define", name, value] = words[..] {
            api.constants.insert(name.to_string(), value.to_string());
        }
    }
    let mut text = header_text(header);
    while let Some(at) = text.find("typedef struct ") {
        let open = at + text[at..].find('{').expect("struct body");
        let close = open + text[open..].find('}').expect("end of struct");
        let end = close + text[close..].find(';').expect("typedef name");
        let name = text[at + "typedef struct ".len()..open].trim().to_string();
        assert_eq!(text[close + 1..end].trim(), name, "typedef name of {name}");
        let fields = text[open + 1..close]
            .split(';')
            .map(str::trim)
            .filter(|f| !f.is_empty())
            .map(normalise)
            .collect();
        api.structs.insert(name, fields);
        text.replace_range(at..=end, "");
    }
    for declaration in text.split(';').map(str::trim).filter(|d| !d.is_empty()) {
        let declaration = normalise(declaration);
        let name = declaration
            .split('(')
            .next()
            .and_then(|head| head.rsplit(['*', ' ']).next())
            .expect("a function name")
            .to_string();
        api.functions.insert(name, declaration);
    }
    api
}

fn read(relative: &str) -> String {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join(relative);
    fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

#[test]
fn abi_header_matches_rust_source() {
    let rust = rust_api(&read("src/lib.rs"));
    let header = header_api(&read("include/calor.h"));
    assert!(rust.functions.len() >= 8, "parsed {:?}", rust.functions);
    assert!(rust.structs.len() >= 3, "parsed {:?}", rust.structs);
    assert_eq!(
        rust.structs.get("CalorGreeks").map(Vec::len),
        Some(15),
        "fifteen Greeks"
    );
    assert_eq!(rust.constants, header.constants, "#define values");
    assert_eq!(rust.structs, header.structs, "struct fields");
    assert_eq!(rust.functions, header.functions, "prototypes");
}

#[test]
fn abi_header_check_catches_a_changed_parameter() {
    let header = read("include/calor.h").replace(
        "int32_t calor_price(const CalorInputs *inputs, double vol, double *price);",
        "int32_t calor_price(const CalorInputs *inputs, float vol, double *price);",
    );
    let rust = rust_api(&read("src/lib.rs"));
    assert_ne!(rust.functions, header_api(&header).functions);
}
