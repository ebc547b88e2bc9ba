//! The module of the page `restrained-length.html`: its calculator only.
fluxledger_wasm::page_module!("restrained-length");
