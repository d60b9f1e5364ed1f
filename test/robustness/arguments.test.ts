/**
 * The worksheet functions' own arguments when they are blank, of the wrong
 * kind or out of place (OPTIONS, BREAKSCAN's penalty ends, output and detail
 * words, settings that are not text): each is a clear #VALUE! naming the
 * argument, or a correct result. Counted in the robustness line.
 */
import { breakScan } from '../../src/functions/breaks';
import { options } from '../../src/functions/options';
import { evaluateAt, knots, penalty, smooth } from '../../src/functions/smoothing';
import { BASE_X, BASE_Y } from './catalogue';
import { Run } from './fronts';
import { count, newTally, saveTally } from './tally';

const tally = newTally();
afterAll(() => saveTally('arguments', tally));

const y = BASE_Y.map((v) => [v]);
const x = BASE_X.map((v) => [v]);
const CELL_OK = (v: unknown) => (typeof v === 'number' && Number.isFinite(v)) || typeof v === 'string' || typeof v === 'boolean';

async function outcome(call: string, f: () => unknown): Promise<Run> {
  const run: Run = { front: 'sheet', target: 'level', call, kind: 'result', warnings: [], warningText: '', problems: [] };
  try {
    const out = await f();
    if (!Array.isArray(out) || !(out as unknown[][]).every((r) => Array.isArray(r) && r.every(CELL_OK))) run.problems.push(`cells: ${JSON.stringify(out).slice(0, 120)}`);
  } catch (e) {
    run.kind = 'error';
    run.error = (e as Error).message;
    if ((e as { code?: string }).code !== '#VALUE!' || /unexpected failure|undefined|\[object /.test(run.error)) run.problems.push(`unclear error: ${run.error}`);
  }
  if (run.problems.length) run.kind = 'crash';
  count(tally, run);
  return run;
}

const CASES: [string, () => unknown, RegExp | null][] = [
  ['OPTIONS()', () => options(), null],
  ['OPTIONS("trend")', () => options('trend'), null],
  ['OPTIONS as a 1 x 1 range', () => options([['level']] as any), null],
  ['OPTIONS("nope")', () => options('nope'), /unknown method "nope"/],
  ['OPTIONS(5)', () => options(5 as any), /unknown method "5"/],
  ['BREAKSCAN with a blank low end', () => breakScan(y, '', 5, x), /^low \(the smallest penalty of the scan\) is blank; give a number\.$/],
  ['BREAKSCAN with an omitted low end', () => breakScan(y, null, 5, x), /^low \(the smallest penalty of the scan\) is blank/],
  ['BREAKSCAN with a blank cell as high end', () => breakScan(y, 2, [['']], x), /^high \(the largest penalty of the scan\) is blank/],
  ['BREAKSCAN with text as low end', () => breakScan(y, 'abc', 5, x), /penalty-range \(level\) must be two numbers low, high with low < high.*"abc"/],
  ['BREAKSCAN with low above high', () => breakScan(y, 200, 2, x), /penalty-range \(level\) must be two numbers low, high with low < high from 0; got \[200, 2\]/],
  ['BREAKSCAN with ends as 1 x 1 ranges', () => breakScan(y, [[2]], [[200]], x), null],
  ['PENALTY table as the text "TRUE"', () => penalty(y, x, 'spline', undefined, undefined, 'TRUE'), null],
  ['PENALTY table as "maybe"', () => penalty(y, x, 'spline', undefined, undefined, 'maybe'), /table must be TRUE or FALSE; got "maybe"/],
  ['SMOOTH output "se" of trend filtering', () => smooth(y, x, 'trend', 'penalty=1', undefined, 'se'), /output "se" is not available for method "trend": it is not a linear smoother/],
  ['SMOOTH output "wiggle"', () => smooth(y, x, 'spline', undefined, undefined, 'wiggle'), /output must be "fitted", "se", "residual" or "leverage"; got "wiggle"/],
  ['SMOOTH settings TRUE', () => smooth(y, x, 'spline', true), /settings must be text such as "order=2; folds=10"; got true/],
  ['SMOOTH settings with a name and no value', () => smooth(y, x, 'trend', '=2'), /has no name before "="/],
  ['SMOOTH with a changepoint model', () => smooth(y, x, 'level'), /unknown method "level"; use one of: spline, trend/],
  ['SMOOTH method 5', () => smooth(y, x, 5 as any), /unknown method "5"/],
  ['KNOTS detail "some"', () => knots(y, x, 'trend', 'penalty=1', undefined, 'some'), /detail must be "bends" or "all"; got "some"/],
  ['EVALUATE at a scalar', () => evaluateAt(y, 5 as any, x), /at must be a range of cells/],
  ['EVALUATE at text and blank cells', () => evaluateAt(y, [['n/a'], [''], [12.5]], x, 'spline', 'df=4'), null],
];

describe('worksheet arguments', () => {
  test.each(CASES)('%s', async (_name, f, error) => {
    const r = await outcome(_name, f);
    expect(r.problems).toEqual([]);
    if (error) { expect(r.kind).toBe('error'); expect(r.error).toMatch(error); } else expect(r).toMatchObject({ kind: 'result' });
  });

  test('EVALUATE leaves positions that are not numbers empty, beside their rows', async () => {
    const out = await evaluateAt(y, [['n/a'], [''], [12.5]], x, 'spline', 'df=4');
    expect(out[0]).toEqual(['', '']);
    expect(out[1]).toEqual(['', '']);
    expect(typeof out[2][0]).toBe('number');
    expect(out[2][1]).toBe(false);
  });
});
