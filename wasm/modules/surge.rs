//! The module of the page `surge.html`: its calculator only.
fluxledger_wasm::page_module!("surge");
