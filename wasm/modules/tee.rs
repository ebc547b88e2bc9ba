//! The module of the page `tee.html`: its calculator only.
fluxledger_wasm::page_module!("tee");
