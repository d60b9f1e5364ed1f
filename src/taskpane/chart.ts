/**
 * The pane's charts, drawn with uPlot (a small canvas time-series chart
 * library): data points, the fitted curve and its band, the end zones whose
 * values get revised, the curve continued after the data (shaded as
 * extrapolation), and knot or break markers with tooltips. Dates get calendar
 * ticks (weeks, months, quarters, years). Also the "why this penalty" plot of
 * the criterion against degrees of freedom.
 *
 * Zones and markers are overlay elements (with tooltips) placed over the
 * plot; the container records what it drew (data-points, data-fit,
 * data-x-ticks) so tests and assistive tools can read it.
 */
import uPlot from 'uplot';
import { calendarTicks, formatNumber } from '../present';
import type { View } from './view';

const FONT = '11px system-ui, sans-serif';
const INK = '#5f7180', GRID = '#eef2f5', FIT = '#0f7c7a', MARK = '#c8611a', POINT = '#7b8fa1';
/** The second fit drawn for comparison (dashed), and a decomposition's season line and stems. */
const SECOND = '#c2185b', SEASON = '#2f5f9e', STEM = '#8a98a6';
/** Width an 11 px label needs, with a gap: a full date (2023-01-02), or a month, quarter or year. */
const DATE_LABEL_PX = 80, SHORT_LABEL_PX = 58;

/** Calendar ticks that fit the plot's width: short labels (months, quarters, years) are packed closer than full dates. */
function ticksFor(u: uPlot, lo: number, hi: number) {
  const px = u.bbox.width / devicePixelRatio;
  const t = calendarTicks(lo, hi, Math.max(2, Math.floor(px / SHORT_LABEL_PX)));
  if ((t.unit === 'day' || t.unit === 'week' || t.unit === 'hour') && t.ticks.length * DATE_LABEL_PX > px) return calendarTicks(lo, hi, Math.max(2, Math.floor(px / DATE_LABEL_PX)));
  return t;
}

const charts = new WeakMap<HTMLElement, uPlot>();
/** The stacked panels drawn in a box (a decomposition), so the next drawing removes them. */
const panelCharts = new WeakMap<HTMLElement, uPlot[]>();

function clear(box: HTMLElement): void {
  charts.get(box)?.destroy();
  charts.delete(box);
  for (const u of panelCharts.get(box) ?? []) u.destroy();
  panelCharts.delete(box);
  box.replaceChildren();
  delete box.dataset.panels;
  delete box.dataset.panelLabels;
  delete box.dataset.second;
  delete box.dataset.xTicks;
}

/** The x axis: calendar ticks and date labels when x are dates (the labels drawn are recorded in box.dataset.xTicks). */
export function axisFor(xDates: boolean, show: (v: number) => string, box: HTMLElement): uPlot.Axis {
  const base: uPlot.Axis = { font: FONT, stroke: INK, grid: { stroke: GRID, width: 1 }, ticks: { stroke: GRID, width: 1 }, gap: 3, size: 28 };
  if (!xDates) return { ...base, values: (_u, splits) => splits.map((v) => formatNumber(v, 4)) };
  return {
    ...base,
    splits: (u, _i, lo, hi) => {
      const t = ticksFor(u, lo, hi);
      return t.ticks.length ? t.ticks : [lo, hi];
    },
    values: (u, splits) => {
      const t = ticksFor(u, u.scales.x.min!, u.scales.x.max!);
      const labels = splits.map((s) => { const k = t.ticks.indexOf(s); return k >= 0 ? t.labels[k] : show(s); });
      box.dataset.xTicks = labels.join('|');
      return labels;
    },
  };
}

const yAxis = (): uPlot.Axis => ({
  font: FONT, stroke: INK, grid: { stroke: GRID, width: 1 }, ticks: { stroke: GRID, width: 1 }, gap: 3, space: 22,
  size: (_u, values) => (values && values.length ? Math.max(...values.map((v) => String(v).length)) * 7 + 20 : 44),
  values: (_u, splits) => splits.map((v) => formatNumber(v, 4)),
});

/** An overlay element over the plot (u.over) at x positions [x0, x1] (one x: a marker line). */
function overlay(u: uPlot, cls: string, title: string): HTMLDivElement {
  const d = document.createElement('div');
  d.className = cls;
  d.title = title;
  u.over.append(d);
  return d;
}

function place(u: uPlot, el: HTMLElement, x0: number, x1?: number): void {
  const a = u.valToPos(x0, 'x');
  const b = x1 === undefined ? a : u.valToPos(x1, 'x');
  el.style.left = `${Math.min(a, b) - (x1 === undefined ? 4 : 0)}px`;
  el.style.width = x1 === undefined ? '9px' : `${Math.max(2, Math.abs(b - a))}px`;
}

/** Legend entries for what is drawn, and nothing else. */
function legend(box: HTMLElement, items: [string, string][]): void {
  const lg = document.createElement('div');
  lg.className = 'legend';
  for (const [cls, text] of items) {
    const item = document.createElement('span');
    item.className = 'legend-item';
    const sw = document.createElement('span');
    sw.className = `swatch ${cls}`;
    item.append(sw, document.createTextNode(text));
    lg.append(item);
  }
  box.append(lg);
}

/** The knot or break markers of a view over a chart, each placed at its x (with `layoutOverlays`), its label as tooltip. */
function addMarkers(u: uPlot, v: Pick<View, 'markers' | 'showX'>, zones: { el: HTMLElement; x0: number; x1?: number }[]): void {
  const marks = document.createElement('div');
  marks.className = 'markers';
  u.over.append(marks);
  for (const m of v.markers) {
    const el = document.createElement('div');
    el.className = 'marker';
    el.title = m.label;
    el.dataset.x = v.showX(m.x);
    marks.append(el);
    zones.push({ el, x0: m.x });
  }
}

/** Draws a fit into `box` (emptied first), as wide as the box. */
export function drawFit(box: HTMLElement, v: View, height = 240): void {
  clear(box);
  const n = v.x.length;
  const bx = v.beyond && v.beyond.x.length > 1 ? v.beyond : undefined;
  // uPlot wants one increasing x for all series: the data's x, then the extrapolated x after the last point.
  const extra = bx ? bx.x.slice(1) : [];
  const xs = [...Array.from(v.x), ...extra];
  const pad = <T,>(a: ArrayLike<number>, after: (number | null)[] = extra.map(() => null)): (number | null)[] => [...Array.from(a), ...after];
  const none = (k: number) => Array<number | null>(k).fill(null);
  // At most about 20000 dots: a chart this size cannot show more, and drawing each as a circle keeps the pane busy.
  const stride = Math.max(1, Math.ceil(n / 20000));
  const dots = stride === 1 ? pad(v.y) : pad(Array.from(v.y, (y, i) => (i % stride === 0 ? y : NaN))).map((y) => (y === null || Number.isNaN(y) ? null : y));
  const data: (number | null)[][] = [xs, dots, pad(v.fitted)];
  const series: uPlot.Series[] = [
    {},
    { label: 'data', stroke: POINT, paths: () => null, points: { show: true, size: 4, width: 0, fill: POINT, stroke: POINT } },
    { label: 'fit', stroke: FIT, width: 2, points: { show: false } },
  ];
  if (v.second) {
    // the comparison fit: another colour and dashed, so the two read apart without colour too
    data.push(pad(v.second.fitted));
    series.push({ label: 'compared', stroke: SECOND, width: 2.5, dash: [6, 4], points: { show: false } });
  }
  const bands: uPlot.Band[] = [];
  if (bx) {
    data.push([...none(n - 1), v.fitted[n - 1], ...bx.y.slice(1)]);
    series.push({ label: 'beyond', stroke: FIT, width: 1.5, dash: [5, 4], points: { show: false } });
  }
  if (v.band) {
    data.push(pad(v.band.upper), pad(v.band.lower));
    series.push({ label: 'upper', stroke: 'transparent', points: { show: false } }, { label: 'lower', stroke: 'transparent', points: { show: false } });
    bands.push({ series: [data.length - 2, data.length - 1], fill: 'rgba(15,124,122,0.13)' });
  }
  if (v.markers.length) {
    const at = new Map(v.markers.map((m) => [m.x, m.y]));
    data.push(xs.map((x, i) => (i < n && at.has(x) ? at.get(x)! : null)));
    series.push({ label: v.markerName, stroke: MARK, paths: () => null, points: { show: true, size: 9, width: 2, stroke: MARK, fill: '#fff' } });
  }
  const width = Math.max(240, box.clientWidth || 320);
  // Overlays are made once the plot exists, and placed on every draw (resize included).
  const zones: { el: HTMLElement; x0: number; x1?: number }[] = [];
  const readout = document.createElement('div');
  readout.className = 'readout';
  readout.textContent = 'Point at the chart to read a value.';
  const u = new uPlot({
    width, height,
    legend: { show: false },
    cursor: { drag: { x: false, y: false }, points: { size: 6 } },
    scales: { x: { time: false } },
    axes: [axisFor(v.xDates, v.showX, box), yAxis()],
    series, bands,
    hooks: {
      setCursor: [(u) => {
        const i = u.cursor.idx;
        if (i === null || i === undefined || i >= n) return;
        const mk = v.markers.find((m) => m.x === xs[i]);
        readout.textContent = `${v.showX(xs[i])}: ${v.yName} ${v.showY(v.y[i])}, fit ${v.showY(v.fitted[i])}${v.second ? `, compared ${v.showY(v.second.fitted[i])}` : ''}${mk ? `; ${mk.label}` : ''}`;
      }],
      draw: [(u) => layoutOverlays(u, zones)],
    },
  }, data as uPlot.AlignedData, box);
  charts.set(box, u);
  const ends = v.boundaryPoints > 0 && n > 2 * v.boundaryPoints;
  if (ends) {
    for (const [i0, i1] of [[0, v.boundaryPoints - 1], [n - v.boundaryPoints, n - 1]]) {
      zones.push({ el: overlay(u, 'zone zone-boundary', `End zone (${v.showX(v.x[i0])} to ${v.showX(v.x[i1])}): these fitted values rest on data from one side and will be revised as data arrive.`), x0: v.x[i0], x1: v.x[i1] });
    }
  }
  if (bx) zones.push({ el: overlay(u, 'zone zone-extrapolation', `After ${v.showX(v.x[n - 1])}: the fitted curve continued beyond the data, an extrapolation, not a forecast.`), x0: bx.x[0], x1: bx.x[bx.x.length - 1] });
  addMarkers(u, v, zones);
  layoutOverlays(u, zones);
  box.dataset.points = String(dots.filter((y) => y !== null && Number.isFinite(y)).length);
  box.dataset.stride = String(stride);
  box.dataset.fit = String(v.fitted.filter(Number.isFinite).length);
  box.dataset.markers = String(v.markers.length);
  if (v.second) box.dataset.second = String(v.second.fitted.filter(Number.isFinite).length);
  const items: [string, string][] = [['sw-points', stride > 1 ? `data (1 in ${stride} points drawn)` : 'data'], ['sw-fit', v.second ? `fit: ${v.fitLabel ?? 'first method'}` : 'fit']];
  if (v.second) items.push(['sw-second', `compared: ${v.second.label}`]);
  if (v.band) items.push(['sw-band', 'approx. 95% band']);
  if (ends) items.push(['sw-edge', 'end zone: values get revised']);
  if (bx) items.push(['sw-beyond', 'after the data: extrapolation, not a forecast']);
  if (v.markers.length) items.push(['sw-mark', `${v.markerName === 'knot' ? 'knot' : 'break'}${v.second ? ' of the fit' : ''}`]);
  legend(box, items);
  box.append(readout);
}

function layoutOverlays(u: uPlot, zones: { el: HTMLElement; x0: number; x1?: number }[]): void {
  for (const z of zones) place(u, z.el, z.x0, z.x1);
}

/** Redraws every chart in `root` at its box's current width. */
export function resizeCharts(root: ParentNode): void {
  root.querySelectorAll<HTMLElement>('.chart-box').forEach((box) => {
    const u = charts.get(box);
    if (u && box.clientWidth > 0) u.setSize({ width: Math.max(240, box.clientWidth), height: u.height });
    for (const p of panelCharts.get(box) ?? []) if (box.clientWidth > 0) p.setSize({ width: Math.max(240, box.clientWidth), height: p.height });
  });
}

/**
 * Draws a decomposition into `box` (emptied first): one panel per component, stacked on one x axis
 * (calendar ticks on the bottom panel, the same grid on all), with a synchronised cursor and one
 * readout of every component at the pointed x. The top panel shows the data with the trend, its end
 * zones and knots; spikes are ringed where they occur.
 */
export function drawPanels(box: HTMLElement, v: View): void {
  clear(box);
  const panels = v.panels ?? [];
  const n = v.x.length;
  const xs = Array.from(v.x);
  const lo = xs[0], hi = xs[n - 1] > xs[0] ? xs[n - 1] : xs[0] + 1;
  const width = Math.max(240, box.clientWidth || 320);
  // one y-axis width for every panel, so the plots (and their x positions) line up
  const rangeText = (a: ArrayLike<number> | undefined) => {
    if (!a) return 0;
    let mn = Infinity, mx = -Infinity;
    for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i])) { mn = Math.min(mn, a[i]); mx = Math.max(mx, a[i]); }
    return Number.isFinite(mn) ? Math.max(formatNumber(mn, 4).length, formatNumber(mx, 4).length) : 0;
  };
  const ySize = Math.max(40, 7 * Math.max(...panels.map((p) => Math.max(rangeText(p.dots), rangeText(p.line), rangeText(p.stems)))) + 22);
  const readout = document.createElement('div');
  readout.className = 'readout';
  readout.textContent = 'Point at a panel to read every component there.';
  const plots: uPlot[] = [];
  const key = `panels-${Math.random().toString(36).slice(2)}`;
  const zones: { el: HTMLElement; x0: number; x1?: number }[] = [];
  const withZero = (_u: uPlot, mn: number, mx: number): uPlot.Range.MinMax => {
    const a = Math.min(0, mn), b = Math.max(0, mx);
    const pad = (b - a) * 0.08 || 1;
    return [a - pad, b + pad];
  };
  panels.forEach((p, k) => {
    const last = k === panels.length - 1;
    const wrap = document.createElement('div');
    wrap.className = 'panel';
    wrap.dataset.panel = p.id;
    const label = document.createElement('div');
    label.className = 'panel-label';
    label.textContent = p.label;
    const plot = document.createElement('div');
    plot.className = 'panel-plot';
    wrap.append(label, plot);
    box.append(wrap);
    const data: (number | null)[][] = [xs];
    const series: uPlot.Series[] = [{}];
    if (p.dots) {
      data.push(Array.from(p.dots));
      series.push({ label: 'data', stroke: POINT, paths: () => null, points: { show: true, size: 3.5, width: 0, fill: POINT, stroke: POINT } });
    }
    if (p.line) {
      data.push(Array.from(p.line));
      series.push({ label: p.lineName ?? 'line', stroke: k === 0 ? FIT : SEASON, width: 2, points: { show: false } });
    }
    if (p.stems) {
      // spikes: only the non-zero ones drawn; remainder: every point, a thin stem from zero
      const isSpikes = p.id === 'spikes';
      data.push(Array.from(p.stems, (s) => (isSpikes && s === 0 ? null : s)));
      series.push({ label: p.lineName ?? 'stems', stroke: isSpikes ? MARK : STEM, fill: isSpikes ? MARK : STEM, width: 0, paths: uPlot.paths.bars!({ size: [0.5, isSpikes ? 3 : 2], align: 0 }), points: { show: false } });
    }
    if (p.marked && p.marked.length) {
      const at = new Set(p.marked);
      const src = p.dots ?? p.stems!;
      data.push(xs.map((_, i) => (at.has(i) ? src[i] : null)));
      series.push({ label: 'spike', stroke: MARK, paths: () => null, points: { show: true, size: 9, width: 2, stroke: MARK, fill: 'rgba(255,255,255,0)' } });
    }
    const xAxis = axisFor(v.xDates, v.showX, box);
    const axes: uPlot.Axis[] = [
      last ? xAxis : { ...xAxis, values: (_u, splits) => splits.map(() => ''), size: 4, gap: 0 },
      { ...yAxis(), size: ySize, space: k === 0 ? 24 : 15 },
    ];
    const height = (k === 0 ? 130 : 84) + (last ? 28 : 4);
    const u = new uPlot({
      width, height,
      legend: { show: false },
      cursor: { drag: { x: false, y: false }, points: { size: 5 }, sync: { key, setSeries: false } },
      scales: { x: { time: false, range: [lo, hi] }, ...(p.stems || p.id.startsWith('season') ? { y: { range: withZero } } : {}) },
      axes, series,
      hooks: {
        setCursor: [(u) => {
          const i = u.cursor.idx;
          if (i === null || i === undefined || i >= n) return;
          const parts = panels.flatMap((q) => {
            const name = q.id === 'data' ? v.yName : q.lineName ?? q.id;
            const out: string[] = [];
            if (q.dots) out.push(`${name} ${v.showY(q.dots[i])}`);
            if (q.line) out.push(`${q.lineName} ${v.showY(q.line[i])}`);
            if (q.stems) out.push(`${name} ${v.showY(q.stems[i])}`);
            return out;
          });
          const mk = v.markers.find((m) => m.x === xs[i]);
          readout.textContent = `${v.showX(xs[i])}: ${parts.join(', ')}${mk ? `; ${mk.label}` : ''}`;
        }],
        ...(k === 0 ? { draw: [(u: uPlot) => layoutOverlays(u, zones)] } : {}),
      },
    }, data as uPlot.AlignedData, plot);
    plots.push(u);
  });
  panelCharts.set(box, plots);
  // end zones and knots on the top panel, as on a fit's chart
  const top = plots[0];
  const ends = top && v.boundaryPoints > 0 && n > 2 * v.boundaryPoints;
  if (top && ends) {
    for (const [i0, i1] of [[0, v.boundaryPoints - 1], [n - v.boundaryPoints, n - 1]]) {
      zones.push({ el: overlay(top, 'zone zone-boundary', `End zone (${v.showX(v.x[i0])} to ${v.showX(v.x[i1])}): the trend here rests on data from one side and will be revised as data arrive.`), x0: v.x[i0], x1: v.x[i1] });
    }
  }
  if (top && v.markers.length) addMarkers(top, v, zones);
  if (top) layoutOverlays(top, zones);
  box.dataset.panels = String(panels.length);
  box.dataset.panelLabels = panels.map((p) => p.label).join('|');
  box.dataset.points = String(n);
  box.dataset.fit = String(v.fitted.filter(Number.isFinite).length);
  box.dataset.markers = String(v.markers.length);
  const items: [string, string][] = [['sw-points', 'data'], ['sw-fit', 'trend']];
  if (panels.some((p) => p.id.startsWith('season'))) items.push(['sw-season', 'season']);
  if (panels.some((p) => p.id === 'spikes')) items.push(['sw-ring', 'spike']);
  items.push(['sw-stem', 'remainder']);
  if (v.markers.length) items.push(['sw-mark', 'knot']);
  if (ends) items.push(['sw-edge', 'end zone: values get revised']);
  legend(box, items);
  box.append(readout);
  const note = document.createElement('div');
  note.className = 'note panel-note';
  note.textContent = 'y = trend + season + spikes + remainder. The trend describes the past; it is not a forecast, and its last values will be revised as data arrive.';
  box.append(note);
}

/** Draws the criterion against df, marking the chosen fit. */
export function drawCurve(box: HTMLElement, c: NonNullable<View['curve']>, height = 160): void {
  clear(box);
  const order = c.df.map((_, i) => i).filter((i) => Number.isFinite(c.score[i]) && Number.isFinite(c.df[i])).sort((a, b) => c.df[a] - c.df[b]);
  const xs = order.map((i) => c.df[i]), ys = order.map((i) => c.score[i]);
  if (!xs.length) return;
  const chosenY = Number.isFinite(c.chosenScore) ? c.chosenScore : ys[0];
  // The chosen point joins the x values so it can be drawn as its own series.
  const all = [...xs.map((x, i) => ({ x, y: ys[i] as number | null, c: null as number | null })), { x: c.chosenDf, y: null, c: chosenY }].sort((a, b) => a.x - b.x);
  const width = Math.max(240, box.clientWidth || 320);
  const u = new uPlot({
    width, height, legend: { show: false }, cursor: { show: false },
    scales: { x: { time: false } },
    axes: [{ ...axisFor(false, String, box), label: c.xLabel, labelFont: FONT, labelSize: 16, size: 26 }, { ...yAxis(), label: c.name, labelFont: FONT, labelSize: 16 }],
    series: [{}, { stroke: '#1d2b36', width: 1.5, spanGaps: true, paths: c.step ? uPlot.paths.stepped!({ align: 1 }) : undefined, points: { show: false } },
      { stroke: MARK, paths: () => null, points: { show: true, size: 9, fill: MARK, stroke: MARK } }],
  }, [all.map((p) => p.x), all.map((p) => p.y), all.map((p) => p.c)] as uPlot.AlignedData, box);
  charts.set(box, u);
  box.dataset.chosen = `${c.xLabel} ${Number(c.chosenDf.toPrecision(3))}`;
  const note = document.createElement('div');
  note.className = 'readout';
  note.textContent = `Chosen: ${c.xLabel} ${Number(c.chosenDf.toPrecision(3))}, ${c.name} ${formatNumber(chosenY, 4)}.${c.leftOut ? ` ${c.leftOut} ${c.leftOut === 1 ? 'point' : 'points'} of the search not drawn: their fits did not converge, so their degrees of freedom are not known.` : ''}`;
  box.append(note);
}

/** The axis label sizes (CSS px) of the chart drawn in `box`, as uPlot draws them. */
export function axisFontSizes(box: HTMLElement): number[] {
  const all = [charts.get(box), ...(panelCharts.get(box) ?? [])].filter((u): u is uPlot => !!u);
  return all.flatMap((u) => u.axes.map((a) => {
    const f = a.font as unknown;
    const text = Array.isArray(f) ? String(f[0]) : String(f);
    return parseFloat(text) / devicePixelRatio;
  }));
}
