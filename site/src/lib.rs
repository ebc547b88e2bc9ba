//! The handbook's site tool: builds the static site (wasm module, pages, service
//! worker, manifest, icons) into a folder and serves it on loopback.
//!
//! A key design decision: the site is *generated from the core's catalog*. The
//! contents page and one page per registered calculator are rendered from
//! `fluxledger_core::calculators::catalog()`, each with its method note from
//! `site/notes/<key>.md` (Markdown, LaTeX math rendered to MathML at build time) and
//! its cautions as static HTML. The page script, stylesheet and service worker come
//! from `site/assets/` with build-time placeholders filled in. Everything is
//! written by Rust with pinned versions: no Node tool chain, no shell scripts.
//!
//! Library entry points (used by the command line in `main.rs` and by the browser
//! tests):
//! - [`build_site`]`(out, &BuildOptions)` → [`BuildReport`] (file sizes, hashed
//!   names). Safe to call from several test threads: builds are serialised.
//! - [`serve`]`(dir, addr)` → [`ServerHandle`] with the bound port and a
//!   [`ServerHandle::stop`] that also closes already-accepted keep-alive
//!   connections, so a stopped server really looks offline to a browser.
//!
//! ```no_run
//! use fluxledger_site::{build_site, serve, BuildOptions};
//! let dir = std::env::temp_dir().join("fluxledger-site-example");
//! let report = build_site(&dir, &BuildOptions::default())?;
//! let mut server = serve(&dir, "127.0.0.1:0".parse().unwrap())?;
//! let page = format!("{}bend.html", server.url());
//! // ... drive a browser at `page` ...
//! server.stop(); // the browser now sees the site as offline
//! # Ok::<(), fluxledger_site::SiteError>(())
//! ```
//!
//! Modules: [`build`] (the build pipeline), [`wasm_build`] (cargo + wasm-bindgen),
//! [`pages`] (HTML), [`notes`] (Markdown and math), [`icons`] (PNG/SVG icon),
//! [`server`] (loopback HTTP), [`verify`] (the live verification page), [`error`].

pub mod build;
pub mod bundle;
pub mod error;
pub mod first_screen;
pub mod icons;
pub mod notes;
pub mod pages;
pub mod prerender;
pub mod server;
pub mod verify;
pub mod wasm_build;

pub use build::{build_site, workspace_root, BuildOptions, BuildReport, ColdLoad, FileReport};
pub use error::{SiteError, SiteErrorKind};
pub use server::{serve, ServerHandle};
