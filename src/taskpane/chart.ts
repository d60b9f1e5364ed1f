/**
 * SVG drawing of a fit: data points, the fitted curve, knots or breaks, the
 * end zones whose values get revised, and the curve continued beyond the data
 * (shaded as extrapolation). Also the "why this penalty" plot of the
 * criterion against degrees of freedom.
 */
import type { View } from './analysis';

const NS = 'http://www.w3.org/2000/svg';

function el(name: string, attrs: Record<string, string | number>, parent?: Element): SVGElement {
  const e = document.createElementNS(NS, name);
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, String(v));
  if (parent) parent.appendChild(e);
  return e;
}

function ticks(lo: number, hi: number, count = 5): number[] {
  const span = hi - lo || 1;
  const step0 = span / count;
  const mag = Math.pow(10, Math.floor(Math.log10(step0)));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= step0) ?? step0;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + 1e-9 * span; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

/** Excel serial date (1900 system, days since 1899-12-30) as yyyy-mm-dd. */
export function serialToIso(serial: number): string {
  const ms = Math.round((serial - 25569) * 86400000);
  return new Date(ms).toISOString().slice(0, 10);
}

const label = (v: number) => (Math.abs(v) >= 1e5 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(1) : String(Number(v.toPrecision(6))));

interface Frame { x0: number; x1: number; y0: number; y1: number; w: number; h: number; m: { l: number; r: number; t: number; b: number } }

function frame(svg: SVGSVGElement, xs: number[], ys: number[], w: number, h: number, xLabel: (v: number) => string = label): { f: Frame; sx: (v: number) => number; sy: (v: number) => number } {
  const m = { l: 52, r: 10, t: 10, b: 26 };
  let x0 = Math.min(...xs), x1 = Math.max(...xs), y0 = Math.min(...ys), y1 = Math.max(...ys);
  if (x1 === x0) { x0 -= 1; x1 += 1; }
  if (y1 === y0) { y0 -= 1; y1 += 1; }
  const pad = 0.05 * (y1 - y0);
  y0 -= pad; y1 += pad;
  const f = { x0, x1, y0, y1, w, h, m };
  const sx = (v: number) => m.l + ((v - x0) / (x1 - x0)) * (w - m.l - m.r);
  const sy = (v: number) => h - m.b - ((v - y0) / (y1 - y0)) * (h - m.t - m.b);
  svg.setAttribute('viewBox', `0 0 ${w} ${h}`);
  const axes = el('g', { class: 'axes' }, svg);
  for (const t of ticks(x0, x1)) {
    el('line', { x1: sx(t), x2: sx(t), y1: m.t, y2: h - m.b, class: 'grid' }, axes);
    const px = sx(t);
    const anchor = px > w - 40 ? 'end' : px < m.l + 20 ? 'start' : 'middle';
    const tx = el('text', { x: px, y: h - 8, 'text-anchor': anchor, class: 'tick' }, axes); tx.textContent = xLabel(t);
  }
  for (const t of ticks(y0, y1)) {
    el('line', { x1: m.l, x2: w - m.r, y1: sy(t), y2: sy(t), class: 'grid' }, axes);
    const ty = el('text', { x: m.l - 4, y: sy(t) + 3, 'text-anchor': 'end', class: 'tick' }, axes); ty.textContent = label(t);
  }
  return { f, sx, sy };
}

function pathOf(xs: ArrayLike<number>, ys: ArrayLike<number>, sx: (v: number) => number, sy: (v: number) => number): string {
  const step = Math.max(1, Math.ceil(xs.length / 4000));
  let d = '';
  for (let i = 0; i < xs.length; i += step) d += `${i ? 'L' : 'M'}${sx(xs[i]).toFixed(1)},${sy(ys[i]).toFixed(1)}`;
  const last = xs.length - 1;
  if (last > 0 && last % step !== 0) d += `L${sx(xs[last]).toFixed(1)},${sy(ys[last]).toFixed(1)}`;
  return d;
}

/** Draws a fit into an (emptied) SVG element. */
export function drawFit(svg: SVGSVGElement, v: View, width = 560, height = 280): void {
  svg.replaceChildren();
  const allX = [...Array.from(v.x), ...(v.beyond ? [...v.beyond.left.x, ...v.beyond.right.x] : [])];
  const allY = [...Array.from(v.y), ...Array.from(v.fitted), ...(v.beyond ? [...v.beyond.left.y, ...v.beyond.right.y] : [])];
  const { f, sx, sy } = frame(svg, allX, allY, width, height, v.xDates ? serialToIso : label);
  const n = v.x.length;
  if (v.beyond) {
    for (const side of [v.beyond.left, v.beyond.right]) {
      const a = sx(side.x[0]), b = sx(side.x[side.x.length - 1]);
      const r = el('rect', { x: Math.min(a, b), y: f.m.t, width: Math.abs(b - a), height: f.h - f.m.t - f.m.b, class: 'zone-extrapolation' }, svg);
      el('title', {}, r).textContent = 'Beyond the data: an extrapolation of the fitted curve, not a forecast.';
    }
  }
  if (v.boundaryPoints > 0 && n > 2 * v.boundaryPoints) {
    for (const [i0, i1] of [[0, v.boundaryPoints - 1], [n - v.boundaryPoints, n - 1]]) {
      const r = el('rect', { x: sx(v.x[i0]), y: f.m.t, width: Math.max(1, sx(v.x[i1]) - sx(v.x[i0])), height: f.h - f.m.t - f.m.b, class: 'zone-boundary' }, svg);
      el('title', {}, r).textContent = 'End zone: these fitted values rest on data from one side and will be revised as data arrive.';
    }
  }
  // At most about 3000 dots and 4000 path vertices: a chart this size cannot show more, and the pane stays responsive.
  const pts = el('g', { class: 'points' }, svg);
  const stride = Math.max(1, Math.ceil(n / 3000));
  if (stride > 1) pts.setAttribute('data-stride', String(stride));
  for (let i = 0; i < n; i += stride) el('circle', { cx: sx(v.x[i]).toFixed(1), cy: sy(v.y[i]).toFixed(1), r: 2.2 }, pts);
  if (v.beyond) {
    for (const side of [v.beyond.left, v.beyond.right]) el('path', { d: pathOf(side.x, side.y, sx, sy), class: 'fit-beyond' }, svg);
  }
  if (v.band) {
    const up = pathOf(v.x, v.band.upper, sx, sy);
    const xsR = Array.from(v.x).reverse(), loR = Array.from(v.band.lower).reverse();
    const down = pathOf(xsR, loR, sx, sy).replace(/^M/, 'L');
    const b = el('path', { d: `${up}${down}Z`, class: 'band' }, svg);
    el('title', {}, b).textContent = 'Approximate 95% pointwise band (fitted value +/- 1.96 standard errors).';
  }
  el('path', { d: pathOf(v.x, v.fitted, sx, sy), class: 'fit' }, svg);
  const marks = el('g', { class: 'markers' }, svg);
  for (const mk of v.markers) {
    const line = el('line', { x1: sx(mk.x), x2: sx(mk.x), y1: f.m.t, y2: f.h - f.m.b, class: 'marker' }, marks);
    el('title', {}, line).textContent = mk.label;
  }
}

/** Draws the criterion against df, marking the chosen fit. */
export function drawCurve(svg: SVGSVGElement, c: NonNullable<View['curve']>, width = 560, height = 180): void {
  svg.replaceChildren();
  const order = c.df.map((_, i) => i).filter((i) => Number.isFinite(c.score[i]) && Number.isFinite(c.df[i])).sort((a, b) => c.df[a] - c.df[b]);
  const xs = order.map((i) => c.df[i]), ys = order.map((i) => c.score[i]);
  if (!xs.length) return;
  const { sx, sy } = frame(svg, [...xs, c.chosenDf], [...ys, Number.isFinite(c.chosenScore) ? c.chosenScore : ys[0]], width, height);
  el('path', { d: pathOf(xs, ys, sx, sy), class: 'curve' }, svg);
  const cy = Number.isFinite(c.chosenScore) ? c.chosenScore : ys[0];
  const dot = el('circle', { cx: sx(c.chosenDf), cy: sy(cy), r: 4.5, class: 'chosen' }, svg);
  el('title', {}, dot).textContent = `chosen: df ${c.chosenDf.toPrecision(4)}`;
  const t = el('text', { x: width - 12, y: 22, 'text-anchor': 'end', class: 'tick' }, svg);
  t.textContent = `${c.name} against ${c.xLabel}`;
}
