//! The module of the page `tank-drain.html`: its calculator only.
fluxledger_wasm::page_module!("tank-drain");
