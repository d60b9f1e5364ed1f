#!/usr/bin/env node
// npm start [-- --https] [-- --port=N]: build everything, then serve the add-in and the standalone preview
// (serve.js reads the same arguments).
const { execSync } = require('child_process');
const path = require('path');
const root = path.join(__dirname, '..');
execSync('npm run build', { cwd: root, stdio: 'inherit' });
require('./serve.js').start();
