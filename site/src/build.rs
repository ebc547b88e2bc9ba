//! Building the static site into a folder.
//!
//! The output is flat: pages, the hashed page script (its modules joined into one
//! file, see [`crate::bundle`]), stylesheet, wasm glue and wasm modules (each
//! calculator page its own, `fluxledger_<key>.<hash>.wasm`, with one glue shared by
//! all of them; the verification page a module of every calculator with its own
//! glue; the offline module, every calculator behind the pages' glue), the service
//! worker, the manifest and the icons, all side by side so
//! that every URL is relative and the service worker's scope (its own folder)
//! covers everything. File names of the script, stylesheet, glue and module carry
//! the first 8 hex digits of the SHA-256 of their content: a page can never load a
//! glue and a module from different builds, and a new build never reuses a stale
//! cached file. `sw.js` keeps its name (browsers look it up by URL) and gets the
//! build's cache version (a hash over every other file), the list of every file
//! to precache (all but the pages' own modules), the pages' module names and the
//! offline module's name, which it hands to a page whose own module the browser
//! does not hold.
//!
//! Each calculator page carries its demo result, computed natively by the core at
//! build time ([`crate::prerender`]), and the stylesheet's screen rules inline
//! ([`split_print_rules`]; the print rules are the hashed stylesheet file), so a
//! first visit shows a result with the HTML alone. Its one inline script
//! (`query.js`, see [`head_script`]) loads the page script, the glue and the wasm
//! after the first paint, or at once for a link with a query.
//!
//! Every text file and the wasm module are also written precompressed beside
//! themselves: `name.br` (Brotli, quality 11) and `name.gz` (gzip, level 9). The
//! local server sends them with `Content-Encoding` and `Vary: Accept-Encoding`
//! when the request accepts them; a static host should do the same (README).

use std::collections::BTreeMap;
use std::fmt;
use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::Mutex;

use flate2::write::GzEncoder;
use flate2::Compression;
use sha2::{Digest, Sha256};

use fluxledger_core::calculators;
use fluxledger_core::catalog::CalculatorSpec;

use crate::error::{SiteError, SiteErrorKind};
use crate::pages::{self, PageAssets};
use crate::{icons, notes, prerender, wasm_build};

/// Placeholder in a page-script module (`js/wasm.js`) for the file name of the
/// hashed wasm glue.
pub const GLUE_PLACEHOLDER: &str = "__GLUE__";
/// Folder of `site/assets` with the page script's ES modules, imported by `app.js`.
pub const MODULES_DIR: &str = "js";
/// Placeholder in `sw.js` for the build's cache version (a bare hex string; put it
/// inside quotes).
pub const CACHE_VERSION_PLACEHOLDER: &str = "__CACHE_VERSION__";
/// Placeholder in `sw.js` for the offline module's file name (put it inside quotes).
pub const OFFLINE_MODULE_PLACEHOLDER: &str = "__OFFLINE_MODULE__";
/// Placeholder in `sw.js` for the JSON array of the calculator pages' module file
/// names (written as an array literal, like [`PRECACHE_PLACEHOLDER`]).
pub const PAGE_MODULES_PLACEHOLDER: &str = "__PAGE_MODULES__";
/// Placeholder in `sw.js` for the JSON array of every file to precache (written as
/// an array literal; a quoted placeholder is replaced together with its quotes).
pub const PRECACHE_PLACEHOLDER: &str = "__PRECACHE__";
/// Marker file written into every built site, so that a rebuild may clear the folder.
pub const MARKER_FILE: &str = ".fluxledger-site";
/// The script in `site/assets` inlined in the head of every calculator page: it
/// marks a page opened with a query before its body is parsed (see
/// [`crate::prerender`]) and loads the page script ([`head_script`]).
pub const QUERY_SCRIPT: &str = "query.js";
/// Placeholders of `query.js`: the page script, the modules and glue to preload (a
/// JSON array) and the wasm module.
pub const HEAD_SCRIPT_PLACEHOLDERS: [&str; 3] = ["__PAGE_SCRIPT__", "__PRELOADS__", "__WASM__"];
/// File name endings written precompressed (`.br`, `.gz`) beside the file.
pub const COMPRESSED_EXTENSIONS: [&str; 7] = ["html", "js", "css", "wasm", "svg", "webmanifest", "json"];
/// Most bytes a calculator page's HTML (its first response, which shows the demo
/// result) may take gzipped at the default level: issue 9's budget for the bytes
/// before the first result on a visit without a query. The browser tests check
/// every page of a build against it ([`BuildReport::pages_over_budget`]).
pub const FIRST_RESPONSE_GZIP_BUDGET: usize = 20_000;
/// Sizes of the app icons (PNG), besides the SVG icon.
pub const ICON_SIZES: [u32; 2] = [192, 512];

/// How to build.
#[derive(Clone, Debug)]
pub struct BuildOptions {
    /// The workspace root (holds `Cargo.toml`; the wasm crate is built from here).
    pub root: PathBuf,
    /// The site sources: `assets/` (page script, stylesheet, service worker, any
    /// extra files) and `notes/` (one method note per calculator). `None` means
    /// `<root>/site`.
    pub site_dir: Option<PathBuf>,
    /// Cargo's target folder for the wasm build; `None` means `$CARGO_TARGET_DIR`
    /// or `<root>/target`, so the nested build reuses the workspace's artifacts.
    pub target_dir: Option<PathBuf>,
    /// Run `wasm-opt -Os` when it is on `PATH` (off by default, never required).
    /// Off because Debian 12's binaryen 108 produced a module that Chromium
    /// rejects ("WebAssembly.Table.set(): Argument 1 is invalid for table") and
    /// its output was 6 % smaller raw but 2 % larger gzipped (tried on this site).
    pub wasm_opt: bool,
    /// Print progress (nested cargo output) to stderr; without it, output of a
    /// failing nested build is put into the error.
    pub log: bool,
}

impl Default for BuildOptions {
    fn default() -> BuildOptions {
        BuildOptions {
            root: workspace_root(),
            site_dir: None,
            target_dir: None,
            wasm_opt: false,
            log: false,
        }
    }
}

impl BuildOptions {
    pub fn site_dir(&self) -> PathBuf {
        self.site_dir.clone().unwrap_or_else(|| self.root.join("site"))
    }
    pub fn target_dir(&self) -> PathBuf {
        self.target_dir
            .clone()
            .or_else(|| std::env::var_os("CARGO_TARGET_DIR").map(PathBuf::from))
            .map(|dir| if dir.is_relative() { self.root.join(dir) } else { dir })
            .unwrap_or_else(|| self.root.join("target"))
    }
}

/// The workspace root this tool was compiled from.
pub fn workspace_root() -> PathBuf {
    let site = Path::new(env!("CARGO_MANIFEST_DIR"));
    site.parent().unwrap_or(site).to_path_buf()
}

/// One written file with its size.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct FileReport {
    /// File name relative to the site folder (also its URL).
    pub name: String,
    pub bytes: usize,
    pub gzip_bytes: usize,
    /// Size of the `.br` file written beside it (`None`: not precompressed).
    pub brotli_bytes: Option<usize>,
}

impl FileReport {
    /// Bytes a browser that accepts Brotli receives for this file.
    pub fn transfer_bytes(&self) -> usize {
        self.brotli_bytes.unwrap_or(self.bytes)
    }
}

/// The bytes fetched on a first visit to one calculator page.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ColdLoad {
    pub page: String,
    /// The files counted: page, page script and its modules, glue, wasm.
    pub files: Vec<String>,
    pub bytes: usize,
    pub gzip_bytes: usize,
    pub brotli_bytes: usize,
    /// What shows the first (prerendered) result: the page (its screen styles and
    /// head script are inline).
    pub first_result_files: Vec<String>,
    pub first_result_gzip_bytes: usize,
    pub first_result_brotli_bytes: usize,
}

/// What a build wrote.
#[derive(Clone, Debug)]
pub struct BuildReport {
    pub out: PathBuf,
    /// Every file, sorted by name.
    pub files: Vec<FileReport>,
    /// Hashed names of the main assets: each calculator page's module by page key,
    /// the verification page's, the offline module (stored by the service worker in
    /// place of the pages' own), and the glue of the calculator pages.
    pub modules: BTreeMap<String, String>,
    pub verify_module: String,
    pub offline_module: String,
    pub glue: String,
    pub script: String,
    pub stylesheet: String,
    /// The service worker's cache version.
    pub cache_version: String,
    /// Calculator pages (`bend.html`, ...), in contents order.
    pub calculator_pages: Vec<String>,
    /// Whether wasm-opt ran.
    pub wasm_optimised: bool,
    /// First visit to `bend.html`, or to the first calculator page when there is no
    /// bend page; `None` without calculators.
    pub cold_load: Option<ColdLoad>,
    /// What the service worker stores for offline use, as sent compressed
    /// (Brotli where written): everything, and the part a first visit to the
    /// cold-load page had not already fetched.
    pub precache_bytes: usize,
    pub precache_extra_bytes: usize,
}

impl BuildReport {
    pub fn file(&self, name: &str) -> Option<&FileReport> {
        self.files.iter().find(|f| f.name == name)
    }

    /// Calculator pages whose HTML is over [`FIRST_RESPONSE_GZIP_BUDGET`] gzipped,
    /// with their gzip size.
    pub fn pages_over_budget(&self) -> Vec<(String, usize)> {
        self.calculator_pages
            .iter()
            .filter_map(|page| self.file(page))
            .filter(|file| file.gzip_bytes > FIRST_RESPONSE_GZIP_BUDGET)
            .map(|file| (file.name.clone(), file.gzip_bytes))
            .collect()
    }
}

impl fmt::Display for BuildReport {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        writeln!(f, "site written to {}", self.out.display())?;
        let width = self.files.iter().map(|x| x.name.len()).max().unwrap_or(4).max(5);
        writeln!(
            f,
            "  {:<width$}  {:>9}  {:>9}  {:>9}",
            "file", "bytes", "gzip", "brotli"
        )?;
        let brotli = |x: &FileReport| x.brotli_bytes.map(|b| b.to_string()).unwrap_or_else(|| "-".into());
        for file in &self.files {
            writeln!(
                f,
                "  {:<width$}  {:>9}  {:>9}  {:>9}",
                file.name,
                file.bytes,
                file.gzip_bytes,
                brotli(file)
            )?;
        }
        let (bytes, gzip, transfer) = self.files.iter().fold((0, 0, 0), |(b, g, t), x| {
            (b + x.bytes, g + x.gzip_bytes, t + x.transfer_bytes())
        });
        writeln!(f, "  {:<width$}  {:>9}  {:>9}  {:>9}", "total", bytes, gzip, transfer)?;
        writeln!(
            f,
            "service worker precache: {} bytes as sent (Brotli), {} of them not already fetched by the first visit \
             (the pages' own modules are not stored: {} stands in for each)",
            self.precache_bytes, self.precache_extra_bytes, self.offline_module
        )?;
        if !self.wasm_optimised {
            writeln!(
                f,
                "  (module as wasm-bindgen wrote it; --wasm-opt runs wasm-opt -Os when on PATH)"
            )?;
        }
        let largest = self
            .calculator_pages
            .iter()
            .filter_map(|page| self.file(page))
            .max_by_key(|file| file.gzip_bytes);
        if let Some(file) = largest {
            writeln!(
                f,
                "largest calculator page: {} at {} bytes gzip (budget {FIRST_RESPONSE_GZIP_BUDGET}){}",
                file.name,
                file.gzip_bytes,
                match self.pages_over_budget().len() {
                    0 => String::new(),
                    n => format!("; {n} pages over the budget"),
                }
            )?;
        }
        match &self.cold_load {
            Some(cold) => write!(
                f,
                concat!(
                    "first result of {} ({}): {} bytes gzip, {} bytes Brotli\n",
                    "cold load of {} until interactive ({}): {} bytes, {} bytes gzip, {} bytes Brotli"
                ),
                cold.page,
                cold.first_result_files.join(", "),
                cold.first_result_gzip_bytes,
                cold.first_result_brotli_bytes,
                cold.page,
                cold.files.join(", "),
                cold.bytes,
                cold.gzip_bytes,
                cold.brotli_bytes
            ),
            None => write!(f, "no calculator pages yet: no cold-load figure"),
        }
    }
}

/// First 8 hex digits of the SHA-256 of `bytes`.
pub fn short_hash(bytes: &[u8]) -> String {
    let digest = Sha256::digest(bytes);
    digest.iter().take(4).map(|b| format!("{b:02x}")).collect()
}

/// `stem.<hash>.ext` for the content.
fn hashed_name(stem: &str, ext: &str, bytes: &[u8]) -> String {
    format!("{stem}.{}.{ext}", short_hash(bytes))
}

/// Gzip size of `bytes` at the default level (what a static host typically sends).
pub fn gzip_size(bytes: &[u8]) -> usize {
    gzip(bytes, Compression::default()).len()
}

/// `bytes` gzipped at `level`.
pub fn gzip(bytes: &[u8], level: Compression) -> Vec<u8> {
    let mut encoder = GzEncoder::new(Vec::new(), level);
    // Writing into a Vec cannot fail.
    let _ = encoder.write_all(bytes);
    encoder.finish().unwrap_or_default()
}

/// `bytes` compressed with Brotli at quality 11, window 2^22 (the `.br` files).
pub fn brotli_compress(bytes: &[u8]) -> Vec<u8> {
    let mut out = Vec::new();
    let params = brotli::enc::BrotliEncoderParams {
        quality: 11,
        lgwin: 22,
        ..Default::default()
    };
    let mut input = bytes;
    // Reading from a slice and writing into a Vec cannot fail.
    let _ = brotli::BrotliCompress(&mut input, &mut out, &params);
    out
}

/// Whether a file is written precompressed beside itself.
pub fn is_compressed_type(name: &str) -> bool {
    name.rsplit_once('.')
        .is_some_and(|(_, ext)| COMPRESSED_EXTENSIONS.contains(&ext))
}

/// A JSON array literal of `items`, each written by [`json_string`].
fn json_array<'a>(items: impl IntoIterator<Item = &'a str>) -> String {
    let items: Vec<String> = items.into_iter().map(json_string).collect();
    format!("[{}]", items.join(", "))
}

/// A JSON string literal.
pub fn json_string(text: &str) -> String {
    let mut out = String::with_capacity(text.len() + 2);
    out.push('"');
    for ch in text.chars() {
        match ch {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\r' => out.push_str("\\r"),
            '\t' => out.push_str("\\t"),
            c if (c as u32) < 0x20 => out.push_str(&format!("\\u{:04x}", c as u32)),
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

/// Serialises builds within one process (tests may build from several threads).
static BUILD_LOCK: Mutex<()> = Mutex::new(());

/// Builds the site into `out` (created if needed; a previous site build there is
/// replaced; any other non-empty folder is refused).
///
/// Safe to call from several threads at once: builds are serialised by a process
/// lock, and the nested cargo build waits on cargo's own lock across processes.
///
/// # Errors
/// Missing assets or method notes (all listed at once), a failing wasm build, a
/// placeholder missing from `app.js` or `sw.js`, bad LaTeX in a note, or I/O.
pub fn build_site(out: &Path, opts: &BuildOptions) -> Result<BuildReport, SiteError> {
    let _guard = BUILD_LOCK.lock().unwrap_or_else(|poisoned| poisoned.into_inner());
    build_locked(out, opts)
}

struct Sources {
    app_js: String,
    /// The page script's modules in `site/assets/js` (file name, text).
    modules: BTreeMap<String, String>,
    /// `query.js`, when the assets have one.
    query_js: Option<String>,
    style_css: Vec<u8>,
    sw_js: String,
    /// Other files in `site/assets` copied as they are (file name, bytes).
    extra_assets: Vec<(String, Vec<u8>)>,
    /// Rendered method note per calculator key.
    notes: BTreeMap<&'static str, String>,
}

fn assets_dir(site: &Path) -> PathBuf {
    site.join("assets")
}

fn notes_dir(site: &Path) -> PathBuf {
    site.join("notes")
}

/// Reads every source before anything slow happens, reporting all missing files
/// at once.
fn read_sources(site: &Path, root: &Path, specs: &[CalculatorSpec]) -> Result<Sources, SiteError> {
    let assets = assets_dir(site);
    let required_assets = ["app.js", "style.css", "sw.js"].map(|name| assets.join(name));
    let note_paths: Vec<(&'static str, PathBuf)> = specs
        .iter()
        .map(|s| (s.key, notes_dir(site).join(format!("{}.md", s.key))))
        .collect();
    let missing: Vec<PathBuf> = required_assets
        .iter()
        .chain(note_paths.iter().map(|(_, p)| p))
        .filter(|p| !p.is_file())
        .map(|p| {
            p.strip_prefix(root)
                .map(Path::to_path_buf)
                .unwrap_or_else(|_| p.clone())
        })
        .collect();
    if !missing.is_empty() {
        return Err(SiteErrorKind::MissingSources { paths: missing }.into());
    }
    let read_text = |path: &Path| fs::read_to_string(path).map_err(|e| SiteError::io(path, e));
    let app_js = read_text(&required_assets[0])?;
    let style_css = fs::read(&required_assets[1]).map_err(|e| SiteError::io(&required_assets[1], e))?;
    let sw_js = read_text(&required_assets[2])?;
    let modules = read_modules(&assets.join(MODULES_DIR))?;

    let mut extra_assets = Vec::new();
    let entries = fs::read_dir(&assets).map_err(|e| SiteError::io(&assets, e))?;
    for entry in entries {
        let entry = entry.map_err(|e| SiteError::io(&assets, e))?;
        let name = entry.file_name().to_string_lossy().into_owned();
        let path = entry.path();
        if name.starts_with('.')
            || ["app.js", "style.css", "sw.js", crate::verify::SCRIPT, QUERY_SCRIPT].contains(&name.as_str())
            || !path.is_file()
        {
            continue;
        }
        extra_assets.push((name, fs::read(&path).map_err(|e| SiteError::io(&path, e))?));
    }
    extra_assets.sort();

    let mut rendered = BTreeMap::new();
    for (key, path) in &note_paths {
        let markdown = read_text(path)?;
        let shown = path.strip_prefix(root).unwrap_or(path);
        rendered.insert(*key, notes::render_note(&markdown, shown)?);
    }
    let query_path = assets.join(QUERY_SCRIPT);
    let query_js = if query_path.is_file() {
        Some(read_text(&query_path)?)
    } else {
        None
    };
    Ok(Sources {
        app_js,
        modules,
        query_js,
        style_css,
        sw_js,
        extra_assets,
        notes: rendered,
    })
}

/// The `.js` files of the modules folder (none when it does not exist).
fn read_modules(dir: &Path) -> Result<BTreeMap<String, String>, SiteError> {
    let mut modules = BTreeMap::new();
    if !dir.is_dir() {
        return Ok(modules);
    }
    for entry in fs::read_dir(dir).map_err(|e| SiteError::io(dir, e))? {
        let path = entry.map_err(|e| SiteError::io(dir, e))?.path();
        let name = path
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        if path.is_file() && name.ends_with(".js") && !name.starts_with('.') {
            modules.insert(name, fs::read_to_string(&path).map_err(|e| SiteError::io(&path, e))?);
        }
    }
    Ok(modules)
}

/// Splits a stylesheet into its screen rules and its print rules: every top-level
/// `@media print { … }` block goes to the second part, whole; the rest to the first.
/// Comments go from both; the stylesheet is cut into its top-level rules by
/// [`first_screen::units`](crate::first_screen::units), which skips strings when
/// matching braces.
pub fn split_print_rules(css: &str) -> (String, String) {
    let css = without_comments(css);
    let (mut screen, mut print) = (Vec::new(), String::new());
    for unit in crate::first_screen::units(&css) {
        if unit.starts_with("@media print") {
            print.push_str(unit);
            print.push('\n');
        } else {
            screen.push(unit);
        }
    }
    let screen: String = screen
        .join("\n")
        .lines()
        .map(str::trim_end)
        .filter(|line| !line.trim().is_empty())
        .collect::<Vec<_>>()
        .join("\n");
    (screen, print)
}

/// A stylesheet with its comments removed (a `/*` inside a string is not one).
fn without_comments(css: &str) -> String {
    let bytes = css.as_bytes();
    let mut out = String::with_capacity(css.len());
    let (mut copied, mut i) = (0, 0);
    while i < bytes.len() {
        match bytes[i] {
            b'/' if bytes.get(i + 1) == Some(&b'*') => {
                out.push_str(&css[copied..i]);
                i = css[i + 2..].find("*/").map_or(bytes.len(), |e| i + 2 + e + 2);
                copied = i;
                continue;
            }
            quote @ (b'"' | b'\'') => {
                i += 1;
                while i < bytes.len() && bytes[i] != quote {
                    i += if bytes[i] == b'\\' { 2 } else { 1 };
                }
            }
            _ => {}
        }
        i += 1;
    }
    out.push_str(&css[copied.min(css.len())..]);
    out
}

/// The inline head script of calculator pages: `query.js` without its comment
/// lines and blank lines, its placeholders filled with the page script, the
/// scripts to preload with it (the wasm glue) and the wasm module (JSON literals).
///
/// # Errors
/// A placeholder missing from the source.
pub fn head_script(source: &str, script: &str, preloaded: &[String], wasm: &str) -> Result<String, String> {
    let code: String = source
        .lines()
        .filter(|line| !line.trim_start().starts_with("//") && !line.trim().is_empty())
        .collect::<Vec<_>>()
        .join("\n");
    let list = format!(
        "[{}]",
        preloaded.iter().map(|n| json_string(n)).collect::<Vec<_>>().join(", ")
    );
    let [page_script, preloads, wasm_module] = HEAD_SCRIPT_PLACEHOLDERS;
    let mut filled = code;
    for (token, literal) in [
        (page_script, json_string(script)),
        (preloads, list),
        (wasm_module, json_string(wasm)),
    ] {
        let quoted = format!("\"{token}\"");
        if !filled.contains(&quoted) {
            return Err(format!("the placeholder {quoted} is missing"));
        }
        filled = filled.replace(&quoted, &literal);
    }
    if filled.to_ascii_lowercase().contains("</script") {
        return Err("the script contains `</script`".to_string());
    }
    Ok(filled)
}

/// Replaces every occurrence of `token`, which must occur at least once.
fn fill(text: &str, token: &str, value: &str, path: &Path) -> Result<String, SiteError> {
    if !text.contains(token) {
        return Err(SiteError::content(path, format!("the placeholder {token} is missing")));
    }
    Ok(text.replace(token, value))
}

/// Replaces a placeholder that stands for a JavaScript literal: a quoted
/// placeholder (`"__X__"`) is replaced with its quotes, a bare one as it stands.
fn fill_literal(text: &str, token: &str, literal: &str, path: &Path) -> Result<String, SiteError> {
    if !text.contains(token) {
        return Err(SiteError::content(path, format!("the placeholder {token} is missing")));
    }
    let mut filled = text.to_string();
    for quote in ['"', '\'', '`'] {
        filled = filled.replace(&format!("{quote}{token}{quote}"), literal);
    }
    Ok(filled.replace(token, literal))
}

fn build_locked(out: &Path, opts: &BuildOptions) -> Result<BuildReport, SiteError> {
    let root = &opts.root;
    let specs = calculators::catalog();
    let site = opts.site_dir();
    let sources = read_sources(&site, root, &specs)?;
    let assets = assets_dir(&site);

    wasm_build::ensure_wasm_target(opts.log)?;
    let names: Vec<&str> = specs
        .iter()
        .map(|spec| spec.key)
        .chain([wasm_build::VERIFY_MODULE, wasm_build::OFFLINE_MODULE])
        .collect();
    let module_paths = wasm_build::cargo_build_wasm(root, &opts.target_dir(), &names, opts.log)?;
    let built = bindgen_all(&module_paths, opts.wasm_opt, opts.log)?;

    let mut files: BTreeMap<String, Vec<u8>> = BTreeMap::new();

    // Every calculator page's module has the same exports, so the same glue; it is
    // checked, then written once. Its default module (used only when the page
    // script passes none) is the first page's. The offline module must have that
    // glue too: the service worker hands it to any page in place of its own.
    let mut page_modules: BTreeMap<String, String> = BTreeMap::new();
    let mut page_glue: Option<(String, String)> = None;
    let mut verify = None;
    let mut offline = None;
    let mut optimised = true;
    for (name, output) in built {
        optimised &= output.optimised;
        let wasm_name = hashed_name(&format!("fluxledger_{name}"), "wasm", &output.wasm);
        files.insert(wasm_name.clone(), output.wasm);
        let glue = fill(
            &output.glue_js,
            &output.glue_wasm_name,
            &wasm_name,
            Path::new("wasm-bindgen glue"),
        )?;
        if name == wasm_build::VERIFY_MODULE {
            verify = Some((wasm_name, glue));
            continue;
        }
        let unnamed = output.glue_js.replace(&output.glue_wasm_name, "");
        match &page_glue {
            None => page_glue = Some((unnamed, glue)),
            Some((first, _)) if *first != unnamed => {
                return Err(SiteErrorKind::Bindgen {
                    detail: format!(
                        "the module '{name}' has other exports than the first page's \
                         (every calculator page and the offline module share one glue; see wasm/modules/)"
                    ),
                }
                .into());
            }
            Some(_) => {}
        }
        if name == wasm_build::OFFLINE_MODULE {
            offline = Some(wasm_name);
        } else {
            page_modules.insert(name, wasm_name);
        }
    }
    let (Some((_, glue_js)), Some((verify_wasm, verify_glue_js)), Some(offline_wasm)) = (page_glue, verify, offline)
    else {
        return Err(SiteErrorKind::Bindgen {
            detail: "the build lacks a calculator page module, the verification module or the offline module".into(),
        }
        .into());
    };
    // The page calls the glue as soon as the module is in: compiled while it streams.
    let glue_js = format!("{}{glue_js}", crate::bundle::EAGER_COMPILE_HINT);
    let glue_name = hashed_name("fluxledger_wasm", "js", glue_js.as_bytes());
    let verify_glue_name = hashed_name("fluxledger_verify", "js", verify_glue_js.as_bytes());
    let mut modules = sources.modules.clone();
    let glue_module = modules
        .iter()
        .find(|(_, text)| text.contains(GLUE_PLACEHOLDER))
        .map(|(n, _)| n.clone());
    let mut app_js = sources.app_js.clone();
    match glue_module {
        Some(name) => {
            let path = assets.join(MODULES_DIR).join(&name);
            let filled = fill(&modules[&name], GLUE_PLACEHOLDER, &glue_name, &path)?;
            modules.insert(name, filled);
        }
        None => app_js = fill(&app_js, GLUE_PLACEHOLDER, &glue_name, &assets.join("app.js"))?,
    }
    let app_js = crate::bundle::join(&app_js, MODULES_DIR, &modules)
        .map_err(|message| SiteError::content(assets.join(MODULES_DIR), message))?;
    let script = hashed_name("app", "js", app_js.as_bytes());
    let style_path = assets.join("style.css");
    let style_text = String::from_utf8(sources.style_css)
        .map_err(|_| SiteError::content(&style_path, "the stylesheet is not UTF-8".to_string()))?;
    let (screen_rules, print_rules) = split_print_rules(&style_text);
    if screen_rules.to_ascii_lowercase().contains("</style") {
        return Err(SiteError::content(
            &style_path,
            "the stylesheet contains `</style`".to_string(),
        ));
    }
    let stylesheet = hashed_name("style", "css", print_rules.as_bytes());
    // The screen rules as a file too, for the method-note pages: they are not a
    // first response, and linking saves the precache a copy of the rules per note.
    let screen_stylesheet = hashed_name("screen", "css", screen_rules.as_bytes());
    files.insert(screen_stylesheet.clone(), screen_rules.clone().into_bytes());
    files.insert(glue_name.clone(), glue_js.into_bytes());
    files.insert(verify_glue_name.clone(), verify_glue_js.into_bytes());
    files.insert(script.clone(), app_js.into_bytes());
    files.insert(stylesheet.clone(), print_rules.into_bytes());
    // Each calculator page's inline head script names its own module.
    let head_script_of = |wasm: &str| match &sources.query_js {
        Some(text) => head_script(text, &script, std::slice::from_ref(&glue_name), wasm)
            .map_err(|message| SiteError::content(assets.join(QUERY_SCRIPT), message)),
        None => Ok(String::new()),
    };

    files.insert("icon.svg".into(), icons::svg().into_bytes());
    for size in ICON_SIZES {
        files.insert(format!("icon-{size}.png"), icons::png(size));
    }
    files.insert("manifest.webmanifest".into(), manifest().into_bytes());
    // Files in site/assets other than the three above (their own icons, fonts...)
    // are copied as they are and win over generated ones of the same name.
    for (name, bytes) in sources.extra_assets {
        files.insert(name, bytes);
    }

    let page_assets = PageAssets {
        stylesheet: stylesheet.clone(),
        screen_stylesheet,
        script: script.clone(),
        glue: glue_name.clone(),
        wasm: String::new(),
        inline_style: screen_rules,
        head_script: String::new(),
        theme_colour: icons::theme_colour(),
        version: env!("CARGO_PKG_VERSION").to_string(),
    };
    files.insert(
        "index.html".into(),
        pages::contents_page(&specs, &page_assets).into_bytes(),
    );
    let mut calculator_pages = Vec::new();
    for spec in &specs {
        let note = sources.notes.get(spec.key).map(String::as_str).unwrap_or("");
        let file = pages::page_file(spec.key);
        let wasm = page_modules.get(spec.key).cloned().unwrap_or_default();
        let own_assets = PageAssets {
            head_script: head_script_of(&wasm)?,
            wasm,
            ..page_assets.clone()
        };
        files.insert(
            file.clone(),
            pages::calculator_page(spec, note, prerender::calculator_section(spec).as_deref(), &own_assets)
                .into_bytes(),
        );
        calculator_pages.push(file);
        if let Some(page) = pages::method_page(spec, note, &page_assets) {
            files.insert(pages::method_file(spec.key), page.into_bytes());
        }
    }
    crate::verify::add_page(&site, root, &verify_glue_name, &page_assets, &mut files)?;

    // Cache version: a hash over every file's name and content.
    let mut all = Sha256::new();
    for (name, bytes) in &files {
        all.update((name.len() as u64).to_le_bytes());
        all.update(name.as_bytes());
        all.update((bytes.len() as u64).to_le_bytes());
        all.update(bytes);
    }
    let cache_version: String = all.finalize().iter().take(8).map(|b| format!("{b:02x}")).collect();
    // Every file but the pages' own modules: the offline module stands in for them.
    let precached_files: Vec<String> = files
        .keys()
        .filter(|name| !page_modules.values().any(|module| module == *name))
        .cloned()
        .collect();
    let precache = json_array(std::iter::once("./").chain(precached_files.iter().map(String::as_str)));
    let page_module_names = json_array(page_modules.values().map(String::as_str));
    let sw_path = assets.join("sw.js");
    let sw_js = fill(&sources.sw_js, CACHE_VERSION_PLACEHOLDER, &cache_version, &sw_path)?;
    let sw_js = fill(&sw_js, OFFLINE_MODULE_PLACEHOLDER, &offline_wasm, &sw_path)?;
    let sw_js = fill_literal(&sw_js, PAGE_MODULES_PLACEHOLDER, &page_module_names, &sw_path)?;
    let sw_js = fill_literal(&sw_js, PRECACHE_PLACEHOLDER, &precache, &sw_path)?;
    files.insert("sw.js".into(), sw_js.into_bytes());

    let compressed = compress_all(&files);
    write_output(out, &files)?;
    write_compressed(out, &compressed)?;

    let reports: Vec<FileReport> = files
        .iter()
        .map(|(name, bytes)| FileReport {
            name: name.clone(),
            bytes: bytes.len(),
            gzip_bytes: gzip_size(bytes),
            brotli_bytes: compressed.get(name).map(|(br, _)| br.len()),
        })
        .collect();
    let cold_page = calculator_pages
        .iter()
        .find(|p| *p == "bend.html")
        .or(calculator_pages.first());
    let cold_load = cold_page.map(|page| {
        // Every module of the page script is loaded on every page; the first result
        // needs only the page (screen styles and head script inline).
        let first: Vec<String> = vec![page.clone()];
        let key = page.strip_suffix(".html").unwrap_or(page);
        let names: Vec<String> = first
            .iter()
            .cloned()
            .chain([script.clone(), glue_name.clone()])
            .chain(page_modules.get(key).cloned())
            .collect();
        let counted: Vec<&FileReport> = reports.iter().filter(|r| names.contains(&r.name)).collect();
        let first_counted: Vec<&FileReport> = reports.iter().filter(|r| first.contains(&r.name)).collect();
        ColdLoad {
            page: page.clone(),
            files: names.clone(),
            bytes: counted.iter().map(|r| r.bytes).sum(),
            gzip_bytes: counted.iter().map(|r| r.gzip_bytes).sum(),
            brotli_bytes: counted.iter().map(|r| r.transfer_bytes()).sum(),
            first_result_files: first.clone(),
            first_result_gzip_bytes: first_counted.iter().map(|r| r.gzip_bytes).sum(),
            first_result_brotli_bytes: first_counted.iter().map(|r| r.transfer_bytes()).sum(),
        }
    });
    // The precache list is every file but sw.js; the files of the first visit are
    // in the HTTP cache already, and the worker reads hashed files from there.
    let precached = reports.iter().filter(|r| precached_files.contains(&r.name));
    let precache_bytes: usize = precached.clone().map(FileReport::transfer_bytes).sum();
    let precache_extra_bytes: usize = precached
        .filter(|r| !cold_load.as_ref().is_some_and(|c| c.files.contains(&r.name)))
        .map(FileReport::transfer_bytes)
        .sum();
    Ok(BuildReport {
        out: out.to_path_buf(),
        files: reports,
        modules: page_modules,
        verify_module: verify_wasm,
        offline_module: offline_wasm,
        glue: glue_name,
        script,
        stylesheet,
        cache_version,
        calculator_pages,
        wasm_optimised: optimised,
        cold_load,
        precache_bytes,
        precache_extra_bytes,
    })
}

/// Runs wasm-bindgen on every compiled module, on as many threads as the machine
/// has; the outputs in the order of `modules`.
fn bindgen_all(
    modules: &wasm_build::Modules,
    use_wasm_opt: bool,
    log: bool,
) -> Result<Vec<(String, wasm_build::WasmOutput)>, SiteError> {
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1)
        .max(1);
    let chunk = modules.len().div_ceil(threads).max(1);
    let parts: Vec<Result<Vec<(String, wasm_build::WasmOutput)>, SiteError>> = std::thread::scope(|scope| {
        let handles: Vec<_> = modules
            .chunks(chunk)
            .map(|part| {
                scope.spawn(move || {
                    part.iter()
                        .map(|(name, path)| Ok((name.clone(), wasm_build::bindgen(path, use_wasm_opt, log)?)))
                        .collect()
                })
            })
            .collect();
        handles
            .into_iter()
            .map(|handle| {
                handle.join().unwrap_or_else(|_| {
                    Err(SiteErrorKind::Bindgen {
                        detail: "a wasm-bindgen thread panicked".into(),
                    }
                    .into())
                })
            })
            .collect()
    });
    let mut all = Vec::with_capacity(modules.len());
    for part in parts {
        all.extend(part?);
    }
    Ok(all)
}

/// The `.br` and `.gz` bytes of every file of a compressed type, by file name,
/// compressed on as many threads as the machine has (Brotli 11 is slow).
fn compress_all(files: &BTreeMap<String, Vec<u8>>) -> BTreeMap<String, (Vec<u8>, Vec<u8>)> {
    let todo: Vec<(&String, &Vec<u8>)> = files.iter().filter(|(name, _)| is_compressed_type(name)).collect();
    let threads = std::thread::available_parallelism()
        .map(|n| n.get())
        .unwrap_or(1)
        .max(1);
    let chunk = todo.len().div_ceil(threads).max(1);
    std::thread::scope(|scope| {
        let handles: Vec<_> = todo
            .chunks(chunk)
            .map(|part| {
                scope.spawn(move || {
                    part.iter()
                        .map(|(name, bytes)| {
                            (
                                (*name).clone(),
                                (brotli_compress(bytes), gzip(bytes, Compression::best())),
                            )
                        })
                        .collect::<Vec<_>>()
                })
            })
            .collect();
        handles.into_iter().flat_map(|h| h.join().unwrap_or_default()).collect()
    })
}

/// Writes `name.br` and `name.gz` beside each file.
fn write_compressed(out: &Path, compressed: &BTreeMap<String, (Vec<u8>, Vec<u8>)>) -> Result<(), SiteError> {
    for (name, (br, gz)) in compressed {
        for (ext, bytes) in [("br", br), ("gz", gz)] {
            let path = out.join(format!("{name}.{ext}"));
            fs::write(&path, bytes).map_err(|e| SiteError::io(&path, e))?;
        }
    }
    Ok(())
}

/// The web app manifest (relative start URL and scope: works under a sub-path).
pub fn manifest() -> String {
    let theme = json_string(&icons::theme_colour());
    let mut icons_json: Vec<String> = ICON_SIZES
        .iter()
        .map(|s| format!("    {{ \"src\": \"icon-{s}.png\", \"sizes\": \"{s}x{s}\", \"type\": \"image/png\" }}"))
        .collect();
    icons_json.push("    { \"src\": \"icon.svg\", \"sizes\": \"any\", \"type\": \"image/svg+xml\" }".into());
    format!(
        concat!(
            "{{\n",
            "  \"name\": \"Fluxledger: control-volume force calculations\",\n",
            "  \"short_name\": \"Fluxledger\",\n",
            "  \"description\": \"Offline handbook of anchor, thrust-block, jet and turbine force calculations.\",\n",
            "  \"start_url\": \"./index.html\",\n",
            "  \"scope\": \"./\",\n",
            "  \"display\": \"standalone\",\n",
            "  \"background_color\": {theme},\n",
            "  \"theme_color\": {theme},\n",
            "  \"icons\": [\n{icons}\n  ]\n",
            "}}\n"
        ),
        theme = theme,
        icons = icons_json.join(",\n"),
    )
}

/// Clears `out` if it is empty or a previous build, then writes every file and the
/// marker.
fn write_output(out: &Path, files: &BTreeMap<String, Vec<u8>>) -> Result<(), SiteError> {
    if out.exists() {
        let mut entries = fs::read_dir(out).map_err(|e| SiteError::io(out, e))?.peekable();
        let is_empty = entries.peek().is_none();
        if !is_empty {
            if !out.join(MARKER_FILE).is_file() {
                return Err(SiteErrorKind::UnsafeOutput {
                    path: out.to_path_buf(),
                }
                .into());
            }
            for entry in entries {
                let entry = entry.map_err(|e| SiteError::io(out, e))?;
                let path = entry.path();
                let removed = if path.is_dir() {
                    fs::remove_dir_all(&path)
                } else {
                    fs::remove_file(&path)
                };
                removed.map_err(|e| SiteError::io(&path, e))?;
            }
        }
    }
    fs::create_dir_all(out).map_err(|e| SiteError::io(out, e))?;
    let marker = out.join(MARKER_FILE);
    fs::write(
        &marker,
        "Built by fluxledger-site; this folder is replaced on every build.\n",
    )
    .map_err(|e| SiteError::io(&marker, e))?;
    for (name, bytes) in files {
        let path = out.join(name);
        fs::write(&path, bytes).map_err(|e| SiteError::io(&path, e))?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn print_blocks_leave_the_screen_rules_whole_and_comments_go() {
        let css = "/* a { } */\nbody { color: red; }\n@media print {\n  .x { content: \"}\"; }\n  @page { margin: 1cm; }\n}\n\
@media (min-width: 900px) { main { width: 1px; } }\n@media print { .y { display: none; } }\n";
        let (screen, print) = split_print_rules(css);
        assert_eq!(
            screen,
            "body { color: red; }\n@media (min-width: 900px) { main { width: 1px; } }"
        );
        assert_eq!(
            print,
            "@media print {\n  .x { content: \"}\"; }\n  @page { margin: 1cm; }\n}\n@media print { .y { display: none; } }\n"
        );
        // Nothing lost: every rule is in one part or the other.
        let (screen, print) = split_print_rules("a{b:c}");
        assert_eq!((screen.as_str(), print.as_str()), ("a{b:c}", ""));
    }

    #[test]
    fn head_script_fills_every_placeholder_and_drops_comment_lines() {
        let source = "// note\n(function (s, m, w) {\n  // inner\n  go(s, m, w);\n})(\"__PAGE_SCRIPT__\", \"__PRELOADS__\", \"__WASM__\");\n";
        let filled = head_script(source, "app.1.js", &["a.2.js".into(), "g\"3.js".into()], "m.4.wasm").unwrap();
        assert_eq!(
            filled,
            "(function (s, m, w) {\n  go(s, m, w);\n})(\"app.1.js\", [\"a.2.js\", \"g\\\"3.js\"], \"m.4.wasm\");"
        );
        let missing = head_script("go(\"__PAGE_SCRIPT__\", \"__WASM__\")", "a", &[], "w");
        assert!(missing.unwrap_err().contains("__PRELOADS__"));
        let closing = head_script(
            "x(\"__PAGE_SCRIPT__\", \"__PRELOADS__\", \"__WASM__\")",
            "</script>",
            &[],
            "w",
        );
        assert!(closing.is_err());
    }

    #[test]
    fn short_hash_is_the_sha256_prefix() {
        // SHA-256("abc") = ba7816bf 8f01cfea ... (FIPS 180-2, appendix B.1 example).
        assert_eq!(short_hash(b"abc"), "ba7816bf");
        assert_eq!(hashed_name("app", "js", b"abc"), "app.ba7816bf.js");
    }

    #[test]
    fn json_strings_escape_quotes_backslashes_and_controls() {
        assert_eq!(json_string("a\"b\\c\nd\u{1}"), "\"a\\\"b\\\\c\\nd\\u0001\"");
    }

    #[test]
    fn placeholders_must_be_present() {
        let path = Path::new("sw.js");
        assert!(fill("const V = 'x';", CACHE_VERSION_PLACEHOLDER, "abc", path).is_err());
        assert_eq!(
            fill("\"v-__CACHE_VERSION__\"", CACHE_VERSION_PLACEHOLDER, "abc", path)
                .ok()
                .as_deref(),
            Some("\"v-abc\"")
        );
        assert!(fill_literal("const P = [];", PRECACHE_PLACEHOLDER, "[]", path).is_err());
    }

    #[test]
    fn precache_placeholder_is_replaced_bare_or_with_its_quotes() {
        let path = Path::new("sw.js");
        let list = "[\"./\", \"index.html\"]";
        for source in [
            "const P = __PRECACHE__;",
            "const P = \"__PRECACHE__\";",
            "const P = '__PRECACHE__';",
        ] {
            let filled = fill_literal(source, PRECACHE_PLACEHOLDER, list, path).ok();
            assert_eq!(
                filled.as_deref(),
                Some("const P = [\"./\", \"index.html\"];"),
                "{source}"
            );
        }
    }

    #[test]
    fn manifest_has_relative_start_and_scope_and_lists_icons() {
        let manifest = manifest();
        let value: serde_json::Value = serde_json::from_str(&manifest).expect("valid JSON");
        assert_eq!(value["start_url"], "./index.html");
        assert_eq!(value["scope"], "./");
        let icons = value["icons"].as_array().cloned().unwrap_or_default();
        assert_eq!(icons.len(), ICON_SIZES.len() + 1);
        assert_eq!(icons[0]["src"], "icon-192.png");
        assert_eq!(value["theme_color"], icons::theme_colour().as_str());
    }

    #[test]
    fn output_folder_that_is_not_a_site_is_refused_and_a_site_is_replaced() {
        let base = std::env::temp_dir().join(format!("fluxledger-site-out-{}", std::process::id()));
        let _ = fs::remove_dir_all(&base);
        fs::create_dir_all(&base).expect("temp dir");
        fs::write(base.join("precious.txt"), "keep").expect("write");
        let files: BTreeMap<String, Vec<u8>> = [("index.html".to_string(), b"<p>1</p>".to_vec())].into();
        let refused = write_output(&base, &files);
        assert!(matches!(
            refused,
            Err(SiteError {
                kind: SiteErrorKind::UnsafeOutput { .. }
            })
        ));
        assert!(base.join("precious.txt").is_file(), "nothing removed");

        let site = base.join("site");
        write_output(&site, &files).expect("new folder");
        fs::write(site.join("stale.7777aaaa.js"), "old").expect("write");
        let next: BTreeMap<String, Vec<u8>> = [("index.html".to_string(), b"<p>2</p>".to_vec())].into();
        write_output(&site, &next).expect("rebuild over a previous site");
        assert!(!site.join("stale.7777aaaa.js").exists(), "stale file removed");
        assert_eq!(fs::read(site.join("index.html")).ok(), Some(b"<p>2</p>".to_vec()));
        let _ = fs::remove_dir_all(&base);
    }
}
