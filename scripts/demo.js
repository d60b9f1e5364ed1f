#!/usr/bin/env node
// Writes assets/demo/weekly-orders.csv from the seeded demo generator (src/demo/weeklyOrders.ts).
const fs = require('fs');
const path = require('path');
const { weeklyOrdersCsv } = require('../dist/node/src/demo/weeklyOrders.js');
const out = path.join(__dirname, '..', 'assets', 'demo', 'weekly-orders.csv');
fs.writeFileSync(out, weeklyOrdersCsv());
console.log(`wrote ${out}`);
