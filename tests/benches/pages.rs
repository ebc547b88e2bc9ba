//! Page measurements in headless Chromium, the handbook against a plain-JavaScript
//! baseline page of the same bend calculation, printed and never asserted (a
//! measurement of time on a shared machine is not a test).
//!
//! A std harness (`harness = false`), like the engine benchmark. It builds the site
//! the way the browser tests do (their fixture and DevTools client are shared with
//! `#[path]`) and serves the baseline (`../shared/peer-bend/` from the workspace
//! root, or the nearest `shared/peer-bend` further up; copied unchanged into a
//! temporary folder) with the same server, so both
//! get the same headers. Run with
//! `cargo bench -p fluxledger-tests --bench pages`
//! (Chromium at `/usr/bin/chromium`, as for the browser tests;
//! `FLUXLEDGER_PEER=DIR` names another baseline folder).
//!
//! Conditions (issue 9): fresh profile for every cold run, 4× CPU throttling,
//! 150 ms round trip, 1.6 Mbit/s down (750 kbit/s up), a 360 × 740 phone screen;
//! 7 runs of each, the two pages interleaved. Figures:
//! - first result, cold, without a query and with a bookmarked query. The
//!   handbook's first result without a query is its first contentful paint (the
//!   demo result is in the HTML); with a query it is the page script's
//!   `fluxledger:first-result` mark (the link's own result: the demo is hidden).
//!   The baseline's is the later of its `first-result` mark and its first
//!   contentful paint (its result is written by a script before the paint).
//! - repeat visit (the handbook's service worker; the baseline's HTTP cache),
//! - layout shift (sum of `layout-shift` entries),
//! - bytes before the first result: transfer sizes (headers included) of every
//!   response completed by then,
//! - keystroke to next frame at 1× and 4× (input event dispatched, then the time
//!   to a task queued from the next animation frame, i.e. after that frame), with
//!   the edits at one phase of the frame clock and spread over a frame interval
//!   (`KEYSTROKES`), and the frame's own work without the wait for it; 7 loads
//!   of each page, interleaved, 30 edits each, the median over all edits,
//! - a 500-row line schedule: one edited row to next frame, 1×, with the schedule
//!   table off screen (the page brings it up to date once typing pauses) and in
//!   view (its changed rows are rewritten in the keystroke's frame).

#[allow(dead_code)] // the browser tests use more of the client than these figures do
#[path = "../tests/browser/cdp.rs"]
mod cdp;
#[allow(dead_code)]
#[path = "../tests/browser/harness.rs"]
mod harness;

use std::fs;
use std::path::{Path, PathBuf};
use std::time::Duration;

use serde_json::{json, Value};

use cdp::{Browser, Launch, Page};
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

const RUNS: usize = 7;
const PHONE: Launch = Launch {
    width: 360,
    height: 740,
};

fn median(values: &[f64]) -> f64 {
    let mut values: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
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

fn shown(values: &[f64]) -> String {
    let rounded: Vec<String> = values.iter().map(|v| format!("{v:.0}")).collect();
    format!("median {:>6.0} of [{}]", median(values), rounded.join(", "))
}

/// The baseline folder: `FLUXLEDGER_PEER`, or `shared/peer-bend` in the nearest
/// folder above the workspace root that has one (`../shared/peer-bend` for a
/// checkout beside `shared/`, also found from a worktree further down).
fn peer_source() -> PathBuf {
    if let Some(dir) = std::env::var_os("FLUXLEDGER_PEER") {
        return PathBuf::from(dir);
    }
    let root = fluxledger_site::workspace_root();
    root.ancestors()
        .skip(1)
        .map(|dir| dir.join("shared").join("peer-bend"))
        .find(|dir| dir.is_dir())
        .unwrap_or_else(|| root.join("../shared/peer-bend"))
}

/// Copies the baseline unchanged into a temporary folder (the server serves one
/// folder) and serves it.
fn serve_peer() -> Result<(harness::Server, PathBuf), String> {
    let source = peer_source();
    let dir = std::env::temp_dir().join(format!("fluxledger-peer-{}", std::process::id()));
    let _ = fs::remove_dir_all(&dir);
    fs::create_dir_all(&dir).map_err(|e| format!("{}: {e}", dir.display()))?;
    let entries = fs::read_dir(&source).map_err(|e| format!("baseline {}: {e}", source.display()))?;
    for entry in entries {
        let entry = entry.map_err(|e| e.to_string())?;
        if entry.path().is_file() {
            fs::copy(entry.path(), dir.join(entry.file_name())).map_err(|e| e.to_string())?;
        }
    }
    Ok((harness::serve(&dir)?, dir))
}

/// The throttling of issue 9 on a tab.
fn throttle(page: &Page, browser: &mut Browser, cpu: u32) -> Result<(), String> {
    page.call(browser, "Emulation.setCPUThrottlingRate", json!({ "rate": cpu }))?;
    page.call(
        browser,
        "Network.emulateNetworkConditions",
        json!({
            "offline": false,
            "latency": 150,
            "downloadThroughput": 1_600_000.0 / 8.0,
            "uploadThroughput": 750_000.0 / 8.0,
        }),
    )?;
    Ok(())
}

#[derive(Clone, Copy, PartialEq)]
enum Site {
    Handbook,
    Baseline,
}

impl Site {
    fn name(self) -> &'static str {
        match self {
            Site::Handbook => "handbook",
            Site::Baseline => "baseline",
        }
    }
}

/// Figures of one page load.
#[derive(Default)]
struct Load {
    first_result: f64,
    /// The handbook: when its script had rendered (the wasm took over).
    interactive: f64,
    layout_shift: f64,
    bytes_before: f64,
    bytes_total: f64,
}

const FIGURES: &str = r#"
new Promise((resolve) => {
  let shift = 0;
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) if (!e.hadRecentInput) shift += e.value;
  }).observe({ type: "layout-shift", buffered: true });
  setTimeout(() => {
    const fcp = performance.getEntriesByName("first-contentful-paint")[0]?.startTime ?? NaN;
    const mark = (performance.getEntriesByName("fluxledger:first-result")[0] ||
      performance.getEntriesByName("first-result")[0])?.startTime ?? NaN;
    const nav = performance.getEntriesByType("navigation")[0];
    const resources = performance.getEntriesByType("resource");
    resolve({ fcp, mark, shift, nav: nav.transferSize, navEnd: nav.responseEnd,
      resources: resources.map((r) => [r.responseEnd, r.transferSize]) });
  }, 500);
})"#;

/// Waits for a page's result and reads its figures. `query`: the page was opened
/// with a bookmarked query.
fn read_load(page: &Page, browser: &mut Browser, site: Site, query: bool) -> Result<Load, String> {
    let ready = match site {
        Site::Handbook => "document.body && document.body.dataset.state",
        Site::Baseline => "performance.getEntriesByName('first-result').length > 0",
    };
    page.wait_for(browser, ready, Duration::from_secs(60))?;
    page.wait_for(
        browser,
        "performance.getEntriesByName('first-contentful-paint').length > 0",
        Duration::from_secs(30),
    )?;
    let figures = page.eval(browser, FIGURES)?;
    let number = |v: &Value| v.as_f64().unwrap_or(f64::NAN);
    let (fcp, mark) = (number(&figures["fcp"]), number(&figures["mark"]));
    let first_result = match (site, query) {
        // The demo result is in the HTML: it shows with the first paint. (A served
        // page without it would have no [data-output] before the script; the
        // browser test `prerender` checks that every page has one.)
        (Site::Handbook, false) => fcp,
        (Site::Handbook, true) => mark,
        (Site::Baseline, _) => fcp.max(mark),
    };
    let resources: Vec<(f64, f64)> = figures["resources"]
        .as_array()
        .map(|a| a.iter().map(|r| (number(&r[0]), number(&r[1]))).collect())
        .unwrap_or_default();
    let navigation = number(&figures["nav"]);
    let before = navigation
        + resources
            .iter()
            .filter(|(end, _)| *end <= first_result)
            .map(|(_, size)| size)
            .sum::<f64>();
    let total = navigation + resources.iter().map(|(_, size)| size).sum::<f64>();
    Ok(Load {
        first_result,
        interactive: mark,
        layout_shift: number(&figures["shift"]),
        bytes_before: before,
        bytes_total: total,
    })
}

/// One cold visit in a fresh profile, then (without a query) a repeat visit.
fn cold_visit(url: &str, site: Site, query: bool) -> Result<(Load, Option<Load>), String> {
    let mut browser = Browser::launch(&PHONE)?;
    let page = browser.new_page()?;
    throttle(&page, &mut browser, 4)?;
    page.goto(&mut browser, url)?;
    let cold = read_load(&page, &mut browser, site, query)?;
    if query {
        return Ok((cold, None));
    }
    if site == Site::Handbook {
        // The repeat visit is from the service worker: wait until it controls the
        // page and has stored the site.
        page.wait_for(
            &mut browser,
            "navigator.serviceWorker.controller !== null",
            Duration::from_secs(60),
        )?;
        page.wait_for(
            &mut browser,
            "navigator.serviceWorker.ready.then(r => r.active && r.active.state === 'activated')",
            Duration::from_secs(60),
        )?;
    }
    page.goto(&mut browser, "about:blank")?;
    page.goto(&mut browser, url)?;
    let repeat = read_load(&page, &mut browser, site, false)?;
    Ok((cold, Some(repeat)))
}

/// Keystroke to next frame: the input event is dispatched, then the time until a
/// task queued from the next animation frame runs (after that frame's paint).
///
/// The pause before each edit is 30 ms plus `STEP` × (n mod 10) ms after the
/// previous edit's frame. With `STEP` 0 (the first form of this figure) every edit
/// falls at the same place in the frame clock, a place set by how long the page's
/// own previous frame took, so the wait for the next frame is the same in every
/// edit and differs between the two pages for that reason alone. With `STEP` 1.7
/// the ten pauses spread the edits over one 60 Hz frame interval, as a person's
/// keystrokes fall. Each edit also gives the time its input handler took and the
/// frame's own work: from the later of the frame's start and the handler's end,
/// to the task after the frame (the wait for the frame left out).
const KEYSTROKES: &str = r#"
(async () => {
  const input = document.getElementById("field-p") || document.querySelector("input[name=p]");
  const out = [];
  for (let n = 0; n < 30; n++) {
    await new Promise((r) => setTimeout(r, 30 + STEP * (n % 10)));
    const t0 = performance.now();
    input.value = String(10 + (n % 7));
    input.dispatchEvent(new Event("input", { bubbles: true }));
    const handled = performance.now();
    const frameStart = await new Promise((resolve) => requestAnimationFrame((start) => {
      const channel = new MessageChannel();
      channel.port1.onmessage = () => resolve(start);
      channel.port2.postMessage(0);
    }));
    const painted = performance.now();
    out.push([painted - t0, handled - t0, painted - Math.max(frameStart, handled)]);
  }
  return out;
})()"#;

/// One edit's times (ms): keystroke to next frame, input handler, frame's own work.
struct Keystroke {
    to_next_frame: f64,
    handler: f64,
    frame_work: f64,
}

fn keystrokes(url: &str, site: Site, cpu: u32, step_ms: f64) -> Result<Vec<Keystroke>, String> {
    let mut browser = Browser::launch(&PHONE)?;
    let page = browser.new_page()?;
    page.goto(&mut browser, url)?;
    read_load(&page, &mut browser, site, false)?;
    page.call(&mut browser, "Emulation.setCPUThrottlingRate", json!({ "rate": cpu }))?;
    let script = KEYSTROKES.replace("STEP", &format!("{step_ms}"));
    let times = page.eval(&mut browser, &script)?;
    Ok(times
        .as_array()
        .map(|edits| {
            edits
                .iter()
                .filter_map(|edit| {
                    let at = |i: usize| edit.get(i).and_then(Value::as_f64);
                    Some(Keystroke {
                        to_next_frame: at(0)?,
                        handler: at(1)?,
                        frame_work: at(2)?,
                    })
                })
                .collect()
        })
        .unwrap_or_default())
}

/// 500 fittings from the kinds of the schedule's own help text (not the demo).
fn schedule_rows(count: usize) -> String {
    let kinds = [
        "bend 90deg di52_12 nfpa24_sandy_silt",
        "bend 45deg di52_12 nfpa24_sand turn=right",
        "tee di52_12 di52_8 nfpa24_sand",
        "reducer di52_12 di52_8",
        "bend 22.5deg di52_8 turn=down",
        "dead_end di52_8 h=0.9m",
    ];
    (0..count)
        .map(|n| format!("{} tag=F{n}", kinds[n % kinds.len()]))
        .collect::<Vec<_>>()
        .join("\n")
}

/// Edits one row of a 500-row schedule seven times; `table_in_view`: the schedule
/// table is scrolled into view first, so each edit's frame rewrites its rows.
fn line_schedule(base: &str, table_in_view: bool) -> Result<Vec<f64>, String> {
    let mut browser = Browser::launch(&PHONE)?;
    let page = browser.new_page()?;
    page.goto(&mut browser, &format!("{base}/line-schedule.html"))?;
    page.wait_rendered(&mut browser)?;
    let rows = serde_json::to_string(&schedule_rows(500)).map_err(|e| e.to_string())?;
    let script = format!(
        r#"(async () => {{
  const area = document.getElementById("field-rows");
  const rows = {rows};
  const frame = () => new Promise((resolve) => requestAnimationFrame(() => {{
    const channel = new MessageChannel();
    channel.port1.onmessage = resolve;
    channel.port2.postMessage(0);
  }}));
  area.value = rows;
  area.dispatchEvent(new Event("input", {{ bubbles: true }}));
  await frame();
  if ({table_in_view}) {{
    document.querySelector("table[data-table=schedule]").scrollIntoView();
    // The parts that were off screen catch up once they are in view.
    await new Promise((r) => setTimeout(r, 1000));
    await frame();
  }}
  const state = document.body.dataset.state;
  const out = [];
  for (let n = 0; n < 7; n++) {{
    await new Promise((r) => setTimeout(r, 50));
    const t0 = performance.now();
    area.value = rows.replace("bend 90deg", n % 2 ? "bend 60deg" : "bend 75deg");
    area.dispatchEvent(new Event("input", {{ bubbles: true }}));
    await frame();
    out.push(performance.now() - t0);
  }}
  return {{ state, out, shown: document.querySelectorAll("table[data-table=schedule] tbody tr").length }};
}})()"#
    );
    let result = page.eval(&mut browser, &script)?;
    println!(
        "  500-row line schedule, table {}: page state {}, {} schedule rows shown",
        if table_in_view { "in view" } else { "off screen" },
        result["state"],
        result["shown"]
    );
    Ok(result["out"]
        .as_array()
        .map(|a| a.iter().filter_map(Value::as_f64).collect())
        .unwrap_or_default())
}

fn print_measurements(site: &Fixture) -> Result<(), String> {
    let (peer_server, peer_dir) = serve_peer()?;
    let handbook = format!("{}/bend.html", site.base);
    let handbook_query = format!("{handbook}?angle=30deg&d=12in&p=150psi&plane=horizontal&system=us");
    let peer = format!("{}/index.html", peer_server.base());
    let peer_query = format!("{peer}?angle=30&d=300&p=10");
    println!("Fluxledger against the baseline page, bend calculation");
    println!("  handbook: {handbook}");
    println!("  baseline: {peer} (copied from {})", peer_source().display());
    println!(
        "  conditions: fresh profile, 4x CPU, 150 ms RTT, 1.6 Mbit/s down, 360 x 740; {RUNS} runs each, interleaved"
    );

    // Screenshots to look at (phone and desktop widths).
    for width in [360, 1280] {
        let mut browser = Browser::launch(&Launch { width, height: 900 })?;
        let page = browser.new_page()?;
        page.goto(&mut browser, &handbook)?;
        page.wait_rendered(&mut browser)?;
        let path = std::env::temp_dir().join(format!("fluxledger-bend-{width}.png"));
        page.screenshot(&mut browser, &path)?;
        println!("  screenshot {width} px wide: {}", path.display());
    }

    let mut loads: Vec<(Site, bool, Load)> = Vec::new();
    let mut repeats: Vec<(Site, Load)> = Vec::new();
    for run in 0..RUNS {
        for (site, url, query) in [
            (Site::Handbook, &handbook, false),
            (Site::Baseline, &peer, false),
            (Site::Handbook, &handbook_query, true),
            (Site::Baseline, &peer_query, true),
        ] {
            let (cold, repeat) = cold_visit(url, site, query)?;
            loads.push((site, query, cold));
            if let Some(repeat) = repeat {
                repeats.push((site, repeat));
            }
        }
        eprintln!("  run {} of {RUNS} done", run + 1);
    }

    let pick = |site: Site, query: bool, f: fn(&Load) -> f64| -> Vec<f64> {
        loads
            .iter()
            .filter(|(s, q, _)| *s == site && *q == query)
            .map(|(_, _, l)| f(l))
            .collect()
    };
    let pick_repeat = |site: Site, f: fn(&Load) -> f64| -> Vec<f64> {
        repeats.iter().filter(|(s, _)| *s == site).map(|(_, l)| f(l)).collect()
    };
    let mut ratios = Vec::new();
    let mut row = |label: &str, ours: Vec<f64>, theirs: Vec<f64>, unit: &str| {
        println!("  {label}");
        println!("    {:<9} {} {unit}", Site::Handbook.name(), shown(&ours));
        println!("    {:<9} {} {unit}", Site::Baseline.name(), shown(&theirs));
        let ratio = median(&ours) / median(&theirs);
        ratios.push((label.to_string(), ratio));
    };
    row(
        "first result, cold, no query (ms)",
        pick(Site::Handbook, false, |l| l.first_result),
        pick(Site::Baseline, false, |l| l.first_result),
        "ms",
    );
    row(
        "first result, cold, bookmarked query (ms)",
        pick(Site::Handbook, true, |l| l.first_result),
        pick(Site::Baseline, true, |l| l.first_result),
        "ms",
    );
    row(
        "repeat visit, first result (ms)",
        pick_repeat(Site::Handbook, |l| l.first_result),
        pick_repeat(Site::Baseline, |l| l.first_result),
        "ms",
    );
    println!(
        "  handbook, page script rendered (wasm took over), cold no query: {} ms; repeat: {} ms",
        shown(&pick(Site::Handbook, false, |l| l.interactive)),
        shown(&pick_repeat(Site::Handbook, |l| l.interactive))
    );
    for query in [false, true] {
        let what = if query { "bookmarked query" } else { "no query" };
        println!("  layout shift, cold, {what}");
        for site in [Site::Handbook, Site::Baseline] {
            let values = pick(site, query, |l| l.layout_shift);
            let rounded: Vec<String> = values.iter().map(|v| format!("{v:.3}")).collect();
            println!(
                "    {:<9} max {:.3} of [{}]",
                site.name(),
                values.iter().copied().fold(0.0, f64::max),
                rounded.join(", ")
            );
        }
        println!("  bytes before the first result, cold, {what} (transfer sizes, headers included)");
        for site in [Site::Handbook, Site::Baseline] {
            println!(
                "    {:<9} {} B; whole visit {} B",
                site.name(),
                shown(&pick(site, query, |l| l.bytes_before)),
                shown(&pick(site, query, |l| l.bytes_total))
            );
        }
    }

    for cpu in [1, 4] {
        for (step, phase) in [
            (0.0, "edits at one phase of the frame clock"),
            (1.7, "edits spread over a frame"),
        ] {
            // RUNS loads of each page, interleaved, 30 edits each: one load's figure
            // moves by several milliseconds between loads (its layers, the engine's
            // tiers, the machine), more than the targets' margins.
            let (mut ours, mut theirs) = (Vec::new(), Vec::new());
            for _ in 0..RUNS {
                ours.push(keystrokes(&handbook, Site::Handbook, cpu, step)?);
                theirs.push(keystrokes(&peer, Site::Baseline, cpu, step)?);
            }
            let of = |loads: &[Vec<Keystroke>], f: fn(&Keystroke) -> f64| {
                loads.iter().flatten().map(f).collect::<Vec<f64>>()
            };
            let each_load = |loads: &[Vec<Keystroke>]| {
                let medians: Vec<String> = loads
                    .iter()
                    .map(|load| format!("{:.1}", median(&of(std::slice::from_ref(load), |k| k.to_next_frame))))
                    .collect();
                medians.join(", ")
            };
            let max = |v: &[f64]| v.iter().copied().fold(0.0, f64::max);
            let (ours_total, theirs_total) = (of(&ours, |k| k.to_next_frame), of(&theirs, |k| k.to_next_frame));
            println!(
                "  keystroke to next frame, {cpu}x CPU, {phase} ({RUNS} loads x 30 edits; max {:.1} / {:.1} ms)",
                max(&ours_total),
                max(&theirs_total)
            );
            for (site, total, loads) in [
                (Site::Handbook, &ours_total, &ours),
                (Site::Baseline, &theirs_total, &theirs),
            ] {
                println!(
                    "    {:<9} median {:.1} ms (input handler {:.1} ms, the frame's own work {:.1} ms); each load's median [{}]",
                    site.name(),
                    median(total),
                    median(&of(loads, |k| k.handler)),
                    median(&of(loads, |k| k.frame_work)),
                    each_load(loads)
                );
            }
            ratios.push((
                format!(
                    "keystroke to next frame, {cpu}x, {}",
                    if step == 0.0 { "one phase" } else { "spread" }
                ),
                median(&ours_total) / median(&theirs_total),
            ));
        }
    }
    for table_in_view in [false, true] {
        let schedule = line_schedule(&site.base, table_in_view)?;
        println!(
            "  500-row line schedule, one row edited, table {}, to next frame, 1x: median {:.0} ms of {:?}",
            if table_in_view { "in view" } else { "off screen" },
            median(&schedule),
            schedule.iter().map(|v| v.round()).collect::<Vec<_>>()
        );
    }

    println!("  ratios, handbook / baseline (medians of the same run):");
    for (label, ratio) in ratios {
        println!("    {label:<45} {ratio:.2}x");
    }
    peer_server.stop();
    let _ = fs::remove_dir_all(Path::new(&peer_dir));
    Ok(())
}
