/**
 * Property tests of the fronts on random messy ranges: random blanks, text,
 * numbers stored as text, error values and booleans among the numbers, x
 * omitted or given in random order, the range as a column or a row. For every
 * such range: no crash (the fronts' judges in fronts.ts check that every
 * output row maps to its input row, every cell holds a finite number, text, a
 * boolean or '', and a rerun is bit-identical), and a permutation of the rows
 * permutes the per-row output and nothing else.
 */
import fc from 'fast-check';
import { segments } from '../../src/functions/breaks';
import { smooth } from '../../src/functions/smoothing';
import { clearComputeCache } from '../../src/functions/compute';
import type { Case, Target } from './catalogue';
import { Run, runCommand, runSheet } from './fronts';
import { count, newTally, saveTally } from './tally';

const tally = newTally();
afterAll(() => saveTally('properties', tally));

/** One cell: mostly whole numbers (so the counts model applies), sometimes something else. */
const cell = fc.oneof(
  { weight: 12, arbitrary: fc.integer({ min: 0, max: 60 }) },
  { weight: 1, arbitrary: fc.constantFrom('', null) },
  { weight: 1, arbitrary: fc.constantFrom('n/a', ' 12 ', '1,234', '7%', '12') },
  { weight: 1, arbitrary: fc.constantFrom({ code: '#N/A' }, { code: '#DIV/0!' }, { code: '#VALUE!' }) },
  { weight: 1, arbitrary: fc.boolean() },
);

interface Messy { y: unknown[]; x: number[] | null; row: boolean; perm: number[] }

const messy = (minRows: number, maxRows: number) => fc.integer({ min: minRows, max: maxRows }).chain((n) => fc.record({
  y: fc.array(cell, { minLength: n, maxLength: n }),
  x: fc.option(fc.shuffledSubarray(Array.from({ length: 3 * n }, (_, i) => (i + 1) * 0.5), { minLength: n, maxLength: n }), { nil: null }),
  row: fc.boolean(),
  perm: fc.shuffledSubarray(Array.from({ length: n }, (_, i) => i), { minLength: n, maxLength: n }),
}));

const shape = (v: readonly unknown[], row: boolean): unknown[][] => (row ? [v.slice()] : v.map((c) => [c]));
const asCase = (m: Messy): Case => ({ name: 'random', y: shape(m.y, m.row), x: m.x ? shape(m.x, m.row) : undefined, expect: {} });

function noCrash(runs: Run[]): void {
  for (const r of runs) {
    count(tally, r);
    expect({ call: r.call, problems: r.problems, error: r.error }).toEqual({ call: r.call, problems: [], error: r.error });
  }
}

const flatOut = (out: unknown[][], row: boolean) => (row ? out[0] : out.map((r) => r[0]));

/** The per-row output of the permuted rows is the permuted per-row output. */
async function permutes(m: Messy, f: (y: unknown[][], x: unknown[][]) => Promise<unknown[][]>): Promise<void> {
  if (!m.x) return;
  const x = m.x;
  let a: unknown[][], b: unknown[][];
  try { a = await f(shape(m.y, m.row), shape(x, m.row)); } catch { return; }
  clearComputeCache();
  b = await f(shape(m.perm.map((i) => m.y[i]), m.row), shape(m.perm.map((i) => x[i]), m.row));
  clearComputeCache();
  const fa = flatOut(a, m.row), fb = flatOut(b, m.row);
  expect(fb).toEqual(m.perm.map((i) => fa[i]));
}

const SETTINGS: Partial<Record<Target, string>> = { trend: 'order=1; bic' };

describe('random messy ranges through the worksheet functions', () => {
  const methods: Target[] = ['spline', 'trend', 'level', 'volatility', 'counts', 'distribution', 'slope'];
  test.each(methods)('%s: aligned, finite, identical on a rerun, and row order does not matter', async (t) => {
    await fc.assert(fc.asyncProperty(messy(6, 40), async (m) => {
      const c = asCase(m);
      if (SETTINGS[t]) c.options = Object.fromEntries(SETTINGS[t]!.split(';').map((p) => p.trim()).map((p) => (p.includes('=') ? p.split('=') as [string, string] : ['rule', p])));
      noCrash(await runSheet(c, t));
      const per = t === 'spline' || t === 'trend' ? (y: unknown[][], x: unknown[][]) => smooth(y, x, t, SETTINGS[t]) : (y: unknown[][], x: unknown[][]) => segments(y, x, t);
      await permutes(m, per);
    }), { numRuns: t === 'trend' ? 15 : 40, seed: 20261202 });
  });

  test('auto: aligned, finite and identical on a rerun', async () => {
    await fc.assert(fc.asyncProperty(messy(12, 24), async (m) => { noCrash(await runSheet(asCase(m), 'auto')); }), { numRuns: 4, seed: 20261202 });
  });
});

describe('random messy columns through the command line', () => {
  const methods: Target[] = ['spline', 'level', 'counts', 'slope'];
  test.each(methods)('%s: aligned, finite, identical on a rerun', (t) => {
    // a one-column file cannot hold a blank last row (an empty last line ends the file), so that cell holds a number here
    const inFile = (m: Messy): Messy => (m.x ? m : { ...m, y: [...m.y.slice(0, -1), 7] });
    fc.assert(fc.property(messy(6, 40), (m) => { noCrash([runCommand(asCase({ ...inFile(m), row: false }), t)]); }), { numRuns: 40, seed: 20261202 });
  });
});
