//! The browser tests' fixture: the site built once per test process and served on
//! a loopback port, a lock so that one browser runs at a time, and the measurement
//! helper.

use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::{Mutex, MutexGuard, OnceLock};
use std::time::Duration;

use serde_json::{json, Value};

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

/// One browser at a time: the tests run on two shared cores.
/// A fresh browser with one page, for a test: a browser that will not start fails
/// the test with the reason (a missing Chromium says how to install it).
pub fn launched(launch: Launch) -> (Browser, Page) {
    let mut browser = Browser::launch(&launch).unwrap_or_else(|e| panic!("{e}"));
    let page = browser.new_page().unwrap_or_else(|e| panic!("{e}"));
    (browser, page)
}

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

// ---------------------------------------------------------------------------------
// Measurements (printed, never asserted).

const FIRST_RESULT: &str = "performance.getEntriesByName('fluxledger:first-result')[0]?.startTime ?? null";

fn median(values: &mut [f64]) -> f64 {
    values.sort_by(|a, b| a.total_cmp(b));
    let n = values.len();
    if n == 0 {
        return f64::NAN;
    }
    if n % 2 == 1 {
        values[n / 2]
    } else {
        (values[n / 2 - 1] + values[n / 2]) / 2.0
    }
}

fn gzip_len(bytes: &[u8]) -> usize {
    let mut encoder = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::default());
    let _ = encoder.write_all(bytes);
    encoder.finish().map(|v| v.len()).unwrap_or(0)
}

/// Cold-load size, first-result times (4× CPU throttling, fresh profiles and repeat
/// visits from the service worker) and recompute time after a keystroke.
pub fn print_measurements(site: &Fixture) -> Result<(), String> {
    const RUNS: usize = 5;
    let url = format!("{}/bend.html", site.base);
    println!("Fluxledger measurements, bend page, {url}");

    // Screenshots to look at (phone and desktop widths).
    for width in [360, 1280] {
        let mut browser = Browser::launch(&Launch { width, height: 900 })?;
        let page = browser.new_page()?;
        page.goto(&mut browser, &url)?;
        page.wait_rendered(&mut browser)?;
        let path = std::env::temp_dir().join(format!("fluxledger-bend-{width}.png"));
        page.screenshot(&mut browser, &path)?;
        println!("  screenshot {width} px wide: {}", path.display());
    }

    // Cold load: bytes of every request the page made until the first result.
    {
        let mut browser = Browser::launch(&Launch {
            width: 360,
            height: 800,
        })?;
        let page = browser.new_page()?;
        page.goto(&mut browser, &url)?;
        page.wait_rendered(&mut browser)?;
        browser.pump(Duration::from_millis(300))?;
        let mut raw = 0usize;
        let mut gzip = 0usize;
        let mut transferred = 0f64;
        println!("  cold load, files the page itself requested:");
        let page_requests: Vec<(String, String)> = browser
            .events
            .iter()
            .filter(|e| e.session.as_deref() == Some(page.session.as_str()) && e.method == "Network.requestWillBeSent")
            .map(|e| {
                (
                    e.params["requestId"].as_str().unwrap_or_default().to_string(),
                    e.params["request"]["url"].as_str().unwrap_or_default().to_string(),
                )
            })
            .collect();
        for (id, request_url) in &page_requests {
            let Some(path) = request_url.strip_prefix(&format!("{}/", site.base)) else {
                continue;
            };
            let path = path.split(['?', '#']).next().unwrap_or_default();
            let file = site.dir.join(if path.is_empty() { "index.html" } else { path });
            let bytes = fs::read(&file).unwrap_or_default();
            let on_wire = browser
                .events
                .iter()
                .find(|e| e.method == "Network.loadingFinished" && e.params["requestId"].as_str() == Some(id.as_str()))
                .and_then(|e| e.params["encodedDataLength"].as_f64())
                .unwrap_or(0.0);
            raw += bytes.len();
            gzip += gzip_len(&bytes);
            transferred += on_wire;
            println!(
                "    {:<40} {:>8} B raw {:>8} B gzip {:>8.0} B on the wire",
                path,
                bytes.len(),
                gzip_len(&bytes),
                on_wire
            );
        }
        println!(
            "  cold load total: {} requests, {raw} B raw, {gzip} B gzip (level 6), {transferred:.0} B on the wire (headers included)",
            page_requests.len()
        );
    }

    // First result with 4x CPU throttling, fresh profile each run.
    let mut fresh = Vec::new();
    let mut repeat = Vec::new();
    for _ in 0..RUNS {
        let mut browser = Browser::launch(&Launch {
            width: 360,
            height: 800,
        })?;
        let page = browser.new_page()?;
        page.call(&mut browser, "Emulation.setCPUThrottlingRate", json!({ "rate": 4 }))?;
        page.goto(&mut browser, &url)?;
        page.wait_rendered(&mut browser)?;
        if let Some(ms) = page.eval(&mut browser, FIRST_RESULT)?.as_f64() {
            fresh.push(ms);
        }
        // Repeat visit, served by the service worker.
        page.wait_for(
            &mut browser,
            "navigator.serviceWorker.controller !== null",
            Duration::from_secs(30),
        )?;
        page.goto(&mut browser, &url)?;
        page.wait_rendered(&mut browser)?;
        let controlled = page.eval(&mut browser, "navigator.serviceWorker.controller !== null")?;
        if let (Some(ms), Value::Bool(true)) = (page.eval(&mut browser, FIRST_RESULT)?.as_f64(), controlled) {
            repeat.push(ms);
        }
    }
    println!(
        "  first result, 4x CPU throttling, fresh profile: median {:.0} ms of {:?}",
        median(&mut fresh.clone()),
        fresh.iter().map(|v| v.round()).collect::<Vec<_>>()
    );
    println!(
        "  first result, 4x CPU throttling, repeat visit from the service worker: median {:.0} ms of {:?}",
        median(&mut repeat.clone()),
        repeat.iter().map(|v| v.round()).collect::<Vec<_>>()
    );

    // Recompute after a keystroke: the input handler runs synchronously (solve,
    // render, URL write), so its duration is the recompute time.
    for rate in [1, 4] {
        let mut browser = Browser::launch(&Launch {
            width: 360,
            height: 800,
        })?;
        let page = browser.new_page()?;
        page.call(&mut browser, "Emulation.setCPUThrottlingRate", json!({ "rate": rate }))?;
        page.goto(&mut browser, &url)?;
        page.wait_rendered(&mut browser)?;
        let times = page.eval(
            &mut browser,
            "(() => { const i = document.getElementById('field-p'); const out = []; \
             for (let n = 0; n < 40; n++) { const t = performance.now(); i.value = String(10 + (n % 7)); \
             i.dispatchEvent(new Event('input', {bubbles: true})); out.push(performance.now() - t); } return out; })()",
        )?;
        let mut times: Vec<f64> = times
            .as_array()
            .map(|a| a.iter().filter_map(Value::as_f64).collect())
            .unwrap_or_default();
        let max = times.iter().copied().fold(0.0, f64::max);
        let min = times.iter().copied().fold(f64::INFINITY, f64::min);
        println!(
            "  recompute after a keystroke, CPU {rate}x: min {min:.2} ms, median {:.2} ms, max {max:.2} ms (40 edits)",
            median(&mut times)
        );
    }
    Ok(())
}
