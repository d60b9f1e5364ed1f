/**
 * Counts of the catalogue's runs per front, handed to the summary reporter
 * (test/helpers/summaryReporter.js), which prints the robustness line after
 * the run. The reporter names a folder in KNOTWISE_TALLY_DIR; each test file
 * writes its own counts there. Without the reporter nothing is written.
 */
import * as fs from 'fs';
import * as path from 'path';
import type { Run } from './fronts';

export interface Tally {
  sheet: { cases: number; results: number; warned: number; errors: number; crashes: number };
  cli: { cases: number; results: number; warned: number; errors: number; crashes: number };
}

/** Warnings every result of a kind carries, which say nothing about the input. */
const ROUTINE = new Set(['boundary', 'break-cause']);

export function newTally(): Tally {
  const z = () => ({ cases: 0, results: 0, warned: 0, errors: 0, crashes: 0 });
  return { sheet: z(), cli: z() };
}

export function count(t: Tally, r: Run): void {
  const f = t[r.front];
  f.cases++;
  if (r.kind === 'crash') f.crashes++;
  else if (r.kind === 'error') f.errors++;
  else { f.results++; if (r.warnings.some((w) => !ROUTINE.has(w))) f.warned++; }
}

/** Writes this file's counts for the reporter. */
export function saveTally(name: string, t: Tally): void {
  const dir = process.env.KNOTWISE_TALLY_DIR;
  if (!dir || !fs.existsSync(dir)) return;
  fs.writeFileSync(path.join(dir, `${name}-${process.pid}.json`), JSON.stringify(t));
}
