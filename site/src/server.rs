//! A small static file server for the built site, on loopback only.
//!
//! Why not a library: the offline browser tests need one behaviour that general
//! servers do not offer, a [`ServerHandle::stop`] that not only stops accepting but
//! also closes the keep-alive connections it had already accepted (Chromium keeps
//! using an open connection after the listener is gone, which would make "offline"
//! a lie). With std's `TcpListener` and one thread per connection that is a few
//! lines: every accepted stream is registered, and `stop` shuts them all down.
//!
//! What it does: `GET` and `HEAD` of files under one folder; `?query` and
//! `#fragment` are ignored for the lookup; a path ending in `/` serves
//! `index.html`; percent-escapes are decoded; `..`, backslashes, NUL and dot-files
//! are refused; symlinks may not lead outside the folder. Content types include
//! `application/wasm` (needed by `WebAssembly.instantiateStreaming`),
//! `text/javascript` and `application/manifest+json`. Pages, the manifest and
//! `sw.js` are sent with `Cache-Control: no-cache`; content-hashed files
//! (`name.1a2b3c4d.ext`) as immutable.
//!
//! Precompressed files: when the build wrote `name.br` or `name.gz` beside a file
//! and the request's `Accept-Encoding` accepts that coding (`q=0` refuses it),
//! the compressed file is sent with `Content-Encoding` (Brotli preferred, then
//! gzip); every response of a file that has a compressed variant says
//! `Vary: Accept-Encoding`, so caches keep the codings apart.
//!
//! Every response carries the headers a page cannot set for itself in a meta tag:
//! `Content-Security-Policy: frame-ancestors 'none'` and `X-Frame-Options: DENY` (no
//! other site may frame a calculation sheet), `Referrer-Policy: no-referrer` (a
//! link holds a whole calculation; it is not sent on to anyone) and
//! `X-Content-Type-Options: nosniff`. The README lists them for static hosts.
//!
//! Bounds: at most [`MAX_CONNECTIONS`] open connections (more get `503`), request
//! heads of at most [`MAX_HEAD_BYTES`] (more get `431`), no request bodies, an idle
//! timeout of [`IDLE_TIMEOUT`], and at most [`MAX_REQUESTS_PER_CONNECTION`] requests
//! on one connection.
//!
//! Why the head may be large: a calculation lives in its link, and a line schedule
//! is one text field of up to [`fluxledger_core::catalog::MAX_TEXT_CHARS`]
//! characters, which percent-encoding makes up to three times as long. The bound is
//! sized so that such a link loads on a first visit (before the service worker
//! answers from its cache), and no larger: 64 connections hold at most 64 MiB.

use std::collections::HashMap;
use std::fs;
use std::io::{self, BufRead, BufReader, Read, Write};
use std::net::{Shutdown, SocketAddr, TcpListener, TcpStream};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, AtomicU64, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex, MutexGuard};
use std::thread::{self, JoinHandle};
use std::time::{Duration, Instant};

use crate::error::{SiteError, SiteErrorKind};

/// Headers sent with every response (see the module doc).
pub const SECURITY_HEADERS: &[(&str, &str)] = &[
    ("Content-Security-Policy", "frame-ancestors 'none'"),
    ("X-Frame-Options", "DENY"),
    ("Referrer-Policy", "no-referrer"),
    ("X-Content-Type-Options", "nosniff"),
];

pub const MAX_CONNECTIONS: usize = 64;
/// The longest request head accepted: room for a link whose text field is at the
/// core's limit, percent-encoded (3 bytes a character), with every other field and
/// the usual headers (checked by a test against the core's constant).
pub const MAX_HEAD_BYTES: u64 = 1024 * 1024;
pub const MAX_REQUESTS_PER_CONNECTION: usize = 1000;
pub const IDLE_TIMEOUT: Duration = Duration::from_secs(10);

struct Shared {
    root: PathBuf,
    stopped: AtomicBool,
    next_id: AtomicU64,
    active: AtomicUsize,
    connections: Mutex<HashMap<u64, TcpStream>>,
}

impl Shared {
    fn connections(&self) -> MutexGuard<'_, HashMap<u64, TcpStream>> {
        self.connections.lock().unwrap_or_else(|poisoned| poisoned.into_inner())
    }
}

/// A running server. Dropping it stops it.
pub struct ServerHandle {
    addr: SocketAddr,
    shared: Arc<Shared>,
    accept_thread: Option<JoinHandle<()>>,
}

impl ServerHandle {
    /// The address bound (with the real port when port 0 was asked for).
    pub fn addr(&self) -> SocketAddr {
        self.addr
    }
    pub fn port(&self) -> u16 {
        self.addr.port()
    }
    /// `http://127.0.0.1:PORT/` (IPv6 addresses in brackets).
    pub fn url(&self) -> String {
        format!("http://{}/", self.addr)
    }

    /// Stops the server: no new connections are accepted, every open connection
    /// (including idle keep-alive ones) is shut down, and requests still arriving
    /// on them are refused. Returns once the connection threads have ended (or
    /// after two seconds at most). Calling it again does nothing.
    pub fn stop(&mut self) {
        if self.shared.stopped.swap(true, Ordering::SeqCst) {
            return;
        }
        // Wake the blocking accept so the thread sees the flag and drops the listener.
        let _ = TcpStream::connect_timeout(&self.addr, Duration::from_millis(500));
        if let Some(thread) = self.accept_thread.take() {
            let _ = thread.join();
        }
        for stream in self.shared.connections().values() {
            let _ = stream.shutdown(Shutdown::Both);
        }
        let deadline = Instant::now() + Duration::from_secs(2);
        while self.shared.active.load(Ordering::SeqCst) > 0 && Instant::now() < deadline {
            thread::sleep(Duration::from_millis(5));
        }
    }

    /// Blocks until the server is stopped (the command-line `serve` waits here
    /// until the process is interrupted).
    pub fn wait(mut self) {
        if let Some(thread) = self.accept_thread.take() {
            let _ = thread.join();
        }
    }
}

impl Drop for ServerHandle {
    fn drop(&mut self) {
        self.stop();
    }
}

/// Serves `dir` on `addr`, which must be a loopback address; port 0 picks a free
/// port (read it from [`ServerHandle::port`]).
///
/// # Errors
/// A non-loopback address, a missing folder, or a port that cannot be bound.
pub fn serve(dir: &Path, addr: SocketAddr) -> Result<ServerHandle, SiteError> {
    if !addr.ip().is_loopback() {
        return Err(SiteErrorKind::NotLoopback { addr: addr.to_string() }.into());
    }
    let root = dir.canonicalize().map_err(|e| SiteError::io(dir, e))?;
    if !root.is_dir() {
        return Err(SiteError::io(
            dir,
            io::Error::new(io::ErrorKind::NotFound, "not a folder"),
        ));
    }
    let listener = TcpListener::bind(addr).map_err(|e| SiteError::io(format!("{addr}"), e))?;
    let addr = listener.local_addr().map_err(|e| SiteError::io(format!("{addr}"), e))?;
    let shared = Arc::new(Shared {
        root,
        stopped: AtomicBool::new(false),
        next_id: AtomicU64::new(0),
        active: AtomicUsize::new(0),
        connections: Mutex::new(HashMap::new()),
    });
    let accept_shared = Arc::clone(&shared);
    let accept_thread = thread::Builder::new()
        .name("fluxledger-serve".into())
        .spawn(move || accept_loop(listener, accept_shared))
        .map_err(|e| SiteError::io("server thread", e))?;
    Ok(ServerHandle {
        addr,
        shared,
        accept_thread: Some(accept_thread),
    })
}

fn accept_loop(listener: TcpListener, shared: Arc<Shared>) {
    for stream in listener.incoming() {
        if shared.stopped.load(Ordering::SeqCst) {
            break;
        }
        let mut stream = match stream {
            Ok(stream) => stream,
            Err(_) => {
                // Out of descriptors or a reset before accept: back off a little.
                thread::sleep(Duration::from_millis(10));
                continue;
            }
        };
        if shared.active.load(Ordering::SeqCst) >= MAX_CONNECTIONS {
            let _ = write_response(&mut stream, &Response::plain(503, "server busy"), false, false);
            let _ = stream.shutdown(Shutdown::Both);
            continue;
        }
        let id = shared.next_id.fetch_add(1, Ordering::SeqCst);
        let Ok(registered) = stream.try_clone() else { continue };
        shared.connections().insert(id, registered);
        shared.active.fetch_add(1, Ordering::SeqCst);
        let connection_shared = Arc::clone(&shared);
        let spawned = thread::Builder::new().name("fluxledger-conn".into()).spawn(move || {
            let _ = handle_connection(stream, &connection_shared);
            connection_shared.connections().remove(&id);
            connection_shared.active.fetch_sub(1, Ordering::SeqCst);
        });
        if spawned.is_err() {
            if let Some(stream) = shared.connections().remove(&id) {
                let _ = stream.shutdown(Shutdown::Both);
            }
            shared.active.fetch_sub(1, Ordering::SeqCst);
        }
    }
}

/// One parsed request head.
#[derive(Debug, PartialEq)]
struct RequestHead {
    method: String,
    target: String,
    keep_alive: bool,
    content_length: u64,
    accepts: Accepts,
}

/// Which content codings a request accepts.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Accepts {
    pub brotli: bool,
    pub gzip: bool,
}

impl Accepts {
    /// Reads an `Accept-Encoding` value: `br`, `gzip` (or `x-gzip`) and `*`, each
    /// refused by `q=0`.
    pub fn parse(value: &str) -> Accepts {
        let mut accepts = Accepts::default();
        let mut star: Option<bool> = None;
        let mut explicit_br: Option<bool> = None;
        let mut explicit_gzip: Option<bool> = None;
        for item in value.split(',') {
            let mut parts = item.split(';');
            let coding = parts.next().unwrap_or("").trim().to_ascii_lowercase();
            let mut ok = true;
            for param in parts {
                if let Some((name, q)) = param.split_once('=') {
                    if name.trim().eq_ignore_ascii_case("q") {
                        ok = q.trim().parse::<f64>().map(|q| q > 0.0).unwrap_or(false);
                    }
                }
            }
            match coding.as_str() {
                "br" => explicit_br = Some(ok),
                "gzip" | "x-gzip" => explicit_gzip = Some(ok),
                "*" => star = Some(ok),
                _ => {}
            }
        }
        accepts.brotli = explicit_br.or(star).unwrap_or(false);
        accepts.gzip = explicit_gzip.or(star).unwrap_or(false);
        accepts
    }
}

/// Why a request head was refused.
#[derive(Debug)]
enum HeadError {
    /// Not an HTTP/1.x request head (answered `400`).
    Malformed(&'static str),
    /// Longer than [`MAX_HEAD_BYTES`] (answered `431`).
    TooLarge,
    /// The connection failed or timed out (not answered).
    Io(io::Error),
}

impl From<io::Error> for HeadError {
    fn from(error: io::Error) -> HeadError {
        HeadError::Io(error)
    }
}

/// Reads one request head; `Ok(None)` at a clean end of the connection.
fn read_head(reader: &mut impl BufRead) -> Result<Option<RequestHead>, HeadError> {
    let mut limited = reader.take(MAX_HEAD_BYTES);
    let mut line = String::new();
    // Skip empty lines before a request line (allowed by RFC 9112).
    loop {
        line.clear();
        if limited.read_line(&mut line)? == 0 {
            return Ok(None);
        }
        if !line.trim().is_empty() {
            break;
        }
    }
    if !line.ends_with('\n') {
        return Err(if limited.limit() == 0 {
            HeadError::TooLarge
        } else {
            HeadError::Malformed("request line incomplete")
        });
    }
    let mut parts = line.split_whitespace();
    let (Some(method), Some(target), Some(version), None) = (parts.next(), parts.next(), parts.next(), parts.next())
    else {
        return Err(HeadError::Malformed("malformed request line"));
    };
    let http11 = match version {
        "HTTP/1.1" => true,
        "HTTP/1.0" => false,
        _ => return Err(HeadError::Malformed("unsupported HTTP version")),
    };
    let mut head = RequestHead {
        method: method.to_string(),
        target: target.to_string(),
        keep_alive: http11,
        content_length: 0,
        accepts: Accepts::default(),
    };
    loop {
        line.clear();
        if limited.read_line(&mut line)? == 0 || !line.ends_with('\n') {
            return Err(if limited.limit() == 0 {
                HeadError::TooLarge
            } else {
                HeadError::Malformed("request head incomplete")
            });
        }
        let header = line.trim_end();
        if header.is_empty() {
            break;
        }
        let Some((name, value)) = header.split_once(':') else {
            return Err(HeadError::Malformed("malformed header"));
        };
        let value = value.trim();
        if name.eq_ignore_ascii_case("connection") {
            let tokens: Vec<String> = value.split(',').map(|t| t.trim().to_ascii_lowercase()).collect();
            if tokens.iter().any(|t| t == "close") {
                head.keep_alive = false;
            } else if tokens.iter().any(|t| t == "keep-alive") {
                head.keep_alive = true;
            }
        } else if name.eq_ignore_ascii_case("content-length") {
            head.content_length = value.parse().map_err(|_| HeadError::Malformed("bad content-length"))?;
        } else if name.eq_ignore_ascii_case("accept-encoding") {
            head.accepts = Accepts::parse(value);
        } else if name.eq_ignore_ascii_case("transfer-encoding") {
            head.content_length = u64::MAX; // bodies are not accepted
        }
    }
    Ok(Some(head))
}

fn handle_connection(stream: TcpStream, shared: &Shared) -> io::Result<()> {
    stream.set_read_timeout(Some(IDLE_TIMEOUT))?;
    stream.set_write_timeout(Some(IDLE_TIMEOUT))?;
    let mut writer = stream.try_clone()?;
    let mut reader = BufReader::new(stream);
    for _ in 0..MAX_REQUESTS_PER_CONNECTION {
        let head = match read_head(&mut reader) {
            Ok(Some(head)) => head,
            Ok(None) => break,
            Err(HeadError::Malformed(why)) => {
                if !shared.stopped.load(Ordering::SeqCst) {
                    write_response(
                        &mut writer,
                        &Response::plain(400, &format!("bad request: {why}")),
                        false,
                        false,
                    )?;
                }
                break;
            }
            Err(HeadError::TooLarge) => {
                if !shared.stopped.load(Ordering::SeqCst) {
                    let text = format!("request head longer than {MAX_HEAD_BYTES} bytes");
                    write_response(&mut writer, &Response::plain(431, &text), false, false)?;
                    // Read (and drop) what the client is still sending before
                    // closing: closing with unread data resets the connection, and
                    // the client may then lose the answer it was sent.
                    writer.shutdown(Shutdown::Write)?;
                    reader.get_ref().set_read_timeout(Some(Duration::from_millis(500)))?;
                    let _ = io::copy(&mut (&mut reader).take(MAX_HEAD_BYTES), &mut io::sink());
                }
                break;
            }
            Err(HeadError::Io(e)) => return Err(e),
        };
        // A request that arrives after stop() on an old connection is not answered.
        if shared.stopped.load(Ordering::SeqCst) {
            break;
        }
        if head.content_length > 0 {
            write_response(
                &mut writer,
                &Response::plain(413, "request bodies are not accepted"),
                false,
                false,
            )?;
            break;
        }
        let head_only = head.method == "HEAD";
        let response = if head.method == "GET" || head_only {
            respond_encoded(&shared.root, &head.target, head.accepts)
        } else {
            let mut r = Response::plain(405, "method not allowed");
            r.extra_headers.push(("Allow", "GET, HEAD".into()));
            r
        };
        let keep_alive = head.keep_alive && !shared.stopped.load(Ordering::SeqCst);
        write_response(&mut writer, &response, keep_alive, head_only)?;
        if !keep_alive {
            break;
        }
    }
    let _ = writer.shutdown(Shutdown::Both);
    Ok(())
}

struct Response {
    status: u16,
    content_type: &'static str,
    cache_control: &'static str,
    body: Vec<u8>,
    extra_headers: Vec<(&'static str, String)>,
}

impl Response {
    fn plain(status: u16, text: &str) -> Response {
        Response {
            status,
            content_type: "text/plain; charset=utf-8",
            cache_control: "no-store",
            body: format!("{status} {text}\n").into_bytes(),
            extra_headers: Vec::new(),
        }
    }
}

fn reason(status: u16) -> &'static str {
    match status {
        200 => "OK",
        400 => "Bad Request",
        403 => "Forbidden",
        404 => "Not Found",
        405 => "Method Not Allowed",
        413 => "Content Too Large",
        431 => "Request Header Fields Too Large",
        500 => "Internal Server Error",
        503 => "Service Unavailable",
        _ => "Unknown",
    }
}

fn write_response(stream: &mut impl Write, response: &Response, keep_alive: bool, head_only: bool) -> io::Result<()> {
    let mut head = format!(
        "HTTP/1.1 {} {}\r\nContent-Type: {}\r\nContent-Length: {}\r\nCache-Control: {}\r\nConnection: {}\r\n",
        response.status,
        reason(response.status),
        response.content_type,
        response.body.len(),
        response.cache_control,
        if keep_alive { "keep-alive" } else { "close" },
    );
    for (name, value) in SECURITY_HEADERS {
        head.push_str(&format!("{name}: {value}\r\n"));
    }
    for (name, value) in &response.extra_headers {
        head.push_str(&format!("{name}: {value}\r\n"));
    }
    head.push_str("\r\n");
    stream.write_all(head.as_bytes())?;
    if !head_only {
        stream.write_all(&response.body)?;
    }
    stream.flush()
}

/// Content type by file extension.
pub fn content_type(name: &str) -> &'static str {
    let ext = name
        .rsplit_once('.')
        .map(|(_, e)| e.to_ascii_lowercase())
        .unwrap_or_default();
    match ext.as_str() {
        "html" | "htm" => "text/html; charset=utf-8",
        "js" | "mjs" => "text/javascript; charset=utf-8",
        "css" => "text/css; charset=utf-8",
        "wasm" => "application/wasm",
        "webmanifest" => "application/manifest+json",
        "json" => "application/json",
        "svg" => "image/svg+xml",
        "png" => "image/png",
        "ico" => "image/x-icon",
        "woff2" => "font/woff2",
        "txt" | "md" => "text/plain; charset=utf-8",
        _ => "application/octet-stream",
    }
}

/// Whether a file name carries a content hash (`stem.1a2b3c4d.ext`).
fn is_content_hashed(name: &str) -> bool {
    let parts: Vec<&str> = name.split('.').collect();
    parts.len() >= 3 && {
        let hash = parts[parts.len() - 2];
        hash.len() == 8 && hash.bytes().all(|b| b.is_ascii_hexdigit())
    }
}

/// Cache policy: pages, manifest and the service worker are always revalidated;
/// hashed files never change.
pub fn cache_control(name: &str) -> &'static str {
    if is_content_hashed(name) {
        "public, max-age=31536000, immutable"
    } else {
        "no-cache"
    }
}

/// Decodes `%XX` escapes; `None` for a bad escape or non-UTF-8 result.
fn percent_decode(text: &str) -> Option<String> {
    let bytes = text.as_bytes();
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i] == b'%' {
            let hex = text.get(i + 1..i + 3)?;
            out.push(u8::from_str_radix(hex, 16).ok()?);
            i += 3;
        } else {
            out.push(bytes[i]);
            i += 1;
        }
    }
    String::from_utf8(out).ok()
}

/// Maps a request target to a relative file path, or an error status.
fn resolve_target(target: &str) -> Result<Vec<String>, u16> {
    let path = target.split(['?', '#']).next().unwrap_or("");
    if !path.starts_with('/') {
        return Err(400);
    }
    let decoded = percent_decode(path).ok_or(400u16)?;
    let mut segments = Vec::new();
    for segment in decoded.split('/') {
        if segment.is_empty() || segment == "." {
            continue;
        }
        if segment == ".." || segment.contains('\\') || segment.contains('\0') {
            return Err(400);
        }
        if segment.starts_with('.') {
            return Err(404);
        }
        segments.push(segment.to_string());
    }
    if decoded.ends_with('/') || segments.is_empty() {
        segments.push("index.html".into());
    }
    Ok(segments)
}

/// The file for `target`, as `.br` or `.gz` when one was written beside it and the
/// request accepts it.
fn respond_encoded(root: &Path, target: &str, accepts: Accepts) -> Response {
    let segments = match resolve_target(target) {
        Ok(segments) => segments,
        Err(status) => return Response::plain(status, if status == 404 { "not found" } else { "bad request" }),
    };
    let mut path = root.to_path_buf();
    for segment in &segments {
        path.push(segment);
    }
    if path.is_dir() {
        path.push("index.html");
    }
    let Ok(real) = path.canonicalize() else {
        return Response::plain(404, "not found");
    };
    if !real.starts_with(root) || !real.is_file() {
        return Response::plain(404, "not found");
    }
    let name = real
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let variant = |ext: &str| {
        let mut os = real.clone().into_os_string();
        os.push(format!(".{ext}"));
        PathBuf::from(os)
    };
    let (br, gz) = (variant("br"), variant("gz"));
    let has_variant = br.is_file() || gz.is_file();
    let (file, coding) = if accepts.brotli && br.is_file() {
        (br, Some("br"))
    } else if accepts.gzip && gz.is_file() {
        (gz, Some("gzip"))
    } else {
        (real, None)
    };
    let mut extra_headers = Vec::new();
    if let Some(coding) = coding {
        extra_headers.push(("Content-Encoding", coding.to_string()));
    }
    if has_variant {
        extra_headers.push(("Vary", "Accept-Encoding".to_string()));
    }
    match fs::read(&file) {
        Ok(body) => Response {
            status: 200,
            content_type: content_type(&name),
            cache_control: cache_control(&name),
            body,
            extra_headers,
        },
        Err(_) => Response::plain(500, "could not read the file"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::io::Cursor;

    /// Sends one request on `stream` and reads one response: (status, headers, body).
    fn exchange(stream: &mut TcpStream, request: &str) -> io::Result<(u16, String, Vec<u8>)> {
        stream.write_all(request.as_bytes())?;
        let mut reader = BufReader::new(stream.try_clone()?);
        let mut head = String::new();
        loop {
            let mut line = String::new();
            if reader.read_line(&mut line)? == 0 {
                return Err(io::Error::new(io::ErrorKind::UnexpectedEof, "connection closed"));
            }
            if line == "\r\n" {
                break;
            }
            head.push_str(&line);
        }
        let status = head.get(9..12).and_then(|s| s.parse().ok()).unwrap_or(0);
        let length: usize = head
            .lines()
            .find_map(|l| l.strip_prefix("Content-Length: "))
            .and_then(|v| v.trim().parse().ok())
            .unwrap_or(0);
        let mut body = vec![0; if request.starts_with("HEAD") { 0 } else { length }];
        reader.read_exact(&mut body)?;
        Ok((status, head, body))
    }

    fn temp_site(name: &str) -> PathBuf {
        let dir = std::env::temp_dir().join(format!("fluxledger-serve-{name}-{}", std::process::id()));
        let _ = fs::remove_dir_all(&dir);
        fs::create_dir_all(&dir).expect("temp dir");
        for (file, body) in [
            ("index.html", "<p>contents</p>"),
            ("sw.js", "// worker"),
            ("fluxledger_wasm.1a2b3c4d.wasm", "\0asm"),
            ("manifest.webmanifest", "{}"),
            (".fluxledger-site", "marker"),
        ] {
            fs::write(dir.join(file), body).expect("write");
        }
        dir
    }

    #[test]
    fn serves_files_with_types_and_cache_headers_over_keep_alive() {
        let dir = temp_site("types");
        let mut server = serve(&dir, "127.0.0.1:0".parse().expect("addr")).expect("serve");
        assert_ne!(server.port(), 0);
        let mut conn = TcpStream::connect(server.addr()).expect("connect");
        let get = |path: &str| format!("GET {path} HTTP/1.1\r\nHost: x\r\n\r\n");

        let (status, head, body) = exchange(&mut conn, &get("/?p=150psi")).expect("index");
        assert_eq!((status, body), (200, b"<p>contents</p>".to_vec()));
        assert!(head.contains("Content-Type: text/html; charset=utf-8"), "{head}");
        assert!(head.contains("Cache-Control: no-cache"), "{head}");
        assert!(head.contains("Connection: keep-alive"), "{head}");

        let (status, head, _) = exchange(&mut conn, &get("/fluxledger_wasm.1a2b3c4d.wasm")).expect("wasm");
        assert_eq!(status, 200);
        assert!(head.contains("Content-Type: application/wasm"), "{head}");
        assert!(head.contains("immutable"), "{head}");

        let (status, head, _) = exchange(&mut conn, &get("/sw.js")).expect("sw");
        assert_eq!(status, 200);
        assert!(
            head.contains("Content-Type: text/javascript") && head.contains("Cache-Control: no-cache"),
            "{head}"
        );

        let (status, head, _) = exchange(&mut conn, &get("/manifest.webmanifest")).expect("manifest");
        assert!(status == 200 && head.contains("application/manifest+json"), "{head}");

        assert_eq!(exchange(&mut conn, &get("/missing.html")).map(|r| r.0).ok(), Some(404));
        assert_eq!(
            exchange(&mut conn, &get("/.fluxledger-site")).map(|r| r.0).ok(),
            Some(404)
        );
        assert_eq!(exchange(&mut conn, &get("/../secret")).map(|r| r.0).ok(), Some(400));

        let mut conn = TcpStream::connect(server.addr()).expect("connect");
        let head_only = exchange(&mut conn, "HEAD /index.html HTTP/1.1\r\nHost: x\r\n\r\n").expect("head");
        assert_eq!((head_only.0, head_only.2.len()), (200, 0));
        assert!(head_only.1.contains("Content-Length: 15"), "{}", head_only.1);
        let post = exchange(&mut conn, "POST /index.html HTTP/1.1\r\nHost: x\r\n\r\n").expect("post");
        assert_eq!(post.0, 405);
        server.stop();
        let _ = fs::remove_dir_all(&dir);
    }

    #[test]
    fn precompressed_files_are_sent_when_accepted_with_vary() {
        let dir = temp_site("encodings");
        let page = b"<p>contents</p>".to_vec();
        let gz = crate::build::gzip(&page, flate2::Compression::best());
        let br = crate::build::brotli_compress(&page);
        fs::write(dir.join("index.html.gz"), &gz).expect("write");
        fs::write(dir.join("index.html.br"), &br).expect("write");
        let mut server = serve(&dir, "127.0.0.1:0".parse().expect("addr")).expect("serve");
        let mut conn = TcpStream::connect(server.addr()).expect("connect");
        let get =
            |path: &str, accept: &str| format!("GET {path} HTTP/1.1\r\nHost: x\r\nAccept-Encoding: {accept}\r\n\r\n");

        let (status, head, body) = exchange(&mut conn, &get("/index.html", "gzip, deflate, br, zstd")).expect("br");
        assert_eq!(status, 200);
        assert!(head.contains("Content-Encoding: br\r\n"), "{head}");
        assert!(head.contains("Vary: Accept-Encoding"), "{head}");
        assert!(head.contains("Content-Type: text/html; charset=utf-8"), "{head}");
        let mut decoded = Vec::new();
        brotli::BrotliDecompress(&mut body.as_slice(), &mut decoded).expect("valid brotli");
        assert_eq!(decoded, page, "the .br file decodes to the page");

        let (_, head, body) = exchange(&mut conn, &get("/", "gzip;q=1.0, br;q=0")).expect("gzip");
        assert!(head.contains("Content-Encoding: gzip\r\n"), "{head}");
        let mut decoded = Vec::new();
        flate2::read::GzDecoder::new(body.as_slice())
            .read_to_end(&mut decoded)
            .expect("valid gzip");
        assert_eq!(decoded, page, "the .gz file decodes to the page");

        let (_, head, body) = exchange(&mut conn, &get("/index.html", "identity")).expect("plain");
        assert!(!head.contains("Content-Encoding"), "{head}");
        assert!(head.contains("Vary: Accept-Encoding"), "{head}");
        assert_eq!(body, page);

        // A file without compressed variants: no coding, no Vary.
        let (_, head, _) = exchange(&mut conn, &get("/sw.js", "br, gzip")).expect("sw");
        assert!(!head.contains("Content-Encoding") && !head.contains("Vary"), "{head}");
        server.stop();
        let _ = fs::remove_dir_all(&dir);
    }

    #[test]
    fn accept_encoding_values_are_read_with_their_weights() {
        let both = Accepts {
            brotli: true,
            gzip: true,
        };
        assert_eq!(Accepts::parse("gzip, deflate, br, zstd"), both);
        assert_eq!(Accepts::parse("*"), both);
        assert_eq!(
            Accepts::parse("br;q=0, *"),
            Accepts {
                brotli: false,
                gzip: true
            }
        );
        assert_eq!(
            Accepts::parse("GZIP; q=0.5"),
            Accepts {
                brotli: false,
                gzip: true
            }
        );
        assert_eq!(Accepts::parse("x-gzip;q=0"), Accepts::default());
        assert_eq!(Accepts::parse("identity"), Accepts::default());
        assert_eq!(Accepts::parse(""), Accepts::default());
    }

    #[test]
    fn stop_closes_accepted_keep_alive_connections_and_refuses_new_ones() {
        let dir = temp_site("stop");
        let mut server = serve(&dir, "127.0.0.1:0".parse().expect("addr")).expect("serve");
        let addr = server.addr();
        let mut idle = TcpStream::connect(addr).expect("connect");
        idle.set_read_timeout(Some(Duration::from_secs(5))).expect("timeout");
        let request = "GET /index.html HTTP/1.1\r\nHost: x\r\n\r\n";
        assert_eq!(exchange(&mut idle, request).map(|r| r.0).ok(), Some(200));

        server.stop();
        // The old keep-alive connection gets no answer (closed or reset), and no
        // new connection is accepted.
        assert!(
            exchange(&mut idle, request).is_err(),
            "a stopped server must not answer on an old connection"
        );
        assert!(
            TcpStream::connect_timeout(&addr, Duration::from_millis(500)).is_err(),
            "listener closed"
        );
        server.stop(); // idempotent
        let _ = fs::remove_dir_all(&dir);
    }

    #[test]
    fn non_loopback_addresses_are_refused() {
        let dir = temp_site("loopback");
        let refused = serve(&dir, "0.0.0.0:0".parse().expect("addr"));
        assert!(matches!(
            refused,
            Err(SiteError {
                kind: SiteErrorKind::NotLoopback { .. }
            })
        ));
        let _ = fs::remove_dir_all(&dir);
    }

    #[test]
    fn targets_map_to_files_and_tricks_are_refused() {
        let ok = |t: &str| resolve_target(t).map(|s| s.join("/"));
        assert_eq!(ok("/"), Ok("index.html".into()));
        assert_eq!(ok("/bend.html?p=150psi&angle=45deg"), Ok("bend.html".into()));
        assert_eq!(ok("/bend.html#results"), Ok("bend.html".into()));
        assert_eq!(ok("/sub/"), Ok("sub/index.html".into()));
        assert_eq!(ok("/a%20b.txt"), Ok("a b.txt".into()));
        assert_eq!(ok("/../etc/passwd"), Err(400));
        assert_eq!(ok("/%2e%2e/etc/passwd"), Err(400));
        assert_eq!(ok("/a%5c..%5cb"), Err(400));
        assert_eq!(ok("/%zz"), Err(400));
        assert_eq!(ok("/.fluxledger-site"), Err(404));
        assert_eq!(ok("http://example/x"), Err(400));
    }

    #[test]
    fn content_types_and_cache_policy() {
        assert_eq!(content_type("fluxledger_wasm.1a2b3c4d.wasm"), "application/wasm");
        assert_eq!(content_type("app.1a2b3c4d.js"), "text/javascript; charset=utf-8");
        assert_eq!(content_type("manifest.webmanifest"), "application/manifest+json");
        assert_eq!(content_type("index.html"), "text/html; charset=utf-8");
        assert_eq!(cache_control("sw.js"), "no-cache");
        assert_eq!(cache_control("bend.html"), "no-cache");
        assert_eq!(cache_control("app.1a2b3c4d.js"), "public, max-age=31536000, immutable");
        assert_eq!(cache_control("app.notahash.js"), "no-cache");
    }

    #[test]
    fn request_heads_parse_keep_alive_and_bounds() {
        let parse = |text: &str| read_head(&mut Cursor::new(text.as_bytes().to_vec()));
        let head = parse("GET /x HTTP/1.1\r\nHost: a\r\n\r\n").ok().flatten();
        assert_eq!(
            head.map(|h| (h.method, h.target, h.keep_alive)),
            Some(("GET".into(), "/x".into(), true))
        );
        let closing = parse("GET / HTTP/1.1\r\nConnection: close\r\n\r\n").ok().flatten();
        assert_eq!(closing.map(|h| h.keep_alive), Some(false));
        let old = parse("GET / HTTP/1.0\r\n\r\n").ok().flatten();
        assert_eq!(old.map(|h| h.keep_alive), Some(false));
        assert!(matches!(parse(""), Ok(None)));
        assert!(parse("GARBAGE\r\n\r\n").is_err());
        let huge = format!("GET / HTTP/1.1\r\nX: {}\r\n\r\n", "a".repeat(MAX_HEAD_BYTES as usize));
        assert!(matches!(parse(&huge), Err(HeadError::TooLarge)));
        let long_line = format!("GET /?q={} HTTP/1.1\r\n\r\n", "a".repeat(MAX_HEAD_BYTES as usize));
        assert!(matches!(parse(&long_line), Err(HeadError::TooLarge)));
        assert!(matches!(
            parse("GET / HTTP/1.1\r\nno colon\r\n\r\n"),
            Err(HeadError::Malformed(_))
        ));
        assert!(matches!(
            parse("GET / HTTP/1.1\r\nHost: a\r\n"),
            Err(HeadError::Malformed(_))
        ));
    }

    /// A link whose one text field is at the core's limit, every character
    /// percent-encoded (`%41`), with the headers a browser sends.
    fn longest_link_request() -> String {
        let rows = "%41".repeat(fluxledger_core::catalog::MAX_TEXT_CHARS);
        let mut others = String::new();
        for i in 0..40 {
            others.push_str(&format!(
                "&f{i}={}",
                "%39".repeat(fluxledger_core::units::MAX_INPUT_CHARS)
            ));
        }
        format!(
            "GET /line-schedule.html?rows={rows}{others}&units=si HTTP/1.1\r\nHost: 127.0.0.1\r\nUser-Agent: {}\r\nAccept: text/html\r\nAccept-Language: en\r\nCookie: {}\r\n\r\n",
            "u".repeat(400),
            "c".repeat(4096),
        )
    }

    #[test]
    fn the_head_bound_holds_a_link_at_the_core_text_limit_and_no_more() {
        let longest = longest_link_request();
        assert!(
            (longest.len() as u64) < MAX_HEAD_BYTES,
            "a {}-byte link head does not fit in {MAX_HEAD_BYTES}",
            longest.len()
        );
        assert!(
            MAX_HEAD_BYTES <= 2 * longest.len() as u64,
            "the bound is far larger than a link needs"
        );
        let dir = temp_site("long");
        fs::write(dir.join("line-schedule.html"), "<p>schedule</p>").expect("write");
        let mut server = serve(&dir, "127.0.0.1:0".parse().expect("addr")).expect("serve");
        let mut conn = TcpStream::connect(server.addr()).expect("connect");
        let (status, _, body) = exchange(&mut conn, &longest).expect("long link");
        assert_eq!((status, body), (200, b"<p>schedule</p>".to_vec()));

        let mut conn = TcpStream::connect(server.addr()).expect("connect");
        let too_long = format!(
            "GET /line-schedule.html?rows={} HTTP/1.1\r\nHost: x\r\n\r\n",
            "a".repeat(MAX_HEAD_BYTES as usize)
        );
        let (status, head, _) = exchange(&mut conn, &too_long).expect("too long");
        assert_eq!(status, 431, "{head}");
        assert!(head.contains("Connection: close"), "{head}");
        server.stop();
        let _ = fs::remove_dir_all(&dir);
    }

    #[test]
    fn every_response_forbids_framing_referrers_and_sniffing() {
        let dir = temp_site("headers");
        let mut server = serve(&dir, "127.0.0.1:0".parse().expect("addr")).expect("serve");
        for request in [
            "GET /index.html HTTP/1.1\r\nHost: x\r\n\r\n",
            "GET /missing.html HTTP/1.1\r\nHost: x\r\n\r\n",
            "HEAD /sw.js HTTP/1.1\r\nHost: x\r\n\r\n",
            "DELETE /index.html HTTP/1.1\r\nHost: x\r\n\r\n",
        ] {
            let mut conn = TcpStream::connect(server.addr()).expect("connect");
            let (status, head, _) = exchange(&mut conn, request).expect("response");
            for line in [
                "Content-Security-Policy: frame-ancestors 'none'\r\n",
                "X-Frame-Options: DENY\r\n",
                "Referrer-Policy: no-referrer\r\n",
                "X-Content-Type-Options: nosniff\r\n",
            ] {
                assert!(head.contains(line), "{status} to {request:?} lacks {line:?}:\n{head}");
            }
        }
        server.stop();
        let _ = fs::remove_dir_all(&dir);
    }
}
