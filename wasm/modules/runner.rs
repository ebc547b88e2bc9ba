//! The module of the page `runner.html`: its calculator only.
fluxledger_wasm::page_module!("runner");
