//! The module of the page `jet-plate.html`: its calculator only.
fluxledger_wasm::page_module!("jet-plate");
