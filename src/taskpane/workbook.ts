/**
 * The pane reads and writes cells through this one small interface, so the
 * same pane runs inside Excel (Office.js) and in the standalone preview page
 * (an in-page sheet).
 */

/** A block of cells read from the workbook. */
export interface CellBlock {
  /** A display address, e.g. "Sheet1!B2:C157". */
  address: string;
  values: unknown[][];
  /** True when the first column holds dates (Excel serial numbers shown as dates). */
  firstColumnDates?: boolean;
}

export interface Workbook {
  readonly kind: 'excel' | 'page';
  /** The cells the analyst selected. */
  readSelection(): Promise<CellBlock>;
  /** The column just right of `source`, same rows (to check before writing). */
  readBeside(source: CellBlock): Promise<CellBlock>;
  /** Writes one column just right of `source`. */
  writeBeside(source: CellBlock, column: unknown[]): Promise<string>;
}

/** True when no cell of the block holds anything. */
export function isEmptyBlock(b: CellBlock): boolean {
  return b.values.every((r) => r.every((v) => v === '' || v === null || v === undefined));
}

/** Excel through Office.js. */
export class ExcelWorkbook implements Workbook {
  readonly kind = 'excel' as const;

  async readSelection(): Promise<CellBlock> {
    return Excel.run(async (ctx) => {
      const r = ctx.workbook.getSelectedRange();
      r.load(['values', 'address', 'numberFormat']);
      await ctx.sync();
      const fmt = r.numberFormat.map((row) => String(row[0] ?? ''));
      const dates = fmt.slice(1).some((f) => /[dy]/i.test(f.replace(/"[^"]*"/g, '')) && !/^general$/i.test(f));
      return { address: r.address, values: r.values, firstColumnDates: dates };
    });
  }

  private besideRange(ctx: Excel.RequestContext, source: CellBlock): Excel.Range {
    const bang = source.address.lastIndexOf('!');
    const sheet = bang >= 0 ? source.address.slice(0, bang) : undefined;
    const cells = source.address.slice(bang + 1);
    const ws = sheet ? ctx.workbook.worksheets.getItem(sheet.replace(/^'|'$/g, '')) : ctx.workbook.worksheets.getActiveWorksheet();
    return ws.getRange(cells).getLastColumn().getOffsetRange(0, 1);
  }

  async readBeside(source: CellBlock): Promise<CellBlock> {
    return Excel.run(async (ctx) => {
      const r = this.besideRange(ctx, source);
      r.load(['values', 'address']);
      await ctx.sync();
      return { address: r.address, values: r.values };
    });
  }

  async writeBeside(source: CellBlock, column: unknown[]): Promise<string> {
    return Excel.run(async (ctx) => {
      const r = this.besideRange(ctx, source);
      r.values = column.map((v) => [v]) as any[][];
      r.load('address');
      await ctx.sync();
      return r.address;
    });
  }
}

/** An in-page sheet: a table of columns with a chosen x and y column (the preview page). */
export class PageWorkbook implements Workbook {
  readonly kind = 'page' as const;
  constructor(
    public header: string[],
    public rows: unknown[][],
    /** Chosen columns, 0-based: positions (or -1 for none) and values. */
    public selection: { x: number; y: number },
    private readonly onChange: () => void = () => {},
  ) {}

  private columnLetter(i: number): string {
    return String.fromCharCode(65 + i);
  }

  async readSelection(): Promise<CellBlock> {
    const { x, y } = this.selection;
    const cols = x >= 0 ? [x, y] : [y];
    const first = Math.min(...cols), last = Math.max(...cols);
    const values = [cols.map((c) => this.header[c]), ...this.rows.map((r) => cols.map((c) => r[c] ?? ''))];
    const dates = x >= 0 && /date|week|day|month/i.test(this.header[x] ?? '');
    return { address: `Demo!${this.columnLetter(first)}1:${this.columnLetter(last)}${this.rows.length + 1}`, values, firstColumnDates: dates };
  }

  private besideIndex(): number {
    const { x, y } = this.selection;
    return Math.max(x, y) + 1;
  }

  async readBeside(): Promise<CellBlock> {
    const c = this.besideIndex();
    const values = [[this.header[c] ?? ''], ...this.rows.map((r) => [r[c] ?? ''])];
    return { address: `Demo!${this.columnLetter(c)}1:${this.columnLetter(c)}${this.rows.length + 1}`, values };
  }

  async writeBeside(_source: CellBlock, column: unknown[]): Promise<string> {
    const c = this.besideIndex();
    while (this.header.length <= c) this.header.push('');
    this.header[c] = String(column[0] ?? '');
    this.rows.forEach((r, i) => { while (r.length <= c) r.push(''); r[c] = column[i + 1] ?? ''; });
    this.onChange();
    return `Demo!${this.columnLetter(c)}1:${this.columnLetter(c)}${this.rows.length + 1}`;
  }
}
