//! The module of the page `dead-end.html`: its calculator only.
fluxledger_wasm::page_module!("dead-end");
