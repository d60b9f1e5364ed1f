/**
 * The pane's decomposition view and its comparison of two fits, on the seeded demo
 * (an invented depot's weekly orders, 156 weeks with a yearly swing) through the engine
 * on this thread: panels stacked from the components, the components table the sheet
 * receives (header included) adding back to the data, and a second fit run as asked.
 */
import { weeklyOrders } from '../../src/demo/weeklyOrders';
import { analyse, choiceOf } from '../../src/taskpane/analysis';
import { analysisDefinitions } from '../../src/engine';
import { ruleChoices } from '../../src/taskpane/methodChoices';
import { sharePlan } from '../../src/taskpane/share';
import { columnLetters } from '../../src/present';
import { viewOf } from '../../src/taskpane/view';
import type { CellBlock } from '../../src/taskpane/workbook';

const FACTS = { version: '9.9.9', date: '2026-12-02' };
const demo = weeklyOrders();
const rows = demo.map((r) => [r.weekStart, r.orders ?? '']);
const withHeader: CellBlock = { address: 'Sheet1!A1:B157', values: [['week_start', 'orders'], ...rows], firstColumnDates: true };
const noHeader: CellBlock = { address: 'Sheet1!A2:B157', values: rows, firstColumnDates: true };

describe('the decomposition in the pane', () => {
  const a = analyse(withHeader, choiceOf('decompose-adaptive'), { rule: 'auto' });
  const v = viewOf(a, withHeader, FACTS);
  const d = a.kind === 'decompose' ? a.result.decomposition! : null;

  test('panels: data with trend on top, one per kept season, spikes when there are some, remainder last; labels in words', () => {
    const seasons = (d!.seasons as { kept: boolean }[]).filter((q) => q.kept).length;
    const spikes = (d!.spikeIndex as number[]).length;
    expect(v.panels!.map((p) => p.id)).toEqual(['data', ...(d!.seasons as { kept: boolean; label: string }[]).filter((q) => q.kept).map((q) => `season-${q.label}`), ...(spikes ? ['spikes'] : []), 'remainder']);
    expect(v.panels!.length).toBe(2 + seasons + (spikes ? 1 : 0));
    expect(v.panels![0].label).toBe('orders with its trend');
    for (const p of v.panels!) expect(p.label).not.toMatch(/^[a-z]+-[a-z]+$/); // words, not ids
    // spikes are marked where the engine found them, on the data and on their own panel
    expect(v.panels![0].marked).toEqual(d!.spikeIndex);
  });

  test('the sheet gets the components table with its header beside the data, and the report after it', () => {
    const plan = sharePlan(v);
    expect(plan.fitted.what).toBe('components table');
    expect([plan.fitted.col, plan.fitted.row, plan.fitted.values.length]).toEqual([2, 1, 157]);
    expect(plan.fitted.values[0]).toEqual(['trend', 'season', 'spikes', 'remainder', 'adjusted']);
    expect(plan.report[0].col).toBe(2 + 5 + 1);
    expect(plan.chart.fit).toBe('C2:C157');

    // each written row adds back to the data (each part rounded to 0.1: at most 4 x 0.05 off), and adjusted = y - season
    let checked = 0;
    plan.fitted.values.slice(1).forEach((r, i) => {
      const y = demo[i].orders;
      if (typeof y !== 'number' || typeof r[0] !== 'number') { expect(r.every((c) => c === '')).toBe(true); return; }
      const [t, s, o, e, adj] = r as number[];
      expect(Math.abs(t + s + o + e - y)).toBeLessThanOrEqual(0.2 + 1e-9);
      expect(Math.abs(adj - (y - s))).toBeLessThanOrEqual(0.1 + 1e-9);
      checked++;
    });
    expect(checked).toBe(153);
    expect(plan.report[0].values[0][0]).toMatch(/not a forecast/);
  });

  test('the demo has no planted spike, and none is reported (noise is not a spike)', () => {
    const c = choiceOf('decompose-adaptive');
    const on = analyse(withHeader, { ...c, options: { ...c.options, season: 'on' } }, { rule: 'auto' });
    expect(on.kind === 'decompose' ? (on.result.decomposition!.spikeIndex as number[]).length : -1).toBe(0);
    expect(viewOf(on, withHeader, FACTS).panels!.map((q) => q.id)).toEqual(['data', 'season-yearly', 'remainder']);
  });

  test('with the season on and two planted spikes (10 noise sd), they alone are found; the sheet chart marks them on the data points', () => {
    // the demo's orders with 140 more in week 41 and 140 fewer in week 101 (the demo's noise sd is 14)
    const bump = [40, 100];
    const planted = demo.map((r, i) => ({ ...r, orders: typeof r.orders === 'number' && bump.includes(i) ? r.orders + (i === bump[0] ? 140 : -140) : r.orders }));
    const block: CellBlock = { ...withHeader, values: [['week_start', 'orders'], ...planted.map((r) => [r.weekStart, r.orders ?? ''])] };
    const c = choiceOf('decompose-adaptive');
    const on = analyse(block, { ...c, options: { ...c.options, season: 'on' } }, { rule: 'auto' });
    const vOn = viewOf(on, block, FACTS);
    expect(vOn.panels!.map((q) => q.id)).toEqual(['data', 'season-yearly', 'spikes', 'remainder']);
    const plan = sharePlan(vOn);
    const spikes = plan.report.find((b) => b.what === 'spikes table')!;
    expect(spikes.values[1]).toEqual(['date', 'cell', 'spike', 'trend', 'orders']);
    expect(spikes.values.slice(2).map((r) => r[0])).toEqual([demo[40].weekStart, demo[100].weekStart]);
    expect(plan.chart.names.markers).toBe('spikes');
    // each spike row: its date, the cell of that week's orders, and the orders themselves in the last column
    for (const r of spikes.values.slice(2)) {
      const k = planted.findIndex((d) => d.weekStart === r[0]);
      expect(r[1]).toBe(`B${k + 2}`);
      expect(r[4]).toBe(planted[k].orders);
    }
    const last = columnLetters(spikes.col + 4);
    expect(plan.chart.markersY).toBe(`${last}${spikes.row + 2}:${last}${spikes.row + spikes.values.length - 1}`);
  });

  test('without a header row, the header goes on the row above the data', () => {
    const plan = sharePlan(viewOf(analyse(noHeader, choiceOf('decompose-adaptive'), { rule: 'auto' }), noHeader, FACTS));
    expect([plan.fitted.row, plan.fitted.values.length]).toEqual([1, 157]);
    expect(plan.fitted.values[0][0]).toBe('trend');
  });

  test('STL is offered without the trend rules it does not take; the adaptive decomposition with its declared rules', () => {
    expect(ruleChoices('decompose', { method: 'stl' }).map((r) => r.value)).toEqual(['auto']);
    expect(ruleChoices('decompose', { method: 'adaptive' }).map((r) => r.value)).toEqual(['auto', 'cv', 'cv-simpler', 'sure', 'bic', 'value']);
  });
});

describe('two fits on one chart', () => {
  test('a method picked by the analyst is fitted with its own rule and drawn over the first', () => {
    const a = analyse(withHeader, choiceOf('trend1'), { rule: 'auto' }, { kind: 'method', choice: choiceOf('spline'), pen: { rule: 'gcv' } });
    const v = viewOf(a, withHeader, FACTS);
    expect(a.kind === 'smooth' && a.second?.result.criterion.name).toBe('gcv');
    expect(v.second!.fitted.length).toBe(v.fitted.length);
    expect(v.second!.label).toBe(choiceOf('spline').label);
    const side = v.tables.find((t) => t.id === 'side')!.table;
    expect(side.rows.map((r) => r[0].text)).toEqual(expect.arrayContaining(['degrees of freedom', 'criterion']));
    expect(side.rows.find((r) => r[0].text === 'criterion')![2].text).toMatch(/^GCV /);
    // the write to the sheet keeps the first fit only
    expect(sharePlan(v).fitted.values[0]).toEqual(['orders (trend 1)']);
  });

  test('the runner-up of the automatic choice is drawn as it was compared, without a second fit (same folds: same df and CV error)', () => {
    const defs = analysisDefinitions('smoother').filter((d) => d.name !== 'auto');
    const spies = defs.map((d) => jest.spyOn(d, 'run'));
    let a: ReturnType<typeof analyse>;
    let calls: number[];
    try {
      a = analyse(withHeader, choiceOf('auto'), { rule: 'auto' }, { kind: 'runner-up' });
    } finally {
      calls = spies.map((sp) => sp.mock.calls.length); // restoring clears them
      spies.forEach((sp) => sp.mockRestore());
    }
    if (a.kind !== 'smooth') throw new Error('expected a smoother');
    const c = a.comparison!;
    const k = c.runnerUp!.row;
    // no second fit: the runner-up's method ran once per variant compared, inside the automatic choice only
    const i = defs.findIndex((d) => d.name === c.rows[k].method);
    expect(calls[i]).toBe(c.rows.filter((r) => r.method === defs[i].name).length);
    expect(k).not.toBe(c.chosen);
    for (const [i, r] of c.rows.entries()) if (i !== c.chosen && !r.skipped) expect(r.cv).toBeGreaterThanOrEqual(c.rows[k].cv);
    const s = a.second!;
    expect(s.how).toBe('runner-up');
    expect(s.row).toBe(c.rows[k]);
    expect(s.result.criterion.name).toBe('cv');
    expect(s.result.method).toBe(c.rows[k].method);
    expect(s.result.df).toBe(c.rows[k].df);
    expect(s.result.criterion.value).toBe(c.rows[k].cv);
    // with its knot bends, as the winner's, so the side-by-side table counts knots alike for both
    expect(['trend', 'mixed']).toContain(s.result.method);
    expect(s.result.bends).toBeDefined();
    expect(a.result.bends).toBeDefined();
    const v = viewOf(a, withHeader, FACTS);
    expect(v.second!.label).toMatch(/runner-up/);
    expect(v.tables.find((t) => t.id === 'side')!.note).toMatch(/same held-out points/);
  });

  test('a comparison the engine refuses leaves the first fit standing, with the engine\'s message as a warning', () => {
    // 6,000 points: cross-validated trend filtering of order 3 is refused beyond 5,000 (the engine's limit)
    const long: CellBlock = { address: 'Sheet1!A1:B6001', values: [['t', 'v'], ...Array.from({ length: 6000 }, (_, i) => [i + 1, Math.sin(i / 300) * 50 + ((i * 7919) % 13) - 6])] };
    const a = analyse(long, choiceOf('spline'), { rule: 'auto' }, { kind: 'method', choice: choiceOf('trend3'), pen: { rule: 'cv' } });
    if (a.kind !== 'smooth') throw new Error('expected a smoother');
    expect(a.second).toBeUndefined();
    expect(a.secondError).toMatch(/5,000 points/);
    const v = viewOf(a, long, FACTS);
    expect(v.second).toBeUndefined();
    expect(v.fitted.length).toBe(6000);
    expect(v.warnings.find((w) => w.code === 'comparison-failed')!.message).toMatch(/^The comparison fit was not drawn: .*5,000 points/);
  });
});

describe('the criterion chart of a fit whose search has unconverged points', () => {
  test('points whose fits did not converge are left out of the chart and counted', () => {
    // the mixed trend on the demo, with two points of its curve marked not converged (every point of it converges
    // now; the view must not depend on which method's solver stops short)
    const a = analyse(withHeader, choiceOf('mixed'), { rule: 'cv' });
    if (a.kind !== 'smooth') throw new Error('expected a smooth analysis');
    const full = a.result.criterion.curve!;
    expect(full.every((p) => p.converged !== false)).toBe(true);
    const marked = full.map((p, i) => (i === full.length - 2 || i === full.length - 3 ? { ...p, converged: false } : p));
    const b = { ...a, result: { ...a.result, criterion: { ...a.result.criterion, curve: marked } } };
    const v = viewOf(b, withHeader, FACTS);
    expect(v.curve!.leftOut).toBe(2);
    expect(v.curve!.df).toEqual(marked.filter((p) => p.converged !== false).map((p) => p.df));
    expect(viewOf(a, withHeader, FACTS).curve!.leftOut).toBe(0);
  });
});
