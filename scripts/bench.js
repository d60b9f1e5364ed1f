#!/usr/bin/env node
// npm run bench [-- --quick] [-- --only=spline]: compile the benchmarks and run them (JSON lines on stdout).
const { execSync, spawnSync } = require('child_process');
const path = require('path');
const root = path.join(__dirname, '..');
execSync('npx tsc -p tsconfig.bench.json', { cwd: root, stdio: 'inherit' });
const r = spawnSync(process.execPath, ['--max-old-space-size=8192', path.join(root, 'dist/bench/test/bench/run.js'), ...process.argv.slice(2)], { stdio: 'inherit' });
process.exit(r.status ?? 1);
