//! Benchmark of the control-volume engine: one two-port bend balance, a batch of
//! 100,000 different bend balances, and (for scale) the whole `bend` calculator
//! through `solve` with typed text, tables and diagram.
//!
//! A small std harness (`harness = false`): `std::time::Instant` and `black_box`,
//! median of several rounds. It prints figures and asserts nothing about time.
//! Run with `cargo bench -p fluxledger-tests --bench engine`.

use std::f64::consts::PI;
use std::hint::black_box;
use std::time::{Duration, Instant};

use fluxledger_core::engine::{self, si, ControlVolume, Loss, Port, Stream};
use fluxledger_core::fluid::Fluid;
use fluxledger_core::vector::{Direction, Vec3};
use fluxledger_core::Request;

/// A horizontal bend of `angle` radians, 300 mm, with flow, a loss and the contained
/// fluid's weight: the control volume the bend calculator builds.
fn bend(angle: f64, pressure: f64, flow: f64) -> ControlVolume {
    let d = 0.3;
    let area = PI * d * d / 4.0;
    let radius = 1.5 * d;
    let mut cv = ControlVolume::new(Fluid {
        name: "water".into(),
        density: 998.2,
        viscosity: 1.0e-3,
        vapour_pressure: Some(2339.0),
    });
    let inlet = cv.port(
        Port::inlet("inlet", si::area(area), Direction::X)
            .volume_flow(si::volume_flow(flow))
            .pressure(si::pressure(pressure)),
    );
    let outlet_at = Vec3::new(radius * angle.sin(), radius * (1.0 - angle.cos()), 0.0);
    let outlet = cv.port(Port::outlet("outlet", si::area(area), Direction::in_plane(angle)).at(outlet_at));
    cv.stream(Stream::new(inlet, outlet).loss(Loss::Coefficient {
        k: 0.2,
        reference_port: inlet,
    }));
    cv.contains(si::volume(area * radius * angle), outlet_at * 0.5);
    cv
}

/// Median of `rounds` timings of `run`.
fn median(rounds: usize, mut run: impl FnMut() -> Duration) -> Duration {
    let mut times: Vec<Duration> = (0..rounds).map(|_| run()).collect();
    times.sort();
    times[times.len() / 2]
}

fn per_item(total: Duration, items: usize) -> f64 {
    total.as_nanos() as f64 / items as f64
}

fn main() {
    // One balance, the same control volume over and over (loop of 10,000 per round,
    // so the clock's own cost is negligible).
    let cv = bend(PI / 4.0, 1.0e6, 0.2);
    if let Err(e) = engine::balance(&cv) {
        eprintln!("the benchmark bend does not balance: {e}");
        std::process::exit(1);
    }
    let reps = 10_000;
    let one = median(21, || {
        let start = Instant::now();
        for _ in 0..reps {
            let result = engine::balance(black_box(&cv));
            black_box(&result);
        }
        start.elapsed()
    });
    println!(
        "one two-port bend balance:      {:8.1} ns per balance (median of 21 rounds of {reps})",
        per_item(one, reps)
    );

    // A batch of 100,000 different balances (angles, pressures and flows vary).
    let batch: Vec<ControlVolume> = (0..100_000)
        .map(|i| {
            let f = i as f64 / 100_000.0;
            bend(0.05 + 3.0 * f, 1.0e5 + 2.0e6 * f, 0.5 * (1.0 - f))
        })
        .collect();
    let mut checksum = 0.0;
    let total = median(7, || {
        let start = Instant::now();
        for cv in &batch {
            if let Ok(b) = engine::balance(black_box(cv)) {
                checksum += b.support_force.x;
            }
        }
        start.elapsed()
    });
    black_box(checksum);
    println!(
        "batch of 100,000 balances:      {:8.2} ms in all, {:.1} ns per balance (median of 7 rounds)",
        total.as_secs_f64() * 1e3,
        per_item(total, batch.len())
    );

    // The whole calculator for scale: parse typed text, validate, balance, format the
    // outputs, build the ledger tables and the diagram.
    let mut request = Request::default();
    for (key, value) in [
        ("angle", "45 deg"),
        ("d", "300 mm"),
        ("p", "10 bar"),
        ("flow_given", "q"),
        ("q", "720 m3/h"),
        ("fluid", "water"),
        ("t", "20 degC"),
        ("k", "0.2"),
        ("plane", "horizontal"),
    ] {
        request.inputs.insert(key.to_string(), value.to_string());
    }
    if let Err(e) = fluxledger_core::solve("bend", &request).result {
        eprintln!("the benchmark bend request does not solve: {e}");
        std::process::exit(1);
    }
    let solves = 2_000;
    let full = median(11, || {
        let start = Instant::now();
        for _ in 0..solves {
            black_box(fluxledger_core::solve("bend", black_box(&request)));
        }
        start.elapsed()
    });
    println!(
        "bend calculator through solve:  {:8.0} ns per solve (median of 11 rounds of {solves})",
        per_item(full, solves)
    );
}
