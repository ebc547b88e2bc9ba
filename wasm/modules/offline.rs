//! The offline module: every calculator, with exactly the exports of a calculator
//! page's own module, so the one glue of those pages runs it too. The service
//! worker stores it instead of every page's module and answers a page's module
//! request with it when the network is gone (`site/assets/sw.js`).
fluxledger_wasm::calculator_exports!(fluxledger_wasm::CALCULATORS);
