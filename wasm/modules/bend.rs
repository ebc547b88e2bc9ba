//! The module of the page `bend.html`: its calculator only.
fluxledger_wasm::page_module!("bend");
