#!/usr/bin/env node
// Runs the compiled command line (npm run build:cli writes dist/node).
require('../dist/node/src/cli/node.js');
