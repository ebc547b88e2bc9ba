//! The page script as one file: the ES modules under `site/assets/js/` joined in
//! the order the browser evaluates them, so a page asks for one script instead of
//! one per module.
//!
//! Why: on a phone's first visit each module was its own request. Over HTTP/1.1 six
//! of them share the six connections to a host, each waiting a round trip, and the
//! wasm module queued behind them; the inline head script also spent about 10 ms of
//! a 4× throttled processor per `modulepreload` link it added (a DevTools trace of
//! `bend.html` opened with a link, issue 9). One file is one request and one
//! compile.
//!
//! The modules are written in a small subset of the module syntax, and this joiner
//! refuses anything outside it rather than guess:
//! - imports are whole lines, `import { a, b } from "./x.js";` or
//!   `import "./x.js";` (no renaming with `as`, no default or namespace imports);
//!   dynamic `import()` is left as it is;
//! - exports are declarations at the start of a line: `export function`,
//!   `export async function`, `export const`, `export let`, `export class`;
//! - top-level declarations start at column 0 (nested ones are indented).
//!
//! The joined file leaves out the modules' comment lines and blank lines (a third
//! of the script's compressed size: the sources are documented at length, and a
//! phone on a slow link downloads the script on the way to a link's first result),
//! and the indentation of every line that starts in code (0.8 kB Brotli of 21 kB).
//! Only whole lines are left out, and only where a line scanner that knows strings,
//! template literals (with `${…}` nested in them) and comments sees code: a line of
//! a template literal is kept as it is. A module that ends inside a template literal
//! or a comment is refused, since the scanner could then be wrong about the rest.
//!
//! The joined file's first line is V8's explicit compile hint,
//! [`EAGER_COMPILE_HINT`]: the page calls most of the script before a link's first
//! result, and without the hint V8 parsed and compiled each function again on the
//! main thread at its first call, after the module had arrived (a DevTools trace
//! of `bend.html` opened with a link at 4×: 81 lazy compiles inside the task that
//! shows the first result; with the hint, none of the script's).
//!
//! A module is evaluated once, after the modules it imports, in the order of its
//! import lines: the depth-first post-order of the import graph from the entry,
//! which is the evaluation order of ES modules without cycles (a cycle is refused).
//! The joined file is one module scope, so an imported name is the exporting
//! module's own binding (a `let` reassigned later is seen by every importer, as a
//! live binding is). Because of that one scope, two modules may not declare the same
//! top-level name, and every imported name must be exported by the module named:
//! both are checked here, since the browser would otherwise let a later function
//! declaration replace an earlier one silently.

use std::collections::{BTreeMap, BTreeSet};

/// V8's explicit compile hint for a whole file (Chrome 136 and later; other
/// engines read a comment): compile every function of the file while the script
/// streams in, on a background thread, instead of at each function's first call on
/// the main thread. Source: the V8 blog, "Giving V8 a heads-up: faster JavaScript
/// startup with explicit compile hints" (v8.dev/blog/explicit-compile-hints, 2025),
/// which asks for the comment at the top of the file. The site build puts it on the
/// page script (here) and on the wasm-bindgen glue, which the page calls at once.
pub const EAGER_COMPILE_HINT: &str = "//# allFunctionsCalledOnLoad\n";

/// One module read in the subset above.
#[derive(Debug, Default)]
struct Module {
    /// `(names, target)` per import line, in order; `names` is empty for
    /// `import "./x.js";`.
    imports: Vec<(Vec<String>, String)>,
    /// Top-level names the module declares, exported or not.
    declared: Vec<String>,
    exported: BTreeSet<String>,
    /// The text without its import lines and with `export ` taken off.
    body: String,
}

/// The declaration keywords a top-level line may start with, and what follows them.
const DECLARATIONS: [&str; 8] = [
    "async function* ",
    "async function ",
    "function* ",
    "function ",
    "const ",
    "let ",
    "var ",
    "class ",
];

/// The name declared by a line that starts with one of [`DECLARATIONS`].
fn declared_name(line: &str) -> Option<&str> {
    let rest = DECLARATIONS.iter().find_map(|k| line.strip_prefix(k))?.trim_start();
    let end = rest
        .find(|c: char| !(c.is_alphanumeric() || c == '_' || c == '$'))
        .unwrap_or(rest.len());
    (end > 0).then(|| &rest[..end])
}

/// Reads `./x.js` of an import specifier, with the entry's folder prefix
/// (`./js/x.js`) taken off for the entry.
fn target_of(spec: &str, folder_prefix: &str) -> Option<String> {
    let inner = spec.strip_prefix('"')?.strip_suffix('"')?;
    let inner = inner.strip_prefix("./")?;
    let inner = inner.strip_prefix(folder_prefix).unwrap_or(inner);
    (!inner.contains('/') && inner.ends_with(".js")).then(|| inner.to_string())
}

/// Where the scanner is: in code, in a template literal's text, or in the code of
/// a `${…}` in one (with the depth of the braces opened in it).
#[derive(Clone, Copy, Debug, PartialEq)]
enum Frame {
    Template,
    Substitution(usize),
}

/// What a line scan carries to the next line: the open template literals and
/// substitutions, innermost last, and whether a block comment is open.
#[derive(Debug, Default)]
struct Scan {
    frames: Vec<Frame>,
    in_comment: bool,
}

impl Scan {
    /// Whether the next line starts in plain code (not in a template literal, a
    /// substitution or a comment): the only place a comment line is left out.
    fn in_code(&self) -> bool {
        self.frames.is_empty() && !self.in_comment
    }

    /// Reads one line. Strings in quotes end on their line; a `/` that starts a
    /// regular expression is read as code (the modules' regular expressions hold no
    /// quote, backtick or comment mark).
    fn line(&mut self, line: &str) {
        let bytes = line.as_bytes();
        let mut i = 0;
        while i < bytes.len() {
            let (byte, next) = (bytes[i], bytes.get(i + 1).copied());
            if self.in_comment {
                if byte == b'*' && next == Some(b'/') {
                    self.in_comment = false;
                    i += 1;
                }
            } else if self.frames.last() == Some(&Frame::Template) {
                match (byte, next) {
                    (b'\\', _) => i += 1,
                    (b'`', _) => {
                        self.frames.pop();
                    }
                    (b'$', Some(b'{')) => {
                        self.frames.push(Frame::Substitution(0));
                        i += 1;
                    }
                    _ => {}
                }
            } else {
                match (byte, next) {
                    (b'"' | b'\'', _) => {
                        i += 1;
                        while i < bytes.len() && bytes[i] != byte {
                            if bytes[i] == b'\\' {
                                i += 1;
                            }
                            i += 1;
                        }
                    }
                    (b'/', Some(b'/')) => return,
                    (b'/', Some(b'*')) => {
                        self.in_comment = true;
                        i += 1;
                    }
                    (b'`', _) => self.frames.push(Frame::Template),
                    (b'{', _) => {
                        if let Some(Frame::Substitution(depth)) = self.frames.last_mut() {
                            *depth += 1;
                        }
                    }
                    (b'}', _) => match self.frames.last_mut() {
                        Some(Frame::Substitution(0)) => {
                            self.frames.pop();
                        }
                        Some(Frame::Substitution(depth)) => *depth -= 1,
                        _ => {}
                    },
                    _ => {}
                }
            }
            i += 1;
        }
    }
}

/// Whether a line that starts in code is a comment line or blank: left out of the
/// joined script. A line that opens a block comment and has code after its end is
/// kept.
fn is_comment_line(line: &str) -> bool {
    let trimmed = line.trim();
    if trimmed.is_empty() || trimmed.starts_with("//") {
        return true;
    }
    match trimmed.strip_prefix("/*") {
        Some(rest) => rest.find("*/").is_none_or(|end| rest[end + 2..].trim().is_empty()),
        None => false,
    }
}

fn parse(name: &str, text: &str, folder_prefix: &str) -> Result<Module, String> {
    let mut module = Module::default();
    let mut scan = Scan::default();
    // Inside a block comment whose first line was left out.
    let mut leaving_out = false;
    for (number, whole_line) in text.lines().enumerate() {
        let at = || format!("{name}, line {}", number + 1);
        let mut line = whole_line;
        let was_code = scan.in_code();
        scan.line(line);
        if leaving_out {
            if scan.in_comment {
                continue;
            }
            // The comment ends here: what follows its end is kept.
            leaving_out = false;
            line = line.split_once("*/").map_or("", |(_, rest)| rest);
            if line.trim().is_empty() {
                continue;
            }
        } else if was_code && is_comment_line(line) {
            leaving_out = scan.in_comment;
            continue;
        }
        if line.starts_with("import ") || line.starts_with("import{") {
            let statement = line
                .trim_end()
                .strip_suffix(';')
                .ok_or_else(|| format!("{}: an import must be one whole line ending in `;`", at()))?;
            let (names, spec) = match statement.strip_prefix("import {") {
                Some(rest) => {
                    let (list, from) = rest
                        .split_once('}')
                        .ok_or_else(|| format!("{}: an unclosed import list", at()))?;
                    let spec = from
                        .trim()
                        .strip_prefix("from ")
                        .ok_or_else(|| format!("{}: expected `from \"./x.js\"`", at()))?;
                    let names: Vec<String> = list
                        .split(',')
                        .map(str::trim)
                        .filter(|n| !n.is_empty())
                        .map(str::to_string)
                        .collect();
                    if let Some(bad) = names
                        .iter()
                        .find(|n| declared_name(&format!("let {n}")) != Some(n.as_str()))
                    {
                        return Err(format!("{}: `{bad}`: only plain names can be imported (no `as`)", at()));
                    }
                    (names, spec.trim())
                }
                None => (Vec::new(), statement["import".len()..].trim()),
            };
            let target = target_of(spec, folder_prefix).ok_or_else(|| {
                format!(
                    "{}: only modules beside this one can be imported (`\"./x.js\"`), not {spec}",
                    at()
                )
            })?;
            module.imports.push((names, target));
            continue;
        }
        let line = match line.strip_prefix("export ") {
            Some(rest) => {
                let declared = declared_name(rest).ok_or_else(|| {
                    format!(
                        "{}: only declarations can be exported (`export function`, `export const`, ...)",
                        at()
                    )
                })?;
                module.exported.insert(declared.to_string());
                rest
            }
            None => line,
        };
        if let Some(declared) = declared_name(line) {
            module.declared.push(declared.to_string());
        }
        // A line that starts in code loses its indentation (a line of a template
        // literal keeps it: it is text); the line breaks stay, so the code means
        // what it meant.
        let starts_in_code = was_code || line.len() < whole_line.len();
        module
            .body
            .push_str(if starts_in_code { line.trim_start() } else { line });
        module.body.push('\n');
    }
    if !scan.in_code() {
        return Err(format!(
            "{name}: the module ends inside a template literal or a comment (read as {:?}); \
             the joiner cannot tell its comment lines from its text",
            scan
        ));
    }
    Ok(module)
}

/// Joins the entry script (whose imports name `./{folder}/x.js`) and the modules of
/// `folder` (each `x.js` → its text, importing `./y.js`) into one module text.
/// Modules the entry does not reach are left out.
///
/// # Errors
/// A line outside the subset in the module docs, an import of a module that does
/// not exist, a name imported that its module does not export, a top-level name
/// declared by two modules, or an import cycle; each message names the module.
pub fn join(entry: &str, folder: &str, modules: &BTreeMap<String, String>) -> Result<String, String> {
    const ENTRY: &str = "(entry)";
    let mut parsed: BTreeMap<&str, Module> = BTreeMap::new();
    parsed.insert(ENTRY, parse("the entry script", entry, &format!("{folder}/"))?);
    for (name, text) in modules {
        parsed.insert(name.as_str(), parse(name, text, "")?);
    }
    for (name, module) in &parsed {
        for (names, target) in &module.imports {
            let Some(exporter) = parsed.get(target.as_str()) else {
                return Err(format!("{name} imports ./{target}, which is not a module"));
            };
            if let Some(missing) = names.iter().find(|n| !exporter.exported.contains(*n)) {
                return Err(format!(
                    "{name} imports `{missing}` from {target}, which does not export it"
                ));
            }
        }
    }

    // Depth-first post-order from the entry: the modules' evaluation order.
    let mut order: Vec<&str> = Vec::new();
    let mut stack: Vec<(&str, usize)> = vec![(ENTRY, 0)];
    let mut on_path: BTreeSet<&str> = BTreeSet::from([ENTRY]);
    let mut done: BTreeSet<&str> = BTreeSet::new();
    while let Some((name, next)) = stack.pop() {
        let imports = &parsed[name].imports;
        match imports.get(next) {
            Some((_, target)) => {
                stack.push((name, next + 1));
                let target = target.as_str();
                if on_path.contains(target) {
                    return Err(format!("{name} and {target} import each other (a cycle)"));
                }
                if !done.contains(target) {
                    on_path.insert(target);
                    stack.push((target, 0));
                }
            }
            None => {
                on_path.remove(name);
                done.insert(name);
                order.push(name);
            }
        }
    }

    let mut declared_by: BTreeMap<&str, &str> = BTreeMap::new();
    for name in &order {
        for declared in &parsed[name].declared {
            if let Some(first) = declared_by.insert(declared, name) {
                return Err(format!(
                    "{first} and {name} both declare `{declared}` at the top level: rename one \
                     (the page script is joined into one scope)"
                ));
            }
        }
    }

    let mut out = String::from(EAGER_COMPILE_HINT);
    for name in order {
        let label = if name == ENTRY { "app.js" } else { name };
        out.push_str(&format!("// ---- {label}\n"));
        out.push_str(&parsed[name].body);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn modules(list: &[(&str, &str)]) -> BTreeMap<String, String> {
        list.iter().map(|(n, t)| (n.to_string(), t.to_string())).collect()
    }

    #[test]
    fn modules_come_after_what_they_import_in_import_order_and_once() {
        let entry = "// entry\nimport \"./js/main.js\";\n";
        let list = modules(&[
            (
                "main.js",
                "import { a } from \"./a.js\";\nimport { b } from \"./b.js\";\nmain(a, b);\n",
            ),
            ("a.js", "import { d } from \"./d.js\";\nexport const a = d + 1;\n"),
            (
                "b.js",
                "import { d } from \"./d.js\";\nexport function b() {\n  return d;\n}\n",
            ),
            ("d.js", "export let d = 1;\n"),
            ("unused.js", "export const u = 0;\n"),
        ]);
        let joined = join(entry, "js", &list).unwrap();
        // The compile hint is the file's first line, as V8 asks.
        assert_eq!(joined.lines().next(), Some("//# allFunctionsCalledOnLoad"));
        assert_eq!(
            joined.strip_prefix(EAGER_COMPILE_HINT).unwrap(),
            "// ---- d.js\nlet d = 1;\n// ---- a.js\nconst a = d + 1;\n// ---- b.js\nfunction b() {\nreturn d;\n}\n\
             // ---- main.js\nmain(a, b);\n// ---- app.js\n"
        );
    }

    #[test]
    fn comment_lines_are_left_out_and_template_text_is_kept() {
        let source = r#"/** Doc
 * more */
export function f(x) {
  // inside

  const t = `line one
// template text, not a comment
${x ? `inner // text` : "}"} still template
/* also text */`;
  const s = "// in a string"; // trailing
  /* block */ g();
  /* open
  still comment
  */ h();
  return t + s;
}
"#;
        let joined = join(
            "import { f } from \"./js/f.js\";\nf(1);\n",
            "js",
            &modules(&[("f.js", source)]),
        )
        .unwrap();
        assert_eq!(
            joined.strip_prefix(EAGER_COMPILE_HINT).unwrap(),
            r#"// ---- f.js
function f(x) {
const t = `line one
// template text, not a comment
${x ? `inner // text` : "}"} still template
/* also text */`;
const s = "// in a string"; // trailing
/* block */ g();
h();
return t + s;
}
// ---- app.js
f(1);
"#
        );
        for unclosed in ["export const t = `open\n", "export const u = 1;\n/* open\n"] {
            let error = join("import \"./js/u.js\";\n", "js", &modules(&[("u.js", unclosed)])).unwrap_err();
            assert!(error.contains("u.js: the module ends inside"), "{error}");
        }
    }

    #[test]
    fn dynamic_imports_and_indented_names_are_left_alone() {
        let list = modules(&[
            ("main.js", "import { f } from \"./f.js\";\nf();\n"),
            (
                "f.js",
                "export async function f() {\n  const m = await import(\"./glue.1.js\");\n  function inner() {}\n}\n",
            ),
            ("g.js", "function inner() {}\n"),
        ]);
        let joined = join("import \"./js/main.js\";\n", "js", &list).unwrap();
        assert!(joined.contains("await import(\"./glue.1.js\")"));
    }

    #[test]
    fn what_one_scope_cannot_hold_is_refused_by_name() {
        let cases: [(&[(&str, &str)], &str); 8] = [
            (
                &[
                    ("main.js", "import { a } from \"./a.js\";\nfunction click() {}\n"),
                    ("a.js", "export const a = 1;\nfunction click() {}\n"),
                ],
                "`click`",
            ),
            (
                &[
                    ("main.js", "import \"./a.js\";\nfunction* rows() {}\n"),
                    ("a.js", "let rows = [];\n"),
                ],
                "`rows`",
            ),
            (
                &[
                    ("main.js", "import { b } from \"./a.js\";\n"),
                    ("a.js", "export const a = 1;\n"),
                ],
                "`b` from a.js",
            ),
            (
                &[
                    ("main.js", "import { a as b } from \"./a.js\";\n"),
                    ("a.js", "export const a = 1;\n"),
                ],
                "no `as`",
            ),
            (&[("main.js", "import \"./missing.js\";\n")], "./missing.js"),
            (
                &[("main.js", "import \"./a.js\";\n"), ("a.js", "import \"./main.js\";\n")],
                "cycle",
            ),
            (&[("main.js", "export default function () {}\n")], "only declarations"),
            (
                &[
                    ("main.js", "import {\n  a,\n} from \"./a.js\";\n"),
                    ("a.js", "export const a = 1;\n"),
                ],
                "one whole line",
            ),
        ];
        for (list, expected) in cases {
            let error = join("import \"./js/main.js\";\n", "js", &modules(list)).unwrap_err();
            assert!(error.contains(expected), "{error} (expected it to mention {expected})");
        }
    }
}
