/**
 * The pane reads and writes cells through this one small interface, so the
 * same pane runs inside Excel (Office.js) and in the standalone preview page
 * (an in-page sheet). Writing is block by block: when one block fails, the
 * error names the blocks already written, so the analyst knows exactly which
 * cells changed.
 */
import { parseRangeAddress, rangeName } from '../present/cellAddress';
import { excelErrorCell } from '../present/excelErrors';

/** A block of cells read from the workbook. */
export interface CellBlock {
  /** A display address, e.g. "Sheet1!B2:C157". */
  address: string;
  values: unknown[][];
  /** True when the first column holds dates (Excel serial numbers shown as dates). */
  firstColumnDates?: boolean;
  /** Sheet columns (0-based) of the block's columns, when they are not side by side (the preview's picked columns). */
  columns?: number[];
}

/** A rectangle of values to write: top-left cell, values row by row, optional Excel number formats of the same shape. */
export interface WriteBlock {
  /** What the block holds, for messages ("fitted column", "knots table"). */
  what: string;
  /** 0-based column and 1-based row of the top-left cell. */
  col: number;
  row: number;
  values: (number | string)[][];
  formats?: (string | undefined)[][];
}

/** A native chart of the data, the fit and the markers, from ranges of one sheet (A1 addresses without the sheet). */
export interface ChartSpec {
  title: string;
  /** x values (dates or numbers); absent when x are row numbers. */
  x?: string;
  data: string;
  fit: string;
  markersX?: string;
  markersY?: string;
  names: { data: string; fit: string; markers?: string };
  /** Top-left cell of the chart: 0-based column, 1-based row. */
  col: number;
  row: number;
}

/** The longest row's length (at least 1), without spreading long arrays into arguments. */
function widest(rows: readonly unknown[][]): number {
  return rows.reduce((m, r) => Math.max(m, r.length), 1);
}

/** The address of a block on `sheet`. */
export function blockAddress(sheet: string | null, b: WriteBlock): string {
  const w = widest(b.values);
  return rangeName(sheet, b.col, b.row, b.col + w - 1, b.row + b.values.length - 1);
}

/** A write that stopped part way: `written` lists what is already in the sheet. */
export class WriteError extends Error {
  constructor(readonly written: string[], readonly failed: string, cause: string) {
    super(`${written.length ? `Wrote ${written.join(', ')}; then` : 'Nothing was written:'} writing ${failed} failed: ${cause}${written.length ? ' Nothing else was written.' : ''}`);
    this.name = 'WriteError';
  }
}

export interface Workbook {
  readonly kind: 'excel' | 'page';
  /** The cells the analyst selected. */
  readSelection(): Promise<CellBlock>;
  /** Of these blocks' ranges on `sheet`, the addresses that already hold a value. */
  occupied(sheet: string | null, blocks: WriteBlock[]): Promise<string[]>;
  /** Writes the blocks in order; returns their addresses, or throws a WriteError naming those written before a failure. */
  write(sheet: string | null, blocks: WriteBlock[]): Promise<string[]>;
  /** Adds a chart; returns where it was put. */
  addChart(sheet: string | null, spec: ChartSpec): Promise<string>;
}

/** Pads ragged rows to a rectangle (Excel needs one). */
function rectangle<T>(rows: T[][], fill: T): T[][] {
  const w = widest(rows);
  return rows.map((r) => [...r, ...Array<T>(w - r.length).fill(fill)]);
}

/** Excel through Office.js (ExcelApi 1.7 for charts' series; getUsedRangeOrNullObject(true) to check cells before writing). */
export class ExcelWorkbook implements Workbook {
  readonly kind = 'excel' as const;

  async readSelection(): Promise<CellBlock> {
    return Excel.run(async (ctx) => {
      const r = ctx.workbook.getSelectedRange();
      r.load(['values', 'valueTypes', 'address', 'numberFormat']);
      await ctx.sync();
      // an error cell's value is its literal ("#N/A"); its value type says it is an error, not text
      const values = r.values.map((row, i) => row.map((v, j) => (r.valueTypes[i]?.[j] === 'Error' ? { error: String(v) } : v)));
      const fmt = r.numberFormat.map((row) => String(row[0] ?? ''));
      const dates = fmt.slice(1).some((f) => /[dy]/i.test(f.replace(/"[^"]*"/g, '')) && !/^general$/i.test(f));
      return { address: r.address, values, firstColumnDates: dates };
    });
  }

  private sheet(ctx: Excel.RequestContext, sheet: string | null): Excel.Worksheet {
    return sheet ? ctx.workbook.worksheets.getItem(sheet) : ctx.workbook.worksheets.getActiveWorksheet();
  }

  async occupied(sheet: string | null, blocks: WriteBlock[]): Promise<string[]> {
    return Excel.run(async (ctx) => {
      const ws = this.sheet(ctx, sheet);
      const used = blocks.map((b) => {
        const u = ws.getRange(blockAddress(null, b)).getUsedRangeOrNullObject(true);
        u.load('address');
        return u;
      });
      await ctx.sync();
      return blocks.filter((_, i) => !used[i].isNullObject).map((b) => blockAddress(sheet, b));
    });
  }

  async write(sheet: string | null, blocks: WriteBlock[]): Promise<string[]> {
    return Excel.run(async (ctx) => {
      const ws = this.sheet(ctx, sheet);
      const written: string[] = [];
      for (const b of blocks) {
        const address = blockAddress(sheet, b);
        try {
          const r = ws.getRange(blockAddress(null, b));
          if (b.formats) r.numberFormat = rectangle(b.formats.map((row) => row.map((f) => f ?? 'General')), 'General');
          r.values = rectangle(b.values, '');
          await ctx.sync();
        } catch (e) {
          throw new WriteError(written, `${b.what} (${address})`, e instanceof Error ? e.message : String(e));
        }
        written.push(address);
      }
      return written;
    });
  }

  async addChart(sheet: string | null, spec: ChartSpec): Promise<string> {
    return Excel.run(async (ctx) => {
      const ws = this.sheet(ctx, sheet);
      const chart = ws.charts.add(Excel.ChartType.xyscatter, ws.getRange(spec.data), Excel.ChartSeriesBy.columns);
      chart.title.text = spec.title;
      chart.legend.position = Excel.ChartLegendPosition.bottom;
      const data = chart.series.getItemAt(0);
      data.name = spec.names.data;
      data.markerSize = 4;
      if (spec.x) data.setXAxisValues(ws.getRange(spec.x));
      const fit = chart.series.add(spec.names.fit);
      fit.chartType = Excel.ChartType.xyscatterLinesNoMarkers;
      fit.setValues(ws.getRange(spec.fit));
      if (spec.x) fit.setXAxisValues(ws.getRange(spec.x));
      if (spec.markersX && spec.markersY && spec.names.markers) {
        const m = chart.series.add(spec.names.markers);
        m.chartType = Excel.ChartType.xyscatter;
        m.markerStyle = Excel.ChartMarkerStyle.diamond;
        m.markerSize = 8;
        m.setValues(ws.getRange(spec.markersY));
        m.setXAxisValues(ws.getRange(spec.markersX));
      }
      const anchor = rangeName(null, spec.col, spec.row);
      chart.setPosition(anchor, rangeName(null, spec.col + 7, spec.row + 17));
      await ctx.sync();
      return rangeName(sheet, spec.col, spec.row);
    });
  }
}

/** A chart added to the preview's sheet: the spec and the values read back from its ranges. */
export interface PageChart {
  spec: ChartSpec;
  x: number[];
  data: (number | null)[];
  fit: (number | null)[];
  markers: { x: number; y: number }[];
}

/**
 * An in-page sheet (the preview page): a grid whose first row is sheet row 1,
 * with a chosen x and y column, number formats per cell, and charts.
 */
export class PageWorkbook implements Workbook {
  readonly kind = 'page' as const;
  /** Row-major cells; cells[0] is sheet row 1 (the header). */
  cells: unknown[][] = [];
  formats: (string | undefined)[][] = [];
  charts: PageChart[] = [];
  /** Test hook: fail the write of block number k (0-based), to show partial-write messages. */
  failAt = -1;

  constructor(
    public name: string,
    header: string[],
    rows: unknown[][],
    /** Columns holding dates (Excel serials). */
    public dateColumns: boolean[],
    /** Chosen columns, 0-based (x = -1 for row numbers). */
    public selection: { x: number; y: number },
    private readonly onChange: () => void = () => {},
  ) {
    this.load(name, header, rows, dateColumns);
  }

  /** Replaces the sheet's contents. */
  load(name: string, header: string[], rows: unknown[][], dateColumns: boolean[]): void {
    this.name = name;
    this.cells = [header.slice(), ...rows.map((r) => r.slice())];
    this.dateColumns = dateColumns.slice();
    this.formats = this.cells.map((r, i) => r.map((_, j) => (i > 0 && dateColumns[j] ? 'yyyy-mm-dd' : undefined)));
    this.charts = [];
  }

  get header(): string[] {
    return (this.cells[0] ?? []).map((h) => String(h ?? ''));
  }

  get width(): number {
    return widest(this.cells);
  }

  async readSelection(): Promise<CellBlock> {
    const { x, y } = this.selection;
    const cols = x >= 0 ? [x, y] : [y];
    const first = Math.min(...cols), last = Math.max(...cols);
    // the in-page sheet holds what was typed, pasted or read; an error literal (spaces and case aside, as the CLI reads CSV) stands for the error value Excel makes of it
    const values = this.cells.map((r) => cols.map((c) => { const v = r[c] ?? ''; return (typeof v === 'string' && excelErrorCell(v)) || v; }));
    return {
      address: rangeName(this.name, first, 1, last, this.cells.length),
      values, firstColumnDates: x >= 0 && !!this.dateColumns[x], columns: cols,
    };
  }

  async occupied(sheet: string | null, blocks: WriteBlock[]): Promise<string[]> {
    return blocks.filter((b) => b.values.some((row, i) => row.some((_, j) => {
      const v = this.cells[b.row - 1 + i]?.[b.col + j];
      return v !== undefined && v !== null && v !== '';
    }))).map((b) => blockAddress(sheet, b));
  }

  async write(sheet: string | null, blocks: WriteBlock[]): Promise<string[]> {
    const written: string[] = [];
    try {
      blocks.forEach((b, k) => {
        const address = blockAddress(sheet, b);
        if (k === this.failAt) throw new WriteError(written, `${b.what} (${address})`, 'the preview sheet refused this block (test of a failed write).');
        b.values.forEach((row, i) => row.forEach((v, j) => {
          const r = b.row - 1 + i, c = b.col + j;
          while (this.cells.length <= r) { this.cells.push([]); this.formats.push([]); }
          this.cells[r][c] = v;
          this.formats[r][c] = b.formats?.[i]?.[j];
        }));
        written.push(address);
      });
    } finally {
      this.onChange();
    }
    return written;
  }

  /** The numbers in a one-column range "C2:C157" (null where not a number). */
  private column(address: string): (number | null)[] {
    const a = parseRangeAddress(address)!;
    const out: (number | null)[] = [];
    for (let r = a.row; r <= a.lastRow; r++) { const v = this.cells[r - 1]?.[a.col]; out.push(typeof v === 'number' ? v : null); }
    return out;
  }

  async addChart(sheet: string | null, spec: ChartSpec): Promise<string> {
    const data = this.column(spec.data), fit = this.column(spec.fit);
    const x = spec.x ? this.column(spec.x).map((v) => v ?? NaN) : data.map((_, i) => i + 1);
    const mx = spec.markersX ? this.column(spec.markersX) : [], my = spec.markersY ? this.column(spec.markersY) : [];
    const markers = mx.map((v, i) => ({ x: v as number, y: my[i] as number })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
    this.charts.push({ spec, x, data, fit, markers });
    this.onChange();
    return rangeName(sheet, spec.col, spec.row);
  }
}
