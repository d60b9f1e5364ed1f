/**
 * The pane's view and its plan for the sheet, on the demo data through the
 * engine: cell addresses from the selection's place on the sheet, dates and
 * rounding in what is written, and a chart that points at the written cells.
 */
import { weeklyOrders } from '../../src/demo/weeklyOrders';
import { analyse, choiceOf } from '../../src/taskpane/analysis';
import { roundForData } from '../../src/present';
import { sharePlan } from '../../src/taskpane/share';
import { viewOf } from '../../src/taskpane/view';
import type { CellBlock } from '../../src/taskpane/workbook';
import { serialToIso } from '../../src/present';

const FACTS = { version: '9.9.9', date: '2026-12-02' };
const demo = weeklyOrders();

function block(address: string, header: boolean, cols: 'xy' | 'y' = 'xy'): CellBlock {
  const rows = demo.map((r) => (cols === 'xy' ? [r.weekStart, r.orders ?? ''] : [r.orders ?? '']));
  return { address, values: header ? [cols === 'xy' ? ['week_start', 'orders'] : ['orders'], ...rows] : rows, firstColumnDates: cols === 'xy' };
}

describe('the demo in Sheet1!A1:B157 (header in row 1)', () => {
  const b = block('Sheet1!A1:B157', true);
  const v = viewOf(analyse(b, choiceOf('trend1'), { rule: 'auto' }), b, FACTS);
  const plan = sharePlan(v);

  test('warnings name the blank cells B35, B36 and the text in B122, as the README says', () => {
    const dropped = v.warnings.find((w) => w.code === 'dropped-cells')!.message;
    expect(dropped).toContain('2 blank (cells B35, B36); 1 text (cell B122)');
  });

  test('the fitted column goes to C1:C157, rounded to one decimal more than whole orders, empty where dropped', () => {
    expect([plan.fitted.col, plan.fitted.row, plan.fitted.values.length]).toEqual([2, 1, 157]);
    expect(plan.fitted.values[0]).toEqual(['orders (trend 1)']);
    const body = plan.fitted.values.slice(1).map((r) => r[0]);
    for (const sheetRow of [35, 36, 122]) expect(body[sheetRow - 2]).toBe('');
    const nums = body.filter((x): x is number => typeof x === 'number');
    expect(nums).toHaveLength(153);
    for (const x of nums) expect(Math.round(x * 10) / 10).toBe(x);
    expect(plan.fitted.formats![1]).toEqual(['0.0']);
  });

  test('the report starts in E1 with the settings note, and the knots table holds dates formatted as dates', () => {
    const [note, summary, warnings, caveats, knots] = plan.report;
    expect([note.col, note.row]).toEqual([4, 1]);
    expect(note.values[0][0]).toMatch(/^Knotwise 9\.9\.9, 2026-12-02: trend filtering of order 1 of Sheet1!A1:B157; penalty by 5-fold cross-validation: penalty [\d.]+, about \d+ degrees of freedom; \d+ bends \(\d+ knots\); /);
    expect(summary.values[0]).toEqual(['Summary', '']);
    expect(warnings.values.some((r) => r[0] === 'dropped-cells' && String(r[1]).includes('cells B35, B36'))).toBe(true);
    // the standing caveat (ends get revised, not a forecast) in its own block, not among the warnings
    expect(warnings.values.some((r) => r[0] === 'boundary')).toBe(false);
    expect(caveats.values[0]).toEqual(['Read with care', '']);
    expect(caveats.values.some((r) => r[0] === 'boundary' && /not a forecast/.test(String(r[1])))).toBe(true);
    expect(knots.values[1]).toEqual(['date', 'cell', 'slope change per day', 'fitted']);
    const rows = knots.values.slice(2);
    expect(rows.length).toBe(v.markers.length);
    rows.forEach((r, i) => {
      expect(r[0]).toBe(v.markers[i].x);
      expect(knots.formats![i + 2][0]).toBe('yyyy-mm-dd');
      expect(serialToIso(r[0] as number)).toMatch(/^202[3-5]-\d{2}-\d{2}$/);
      expect(r[1]).toMatch(/^B\d+$/);
    });
    // blocks do not overlap: each starts below the previous one with a blank row between
    for (let i = 1; i < plan.report.length; i++) expect(plan.report[i].row).toBe(plan.report[i - 1].row + plan.report[i - 1].values.length + 1);
  });

  test('the chart reads the data, the written fit and the knots table from the sheet', () => {
    const c = plan.chart;
    const knots = plan.report[4];
    expect([c.x, c.data, c.fit]).toEqual(['A2:A157', 'B2:B157', 'C2:C157']);
    expect(c.markersX).toBe(`E${knots.row + 2}:E${knots.row + 1 + v.markers.length}`);
    expect(c.markersY).toBe(`H${knots.row + 2}:H${knots.row + 1 + v.markers.length}`);
    const last = plan.report[plan.report.length - 1];
    expect(c.row).toBe(last.row + last.values.length + 1);
  });
});

describe('other places on the sheet', () => {
  test('a selection D10:E166 with its header in row 10 names E44, E45 and E131 (data from row 11), and writes to F and H', () => {
    const b = block("'Depot data'!D10:E166", true);
    const v = viewOf(analyse(b, choiceOf('spline'), { rule: 'auto' }), b, FACTS);
    expect(v.warnings.find((w) => w.code === 'dropped-cells')!.message).toContain('(cells E44, E45); 1 text (cell E131)');
    const plan = sharePlan(v);
    expect([plan.fitted.col, plan.report[0].col, plan.chart.x, plan.chart.fit]).toEqual([5, 7, 'D11:D166', 'F11:F166']);
    expect(v.sheet).toBe('Depot data');
  });

  test('without a header the data start on the selection\'s first row', () => {
    const b = block('Sheet1!A2:B157', false);
    const v = viewOf(analyse(b, choiceOf('breaks-level'), { rule: 'auto' }), b, FACTS);
    expect(v.warnings.find((w) => w.code === 'dropped-cells')!.message).toContain('(cells B35, B36)');
    const plan = sharePlan(v);
    expect(plan.fitted.values).toHaveLength(156);
    expect(plan.report.map((r) => r.what)).toEqual(['settings note', 'summary', 'warnings', 'read with care', 'breaks table', 'segments table']);
  });

  test('one column (y only): no x range in the chart, row numbers as x and no dates', () => {
    const b = block('Sheet1!B1:B157', true, 'y');
    const v = viewOf(analyse(b, choiceOf('spline'), { rule: 'auto' }), b, FACTS);
    expect(v.xDates).toBe(false);
    const plan = sharePlan(v);
    expect(plan.chart.x).toBeUndefined();
    expect(plan.chart.data).toBe('B2:B157');
    expect(plan.fitted.col).toBe(2);
  });
});

describe('the level-and-volatility model', () => {
  test('its breaks table shows the standard deviation before and after, matching the engine\'s segments', () => {
    const b = block('Sheet1!A1:B157', true);
    const a = analyse(b, choiceOf('breaks-volatility'), { rule: 'auto' });
    const v = viewOf(a, b, FACTS);
    const t = v.tables.find((x) => x.id === 'table')!.table;
    expect(t.header.slice(0, 4)).toEqual(['date', 'cell', 'sd before', 'sd after']);
    if (a.kind !== 'breaks') throw new Error('expected breaks');
    // the table shows the engine's sd at the data's rounding (one decimal more than the data): exactly that
    const r = roundForData(a.series.y);
    a.result.breaks.forEach((brk, i) => {
      expect(t.rows[i][2].value).toBe(r.round(brk.before.sd));
      expect(t.rows[i][3].value).toBe(r.round(brk.after.sd));
    });
    const seg = v.tables.find((x) => x.id === 'segments')!.table;
    expect(seg.rows).toHaveLength(a.result.segments.length);
    expect(seg.header).toEqual(['from', 'to', 'cells', 'points', 'sd', 'level']);
  });
});
