import '../../../src/engine';
import { runCli, CliIO } from '../../../src/cli/main';
import { weeklyOrdersCsv } from '../../../src/demo/weeklyOrders';
import { decompose } from '../../../src/engine/decompose/decompose';
import { prepareSeries } from '../../../src/engine/series';
import { parseCsv } from '../../../src/cli/csv';

function io(files: Record<string, string>) {
  const out: string[] = [], err: string[] = [];
  const host: CliIO = {
    readFile: (p) => { if (!(p in files)) throw new Error('no such file'); return files[p]; },
    out: (t) => out.push(t), err: (t) => err.push(t),
  };
  return { host, out, err };
}

describe('knotwise decompose (the demo weekly orders)', () => {
  test('--noise is refused with --method stl, the message naming the chain of conditions and what to change; accepted with the adaptive method', () => {
    const csv = weeklyOrdersCsv();
    const refused = io({ 'd.csv': csv });
    expect(runCli(['decompose', 'd.csv', '--x', 'week_start', '--y', 'orders', '--method', 'stl', '--noise', 'independent'], refused.host)).toBe(1);
    expect(refused.err.join('')).toContain('noise applies only when rule is "cv" or "cv-simpler", and rule only when method is "adaptive"; method is "stl". Remove noise or change method.');
    const ok = io({ 'd.csv': csv });
    expect(runCli(['decompose', 'd.csv', '--x', 'week_start', '--y', 'orders', '--noise', 'independent', '--json'], ok.host)).toBe(0);
    expect(JSON.parse(ok.out.join(''))).toHaveProperty('trend');
  });

  test('--json prints period, trend, season, spikes, remainder aligned with input rows (null where dropped), knots and warnings', () => {
    const csv = weeklyOrdersCsv();
    const { host, out, err } = io({ 'd.csv': csv });
    const code = runCli(['decompose', 'd.csv', '--x', 'week_start', '--y', 'orders', '--json'], host);
    expect(err.join('')).toBe('');
    expect(code).toBe(0);
    const o = JSON.parse(out.join(''));
    for (const k of ['period', 'trend', 'season', 'spikes', 'remainder', 'knots', 'warnings', 'seasons']) expect(o).toHaveProperty(k);
    const t = parseCsv(csv);
    expect(o.trend).toHaveLength(t.rows.length);
    // the same numbers as the engine on the same columns
    const xi = t.header.indexOf('week_start'), yi = t.header.indexOf('orders');
    const s = prepareSeries(t.rows.map((r) => r[yi]), t.rows.map((r) => r[xi]));
    const r = decompose(s);
    for (let row = 0; row < t.rows.length; row++) {
      const k = s.rowOf[row];
      if (k < 0) expect(o.trend[row]).toBeNull();
      else expect(o.trend[row]).toBeCloseTo(r.trend[k], 10);
    }
  });
  test('help lists the command and its options', () => {
    const { host, out } = io({});
    expect(runCli(['help'], host)).toBe(0);
    expect(out.join('\n')).toMatch(/knotwise decompose <file\.csv\|file\.xlsx>/);
    expect(out.join('\n')).toMatch(/--spike-penalty VALUE/);
  });
});
