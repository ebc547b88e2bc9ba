//! `fluxledger-site`: build, serve and test the handbook.
//!
//! ```text
//! cargo run --release -p fluxledger-site -- build [--out DIR]
//! cargo run --release -p fluxledger-site -- serve [--addr 127.0.0.1] [--port 8080] [--out DIR]
//! cargo run --release -p fluxledger-site -- test
//! ```
//!
//! `test` is the project's one test command on a fresh Debian 12 machine: it adds
//! the wasm target when missing, installs Chromium (as root, from Debian) when
//! `/usr/bin/chromium` is missing, builds the site once (so a broken build shows
//! plainly and the sizes are in the log), then runs `cargo test --workspace` with
//! the output passed through and exits with its status.
//!
//! Why the tests run in the dev profile and not `--release`: the release profile
//! has `panic = "abort"`, and cargo builds test harnesses and every crate they link
//! with `panic = "unwind"`, so `cargo test --release` cannot reuse the release
//! build of this tool anyway (checked: cargo recompiles the library) and would add
//! fat LTO to every test binary. The dev build of the workspace is the faster
//! second compile on two cores.

use std::io::{BufRead, BufReader, Write};
use std::net::{IpAddr, SocketAddr};
use std::path::{Path, PathBuf};
use std::process::{Command, ExitCode, Stdio};

use fluxledger_site::{build_site, serve, wasm_build, BuildOptions, SiteError};

const USAGE: &str = "\
usage: fluxledger-site <command> [options]

commands:
  build [--out DIR]                                 build the site (default DIR: target/site)
  serve [--addr IP] [--port N] [--out DIR]          build, then serve DIR on loopback
                                                    (default 127.0.0.1, port 8080)
        --site-dir DIR  (build, serve)              site sources: DIR/assets and DIR/notes
                                                    (default: site/ of the workspace)
        --wasm-opt      (build, serve)              run wasm-opt -Os on the module when it is
                                                    on PATH (off by default: see BuildOptions)
  test [--out DIR]                                  install what the tests need, build the
                                                    site into DIR, run `cargo test --workspace`
  help                                              show this text
";

const CHROMIUM: &str = "/usr/bin/chromium";

#[derive(Debug)]
struct Args {
    command: String,
    out: PathBuf,
    addr: IpAddr,
    port: u16,
    site_dir: Option<PathBuf>,
    wasm_opt: bool,
}

fn parse_args(mut args: impl Iterator<Item = String>, root: &Path) -> Result<Args, String> {
    let command = args.next().unwrap_or_else(|| "help".into());
    let mut parsed = Args {
        command,
        out: root.join("target").join("site"),
        addr: IpAddr::from([127, 0, 0, 1]),
        port: 8080,
        site_dir: None,
        wasm_opt: false,
    };
    while let Some(flag) = args.next() {
        let (name, inline) = match flag.split_once('=') {
            Some((n, v)) => (n.to_string(), Some(v.to_string())),
            None => (flag.clone(), None),
        };
        let mut value = || {
            inline
                .clone()
                .or_else(|| args.next())
                .ok_or_else(|| format!("{name} needs a value"))
        };
        match (parsed.command.as_str(), name.as_str()) {
            ("build" | "serve" | "test", "--out") => parsed.out = PathBuf::from(value()?),
            ("build" | "serve", "--site-dir") => parsed.site_dir = Some(PathBuf::from(value()?)),
            ("build" | "serve", "--wasm-opt") if inline.is_none() => parsed.wasm_opt = true,
            ("serve", "--addr") => {
                let text = value()?;
                parsed.addr = text
                    .parse()
                    .map_err(|_| format!("--addr: '{text}' is not an IP address"))?;
            }
            ("serve", "--port") => {
                let text = value()?;
                parsed.port = text
                    .parse()
                    .map_err(|_| format!("--port: '{text}' is not a port number (0-65535)"))?;
            }
            _ => return Err(format!("unknown option '{flag}' for '{}'", parsed.command)),
        }
    }
    Ok(parsed)
}

fn main() -> ExitCode {
    let mut options = BuildOptions {
        log: true,
        ..BuildOptions::default()
    };
    let args = match parse_args(std::env::args().skip(1), &options.root) {
        Ok(args) => args,
        Err(message) => {
            eprintln!("error: {message}\n\n{USAGE}");
            return ExitCode::from(2);
        }
    };
    options.site_dir = args.site_dir.clone();
    options.wasm_opt = args.wasm_opt;
    let result = match args.command.as_str() {
        "build" => build(&args.out, &options).map(|_| ExitCode::SUCCESS),
        "serve" => build(&args.out, &options).and_then(|_| {
            let server = serve(&args.out, SocketAddr::new(args.addr, args.port))?;
            println!("serving {} at {}  (Ctrl-C stops)", args.out.display(), server.url());
            server.wait();
            Ok(ExitCode::SUCCESS)
        }),
        "test" => run_tests(&args.out, &options),
        "help" | "--help" | "-h" => {
            print!("{USAGE}");
            Ok(ExitCode::SUCCESS)
        }
        other => {
            eprintln!("error: unknown command '{other}'\n\n{USAGE}");
            return ExitCode::from(2);
        }
    };
    match result {
        Ok(code) => code,
        Err(error) => {
            eprintln!("error: {error}");
            ExitCode::FAILURE
        }
    }
}

fn build(out: &Path, options: &BuildOptions) -> Result<(), SiteError> {
    let report = build_site(out, options)?;
    println!("{report}");
    Ok(())
}

fn is_root() -> bool {
    // The effective uid is the third field of `Uid:` in /proc/self/status.
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("Uid:"))
                .map(|l| l.split_whitespace().nth(2) == Some("0"))
        })
        .unwrap_or(false)
}

fn run(command: &mut Command, display: &str) -> Result<(), SiteError> {
    eprintln!("running: {display}");
    let status = command
        .status()
        .map_err(|e| SiteError::command(display, e.to_string()))?;
    if status.success() {
        Ok(())
    } else {
        Err(SiteError::command(display, status.to_string()))
    }
}

fn ensure_chromium() -> Result<(), SiteError> {
    if Path::new(CHROMIUM).is_file() {
        return Ok(());
    }
    if !is_root() {
        return Err(SiteError::command(
            "chromium check",
            format!(
                "{CHROMIUM} is missing and this user cannot install it; as root run \
                 `apt-get update && apt-get install -y chromium chromium-driver`, then run the tests again"
            ),
        ));
    }
    run(
        Command::new("apt-get")
            .arg("update")
            .env("DEBIAN_FRONTEND", "noninteractive"),
        "apt-get update",
    )?;
    run(
        Command::new("apt-get")
            .args([
                "install",
                "-y",
                "--no-install-recommends",
                "chromium",
                "chromium-driver",
            ])
            .env("DEBIAN_FRONTEND", "noninteractive"),
        "apt-get install -y chromium chromium-driver",
    )?;
    if !Path::new(CHROMIUM).is_file() {
        return Err(SiteError::command(
            "apt-get install chromium",
            format!("finished but {CHROMIUM} is still missing"),
        ));
    }
    Ok(())
}

fn run_tests(out: &Path, options: &BuildOptions) -> Result<ExitCode, SiteError> {
    let root = &options.root;
    wasm_build::ensure_wasm_target(true)?;
    ensure_chromium()?;
    // Build the site once up front: a broken build (missing note, bad formula,
    // missing placeholder) shows here plainly, the sizes land in the log, and the
    // browser tests' own builds find the wasm module already compiled.
    build(out, options)?;
    let display = "cargo test --workspace";
    eprintln!("running: {display}");
    // The test binaries' reports pass through line by line; their counts are summed
    // into one closing line, so the log ends with the whole run's total rather than
    // the last crate's (often empty) doc-test summary.
    let mut child = Command::new(wasm_build::cargo_program())
        .current_dir(root)
        .args(["test", "--workspace"])
        .stdout(Stdio::piped())
        .spawn()
        .map_err(|e| SiteError::command(display, e.to_string()))?;
    let (mut passed, mut failed) = (0u64, 0u64);
    if let Some(stdout) = child.stdout.take() {
        let mut out = std::io::stdout().lock();
        for line in BufReader::new(stdout).lines() {
            let line = line.map_err(|e| SiteError::command(display, e.to_string()))?;
            if let Some((p, f)) = result_counts(&line) {
                passed += p;
                failed += f;
            }
            // A closed stdout (a pager quit early) must not stop the tests.
            let _ = writeln!(out, "{line}");
        }
    }
    let status = child.wait().map_err(|e| SiteError::command(display, e.to_string()))?;
    println!("tests: {passed} passed, {failed} failed");
    Ok(match status.code() {
        Some(0) => ExitCode::SUCCESS,
        Some(code) => ExitCode::from(u8::try_from(code).unwrap_or(1)),
        None => ExitCode::FAILURE,
    })
}

/// The passed and failed counts of a libtest summary line
/// (`test result: ok. 12 passed; 0 failed; 0 ignored; ...`).
fn result_counts(line: &str) -> Option<(u64, u64)> {
    let rest = line.trim().strip_prefix("test result:")?;
    let count = |word: &str| -> Option<u64> {
        rest.split(';')
            .find_map(|part| part.trim().strip_suffix(word)?.trim().rsplit(' ').next()?.parse().ok())
    };
    Some((count(" passed")?, count(" failed")?))
}

#[cfg(test)]
mod tests {
    #[test]
    fn summary_lines_give_their_counts() {
        let line = "test result: ok. 74 passed; 0 failed; 0 ignored; 0 measured; 0 filtered out; finished in 0.04s";
        assert_eq!(super::result_counts(line), Some((74, 0)));
        let line = "test result: FAILED. 7 passed; 1 failed; 0 ignored; 0 measured; 0 filtered out";
        assert_eq!(super::result_counts(line), Some((7, 1)));
        assert_eq!(super::result_counts("test foo ... ok"), None);
    }

    use super::*;

    fn parse(args: &[&str]) -> Result<Args, String> {
        parse_args(args.iter().map(|s| s.to_string()), Path::new("/repo"))
    }

    #[test]
    fn defaults_are_loopback_8080_and_target_site() {
        let args = parse(&["serve"]).expect("valid");
        assert_eq!(args.addr, IpAddr::from([127, 0, 0, 1]));
        assert_eq!(args.port, 8080);
        assert_eq!(args.out, PathBuf::from("/repo/target/site"));
    }

    #[test]
    fn options_take_separate_or_inline_values() {
        let args = parse(&["serve", "--port", "0", "--addr=::1", "--out", "/tmp/x"]).expect("valid");
        assert_eq!(args.port, 0);
        assert_eq!(args.addr, "::1".parse::<IpAddr>().expect("ip"));
        assert_eq!(args.out, PathBuf::from("/tmp/x"));
    }

    #[test]
    fn wasm_opt_is_off_unless_asked() {
        assert!(!parse(&["build"]).expect("valid").wasm_opt);
        assert!(parse(&["build", "--wasm-opt"]).expect("valid").wasm_opt);
        assert!(parse(&["build", "--wasm-opt=yes"]).is_err());
    }

    #[test]
    fn bad_options_are_named() {
        assert!(parse(&["serve", "--port", "99999"])
            .err()
            .is_some_and(|e| e.contains("--port")));
        assert!(parse(&["build", "--port", "1"])
            .err()
            .is_some_and(|e| e.contains("--port")));
        assert!(parse(&["serve", "--out"])
            .err()
            .is_some_and(|e| e.contains("needs a value")));
    }
}
