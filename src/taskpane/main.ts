/**
 * The task pane: pick cells, a method and a penalty rule; see the fit, why
 * this penalty, the knots or breaks, and every warning; write the results to
 * the sheet (asking before anything is replaced) so a colleague without the
 * add-in sees what was done.
 */
import uPlot from 'uplot';
import { DEFAULT_SMOOTHER, isKnotwiseError } from '../engine';
import { weeklyOrders } from '../demo/weeklyOrders';
import { columnLetters, formatFixed, formatNumber, serialToIso, PresentTable } from '../present';
import { analyseWith, choiceOf, PenaltyChoice, SecondChoice, splitSelection } from './analysis';
import { defaultRuleNote, methodChoices, optionApplies, optionChoices, ruleChoices } from './methodChoices';
import { compute, pageRuntime } from '../runtime/browser/pageRuntime';
import { isCancelled } from '../runtime/engineEntry';
import { ProgressBox } from './progress';
import { axisFontSizes, axisFor, drawCurve, drawFit, drawPanels, resizeCharts } from './chart';
import { OwnTable, openOwnFile, readOwnTable } from './ownData';
import { reportStart, sharePlan } from './share';
import { View, viewOf } from './view';
import { CellBlock, ExcelWorkbook, PageWorkbook, WriteBlock, WriteError, Workbook } from './workbook';

declare const KNOTWISE_VERSION: string;
const VERSION = typeof KNOTWISE_VERSION === 'string' ? KNOTWISE_VERSION : 'development';

const $ = <T extends HTMLElement>(id: string) => document.getElementById(id) as T;

function penaltyFrom(ruleId = 'rule', valueId = 'rule-value'): PenaltyChoice {
  const rule = $<HTMLSelectElement>(ruleId).value;
  const raw = $<HTMLInputElement>(valueId).value.trim();
  return rule === 'df' || rule === 'value' ? { rule, value: raw === '' ? NaN : Number(raw) } : { rule };
}

/** The comparison the analyst asked for: nothing, the automatic choice's runner-up, or a method with its rule. */
function secondFrom(): SecondChoice | undefined {
  if ($('second-box').hidden) return undefined;
  const v = $<HTMLSelectElement>('second').value;
  if (v === '') return undefined;
  if (v === 'runner-up') return { kind: 'runner-up' };
  return { kind: 'method', choice: choiceOf(v), pen: penaltyFrom('second-rule', 'second-rule-value') };
}

function showStatus(text: string, kind: 'info' | 'error' = 'info'): void {
  const s = $('status');
  s.textContent = text;
  s.className = kind;
}

function fillTable(el: HTMLElement, t: PresentTable): void {
  el.replaceChildren();
  const head = document.createElement('tr');
  for (const h of t.header) { const th = document.createElement('th'); th.textContent = h; head.append(th); }
  el.append(head);
  for (const row of t.rows) {
    const tr = document.createElement('tr');
    for (const c of row) { const td = document.createElement('td'); td.textContent = c.text; tr.append(td); }
    el.append(tr);
  }
}

function renderView(v: View): void {
  $('result-title').textContent = v.title;
  $('results').hidden = false;
  if (v.panels) drawPanels($('chart'), v); else drawFit($('chart'), v);
  $('chart').setAttribute('aria-label', v.panels ? 'the components stacked on one x axis' : v.second ? 'data, the fitted curve and a second fit for comparison' : 'data and fitted curve');
  $('share-fit-text').textContent = v.components ? 'components table (trend, season, spikes, remainder, adjusted)' : 'fitted column';
  const curveBox = $('curve-box');
  if (v.curve) { curveBox.hidden = false; drawCurve($('curve'), v.curve); } else curveBox.hidden = true;
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
  if (!v.warnings.length) { const li = document.createElement('li'); li.textContent = 'none'; ul.append(li); }
  const cv = $('caveats');
  cv.replaceChildren(...v.caveats.map((w) => { const li = document.createElement('li'); li.dataset.code = w.code; li.textContent = w.message; return li; }));
  $('caveats-box').hidden = !v.caveats.length;
  const main = v.tables.find((t) => t.id === 'table')!;
  $('table-title').textContent = main.title;
  fillTable($('table'), main.table);
  $('table-box').hidden = main.table.rows.length === 0;
  const seg = v.tables.find((t) => t.id === 'segments');
  $('segments-box').hidden = !seg;
  if (seg) fillTable($('segments'), seg.table);
  const cmp = v.tables.find((t) => t.id === 'compare');
  $('compare-box').hidden = !cmp;
  if (cmp) { fillTable($('compare'), cmp.table); $('compare-reason').textContent = v.compareReason ?? ''; }
  const side = v.tables.find((t) => t.id === 'side');
  $('side-box').hidden = !side;
  if (side) { fillTable($('side'), side.table); $('side-note').textContent = side.note ?? ''; }
  const more = $('more-tables');
  more.replaceChildren();
  for (const t of v.tables.filter((x) => x.id === 'more')) {
    const h = document.createElement('h2'); h.textContent = t.title;
    const scroll = document.createElement('div'); scroll.className = 'table-scroll';
    const table = document.createElement('table'); fillTable(table, t.table); scroll.append(table);
    more.append(h, ...(t.note ? [Object.assign(document.createElement('p'), { className: 'note', textContent: t.note })] : []), scroll);
  }
}

/** A sheet cell as the sheet shows it: dates by their format, numbers at their format's decimals. */
function cellText(v: unknown, format: string | undefined): string {
  if (typeof v !== 'number') return String(v ?? '');
  if (format && /^yyyy-mm-dd/.test(format)) return serialToIso(v, format.includes('hh') ? 'auto' : 'never') ?? String(v);
  const m = format ? /^0(?:\.(0+))?$/.exec(format) : null;
  if (m) return formatFixed(v, m[1]?.length ?? 0);
  return formatNumber(v, 6);
}

/** Rows of the preview sheet drawn as a table. */
const SHEET_ROWS_SHOWN = 2000;

function renderSheet(wb: PageWorkbook): void {
  $('sheet-name').textContent = wb.name;
  const t = $('sheet-table');
  t.replaceChildren();
  const width = wb.width;
  const letters = document.createElement('tr');
  letters.append(Object.assign(document.createElement('th'), { className: 'rownum' }));
  for (let j = 0; j < width; j++) {
    const th = document.createElement('th');
    th.textContent = columnLetters(j);
    if (j === wb.selection.x || j === wb.selection.y) th.className = 'selected';
    letters.append(th);
  }
  t.append(letters);
  // A preview sheet shows its first rows only: a page of 1e5 table rows would take seconds to lay out.
  const shown = Math.min(wb.cells.length, SHEET_ROWS_SHOWN);
  wb.cells.slice(0, shown).forEach((r, i) => {
    const tr = document.createElement('tr');
    const num = document.createElement('th');
    num.className = 'rownum';
    num.textContent = String(i + 1);
    tr.append(num);
    for (let j = 0; j < width; j++) {
      const td = document.createElement(i === 0 ? 'th' : 'td');
      td.textContent = cellText(r[j], wb.formats[i]?.[j]);
      if (td.textContent.length > 24) td.title = td.textContent;
      if (j === wb.selection.x || j === wb.selection.y) td.classList.add('selected');
      if (typeof r[j] === 'string') td.classList.add('text');
      tr.append(td);
    }
    t.append(tr);
  });
  if (shown < wb.cells.length) {
    const tr = document.createElement('tr');
    const td = document.createElement('td');
    td.colSpan = width + 1;
    td.className = 'text';
    td.textContent = `Rows ${shown + 1} to ${wb.cells.length} are not shown here; the pane reads them all.`;
    tr.append(td);
    t.append(tr);
  }
  renderSheetCharts(wb);
}

/** Charts written to the preview sheet, drawn from the values read back from their ranges. */
function renderSheetCharts(wb: PageWorkbook): void {
  const box = $('sheet-charts');
  box.replaceChildren();
  for (const c of wb.charts) {
    const el = document.createElement('div');
    el.className = 'sheet-chart';
    const cap = document.createElement('div');
    cap.className = 'note';
    cap.textContent = `Chart at ${columnLetters(c.spec.col)}${c.spec.row}: ${c.spec.title} (series: ${[c.spec.names.data, c.spec.names.fit, c.spec.names.markers].filter(Boolean).join(', ')})`;
    el.append(cap);
    box.append(el);
    el.dataset.series = String(2 + (c.markers.length ? 1 : 0));
    el.dataset.markers = String(c.markers.length);
    const order = c.x.map((_, i) => i).filter((i) => Number.isFinite(c.x[i])).sort((a, b) => c.x[a] - c.x[b]);
    const xs = order.map((i) => c.x[i]);
    const at = new Map(c.markers.map((m) => [m.x, m.y]));
    new uPlot({
      width: Math.max(240, (box.clientWidth || 320) - 12), height: 180, legend: { show: false }, cursor: { show: false }, scales: { x: { time: false } },
      axes: [axisFor(!!wb.dateColumns[wb.selection.x], (v) => serialToIso(v, 'never') ?? formatNumber(v, 4), el), { font: '11px system-ui, sans-serif', size: 44 }],
      series: [{}, { stroke: '#7b8fa1', paths: () => null, points: { show: true, size: 3, fill: '#7b8fa1' } }, { stroke: '#0f7c7a', width: 2, spanGaps: true, points: { show: false } },
        { stroke: '#c8611a', paths: () => null, points: { show: true, size: 8, width: 2, fill: '#fff' } }],
    }, [xs, order.map((i) => c.data[i]), order.map((i) => c.fit[i]), xs.map((x) => at.get(x) ?? null)] as uPlot.AlignedData, el);
  }
}

function demoWorkbook(onChange: () => void): PageWorkbook {
  const rows = weeklyOrders().map((r) => [r.weekStart, r.orders ?? '', r.returns, r.unitCost]);
  return new PageWorkbook('Demo', ['week_start', 'orders', 'returns', 'unit_cost'], rows, [true, false, false, false], { x: 0, y: 1 }, onChange);
}

function pageWorkbook(): PageWorkbook {
  const wb: PageWorkbook = demoWorkbook(() => renderSheet(wb));
  const xs = $<HTMLSelectElement>('pick-x'), ys = $<HTMLSelectElement>('pick-y');
  const fill = (x: number, y: number) => {
    xs.replaceChildren(new Option('(row numbers)', '-1'));
    ys.replaceChildren();
    wb.header.forEach((h, j) => { xs.append(new Option(`${columnLetters(j)}: ${h}`, String(j))); ys.append(new Option(`${columnLetters(j)}: ${h}`, String(j))); });
    xs.value = String(x); ys.value = String(y);
    wb.selection = { x, y };
  };
  fill(0, 1);
  const update = () => { wb.selection = { x: Number(xs.value), y: Number(ys.value) }; renderSheet(wb); };
  xs.onchange = update; ys.onchange = update;
  const useTable = (name: string, text: string | OwnTable) => {
    try {
      const t = typeof text === 'string' ? readOwnTable(text) : text;
      wb.load(name, t.header, t.rows, t.dateColumns);
      const x = t.dateColumns.indexOf(true) >= 0 ? t.dateColumns.indexOf(true) : t.header.length > 1 ? 0 : -1;
      const y = t.header.findIndex((_, j) => j !== x && t.rows.some((r) => typeof r[j] === 'number'));
      fill(x, y >= 0 ? y : Math.min(1, t.header.length - 1));
      $('sheet-note').textContent = `${t.rows.length} rows read${t.dateColumns.some(Boolean) ? `; dates in ${t.header.filter((_, j) => t.dateColumns[j]).join(', ')}` : ''}. Choose the x and y columns, then fit.`;
      renderSheet(wb);
      showStatus(t.notes.length ? `Read ${name}, but ${t.notes.join(' ')}` : `Read ${t.rows.length} rows into the sheet "${name}".`, t.notes.length ? 'error' : 'info');
    } catch (e) {
      showStatus(`Could not read ${name}: ${(e as Error).message}`, 'error');
    }
  };
  $('paste-use').onclick = () => useTable('Pasted', $<HTMLTextAreaElement>('paste').value);
  $<HTMLInputElement>('csv-file').onchange = async () => {
    const f = $<HTMLInputElement>('csv-file').files?.[0];
    if (f) await openOwnFile(f, $<HTMLSelectElement>('own-sheet'), useTable, (m) => showStatus(m, 'error'));
  };
  $('demo-use').onclick = () => {
    const d = demoWorkbook(() => {});
    wb.load('Demo', d.header, d.cells.slice(1), d.dateColumns);
    fill(0, 1);
    renderSheet(wb);
    showStatus('Back to the demo sheet.');
  };
  renderSheet(wb);
  return wb;
}

/** An engine error's "row N" (1-based data rows) named as sheet rows, when the selection's place is known. */
function errorText(e: unknown, block: CellBlock | null): string {
  const msg = isKnotwiseError(e) || e instanceof Error ? (e as Error).message : String(e);
  if (!block) return msg;
  try {
    const m = /!?\$?[A-Z]+\$?(\d+)/.exec(block.address.slice(block.address.lastIndexOf('!') + 1));
    const hasHeader = splitSelection(block).header !== null;
    if (!m) return msg;
    const first = Number(m[1]) + (hasHeader ? 1 : 0);
    return msg.replace(/\b(in )?row (\d+)\b/g, (_a, inWord: string | undefined, r: string) => `${inWord ?? ''}sheet row ${first + Number(r) - 1}`);
  } catch {
    return msg;
  }
}

async function boot(inExcel: boolean): Promise<void> {
  document.body.classList.toggle('in-excel', inExcel);
  const wb: Workbook = inExcel ? new ExcelWorkbook() : pageWorkbook();
  let last: { block: CellBlock; view: View } | null = null;
  // For tests and for checking the pane from the browser console.
  (window as unknown as { knotwise: unknown }).knotwise = { workbook: wb, axisFonts: () => [...axisFontSizes($('chart')), ...axisFontSizes($('curve'))] };

  // The lists come from the engine's declarations: every method it registers, and per method only its own rules.
  const methodSel = $<HTMLSelectElement>('method'), ruleSel = $<HTMLSelectElement>('rule');
  const picked = methodSel.value;
  methodSel.replaceChildren(...methodChoices().map((m) => new Option(m.label, m.value)));
  methodSel.value = methodChoices().some((m) => m.value === picked) ? picked : DEFAULT_SMOOTHER;
  const fillRules = () => {
    const keep = ruleSel.value;
    const c = choiceOf(methodSel.value);
    const rules = ruleChoices(c.analysis, c.options);
    ruleSel.replaceChildren(...rules.map((r) => new Option(r.label, r.value)));
    ruleSel.value = rules.some((r) => r.value === keep) ? keep : 'auto';
    $('rule-note').textContent = defaultRuleNote(c.analysis, c.options);
    $('rule-value').hidden = !(ruleSel.value === 'df' || ruleSel.value === 'value');
    // a decomposition's season setting, as its declaration words it
    const seasons = c.kind === 'decompose' ? optionChoices(c.analysis, 'season') : [];
    const seasonSel = $<HTMLSelectElement>('season');
    const keepSeason = seasonSel.value;
    seasonSel.replaceChildren(...seasons.map((q) => new Option(q.label, q.value)));
    if (seasons.some((q) => q.value === keepSeason)) seasonSel.value = keepSeason;
    $('season-box').hidden = seasons.length === 0;
    fillNoise();
  };
  // what cross-validation assumes of the noise: offered when the method cross-validates with the penalty chosen
  const fillNoise = () => {
    const c = choiceOf(methodSel.value);
    const r = ruleSel.value;
    const given = r === 'df' || r === 'value';
    const show = !given && optionApplies(c.analysis, 'noise', { ...c.options, ...(r === 'auto' ? {} : { rule: r }) });
    const noiseSel = $<HTMLSelectElement>('noise');
    const keep = noiseSel.value;
    const choices = show ? optionChoices(c.analysis, 'noise') : [];
    noiseSel.replaceChildren(...choices.map((q) => new Option(q.label, q.value)));
    if (choices.some((q) => q.value === keep)) noiseSel.value = keep;
    $('noise-box').hidden = choices.length === 0;
  };
  // A second smoother to draw over the first: offered for smoothers only; for the automatic choice its
  // runner-up is the default. Its rules, like the first's, are only those its declaration accepts.
  const secondSel = $<HTMLSelectElement>('second'), secondRule = $<HTMLSelectElement>('second-rule');
  const fillSecondRules = () => {
    const v = secondSel.value;
    const box = $('second-rule-box');
    box.hidden = v === '' || v === 'runner-up';
    if (box.hidden) return;
    const keep = secondRule.value;
    const c = choiceOf(v);
    const rules = ruleChoices(c.analysis, c.options);
    secondRule.replaceChildren(...rules.map((r) => new Option(r.label, r.value)));
    secondRule.value = rules.some((r) => r.value === keep) ? keep : 'auto';
    $('second-rule-value').hidden = !(secondRule.value === 'df' || secondRule.value === 'value');
  };
  let lastFirst = '';
  const fillSecond = () => {
    const first = choiceOf(methodSel.value);
    $('second-box').hidden = first.kind !== 'smooth';
    const keep = secondSel.value;
    const options = [new Option('(nothing)', '')];
    if (first.value === 'auto') options.push(new Option('Runner-up of the automatic choice', 'runner-up'));
    for (const m of methodChoices()) if (m.kind === 'smooth' && m.value !== first.value && m.value !== 'auto') options.push(new Option(m.label, m.value));
    secondSel.replaceChildren(...options);
    // the runner-up is the natural comparison when the method is chosen automatically
    const fresh = first.value !== lastFirst;
    secondSel.value = first.value === 'auto' && fresh ? 'runner-up' : options.some((o) => o.value === keep) ? keep : '';
    lastFirst = first.value;
    fillSecondRules();
  };
  fillRules();
  fillSecond();
  methodSel.addEventListener('change', fillRules);
  methodSel.addEventListener('change', fillSecond);
  secondSel.onchange = fillSecondRules;
  secondRule.onchange = () => { $('second-rule-value').hidden = !(secondRule.value === 'df' || secondRule.value === 'value'); };
  ruleSel.onchange = () => {
    const r = ruleSel.value;
    $('rule-value').hidden = !(r === 'df' || r === 'value');
    fillNoise();
  };
  const progress = new ProgressBox($('status'));
  // load every analysis worker now: the default method (the automatic choice) runs its candidates on all of
  // them at once, so the first fit waits for none of them to load
  pageRuntime().pool?.warm();
  $('run').onclick = async () => {
    const run = progress.start();
    let block: CellBlock | null = null;
    try {
      block = await wb.readSelection();
      showStatus(`Fitting ${block.address} ...`);
      // The fit runs in a worker: the pane stays responsive, shows progress and can cancel.
      // The comparison fit runs after the first in the same way, under the same Cancel.
      const secondRun = { signal: run.signal, onProgress: (p: { fraction: number; stage: string }) => run.onProgress({ fraction: p.fraction, stage: `compared fit: ${p.stage}` }) };
      const first = choiceOf($<HTMLSelectElement>('method').value);
      const chosen = {
        ...first,
        options: {
          ...first.options,
          ...($('season-box').hidden ? {} : { season: $<HTMLSelectElement>('season').value }),
          ...($('noise-box').hidden ? {} : { noise: $<HTMLSelectElement>('noise').value }),
        },
      };
      const analysis = await analyseWith(block, chosen, penaltyFrom(), (r, second) => compute(r, second ? secondRun : run), secondFrom());
      const view = viewOf(analysis, block, { version: VERSION, date: new Date().toISOString().slice(0, 10) });
      last = { block, view };
      renderView(view);
      showStatus(`Fitted ${block.address}.`);
    } catch (e) {
      if (isCancelled(e)) { if (!run.superseded) showStatus('Fit cancelled: nothing new was fitted.'); return; }
      $('results').hidden = true;
      showStatus(errorText(e, block), 'error');
    } finally {
      run.done();
    }
  };
  let resizeTimer = 0;
  window.addEventListener('resize', () => { clearTimeout(resizeTimer); resizeTimer = window.setTimeout(() => resizeCharts(document), 150); });

  const confirmBox = $('confirm');
  let pending: WriteBlock[] = [];
  const doWrite = async () => {
    confirmBox.hidden = true;
    if (!last) return;
    const v = last.view;
    const plan = sharePlan(v);
    try {
      const written = await wb.write(v.sheet, pending);
      let chartAt = '';
      if ($<HTMLInputElement>('share-chart').checked) {
        chartAt = await wb.addChart(v.sheet, plan.chart);
      }
      showStatus(`Wrote ${written.join(', ')}${chartAt ? `; chart at ${chartAt}` : ''}.`);
    } catch (e) {
      showStatus(e instanceof WriteError ? e.message : `Writing failed: ${(e as Error).message}`, 'error');
    }
  };
  $('write').onclick = async () => {
    if (!last) return;
    const plan = sharePlan(last.view);
    pending = [
      ...($<HTMLInputElement>('share-fit').checked ? [plan.fitted] : []),
      ...($<HTMLInputElement>('share-report').checked ? plan.report : []),
    ];
    if (!pending.length && !$<HTMLInputElement>('share-chart').checked) { showStatus('Nothing chosen to write.'); return; }
    if ($<HTMLInputElement>('share-chart').checked && !$<HTMLInputElement>('share-fit').checked) { showStatus('The chart draws the fitted column from the sheet: tick "fitted column" too.', 'error'); return; }
    const taken = await wb.occupied(last.view.sheet, pending);
    if (!taken.length) return doWrite();
    $('confirm-text').textContent = `${taken.join(', ')} already ${taken.length > 1 ? 'hold' : 'holds'} values. Replace them with the ${pending.map((b) => b.what).join(', ')} (report from ${reportStart(plan)})?`;
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
