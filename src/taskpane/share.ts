/**
 * What "write to sheet" puts where, so a colleague without the add-in sees
 * what was done: the fitted column just right of the data; one column
 * further on, a report (the settings note, the summary, the warnings, the
 * knots or breaks table and, for changepoints, the segments table); and a
 * native chart of data, fit and markers below the report. Pure: a plan of
 * blocks and ranges that a Workbook then writes.
 */
import { PresentTable, cellName, rangeName } from '../present';
import type { View } from './view';
import type { ChartSpec, WriteBlock } from './workbook';

export interface SharePlan {
  fitted: WriteBlock;
  /** Note, summary, warnings, tables: in writing order. */
  report: WriteBlock[];
  chart: ChartSpec;
}

function tableBlock(what: string, title: string, t: PresentTable, col: number, row: number): WriteBlock {
  const width = t.header.length;
  const pad = (r: (number | string)[]) => [...r, ...Array<string>(Math.max(0, width - r.length)).fill('')];
  return {
    what, col, row,
    values: [pad([title]), t.header, ...t.rows.map((r) => r.map((c) => c.value))],
    formats: [Array(width).fill(undefined), Array(width).fill('@'), ...t.rows.map((r) => r.map((c) => c.format))],
  };
}

/**
 * A decomposition's components (trend first, so the chart's fit range is the trend) beside the data, with
 * their header in the selection's header row, or on the row above data without one (none on row 1).
 */
function componentsBlock(v: View, col: number): WriteBlock {
  const c = v.components!;
  const header = v.hasHeader || v.topRow > 1;
  return {
    what: 'components table', col, row: v.hasHeader || !header ? v.topRow : v.topRow - 1,
    values: [...(header ? [c.header] : []), ...c.rows],
    formats: [...(header ? [c.header.map(() => '@')] : []), ...c.rows.map((r) => r.map(() => c.format))],
  };
}

/** The blocks and chart for one view, placed from the selection's position on its sheet. */
export function sharePlan(v: View): SharePlan {
  const nRows = v.column.length;
  const fitCol = v.lastCol + 1;
  const fitted: WriteBlock = v.components ? componentsBlock(v, fitCol) : {
    what: 'fitted column', col: fitCol, row: v.topRow,
    values: [...(v.hasHeader ? [[v.columnHeader]] : []), ...v.column.map((c) => [c])],
    formats: [...(v.hasHeader ? [['@']] : []), ...v.column.map(() => [v.columnFormat])],
  };
  const col = fitCol + (v.components ? v.components.header.length : 1) + 1;
  let row = v.topRow;
  const report: WriteBlock[] = [];
  const add = (b: WriteBlock) => { report.push(b); row += b.values.length + 1; };
  add({ what: 'settings note', col, row, values: [[v.note]], formats: [['@']] });
  add({ what: 'summary', col, row, values: [['Summary', ''], ...v.summary.map(([k, t]) => [k, t])], formats: [['@', '@'], ...v.summary.map(() => ['@', '@'])] });
  const warnings = v.warnings.length ? v.warnings.map((w) => [w.code, w.message]) : [['none', '']];
  add({ what: 'warnings', col, row, values: [['Warnings', ''], ...warnings], formats: [['@', '@'], ...warnings.map(() => ['@', '@'])] });
  if (v.caveats.length) {
    const caveats = v.caveats.map((w) => [w.code, w.message]);
    add({ what: 'read with care', col, row, values: [['Read with care', ''], ...caveats], formats: [['@', '@'], ...caveats.map(() => ['@', '@'])] });
  }
  let markersX: string | undefined, markersY: string | undefined, markersName: string | undefined;
  for (const t of v.tables) {
    const b = tableBlock(`${t.title.toLowerCase()} table`, t.title, t.table, col, row);
    if (t.id === 'table' && t.table.rows.length) {
      const first = row + 2, last = row + 1 + t.table.rows.length;
      markersX = rangeName(null, col, first, col, last);
      markersY = rangeName(null, col + t.table.header.length - 1, first, col + t.table.header.length - 1, last);
      markersName = t.title.toLowerCase();
    }
    add(b);
  }
  const first = v.place.firstRow, last = v.place.firstRow + nRows - 1;
  const chart: ChartSpec = {
    title: `${v.yName}: ${v.title.toLowerCase()}`,
    x: v.xCol >= 0 ? rangeName(null, v.xCol, first, v.xCol, last) : undefined,
    data: rangeName(null, v.place.yCol, first, v.place.yCol, last),
    fit: rangeName(null, fitCol, first, fitCol, last),
    markersX, markersY,
    names: { data: v.yName, fit: v.columnHeader, markers: markersName },
    col, row,
  };
  return { fitted, report, chart };
}

/** The cell where the report starts, for messages. */
export function reportStart(p: SharePlan): string {
  return cellName(p.report[0].col, p.report[0].row);
}
