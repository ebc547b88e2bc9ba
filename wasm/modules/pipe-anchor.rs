//! The module of the page `pipe-anchor.html`: its calculator only.
fluxledger_wasm::page_module!("pipe-anchor");
