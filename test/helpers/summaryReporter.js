// Prints, after jest's own report, the robustness line of the hostile-input
// catalogue (when it ran) and then one closing line "unit: N passed, N failed".
// The catalogue's test files run in workers: each writes its counts as JSON to
// the folder named in KNOTWISE_TALLY_DIR, made here before any worker starts.
const fs = require('fs');
const os = require('os');
const path = require('path');

class SummaryReporter {
  constructor() {
    this.dir = fs.mkdtempSync(path.join(os.tmpdir(), 'knotwise-tally-'));
    process.env.KNOTWISE_TALLY_DIR = this.dir;
  }

  robustnessLine() {
    const sum = { sheet: { cases: 0, results: 0, warned: 0, errors: 0, crashes: 0 }, cli: { cases: 0, results: 0, warned: 0, errors: 0, crashes: 0 } };
    let files = [];
    try { files = fs.readdirSync(this.dir).filter((f) => f.endsWith('.json')); } catch { return null; }
    let random = 0;
    for (const f of files) {
      const t = JSON.parse(fs.readFileSync(path.join(this.dir, f), 'utf8'));
      if (f.startsWith('properties')) random += t.sheet.cases + t.cli.cases;
      for (const front of ['sheet', 'cli']) for (const k of Object.keys(sum[front])) sum[front][k] += t[front][k];
    }
    if (!files.length) return null;
    const all = (k) => sum.sheet[k] + sum.cli[k];
    return `robustness: ${all('cases')} cases (worksheet ${sum.sheet.cases}, CLI ${sum.cli.cases}; ${all('cases') - random} from the catalogue, ${random} random): ${all('results')} results, ${all('warned')} with warnings, ${all('errors')} clear errors, ${all('crashes')} crashes`;
  }

  onRunComplete(_contexts, results) {
    const line = this.robustnessLine();
    try { fs.rmSync(this.dir, { recursive: true, force: true }); } catch { /* a leftover temporary folder is harmless */ }
    if (line) process.stdout.write(line + '\n');
    const skipped = results.numPendingTests + results.numTodoTests;
    process.stdout.write(`unit: ${results.numPassedTests} passed, ${results.numFailedTests} failed${skipped ? `, ${skipped} skipped` : ''}\n`);
  }
}
module.exports = SummaryReporter;
