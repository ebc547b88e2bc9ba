//! The module of the page `reaction-arm.html`: its calculator only.
fluxledger_wasm::page_module!("reaction-arm");
