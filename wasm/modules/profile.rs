//! The module of the page `profile.html`: its calculator only.
fluxledger_wasm::page_module!("profile");
