//! The module of the page `reducer.html`: its calculator only.
fluxledger_wasm::page_module!("reducer");
