//! Benchmark of the control-volume engine (filled in when the engine lands).
fn main() {}
