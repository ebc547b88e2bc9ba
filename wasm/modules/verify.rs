//! The verification page's module: every calculator, and `verify_case`.
fluxledger_wasm::calculator_exports!(fluxledger_wasm::CALCULATORS);
fluxledger_wasm::verify_exports!();
