// Fluxledger page script: the one script every page loads. The page script is a
// set of ES modules under js/ (see js/main.js for the map); the site tool joins
// them into this one file, each after the modules it imports (site/src/bundle.rs
// says which forms of import and export it accepts), under a content-hashed name.
import "./js/main.js";
