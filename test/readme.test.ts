/**
 * Every formula in the README's tour runs on the demo data it describes:
 * the documentation cannot drift from the functions' signatures.
 */
import * as fs from 'fs';
import * as path from 'path';
import { worksheetFunctions } from '../src/functions/register';
import { weeklyOrders } from '../src/demo/weeklyOrders';

const readme = fs.readFileSync(path.join(__dirname, '..', 'README.md'), 'utf8');
const formulas = [...readme.matchAll(/`=KNOTWISE\.([A-Z]+)\(([^`]*)\)`/g)].map((m) => ({ name: m[1], args: m[2] }));
const demo = weeklyOrders();
const columns: Record<string, unknown[]> = {
  A: demo.map((r) => r.weekStart), B: demo.map((r) => r.orders ?? ''), C: demo.map((r) => r.returns), D: demo.map((r) => r.unitCost),
  F: [45000, 45500, 46000, 46200],
};

function argValue(a: string): unknown {
  const t = a.trim();
  if (t === '') return null;
  const range = /^([A-Z])(\d+):([A-Z])(\d+)$/.exec(t);
  if (range) {
    const [, c, r0, , r1] = range;
    return columns[c].slice(Number(r0) - 2, Number(r1) - 1).map((v) => [v]);
  }
  if (t === 'TRUE' || t === 'FALSE') return t === 'TRUE';
  if (/^".*"$/.test(t)) return t.slice(1, -1);
  return Number(t);
}

describe('README formulas', () => {
  test('the tour lists formulas', () => expect(formulas.length).toBeGreaterThanOrEqual(8));
  for (const f of formulas) {
    test(`=KNOTWISE.${f.name}(${f.args}) runs on the demo data`, async () => {
      const fn = worksheetFunctions[f.name];
      expect(fn).toBeDefined();
      const out = await fn(...f.args.split(',').map(argValue));
      expect(Array.isArray(out)).toBe(true);
      expect(out.length).toBeGreaterThan(0);
    });
  }
});

describe('README option tables', () => {
  test('the README holds the option tables generated from the declarations (npm run readme:options)', () => {
    const { optionsMarkdown, OPTIONS_BEGIN, OPTIONS_END } = require('../src/cli/optionsMarkdown');
    const a = readme.indexOf(OPTIONS_BEGIN), b = readme.indexOf(OPTIONS_END);
    expect(a).toBeGreaterThan(0);
    expect(readme.slice(a + OPTIONS_BEGIN.length, b).trim()).toBe(optionsMarkdown());
  });
});
