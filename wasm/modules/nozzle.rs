//! The module of the page `nozzle.html`: its calculator only.
fluxledger_wasm::page_module!("nozzle");
