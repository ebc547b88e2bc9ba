//! The site tool's one error type: what failed, and the file or command it was about.

use std::fmt;
use std::io;
use std::path::{Path, PathBuf};

/// Why building or serving the site failed.
#[derive(Debug)]
pub struct SiteError {
    pub kind: SiteErrorKind,
}

/// Every way the site tool can fail.
#[derive(Debug)]
pub enum SiteErrorKind {
    /// Reading or writing a file failed.
    Io { path: PathBuf, source: io::Error },
    /// A source file the site needs is missing (an asset or a method note).
    MissingSources { paths: Vec<PathBuf> },
    /// An external command (rustup, cargo, apt-get) could not start or failed.
    Command { command: String, detail: String },
    /// The wasm-bindgen step failed.
    Bindgen { detail: String },
    /// A source file has content the build cannot use (a missing placeholder, bad
    /// LaTeX, markup the page's content security policy would block).
    Content { path: PathBuf, detail: String },
    /// The output folder holds files that are not a previous site build.
    UnsafeOutput { path: PathBuf },
    /// The server was asked to listen on an address other than loopback.
    NotLoopback { addr: String },
}

impl SiteError {
    pub fn io(path: impl AsRef<Path>, source: io::Error) -> SiteError {
        SiteError {
            kind: SiteErrorKind::Io {
                path: path.as_ref().to_path_buf(),
                source,
            },
        }
    }
    pub fn command(command: impl Into<String>, detail: impl Into<String>) -> SiteError {
        SiteError {
            kind: SiteErrorKind::Command {
                command: command.into(),
                detail: detail.into(),
            },
        }
    }
    pub fn content(path: impl AsRef<Path>, detail: impl Into<String>) -> SiteError {
        SiteError {
            kind: SiteErrorKind::Content {
                path: path.as_ref().to_path_buf(),
                detail: detail.into(),
            },
        }
    }
}

impl From<SiteErrorKind> for SiteError {
    fn from(kind: SiteErrorKind) -> SiteError {
        SiteError { kind }
    }
}

impl fmt::Display for SiteError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.kind {
            SiteErrorKind::Io { path, source } => write!(f, "{}: {source}", path.display()),
            SiteErrorKind::MissingSources { paths } => {
                write!(f, "missing site source files (create them, then build again):")?;
                for path in paths {
                    write!(f, "\n  {}", path.display())?;
                }
                Ok(())
            }
            SiteErrorKind::Command { command, detail } => write!(f, "`{command}` failed: {detail}"),
            SiteErrorKind::Bindgen { detail } => write!(f, "wasm-bindgen step failed: {detail}"),
            SiteErrorKind::Content { path, detail } => write!(f, "{}: {detail}", path.display()),
            SiteErrorKind::UnsafeOutput { path } => write!(
                f,
                "refusing to write the site into {}: the folder is not empty and is not a previous site build \
                 (choose an empty or new folder)",
                path.display()
            ),
            SiteErrorKind::NotLoopback { addr } => {
                write!(
                    f,
                    "refusing to serve on {addr}: the local server listens on loopback addresses only (127.0.0.1, ::1)"
                )
            }
        }
    }
}

impl std::error::Error for SiteError {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        match &self.kind {
            SiteErrorKind::Io { source, .. } => Some(source),
            _ => None,
        }
    }
}
