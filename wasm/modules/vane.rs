//! The module of the page `vane.html`: its calculator only.
fluxledger_wasm::page_module!("vane");
