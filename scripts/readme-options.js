#!/usr/bin/env node
/* Writes the option tables generated from the analyses' declarations into
 * README.md between its markers. Run after npm run build:cli. */
const fs = require('fs');
const path = require('path');
const { optionsMarkdown, OPTIONS_BEGIN, OPTIONS_END } = require('../dist/node/src/cli/optionsMarkdown.js');
const file = path.join(__dirname, '..', 'README.md');
const text = fs.readFileSync(file, 'utf8');
const a = text.indexOf(OPTIONS_BEGIN), b = text.indexOf(OPTIONS_END);
if (a < 0 || b < a) { console.error('README.md has no option-table markers'); process.exit(1); }
fs.writeFileSync(file, text.slice(0, a + OPTIONS_BEGIN.length) + '\n\n' + optionsMarkdown() + '\n\n' + text.slice(b));
console.log('README.md option tables written');
