/**
 * The Excel path of writing and charting, against office-addin-mock's Excel
 * objects: what is set on which range, in which order, and what the
 * analyst is told when a write fails part way.
 */
import { OfficeMockObject } from 'office-addin-mock';

// office-addin-mock reads only the OfficeApp enumeration from office-addin-manifest, whose own dependencies
// include an ES module that jest on Node 20 cannot require; the enumeration is given here with its values.
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', Project: 'project', PowerPoint: 'powerpoint', Word: 'word' },
}));
import { ChartSpec, ExcelWorkbook, PageWorkbook, WriteBlock, WriteError } from '../../src/taskpane/workbook';

interface Series { name?: string; values?: string; x?: string; chartType?: string; markerStyle?: string; markerSize?: number }

function excelMock(opts: { failOnSync?: number; used?: string[]; selected?: { address: string; values: unknown[][]; numberFormat: string[][]; valueTypes?: string[][] } } = {}) {
  const ranges: any[] = [];
  const charts: any[] = [];
  const sheets: string[] = [];
  let syncs = 0;
  // Where each range object points (the mock, like Excel, refuses to read an address that was not loaded).
  const where = new Map<object, string>();
  const rangeOf = (address: string) => {
    const r: any = new OfficeMockObject({ address });
    r.getUsedRangeOrNullObject = (valuesOnly: boolean) => {
      const u: any = new OfficeMockObject({ address });
      u.isNullObject = !(opts.used ?? []).includes(address);
      u.valuesOnly = valuesOnly;
      return u;
    };
    ranges.push(r);
    where.set(r, address);
    return r;
  };
  const series = (s: Series) => ({
    ...s,
    setValues(r: any) { this.values = where.get(r); },
    setXAxisValues(r: any) { this.x = where.get(r); },
  }) as Series & { setValues(r: any): void; setXAxisValues(r: any): void };
  const sheet = {
    getRange: rangeOf,
    charts: {
      add(type: string, source: any, by: string) {
        const items = [series({ values: where.get(source) })];
        const chart: any = {
          type, source: where.get(source), by, title: {}, legend: {},
          series: { items, getItemAt: (i: number) => items[i], add: (name: string) => { const s = series({ name }); items.push(s); return s; } },
          setPosition(a: string, b: string) { chart.position = [a, b]; },
        };
        charts.push(chart);
        return chart;
      },
    },
  };
  const sel = opts.selected ?? { address: 'Sheet1!A1', values: [['']], numberFormat: [['General']] };
  // Office.js value types: Double for numbers, String for text, Empty for blanks, unless the test gives them
  const valueTypes = sel.valueTypes ?? sel.values.map((row) => row.map((v) => (typeof v === 'number' ? 'Double' : v === '' ? 'Empty' : 'String')));
  const selected: any = new OfficeMockObject({ ...sel, valueTypes });
  const mock: any = new OfficeMockObject({
    context: {
      workbook: {
        getSelectedRange: () => selected,
        worksheets: { getItem: (name: string) => { sheets.push(name); return sheet; }, getActiveWorksheet: () => { sheets.push('(active)'); return sheet; } },
      },
      sync: async () => {
        syncs++;
        if (syncs === opts.failOnSync) throw new Error('This operation is not allowed because the sheet is protected.');
        await selected.sync(); // loaded properties of the selection become readable, as after Excel's sync
      },
    },
    run: async function (this: any, cb: (ctx: any) => Promise<unknown>) { return cb(this.context); },
  });
  // Enumerations as Office.js defines them (string values).
  mock.ChartType = { xyscatter: 'XYScatter', xyscatterLinesNoMarkers: 'XYScatterLinesNoMarkers' };
  mock.ChartSeriesBy = { columns: 'Columns' };
  mock.ChartLegendPosition = { bottom: 'Bottom' };
  mock.ChartMarkerStyle = { diamond: 'Diamond' };
  return { mock, ranges, charts, sheets, syncs: () => syncs, where };
}

const blocks: WriteBlock[] = [
  { what: 'fitted column', col: 2, row: 1, values: [['orders (spline)'], [430.1], ['']], formats: [['@'], ['0.0'], ['0.0']] },
  { what: 'settings note', col: 4, row: 1, values: [['Knotwise 0.1.0, ...']], formats: [['@']] },
  { what: 'knots table', col: 4, row: 3, values: [['Knots', '', ''], ['date', 'cell', 'fitted'], [44928, 'B2']], formats: [[undefined, undefined, undefined], ['@', '@', '@'], ['yyyy-mm-dd', undefined]] },
];

describe('ExcelWorkbook with office-addin-mock', () => {
  afterEach(() => { delete (global as any).Excel; });

  test('reads the selection with its address, and takes a date number format in the first column as dates', async () => {
    const values = [['week', 'orders'], [44928, 422], [44935, 448]];
    const m = excelMock({ selected: { address: 'Sheet1!A1:B3', values, numberFormat: [['General', 'General'], ['yyyy-mm-dd', 'General'], ['yyyy-mm-dd', 'General']] } });
    (global as any).Excel = m.mock;
    const b = await new ExcelWorkbook().readSelection();
    expect(b).toEqual({ address: 'Sheet1!A1:B3', values, firstColumnDates: true });
    const plain = excelMock({ selected: { address: 'Sheet1!A1:B3', values, numberFormat: [['General', 'General'], ['0', 'General'], ['General', 'General']] } });
    (global as any).Excel = plain.mock;
    expect((await new ExcelWorkbook().readSelection()).firstColumnDates).toBe(false);
  });

  test('reads an error cell as an error value (its value type is Error), and text that looks like one as text', async () => {
    const values = [['week', 'orders'], [44928, '#N/A'], [44935, '#N/A'], [44942, 448]];
    const valueTypes = [['String', 'String'], ['Double', 'Error'], ['Double', 'String'], ['Double', 'Double']];
    const m = excelMock({ selected: { address: 'Sheet1!A1:B4', values, numberFormat: values.map(() => ['General', 'General']), valueTypes } });
    (global as any).Excel = m.mock;
    const b = await new ExcelWorkbook().readSelection();
    expect(b.values[1][1]).toEqual({ error: '#N/A' });
    expect(b.values[2][1]).toBe('#N/A');
    expect(b.values[3]).toEqual([44942, 448]);
  });

  test('writes each block to its range with values and number formats, one sync each, on the named sheet', async () => {
    const m = excelMock();
    (global as any).Excel = m.mock;
    const out = await new ExcelWorkbook().write("Q1 data", blocks);
    expect(out).toEqual(["'Q1 data'!C1:C3", "'Q1 data'!E1", "'Q1 data'!E3:G5"]);
    expect(m.sheets).toEqual(['Q1 data']);
    expect(m.ranges.map((r) => m.where.get(r))).toEqual(['C1:C3', 'E1', 'E3:G5']);
    expect(m.ranges[0].values).toEqual([['orders (spline)'], [430.1], ['']]);
    expect(m.ranges[0].numberFormat).toEqual([['@'], ['0.0'], ['0.0']]);
    // ragged rows are padded to a rectangle, missing formats become General
    expect(m.ranges[2].values[2]).toEqual([44928, 'B2', '']);
    expect(m.ranges[2].numberFormat[0]).toEqual(['General', 'General', 'General']);
    expect(m.ranges[2].numberFormat[2]).toEqual(['yyyy-mm-dd', 'General', 'General']);
    expect(m.syncs()).toBe(3);
  });

  test('a failure part way names the ranges already written and the one that failed', async () => {
    const m = excelMock({ failOnSync: 2 });
    (global as any).Excel = m.mock;
    const err = await new ExcelWorkbook().write('Sheet1', blocks).catch((e) => e);
    expect(err).toBeInstanceOf(WriteError);
    expect(err.written).toEqual(['Sheet1!C1:C3']);
    expect(err.message).toBe('Wrote Sheet1!C1:C3; then writing settings note (Sheet1!E1) failed: This operation is not allowed because the sheet is protected. Nothing else was written.');
    expect(m.syncs()).toBe(2);
    const first = excelMock({ failOnSync: 1 });
    (global as any).Excel = first.mock;
    const e1 = await new ExcelWorkbook().write('Sheet1', blocks).catch((e) => e);
    expect(e1.message).toMatch(/^Nothing was written: writing fitted column \(Sheet1!C1:C3\) failed/);
  });

  test('occupied lists the blocks whose ranges already hold values (values only, formats ignored)', async () => {
    const m = excelMock({ used: ['C1:C3', 'E3:G5'] });
    (global as any).Excel = m.mock;
    expect(await new ExcelWorkbook().occupied('Sheet1', blocks)).toEqual(['Sheet1!C1:C3', 'Sheet1!E3:G5']);
    const none = excelMock();
    (global as any).Excel = none.mock;
    expect(await new ExcelWorkbook().occupied(null, blocks)).toEqual([]);
    expect(none.sheets).toEqual(['(active)']);
  });

  test('adds a native scatter chart: data as points, the fit as a line, markers as diamonds, dates on x', async () => {
    const m = excelMock();
    (global as any).Excel = m.mock;
    const spec: ChartSpec = {
      title: 'orders: trend filtering, order 1', x: 'A2:A157', data: 'B2:B157', fit: 'C2:C157', markersX: 'E20:E38', markersY: 'H20:H38',
      names: { data: 'orders', fit: 'orders (trend 1)', markers: 'knots' }, col: 4, row: 41,
    };
    expect(await new ExcelWorkbook().addChart('Sheet1', spec)).toBe('Sheet1!E41');
    expect(m.charts).toHaveLength(1);
    const c = m.charts[0];
    expect([c.type, c.source, c.by]).toEqual(['XYScatter', 'B2:B157', 'Columns']);
    expect(c.title.text).toBe('orders: trend filtering, order 1');
    expect(c.legend.position).toBe('Bottom');
    const [data, fit, marks] = c.series.items;
    expect(data).toMatchObject({ name: 'orders', values: 'B2:B157', x: 'A2:A157' });
    expect(fit).toMatchObject({ name: 'orders (trend 1)', values: 'C2:C157', x: 'A2:A157', chartType: 'XYScatterLinesNoMarkers' });
    expect(marks).toMatchObject({ name: 'knots', values: 'H20:H38', x: 'E20:E38', chartType: 'XYScatter', markerStyle: 'Diamond' });
    expect(c.position).toEqual(['E41', 'L58']);
    expect(m.syncs()).toBe(1);
  });

  test('without x (row numbers) and without markers the chart has two series and no x ranges', async () => {
    const m = excelMock();
    (global as any).Excel = m.mock;
    await new ExcelWorkbook().addChart(null, { title: 't', data: 'A2:A9', fit: 'B2:B9', names: { data: 'y', fit: 'y (spline)' }, col: 3, row: 1 });
    const items = m.charts[0].series.items;
    expect(items).toHaveLength(2);
    expect(items.every((s: Series) => s.x === undefined)).toBe(true);
  });
});

describe('PageWorkbook (the preview sheet)', () => {
  test('reads an error literal as the error value Excel would make of it, and other text as text', async () => {
    const wb = new PageWorkbook('Orders', ['week', 'orders'], [[44928, '#N/A'], [44935, ' #div/0! '], [44942, 'n/a'], [44949, 448]], [true, false], { x: 0, y: 1 });
    const b = await wb.readSelection();
    expect(b.values.slice(1).map((r) => r[1])).toEqual([{ error: '#N/A' }, { error: '#DIV/0!' }, 'n/a', 448]);
    expect(b.firstColumnDates).toBe(true);
  });
});
