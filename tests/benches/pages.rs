//! Page measurements in headless Chromium: page weight, first-result times and the
//! recompute time after a keystroke, printed and never asserted (a measurement of
//! time on a shared machine is not a test), plus 360 px and 1280 px screenshots.
//!
//! A std harness (`harness = false`), like the engine benchmark. It builds the site
//! the way the browser tests do (their fixture and DevTools client are shared with
//! `#[path]`). Run with
//! `cargo bench -p fluxledger-tests --bench pages`
//! (Chromium at `/usr/bin/chromium`, as for the browser tests).

#[allow(dead_code)] // the browser tests use more of the client than these figures do
#[path = "../tests/browser/cdp.rs"]
mod cdp;
#[allow(dead_code)]
#[path = "../tests/browser/harness.rs"]
mod harness;

use std::fs;
use std::io::Write;
use std::time::Duration;

use serde_json::{json, Value};

use cdp::{Browser, Launch};
use harness::{fixture, Fixture};

fn main() {
    // `cargo bench` passes `--bench`; `cargo test --benches` does not, and a test
    // run takes no measurements.
    if !std::env::args().any(|a| a == "--bench") {
        println!("page measurements are taken by `cargo bench -p fluxledger-tests --bench pages`");
        return;
    }
    if let Err(message) = print_measurements(fixture()) {
        eprintln!("measurements failed: {message}");
        std::process::exit(1);
    }
}

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
fn print_measurements(site: &Fixture) -> Result<(), String> {
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
