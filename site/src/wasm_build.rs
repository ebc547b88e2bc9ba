//! Compiling the adapter crate to WebAssembly and generating its JavaScript glue.
//!
//! Steps: make sure the `wasm32-unknown-unknown` target is installed (a
//! `rust-toolchain.toml` does not install it for an existing toolchain, so the tool
//! adds it), run `cargo build --release --target wasm32-unknown-unknown -p
//! fluxledger-wasm --examples`, which builds every module the site serves (one per
//! calculator page, `module-<key>`, and the verification page's `module-verify`;
//! see the wasm crate's docs), then run wasm-bindgen on each *in process* through
//! `wasm-bindgen-cli-support`, pinned in the workspace to the same exact version as
//! the `wasm-bindgen` crate so that `Cargo.lock` guarantees they match. `wasm-opt`
//! runs only when asked (`--wasm-opt`) and found on `PATH`; it is never required
//! (see [`crate::BuildOptions::wasm_opt`] for why it is off by default).
//!
//! The nested `cargo build` uses the workspace's own target folder. That is safe
//! from inside `cargo run` and `cargo test`: both release cargo's build-folder lock
//! before they start the program (checked with a probe crate whose `main` and whose
//! test each run `cargo build` on their own target folder).

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

use crate::error::{SiteError, SiteErrorKind};

/// The Rust target the adapter is compiled for.
pub const WASM_TARGET: &str = "wasm32-unknown-unknown";
/// The adapter crate's package name.
const WASM_PACKAGE: &str = "fluxledger-wasm";
/// The file stem every module is given before wasm-bindgen reads it.
const SHARED_STEM: &str = "fluxledger_wasm";
/// The module target of the verification page (every calculator).
pub const VERIFY_MODULE: &str = "verify";
/// The module target the offline copy stores instead of every page's own: every
/// calculator, with a page module's exports (`wasm/modules/offline.rs`).
pub const OFFLINE_MODULE: &str = "offline";

/// The bindgen output, in memory.
pub struct WasmOutput {
    /// The `--target web` ES module glue (refers to the wasm by
    /// [`WasmOutput::glue_wasm_name`]).
    pub glue_js: String,
    pub wasm: Vec<u8>,
    /// Whether `wasm-opt` ran on the module.
    pub optimised: bool,
    /// The file name the glue uses for its module when called without one
    /// (`<module file stem>_bg.wasm`).
    pub glue_wasm_name: String,
}

/// The compiled modules: `(name, path)` with the name a calculator key,
/// [`VERIFY_MODULE`] or [`OFFLINE_MODULE`].
pub type Modules = Vec<(String, PathBuf)>;

/// The cargo program to run: the one running us when we run under cargo.
pub fn cargo_program() -> std::ffi::OsString {
    std::env::var_os("CARGO").unwrap_or_else(|| "cargo".into())
}

/// Adds the wasm target with rustup when it is not installed yet.
///
/// # Errors
/// When rustup is missing or fails.
pub fn ensure_wasm_target(log: bool) -> Result<(), SiteError> {
    let listed = Command::new("rustup")
        .args(["target", "list", "--installed"])
        .stderr(Stdio::inherit())
        .output()
        .map_err(|e| SiteError::command("rustup target list --installed", format!("{e} (is rustup installed?)")))?;
    if !listed.status.success() {
        return Err(SiteError::command(
            "rustup target list --installed",
            listed.status.to_string(),
        ));
    }
    if String::from_utf8_lossy(&listed.stdout)
        .lines()
        .any(|l| l.trim() == WASM_TARGET)
    {
        return Ok(());
    }
    if log {
        eprintln!("adding the Rust target {WASM_TARGET} (rustup target add)");
    }
    let status = Command::new("rustup")
        .args(["target", "add", WASM_TARGET])
        .status()
        .map_err(|e| SiteError::command(format!("rustup target add {WASM_TARGET}"), e.to_string()))?;
    if !status.success() {
        return Err(SiteError::command(
            format!("rustup target add {WASM_TARGET}"),
            status.to_string(),
        ));
    }
    Ok(())
}

/// Compiles the modules `names` (calculator keys and [`VERIFY_MODULE`]) in release
/// for the wasm target, all in one cargo run, and returns their `.wasm` paths.
///
/// With `log` the nested cargo prints its progress to stderr; without, its output
/// is captured and shown only in the error.
pub fn cargo_build_wasm(root: &Path, target_dir: &Path, names: &[&str], log: bool) -> Result<Modules, SiteError> {
    let mut command = Command::new(cargo_program());
    command
        .current_dir(root)
        .arg("build")
        .arg("--release")
        .args(["--target", WASM_TARGET, "-p", WASM_PACKAGE, "--examples"])
        .arg("--manifest-path")
        .arg(root.join("Cargo.toml"))
        .arg("--target-dir")
        .arg(target_dir)
        .stdin(Stdio::null());
    let display = format!("cargo build --release --target {WASM_TARGET} -p {WASM_PACKAGE} --examples");
    if log {
        eprintln!("building the wasm modules ({display})");
        let status = command
            .status()
            .map_err(|e| SiteError::command(&display, e.to_string()))?;
        if !status.success() {
            return Err(SiteError::command(&display, status.to_string()));
        }
    } else {
        let output = command
            .output()
            .map_err(|e| SiteError::command(&display, e.to_string()))?;
        if !output.status.success() {
            let stderr = String::from_utf8_lossy(&output.stderr);
            let tail: Vec<&str> = stderr.lines().rev().take(40).collect();
            let tail: Vec<&str> = tail.into_iter().rev().collect();
            return Err(SiteError::command(
                &display,
                format!("{}\n{}", output.status, tail.join("\n")),
            ));
        }
    }
    let folder = target_dir.join(WASM_TARGET).join("release").join("examples");
    names
        .iter()
        .map(|name| {
            let wasm = folder.join(format!("{}.wasm", module_stem(name)));
            if wasm.is_file() {
                // wasm-bindgen names the glue's import object after the file's stem,
                // inside the module too: one stem for all (in a folder of each's own)
                // lets every calculator page share one glue.
                let dir = folder.join("site").join(name);
                let shared = dir.join(format!("{SHARED_STEM}.wasm"));
                std::fs::create_dir_all(&dir).map_err(|e| SiteError::io(&dir, e))?;
                std::fs::copy(&wasm, &shared).map_err(|e| SiteError::io(&shared, e))?;
                Ok((name.to_string(), shared))
            } else {
                Err(SiteError::command(
                    &display,
                    format!(
                        "finished but {} is not there (is `module-{name}` an example target of {WASM_PACKAGE}?)",
                        wasm.display()
                    ),
                ))
            }
        })
        .collect()
}

/// The file stem cargo gives module `name`'s `.wasm` (the example target
/// `module-<name>`, as a crate name: `module_tank_drain`).
fn module_stem(name: &str) -> String {
    format!("module_{}", name.replace('-', "_"))
}

/// Runs wasm-bindgen (`--target web`, no TypeScript) on the compiled module, then
/// `wasm-opt -Os` when `use_wasm_opt` is set and the program is on `PATH`.
pub fn bindgen(wasm_path: &Path, use_wasm_opt: bool, log: bool) -> Result<WasmOutput, SiteError> {
    let mut bindgen = wasm_bindgen_cli_support::Bindgen::new();
    bindgen
        .input_path(wasm_path)
        .web(true)
        .map_err(bindgen_error)?
        .typescript(false)
        // The library API omits the glue's default wasm URL unless asked; the page
        // script calls `init()` without arguments and the build renames that URL.
        .omit_default_module_path(false)
        // Function names (~90 KB here) and the producers note are not needed in
        // the browser; the target-features section stays for wasm-opt.
        .remove_name_section(true)
        .remove_producers_section(true);
    let mut output = bindgen.generate_output().map_err(bindgen_error)?;
    // The snippet map has an (empty) entry per crate that links wasm-bindgen.
    if output.snippets().values().any(|s| !s.is_empty()) || !output.local_modules().is_empty() {
        return Err(SiteErrorKind::Bindgen {
            detail: "the adapter uses JavaScript snippets or local modules, which the site build does not copy".into(),
        }
        .into());
    }
    let glue_js = output.js().to_string();
    let wasm = output.wasm_mut().emit_wasm();
    let stem = wasm_path.file_stem().and_then(|s| s.to_str()).unwrap_or_default();
    let glue_wasm_name = format!("{stem}_bg.wasm");
    if use_wasm_opt {
        if let Some(program) = find_on_path("wasm-opt") {
            match wasm_opt(&program, &wasm, wasm_path) {
                Ok(optimised) => {
                    return Ok(WasmOutput {
                        glue_js,
                        wasm: optimised,
                        optimised: true,
                        glue_wasm_name,
                    })
                }
                Err(e) => {
                    if log {
                        eprintln!("warning: wasm-opt failed, keeping the module as bindgen wrote it: {e}");
                    }
                }
            }
        }
    }
    Ok(WasmOutput {
        glue_js,
        wasm,
        optimised: false,
        glue_wasm_name,
    })
}

fn bindgen_error(e: impl std::fmt::Display) -> SiteError {
    SiteErrorKind::Bindgen {
        detail: format!("{e:#}"),
    }
    .into()
}

/// Finds an executable by name in `PATH`.
pub fn find_on_path(name: &str) -> Option<PathBuf> {
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .map(|dir| dir.join(name))
        .find(|candidate| candidate.is_file())
}

fn wasm_opt(program: &Path, wasm: &[u8], near: &Path) -> Result<Vec<u8>, SiteError> {
    let dir = near.parent().unwrap_or(Path::new("."));
    let stem = near.file_stem().and_then(|s| s.to_str()).unwrap_or("module");
    let input = dir.join(format!("{stem}.site-bg.{}.wasm", std::process::id()));
    let output = dir.join(format!("{stem}.site-opt.{}.wasm", std::process::id()));
    std::fs::write(&input, wasm).map_err(|e| SiteError::io(&input, e))?;
    let result = Command::new(program)
        .arg("-Os")
        .arg(&input)
        .arg("-o")
        .arg(&output)
        .stdin(Stdio::null())
        .output();
    let _ = std::fs::remove_file(&input);
    let result = result.map_err(|e| SiteError::command("wasm-opt", e.to_string()))?;
    if !result.status.success() {
        let _ = std::fs::remove_file(&output);
        return Err(SiteError::command(
            "wasm-opt -Os",
            String::from_utf8_lossy(&result.stderr).trim().to_string(),
        ));
    }
    let bytes = std::fs::read(&output).map_err(|e| SiteError::io(&output, e));
    let _ = std::fs::remove_file(&output);
    bytes
}
