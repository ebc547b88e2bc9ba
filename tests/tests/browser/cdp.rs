//! A small, synchronous Chrome DevTools Protocol client for the browser tests.
//!
//! Why our own and not a browser-automation crate: the tests need exactly a dozen
//! CDP calls (open a page, evaluate, reload, throttle the CPU) and a record of every
//! event (console messages, uncaught exceptions, log entries, network requests of
//! the page *and* of its service worker, dialogs). Over one WebSocket with
//! `tungstenite` and `serde_json` that is a few hundred lines, builds in seconds on
//! two cores, and leaves no generated protocol bindings to compile.
//!
//! Chromium is started headless with a fresh profile in a temporary folder and
//! `--remote-debugging-port=0`; the port it picked is read from the
//! `DevToolsActivePort` file it writes into the profile. Every event is kept (with
//! the session it belongs to) so that a test can assert on console errors and
//! requests after the fact. Targets that attach automatically (the service worker,
//! workers) get their runtime, log and network domains enabled too.

use std::collections::HashSet;
use std::fs;
use std::io;
use std::net::TcpStream;
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

use serde_json::{json, Value};
use tungstenite::{Message, WebSocket};

/// Where Debian installs Chromium (`apt-get install -y chromium`).
pub const CHROMIUM: &str = "/usr/bin/chromium";

/// How long one protocol call may take before the test fails.
const CALL_TIMEOUT: Duration = Duration::from_secs(60);

pub type Result<T> = std::result::Result<T, String>;

/// One event received from the browser.
#[derive(Clone, Debug)]
pub struct Event {
    pub session: Option<String>,
    pub method: String,
    pub params: Value,
}

/// A running headless Chromium with its own fresh profile.
pub struct Browser {
    child: Child,
    socket: WebSocket<TcpStream>,
    next_id: u64,
    pub events: Vec<Event>,
    profile: PathBuf,
    /// Sessions of auto-attached targets (service worker, workers).
    pub child_sessions: HashSet<String>,
    dialogs_seen: usize,
    size: (u32, u32),
}

/// Options for starting the browser.
#[derive(Clone, Debug)]
pub struct Launch {
    /// Window size in CSS pixels.
    pub width: u32,
    pub height: u32,
}

impl Default for Launch {
    fn default() -> Launch {
        Launch {
            width: 1280,
            height: 900,
        }
    }
}

fn unique_dir(prefix: &str) -> PathBuf {
    static COUNTER: AtomicUsize = AtomicUsize::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.subsec_nanos())
        .unwrap_or(0);
    std::env::temp_dir().join(format!("{prefix}-{}-{n}-{nanos}", std::process::id()))
}

impl Browser {
    /// Starts Chromium. Fails with a message naming the install command when it is
    /// missing: the browser tests are part of the suite and must not skip silently.
    pub fn launch(options: &Launch) -> Result<Browser> {
        if !Path::new(CHROMIUM).exists() {
            return Err(format!(
                "Chromium is not installed at {CHROMIUM}; the browser tests need it. \
                 Install it with `apt-get install -y chromium` (as root) and run the tests again."
            ));
        }
        let profile = unique_dir("fluxledger-chromium");
        fs::create_dir_all(&profile)
            .map_err(|e| format!("cannot create the profile folder {}: {e}", profile.display()))?;
        let log =
            fs::File::create(profile.join("chromium-stderr.log")).map_err(|e| format!("cannot create the log: {e}"))?;
        let child = Command::new(CHROMIUM)
            .args([
                "--headless=new",
                "--no-sandbox",
                "--disable-gpu",
                "--disable-background-networking",
                "--disable-component-update",
                "--disable-sync",
                "--disable-default-apps",
                "--disable-extensions",
                "--no-first-run",
                "--no-default-browser-check",
                "--disable-quic",
                "--disable-dev-shm-usage",
                "--metrics-recording-only",
                "--mute-audio",
                "--remote-debugging-address=127.0.0.1",
                "--remote-debugging-port=0",
                &format!("--window-size={},{}", options.width, options.height),
                &format!("--user-data-dir={}", profile.display()),
                "about:blank",
            ])
            .stdin(Stdio::null())
            .stdout(Stdio::null())
            .stderr(Stdio::from(log))
            .spawn()
            .map_err(|e| format!("cannot start {CHROMIUM}: {e}"))?;

        let mut starting = Starting {
            child: Some(child),
            profile: profile.clone(),
        };
        let port_file = profile.join("DevToolsActivePort");
        let deadline = Instant::now() + Duration::from_secs(30);
        let (port, path) = loop {
            if let Ok(text) = fs::read_to_string(&port_file) {
                let mut lines = text.lines();
                if let (Some(port), Some(path)) = (lines.next(), lines.next()) {
                    break (port.trim().to_string(), path.trim().to_string());
                }
            }
            if let Some(child) = starting.child.as_mut() {
                if let Ok(Some(status)) = child.try_wait() {
                    return Err(format!(
                        "Chromium exited at start ({status}); its log:\n{}",
                        tail(&profile.join("chromium-stderr.log"))
                    ));
                }
            }
            if Instant::now() > deadline {
                return Err(format!(
                    "Chromium did not open its debugging port within 30 s; its log:\n{}",
                    tail(&profile.join("chromium-stderr.log"))
                ));
            }
            std::thread::sleep(Duration::from_millis(50));
        };
        let address = format!("127.0.0.1:{port}");
        let stream =
            TcpStream::connect(&address).map_err(|e| format!("cannot connect to Chromium at {address}: {e}"))?;
        stream.set_nodelay(true).ok();
        let (socket, _) = tungstenite::client::client(format!("ws://{address}{path}"), stream)
            .map_err(|e| format!("WebSocket handshake with Chromium failed: {e}"))?;
        socket
            .get_ref()
            .set_read_timeout(Some(Duration::from_millis(25)))
            .map_err(|e| format!("cannot set a read timeout: {e}"))?;
        let child = starting.child.take().ok_or("internal: child already taken")?;
        Ok(Browser {
            child,
            socket,
            next_id: 1,
            events: Vec::new(),
            profile: std::mem::take(&mut starting.profile),
            child_sessions: HashSet::new(),
            dialogs_seen: 0,
            size: (options.width, options.height),
        })
    }

    fn send(&mut self, session: Option<&str>, method: &str, params: Value) -> Result<u64> {
        let id = self.next_id;
        self.next_id += 1;
        let mut message = json!({ "id": id, "method": method, "params": params });
        if let Some(session) = session {
            message["sessionId"] = json!(session);
        }
        self.socket
            .send(Message::text(message.to_string()))
            .map_err(|e| format!("sending {method} to Chromium failed: {e}"))?;
        Ok(id)
    }

    /// Reads one message if one arrives within the socket's short read timeout.
    fn read_one(&mut self) -> Result<Option<Value>> {
        match self.socket.read() {
            Ok(Message::Text(text)) => serde_json::from_str(text.as_str())
                .map(Some)
                .map_err(|e| format!("bad JSON from Chromium: {e}")),
            Ok(_) => Ok(None),
            Err(tungstenite::Error::Io(e))
                if matches!(e.kind(), io::ErrorKind::WouldBlock | io::ErrorKind::TimedOut) =>
            {
                Ok(None)
            }
            Err(e) => Err(format!("reading from Chromium failed: {e}")),
        }
    }

    /// Records an event and reacts to the few that need an answer.
    fn handle_event(&mut self, message: Value) -> Result<()> {
        let method = message["method"].as_str().unwrap_or_default().to_string();
        let session = message["sessionId"].as_str().map(str::to_string);
        let params = message["params"].clone();
        match method.as_str() {
            "Target.attachedToTarget" => {
                // A service worker or worker of the page: watch it as well.
                if let Some(child) = params["sessionId"].as_str().map(str::to_string) {
                    self.child_sessions.insert(child.clone());
                    for domain in ["Runtime.enable", "Log.enable", "Network.enable"] {
                        self.send(Some(&child), domain, json!({}))?;
                    }
                    self.send(Some(&child), "Runtime.runIfWaitingForDebugger", json!({}))?;
                }
            }
            "Page.javascriptDialogOpening" => {
                // Never leave a dialog open (it would block the page); the test
                // sees the event and fails.
                self.dialogs_seen += 1;
                self.send(
                    session.as_deref(),
                    "Page.handleJavaScriptDialog",
                    json!({ "accept": false }),
                )?;
            }
            _ => {}
        }
        self.events.push(Event {
            session,
            method,
            params,
        });
        Ok(())
    }

    /// Sends a command and waits for its answer, recording events meanwhile.
    pub fn call(&mut self, session: Option<&str>, method: &str, params: Value) -> Result<Value> {
        let id = self.send(session, method, params)?;
        let deadline = Instant::now() + CALL_TIMEOUT;
        loop {
            if let Some(message) = self.read_one()? {
                if message.get("id").and_then(Value::as_u64) == Some(id) {
                    if let Some(error) = message.get("error") {
                        return Err(format!("{method} failed: {error}"));
                    }
                    return Ok(message["result"].clone());
                }
                if message.get("method").is_some() {
                    self.handle_event(message)?;
                }
            }
            if Instant::now() > deadline {
                return Err(format!("{method}: no answer from Chromium within {CALL_TIMEOUT:?}"));
            }
        }
    }

    /// Reads and records events for `duration`.
    pub fn pump(&mut self, duration: Duration) -> Result<()> {
        let deadline = Instant::now() + duration;
        while Instant::now() < deadline {
            if let Some(message) = self.read_one()? {
                if message.get("method").is_some() {
                    self.handle_event(message)?;
                }
            }
        }
        Ok(())
    }

    /// Opens a new tab with every watched domain enabled.
    pub fn new_page(&mut self) -> Result<Page> {
        let created = self.call(None, "Target.createTarget", json!({ "url": "about:blank" }))?;
        let target = created["targetId"]
            .as_str()
            .ok_or("Target.createTarget returned no targetId")?
            .to_string();
        let attached = self.call(
            None,
            "Target.attachToTarget",
            json!({ "targetId": target, "flatten": true }),
        )?;
        let session = attached["sessionId"]
            .as_str()
            .ok_or("Target.attachToTarget returned no sessionId")?
            .to_string();
        let page = Page { session };
        for domain in ["Page.enable", "Runtime.enable", "Log.enable", "Network.enable"] {
            self.call(Some(&page.session), domain, json!({}))?;
        }
        // Headless windows are at least 500 px wide: emulate the asked-for screen
        // (a phone, with its viewport meta honoured, below 600 px).
        let (width, height) = self.size;
        self.call(
            Some(&page.session),
            "Emulation.setDeviceMetricsOverride",
            json!({ "width": width, "height": height, "deviceScaleFactor": 1, "mobile": width < 600 }),
        )?;
        self.call(
            Some(&page.session),
            "Target.setAutoAttach",
            json!({ "autoAttach": true, "waitForDebuggerOnStart": false, "flatten": true }),
        )?;
        Ok(page)
    }

    /// Number of dialogs (alert, confirm, prompt) any page opened.
    pub fn dialogs_seen(&self) -> usize {
        self.dialogs_seen
    }
}

impl Drop for Browser {
    fn drop(&mut self) {
        let _ = self.socket.close(None);
        let _ = self.child.kill();
        let _ = self.child.wait();
        let _ = fs::remove_dir_all(&self.profile);
    }
}

/// Cleans up a browser that failed to start.
struct Starting {
    child: Option<Child>,
    profile: PathBuf,
}

impl Drop for Starting {
    fn drop(&mut self) {
        if let Some(child) = self.child.as_mut() {
            let _ = child.kill();
            let _ = child.wait();
            let _ = fs::remove_dir_all(&self.profile);
        }
    }
}

fn tail(path: &Path) -> String {
    let text = fs::read_to_string(path).unwrap_or_default();
    let lines: Vec<&str> = text.lines().collect();
    lines[lines.len().saturating_sub(20)..].join("\n")
}

/// One tab, addressed by its CDP session.
#[derive(Clone, Debug)]
pub struct Page {
    pub session: String,
}

impl Page {
    /// Evaluates `expression` in the page (awaiting a promise) and returns its value.
    pub fn eval(&self, browser: &mut Browser, expression: &str) -> Result<Value> {
        let result = browser.call(
            Some(&self.session),
            "Runtime.evaluate",
            json!({ "expression": expression, "returnByValue": true, "awaitPromise": true }),
        )?;
        if let Some(details) = result.get("exceptionDetails") {
            let text = details["exception"]["description"]
                .as_str()
                .or(details["text"].as_str())
                .unwrap_or("exception");
            return Err(format!("evaluating `{}` threw: {text}", shorten(expression)));
        }
        Ok(result["result"]["value"].clone())
    }

    /// Saves a PNG of the whole page (the emulated screen is stretched to the
    /// page's height first).
    #[allow(dead_code)] // used by the page measurements (benches/pages.rs)
    pub fn screenshot(&self, browser: &mut Browser, path: &Path) -> Result<()> {
        let height = self
            .eval(browser, "Math.ceil(document.documentElement.scrollHeight)")?
            .as_u64()
            .unwrap_or(900);
        let (width, _) = browser.size;
        self.call(
            browser,
            "Emulation.setDeviceMetricsOverride",
            json!({ "width": width, "height": height.min(8000), "deviceScaleFactor": 1, "mobile": width < 600 }),
        )?;
        browser.pump(Duration::from_millis(300))?;
        let shot = self.call(browser, "Page.captureScreenshot", json!({ "format": "png" }))?;
        let data = shot["data"].as_str().ok_or("no screenshot data")?;
        fs::write(path, base64_decode(data)?).map_err(|e| format!("cannot write {}: {e}", path.display()))
    }

    /// Sends a protocol command to this tab.
    pub fn call(&self, browser: &mut Browser, method: &str, params: Value) -> Result<Value> {
        browser.call(Some(&self.session), method, params)
    }

    /// Navigates and waits for the document to finish loading.
    pub fn goto(&self, browser: &mut Browser, url: &str) -> Result<()> {
        let result = self.call(browser, "Page.navigate", json!({ "url": url }))?;
        if let Some(error) = result.get("errorText").and_then(Value::as_str) {
            return Err(format!("loading {url} failed: {error}"));
        }
        self.wait_for(browser, "document.readyState === 'complete'", Duration::from_secs(30))
    }

    /// Polls a JavaScript condition until it is true.
    pub fn wait_for(&self, browser: &mut Browser, condition: &str, timeout: Duration) -> Result<()> {
        let deadline = Instant::now() + timeout;
        loop {
            // A navigation can destroy the context mid-call; treat that as "not yet".
            if let Ok(Value::Bool(true)) = self.eval(browser, &format!("Boolean({condition})")) {
                return Ok(());
            }
            if Instant::now() > deadline {
                return Err(format!("waited {timeout:?} for `{condition}`"));
            }
            browser.pump(Duration::from_millis(50))?;
        }
    }

    /// Waits until the calculator has rendered (`body[data-state]` set) and no part
    /// waits for its update.
    ///
    /// On a timeout the error says what the page was doing: its address, state,
    /// the parts still waiting and its console's errors (a rare wait in a loaded
    /// run is then readable from the test's output alone).
    pub fn wait_rendered(&self, browser: &mut Browser) -> Result<String> {
        if let Err(waited) = self.wait_for(
            browser,
            // ...and no part off screen still waits for its update (`data-stale`).
            "document.body && document.body.dataset.state && !document.querySelector('[data-stale]')",
            Duration::from_secs(30),
        ) {
            let page = self
                .eval(browser, WAITING_PAGE)
                .map_or_else(|e| format!("(not readable: {e})"), |v| v.to_string());
            let errors = error_messages(self.events(browser));
            return Err(format!("{waited}; the page: {page}; its errors: {errors:?}"));
        }
        let state = self.eval(browser, "document.body.dataset.state")?;
        Ok(state.as_str().unwrap_or_default().to_string())
    }

    /// Events of this tab and of the targets attached through it.
    pub fn events<'a>(&'a self, browser: &'a Browser) -> impl Iterator<Item = &'a Event> + 'a {
        browser.events.iter().filter(move |e| match &e.session {
            Some(s) => *s == self.session || browser.child_sessions.contains(s),
            None => false,
        })
    }
}

/// What a page that is not rendered in time shows: its address, readiness, body
/// state, the parts still marked `data-stale`, the root's classes, visibility and
/// scroll position.
const WAITING_PAGE: &str = "JSON.stringify({ url: location.href, ready: document.readyState, \
    state: document.body ? document.body.dataset.state || null : null, \
    stale: [...document.querySelectorAll('[data-stale]')].map((e) => `${e.tagName.toLowerCase()}.${e.className} ${(e.querySelector('h2, h3') || {}).textContent || ''}`), \
    root: document.documentElement.className, visibility: document.visibilityState, scrollY })";

/// Error-level messages: console errors and assertions, uncaught exceptions, and
/// browser log entries of level error (failed loads, CSP violations).
pub fn error_messages<'a>(events: impl Iterator<Item = &'a Event>) -> Vec<String> {
    let mut out = Vec::new();
    for event in events {
        match event.method.as_str() {
            "Runtime.consoleAPICalled" => {
                let kind = event.params["type"].as_str().unwrap_or_default();
                if kind == "error" || kind == "assert" {
                    let args: Vec<String> = event.params["args"]
                        .as_array()
                        .map(|a| {
                            a.iter()
                                .map(|v| {
                                    v["value"]
                                        .as_str()
                                        .map(str::to_string)
                                        .unwrap_or_else(|| v["description"].as_str().unwrap_or_default().to_string())
                                })
                                .collect()
                        })
                        .unwrap_or_default();
                    out.push(format!("console.{kind}: {}", shorten(&args.join(" "))));
                }
            }
            "Runtime.exceptionThrown" => {
                let details = &event.params["exceptionDetails"];
                let text = details["exception"]["description"]
                    .as_str()
                    .or(details["text"].as_str())
                    .unwrap_or("?");
                out.push(format!("uncaught exception: {}", shorten(text)));
            }
            "Log.entryAdded" => {
                let entry = &event.params["entry"];
                if entry["level"].as_str() == Some("error") {
                    out.push(format!(
                        "log error ({}): {} {}",
                        entry["source"].as_str().unwrap_or_default(),
                        shorten(entry["text"].as_str().unwrap_or_default()),
                        shorten(entry["url"].as_str().unwrap_or_default())
                    ));
                }
            }
            _ => {}
        }
    }
    out
}

/// URLs of every request the page and its workers started.
pub fn request_urls<'a>(events: impl Iterator<Item = &'a Event>) -> Vec<String> {
    events
        .filter(|e| e.method == "Network.requestWillBeSent")
        .filter_map(|e| e.params["request"]["url"].as_str().map(str::to_string))
        .collect()
}

/// Shortens text for messages.
pub fn shorten(text: &str) -> String {
    let chars: Vec<char> = text.chars().collect();
    if chars.len() <= 200 {
        text.to_string()
    } else {
        format!(
            "{}… ({} characters)",
            chars[..200].iter().collect::<String>(),
            chars.len()
        )
    }
}

/// Decodes standard base64 (as CDP sends binary data).
pub fn base64_decode(text: &str) -> Result<Vec<u8>> {
    let mut out = Vec::with_capacity(text.len() * 3 / 4);
    let mut buffer = 0u32;
    let mut bits = 0;
    for byte in text.bytes() {
        let value = match byte {
            b'A'..=b'Z' => byte - b'A',
            b'a'..=b'z' => byte - b'a' + 26,
            b'0'..=b'9' => byte - b'0' + 52,
            b'+' => 62,
            b'/' => 63,
            b'=' | b'\n' | b'\r' => continue,
            _ => return Err(format!("not base64: byte {byte}")),
        };
        buffer = (buffer << 6) | u32::from(value);
        bits += 6;
        if bits >= 8 {
            bits -= 8;
            out.push((buffer >> bits) as u8);
            buffer &= (1 << bits) - 1;
        }
    }
    Ok(out)
}
