import { analysisDefinitions, dashedName } from '../../src/engine';
import { runCli, CliIO } from '../../src/cli/main';
import { weeklyOrdersCsv } from '../../src/demo/weeklyOrders';
import { fitCells, prepareSeries } from '../../src/engine';
import { parseCsv } from '../../src/cli/csv';

function io(files: Record<string, string>) {
  const out: string[] = [], err: string[] = [];
  const host: CliIO = {
    readFile: (p) => { if (!(p in files)) throw new Error('no such file'); return files[p]; },
    out: (t) => out.push(t), err: (t) => err.push(t),
  };
  return { host, out, err };
}

const demo = weeklyOrdersCsv();

describe('knotwise fit', () => {
  test('--json prints the contract fields with one fitted entry per input row, null where dropped', () => {
    const { host, out } = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'spline', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    for (const k of ['method', 'n', 'penalty', 'df', 'sigma', 'criterion', 'fitted', 'knots', 'warnings']) expect(o).toHaveProperty(k);
    expect(o.method).toBe('spline');
    expect(o.fitted).toHaveLength(156);
    expect(o.fitted[33]).toBeNull();
    expect(o.fitted[120]).toBeNull();
    expect(o.knots).toEqual([]);
    expect(o.criterion.name).toBe('gcv');
    // same numbers as the engine called directly on the same columns
    const t = parseCsv(demo);
    const { result } = fitCells(t.rows.map((r) => r[1]), t.rows.map((r) => r[0]), null, {});
    expect(o.df).toBeCloseTo(result.df, 10);
  });

  test('without --method the automatic choice runs: the kept method, every candidate and the reason', () => {
    const { host, out } = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    expect(o.method).toBe('auto');
    const chosen = o.candidates.filter((c: any) => c.chosen);
    expect(chosen).toHaveLength(1);
    // the fit is the kept candidate's: its method, options and df
    expect(o.fittedWith.method).toBe(chosen[0].method);
    for (const [k, v] of Object.entries(chosen[0].options)) expect(o.fittedWith.options[k]).toBe(v);
    expect(o.df).toBeCloseTo(chosen[0].df, 10);
    expect(o.reason.length).toBeGreaterThan(20);
    expect(o.fitted).toHaveLength(156);
    expect(o.fitted[33]).toBeNull();
    // the text output names what was kept
    const t = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders'], t.host)).toBe(0);
    expect(t.out.join('')).toContain(`orders: automatic choice, kept ${chosen[0].label}, 153 points`);
  });

  test('columns can be given by 1-based number, and several --y give an array; a df without --method goes to the spline, with a note', () => {
    const { host, out } = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', '1', '--y', '2,4', '--df', '6', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    expect(Array.isArray(o)).toBe(true);
    expect(o.map((r: any) => r.column)).toEqual(['orders', 'unit_cost']);
    expect(o[0].df).toBeCloseTo(6, 5);
    expect(o[0].method).toBe('spline');
    expect(o[0].warnings[0].message).toMatch(/^No method was named and these settings are not the automatic choice's, so they were applied to the smoothing spline/);
  });

  test('--timing prints one stderr line of phase times and peak memory, and leaves the JSON unchanged', () => {
    // a named method: the automatic choice's JSON carries each candidate's time, which differs between runs
    const plain = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'spline', '--json'], plain.host)).toBe(0);
    const { host, out, err } = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'spline', '--json', '--timing'], host)).toBe(0);
    expect(out.join('')).toBe(plain.out.join(''));
    expect(err).toHaveLength(1);
    expect(err[0]).toMatch(/^knotwise timing: read \d+ ms, engine \d+ ms, write \d+ ms, peak memory \d+ MB \(done\)$/);
    // a refusal still reports the time up to it, after the one-line message
    const r = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'whittaker', '--order', '9', '--timing'], r.host)).toBe(1);
    expect(r.err).toHaveLength(2);
    expect(r.err[1]).toMatch(/^knotwise timing: read \d+ ms, engine \d+ ms, write - ms, peak memory \d+ MB \(refused\)$/);
  });

  test('--eval adds values at new x flagged when extrapolated', () => {
    const { host, out } = io({ 'd.csv': demo, 'new.csv': 'x\n45000\n46200\n' });
    expect(runCli(['fit', 'd.csv', '--x', 'week_start', '--y', 'orders', '--eval', 'new.csv', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    expect(o.eval.map((e: any) => e.extrapolated)).toEqual([false, true]);
  });

  test('bad input exits non-zero with one line naming the problem', () => {
    const { host, err } = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--y', 'nope'], host)).toBe(2);
    expect(err).toHaveLength(1);
    expect(err[0]).toMatch(/no column "nope"/);
    const b = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--y', 'orders', '--df', 'lots'], b.host)).toBe(1);
    expect(b.err[0]).toMatch(/df \(spline\) must be a number greater than 0; got "lots"/);
    const d = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--y', 'orders', '--order', '2'], d.host)).toBe(1);
    expect(d.err[0]).toMatch(/unknown option "order" for auto; auto accepts: rule, folds, noise, season\. No method was named, so the automatic choice ran; name a method to use these settings\.$/);
    const c = io({});
    expect(runCli(['fit', 'missing.csv'], c.host)).toBe(2);
    expect(runCli(['fit', 'd.csv', '--bogus'], io({ 'd.csv': demo }).host)).toBe(2);
  });

  test('help lists every declared option of every method, and old flags still work', () => {
    const { host, out } = io({});
    expect(runCli(['help'], host)).toBe(0);
    const text = out.join('\n');
    for (const def of analysisDefinitions()) {
      for (const o of def.options) expect(text).toContain(`--${dashedName(o.name)}`);
      expect(text).toContain(def.name);
    }
    for (const flag of ['--x', '--y', '--method', '--eval', '--model']) expect(text).toContain(flag);
    // a flag the methods declare differently gives each meaning with its methods, not one method's values and default
    const rule = text.split('\n').find((l) => /^ +--rule /.test(l))!;
    expect(rule).toContain('how the winner is picked [auto]');
    expect(rule).toContain('how to choose the span when none is given [loess]');
    expect(rule).not.toMatch(/default gcv/);
    expect(text.split('\n').find((l) => /^ +--folds /.test(l))).toMatch(/values and defaults: knotwise help NAME$/);
    const t = io({});
    expect(runCli(['help', 'trend'], t.host)).toBe(0);
    expect(t.out.join('\n')).toMatch(/--order N +shape of the pieces/);
    const old = io({ 'd.csv': demo });
    expect(runCli(['fit', 'd.csv', '--y', 'orders', '--method', 'trend', '--select', 'cv', '--one-se', '--relaxed', '--json'], old.host)).toBe(0);
    const o = JSON.parse(old.out.join(''));
    expect(o.options.rule).toBe('cv-simpler');
    expect(o.options.refit).toBe(1);
  });
});

describe('knotwise breaks', () => {
  test('--json prints model, penalty, breaks with rows, segments and an aligned fitted column', () => {
    const { host, out } = io({ 'd.csv': demo });
    expect(runCli(['breaks', 'd.csv', '--x', 'week_start', '--y', 'returns', '--model', 'poisson', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    for (const k of ['model', 'penalty', 'breaks', 'segments', 'fitted', 'warnings']) expect(o).toHaveProperty(k);
    expect(o.model).toBe('counts');
    expect(o.warnings.map((w: any) => w.message).join(' ')).toMatch(/"poisson" is now called "counts"/);
    expect(o.fitted).toHaveLength(156);
    // the caveat that a break is not proof of its cause is reported apart from the warnings about these data
    expect(o.caveats.map((w: any) => w.code)).toContain('break-cause');
    expect(o.warnings.map((w: any) => w.code)).not.toContain('break-cause');
    for (const b of o.breaks) expect(b.row).toBeGreaterThanOrEqual(1);
    // the demo's return rate rises at week 90 (row 90): the first break is near it
    expect(o.breaks.length).toBeGreaterThanOrEqual(1);
    expect(Math.abs(o.breaks[0].row - 90)).toBeLessThanOrEqual(8);
  });

  test('crops:LOW,HIGH returns the penalty path', () => {
    const { host, out } = io({ 'd.csv': demo });
    expect(runCli(['breaks', 'd.csv', '--y', 'orders', '--penalty', 'crops:2,200', '--json'], host)).toBe(0);
    const o = JSON.parse(out.join(''));
    expect(o.crops.length).toBeGreaterThan(1);
    const changes = o.crops.map((c: any) => c.changes);
    for (let i = 1; i < changes.length; i++) expect(changes[i]).toBeLessThanOrEqual(changes[i - 1]);
  });

  test('a Poisson model on fractional values runs with a warning naming the rows', () => {
    const { host, out, err } = io({ 'd.csv': demo });
    expect(runCli(['breaks', 'd.csv', '--y', 'unit_cost', '--model', 'poisson'], host)).toBe(0);
    expect([...out, ...err].join('\n')).toMatch(/not whole \(rows? \d+/);
  });
});

describe('the demo data', () => {
  test('is the same on every call and has the documented gaps', () => {
    expect(weeklyOrdersCsv()).toBe(demo);
    const t = parseCsv(demo);
    const s = prepareSeries(t.rows.map((r) => r[1]), t.rows.map((r) => r[0]));
    expect(s.dropped.map((d) => [d.row, d.reason])).toEqual([[33, 'blank'], [34, 'blank'], [120, 'text']]);
  });
});
