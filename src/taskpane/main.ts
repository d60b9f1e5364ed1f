/**
 * The task pane: pick cells, a method and a penalty rule; see the fit, why
 * this penalty, the knots or breaks, and every warning; write the result
 * beside the data (asking before anything is replaced).
 */
import { isKnotwiseError } from '../engine';
import { weeklyOrders } from '../demo/weeklyOrders';
import { analyse, Choice, PenaltyChoice, View } from './analysis';
import { compute, pageRuntime } from '../runtime/browser/pageRuntime';
import { isCancelled } from '../runtime/engineEntry';
import { ProgressBox } from './progress';
import { drawCurve, drawFit } from './chart';
import { CellBlock, ExcelWorkbook, PageWorkbook, Workbook, isEmptyBlock } from './workbook';

const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

function choiceFrom(value: string): Choice {
  if (value === 'spline') return { kind: 'smooth', method: 'spline' };
  if (value.startsWith('trend')) return { kind: 'smooth', method: 'trend', order: Number(value.slice(5)) };
  return { kind: 'breaks', model: value.slice(7) as any };
}

function penaltyFrom(): PenaltyChoice {
  const rule = $<HTMLSelectElement>('rule').value as PenaltyChoice['rule'];
  const raw = $<HTMLInputElement>('rule-value').value.trim();
  return rule === 'df' || rule === 'value' ? { rule, value: raw === '' ? NaN : Number(raw) } : { rule };
}

function showStatus(text: string, kind: 'info' | 'error' = 'info'): void {
  const s = $('status');
  s.textContent = text;
  s.className = kind;
}

function renderView(v: View): void {
  $('result-title').textContent = v.title;
  drawFit($('chart') as unknown as SVGSVGElement, v);
  const curveBox = $('curve-box');
  if (v.curve) { curveBox.hidden = false; drawCurve($('curve') as unknown as SVGSVGElement, v.curve); } else curveBox.hidden = true;
  const dl = $('summary');
  dl.replaceChildren();
  for (const [k, val] of v.summary) {
    const dt = document.createElement('dt'); dt.textContent = k;
    const dd = document.createElement('dd'); dd.textContent = val;
    dl.append(dt, dd);
  }
  const ul = $('warnings');
  ul.replaceChildren();
  for (const w of v.warnings) {
    const li = document.createElement('li');
    li.dataset.code = w.code;
    const code = document.createElement('span'); code.className = 'code'; code.textContent = w.code;
    li.append(code, document.createTextNode(' ' + w.message));
    ul.append(li);
  }
  const table = $('table');
  table.replaceChildren();
  v.table.forEach((row, i) => {
    const tr = document.createElement('tr');
    for (const c of row) {
      const td = document.createElement(i === 0 ? 'th' : 'td');
      td.textContent = typeof c === 'number' ? String(Number(c.toPrecision(6))) : String(c);
      tr.append(td);
    }
    table.append(tr);
  });
  $('table-box').hidden = v.table.length <= 1;
  $('results').hidden = false;
}

function renderSheet(wb: PageWorkbook): void {
  const t = $('sheet-table');
  t.replaceChildren();
  const head = document.createElement('tr');
  wb.header.forEach((h, j) => {
    const th = document.createElement('th');
    th.textContent = `${String.fromCharCode(65 + j)}: ${h}`;
    if (j === wb.selection.x || j === wb.selection.y) th.className = 'selected';
    head.append(th);
  });
  t.append(head);
  for (const r of wb.rows) {
    const tr = document.createElement('tr');
    wb.header.forEach((_, j) => {
      const td = document.createElement('td');
      const v = r[j];
      td.textContent = typeof v === 'number' ? String(Number(v.toPrecision(6))) : String(v ?? '');
      if (j === wb.selection.x || j === wb.selection.y) td.className = 'selected';
      tr.append(td);
    });
    t.append(tr);
  }
}

function pageWorkbook(): PageWorkbook {
  const rows = weeklyOrders().map((r) => [r.weekStart, r.orders ?? '', r.returns, r.unitCost]);
  const wb: PageWorkbook = new PageWorkbook(['week_start', 'orders', 'returns', 'unit_cost'], rows, { x: 0, y: 1 }, () => renderSheet(wb));
  const xs = $<HTMLSelectElement>('pick-x'), ys = $<HTMLSelectElement>('pick-y');
  const fill = () => {
    for (const [sel, withNone] of [[xs, true], [ys, false]] as const) {
      const keep = sel.value;
      sel.replaceChildren();
      if (withNone) sel.append(new Option('(row numbers)', '-1'));
      wb.header.forEach((h, j) => sel.append(new Option(h, String(j))));
      if (keep) sel.value = keep;
    }
  };
  fill();
  xs.value = '0'; ys.value = '1';
  const update = () => { wb.selection = { x: Number(xs.value), y: Number(ys.value) }; renderSheet(wb); };
  xs.onchange = update; ys.onchange = update;
  renderSheet(wb);
  return wb;
}

async function boot(inExcel: boolean): Promise<void> {
  document.body.classList.toggle('in-excel', inExcel);
  const wb: Workbook = inExcel ? new ExcelWorkbook() : pageWorkbook();
  let last: { block: CellBlock; view: View } | null = null;

  $('rule').onchange = () => {
    const r = $<HTMLSelectElement>('rule').value;
    $('rule-value').hidden = !(r === 'df' || r === 'value');
  };
  const progress = new ProgressBox($('status'));
  pageRuntime().pool?.warm(1); // load one analysis worker now, so the first fit does not wait for it
  $('run').onclick = async () => {
    const run = progress.start();
    try {
      const block = await wb.readSelection();
      showStatus(`Fitting ${block.address} ...`);
      // The fit runs in a worker: the pane stays responsive, shows progress and can cancel.
      const view = await analyse(block, choiceFrom($<HTMLSelectElement>('method').value), penaltyFrom(), (r) => compute(r, run));
      last = { block, view };
      renderView(view);
      showStatus(`Fitted ${block.address}.`);
    } catch (e) {
      if (isCancelled(e)) { if (!run.superseded) showStatus('Fit cancelled: nothing new was fitted.'); return; }
      $('results').hidden = true;
      showStatus(isKnotwiseError(e) || e instanceof Error ? (e as Error).message : String(e), 'error');
    } finally {
      run.done();
    }
  };
  const confirmBox = $('confirm');
  const doWrite = async () => {
    if (!last) return;
    const header = last.block.values.length > last.view.column.length ? [last.view.columnHeader] : [];
    const address = await wb.writeBeside(last.block, [...header, ...last.view.column]);
    confirmBox.hidden = true;
    showStatus(`Wrote ${last.view.column.length} values to ${address}.`);
  };
  $('write').onclick = async () => {
    if (!last) return;
    const target = await wb.readBeside(last.block);
    if (isEmptyBlock(target)) return doWrite();
    $('confirm-text').textContent = `${target.address} already holds values. Replace them with the fitted column?`;
    confirmBox.hidden = false;
  };
  $('confirm-yes').onclick = () => void doWrite();
  $('confirm-no').onclick = () => { confirmBox.hidden = true; showStatus('Nothing was written.'); };
}

declare const Office: { onReady(cb: (info: { host: unknown }) => void): void } | undefined;

if (typeof Office !== 'undefined' && Office) {
  Office.onReady((info) => void boot(info.host === 'Excel' || String(info.host) === 'Excel'));
} else {
  window.addEventListener('DOMContentLoaded', () => void boot(false));
}
