//! The browser tests' fixture: the site built once per test process and served on
//! a loopback port, and a lock so that one browser runs at a time. Also used by the
//! page measurements (`benches/pages.rs`).

use std::fs;
use std::path::{Path, PathBuf};
use std::sync::{Mutex, MutexGuard, OnceLock};
use std::time::Duration;

use serde_json::json;

use crate::cdp::{self, Browser, Launch, Page};

/// The built site and the server every test but the offline one shares.
pub struct Fixture {
    pub dir: PathBuf,
    /// `http://127.0.0.1:PORT` (no trailing slash).
    pub base: String,
    _server: Server,
}

/// A site server on a loopback port.
pub struct Server {
    inner: fluxledger_site::ServerHandle,
}

impl Server {
    /// `http://127.0.0.1:PORT` (no trailing slash).
    pub fn base(&self) -> String {
        self.inner.url().trim_end_matches('/').to_string()
    }
    /// Stops the server; connections already open are refused too.
    pub fn stop(mut self) {
        self.inner.stop();
    }
}

/// Serves `dir` on `127.0.0.1:0`.
pub fn serve(dir: &Path) -> Result<Server, String> {
    let addr = "127.0.0.1:0".parse().map_err(|e| format!("{e}"))?;
    let inner = fluxledger_site::serve(dir, addr).map_err(|e| format!("cannot serve {}: {e}", dir.display()))?;
    Ok(Server { inner })
}

/// Builds the site once (the first test to ask waits for it) and serves it.
pub fn fixture() -> &'static Fixture {
    static FIXTURE: OnceLock<Result<Fixture, String>> = OnceLock::new();
    let result = FIXTURE.get_or_init(|| {
        let dir = std::env::temp_dir().join(format!("fluxledger-site-{}", std::process::id()));
        let _ = fs::remove_dir_all(&dir);
        fluxledger_site::build_site(&dir, &fluxledger_site::BuildOptions::default())
            .map_err(|e| format!("building the site failed: {e}"))?;
        let server = serve(&dir)?;
        let base = server.base();
        Ok(Fixture {
            dir,
            base,
            _server: server,
        })
    });
    match result {
        Ok(fixture) => fixture,
        Err(message) => panic!("{message}"),
    }
}

/// A fresh browser with one page, for a test: a browser that will not start fails
/// the test with the reason (a missing Chromium says how to install it).
pub fn launched(launch: Launch) -> (Browser, Page) {
    let mut browser = Browser::launch(&launch).unwrap_or_else(|e| panic!("{e}"));
    let page = browser.new_page().unwrap_or_else(|e| panic!("{e}"));
    (browser, page)
}

/// One browser at a time: the tests run on two shared cores.
pub fn one_at_a_time() -> MutexGuard<'static, ()> {
    static TURN: Mutex<()> = Mutex::new(());
    TURN.lock().unwrap_or_else(|poisoned| poisoned.into_inner())
}

/// Error messages of a tab and its workers.
pub fn page_errors(browser: &Browser, page: &Page) -> Vec<String> {
    cdp::error_messages(page.events(browser))
}

/// Encodes query parameters: everything but unreserved characters is escaped.
pub fn query_string(params: &[(String, String)]) -> String {
    fn encode(text: &str) -> String {
        let mut out = String::with_capacity(text.len());
        for byte in text.bytes() {
            if byte.is_ascii_alphanumeric() || b"-._~".contains(&byte) {
                out.push(byte as char);
            } else {
                out.push_str(&format!("%{byte:02X}"));
            }
        }
        out
    }
    params
        .iter()
        .map(|(k, v)| format!("{}={}", encode(k), encode(v)))
        .collect::<Vec<_>>()
        .join("&")
}

/// The query a carry-over link must carry: the core's inputs for the next page and
/// the unit system, sorted by key (for comparing with a link's own, sorted too).
pub fn carried_query(carry: &fluxledger_core::catalog::CarryOver, system: &str) -> Vec<(String, String)> {
    let mut pairs: Vec<(String, String)> = carry.inputs.iter().map(|(k, v)| (k.to_string(), v.clone())).collect();
    pairs.push(("system".into(), system.into()));
    pairs.sort();
    pairs
}

/// Types `text` into a field's control the way a user does: focus, select what is
/// there, insert. Clears `data-state` first so that the caller can wait for the
/// render of this edit and not see the previous one.
pub fn type_into(page: &Page, browser: &mut Browser, field: &str, text: &str) -> Result<(), String> {
    let id = serde_json::to_string(&format!("field-{field}")).unwrap_or_default();
    let ready = page.eval(
        browser,
        &format!(
            "(() => {{ const i = document.getElementById({id}); if (!i) return 'missing'; \
             if (i.closest('[data-field]')?.hidden) return 'hidden'; \
             i.focus(); i.select(); delete document.body.dataset.state; return 'ok'; }})()"
        ),
    )?;
    if ready != "ok" {
        return Err(format!("field '{field}': {ready}"));
    }
    page.call(browser, "Input.insertText", json!({ "text": text }))?;
    Ok(())
}

/// Pins the current case on a calculator page and waits for the comparison's
/// table (with its remove crosses and its download).
pub fn pin_a_case(page: &Page, browser: &mut Browser) -> Result<(), String> {
    page.eval(
        browser,
        "document.querySelector('.compare-panel button[data-action=pin]').click()",
    )?;
    page.wait_for(
        browser,
        "document.querySelector('.compare-table button.unpin')",
        Duration::from_secs(5),
    )
    .map_err(|e| format!("pinning showed no comparison: {e}"))
}

/// Waits until a calculator page has its whole method note: it fetches the later
/// sections in idle time after its first result (up to 3 s, later on a loaded
/// machine).
pub fn wait_for_whole_note(page: &Page, browser: &mut Browser) -> Result<(), String> {
    page.wait_for(
        browser,
        "!document.querySelector('.method-note > .note-more')",
        Duration::from_secs(30),
    )
    .map_err(|e| format!("the note's later sections did not come: {e}"))
}
