// Fluxledger page script: the one script every page loads. The page script is a
// set of ES modules under js/ (see js/main.js for the map); the site tool gives
// each a content-hashed name and rewrites the imports to those names.
import "./js/main.js";
