//! The module of the page `line-schedule.html`: its calculator only.
fluxledger_wasm::page_module!("line-schedule");
