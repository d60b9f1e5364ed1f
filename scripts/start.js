#!/usr/bin/env node
// npm start: build everything, then serve the add-in and the standalone preview.
const { execSync } = require('child_process');
const path = require('path');
const root = path.join(__dirname, '..');
execSync('npm run build', { cwd: root, stdio: 'inherit' });
process.argv.splice(2, 0, ...process.argv.splice(2));
require('./serve.js').start();
