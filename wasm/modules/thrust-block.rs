//! The module of the page `thrust-block.html`: its calculator only.
fluxledger_wasm::page_module!("thrust-block");
