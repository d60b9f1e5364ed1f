/**
 * The continuous piecewise-linear model ('slope') by CPOP.
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning, type Warning } from '../warnings';
import { cpop, type SlopeSegmentation } from './cpop';
import { cropsWithCounts } from './crops';
import { givenOrEstimatedSigma } from './stepBreaks';
import { parametersPerChange, penaltyValue } from './penaltyValue';
import { median } from '../median';
import { correlationNote, noiseTreatment } from './noiseCorrelation';
import { autocorrelationWarning, breakCauseWarning, residualAutocorrelation } from './summariseSegment';
import type { Break, BreaksResult, CropsRow, SegmentSummary } from './types';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';

const NO_INTERVAL = { given: false as const, note: 'CPOP returns the optimal kink location only; no confidence interval is computed.' };

/** Points with equal x merged into one weighted position (exact for a fitted curve in x). Unchecked. */
export interface MergedPositions {
  /** Distinct x (original units). */
  x: Float64Array;
  /** Total weight, weighted mean of y, and sum of w y^2 at each position. */
  w: Float64Array;
  y: Float64Array;
  wyy: Float64Array;
  /** First and last clean point of each position. */
  first: Int32Array;
  last: Int32Array;
}

/** Merges tied x of a series, with y mapped through z = (y - centre) / scale. Unchecked. */
export function mergePositions(series: Series, centre: number, scale: number): MergedPositions {
  const n = series.n;
  const xs: number[] = [], ws: number[] = [], ys: number[] = [], yy: number[] = [], f: number[] = [], l: number[] = [];
  for (let i = 0; i < n; i++) {
    const z = (series.y[i] - centre) / scale;
    const wi = series.w[i];
    const k = xs.length - 1;
    if (k >= 0 && xs[k] === series.x[i]) {
      ws[k] += wi; ys[k] += wi * z; yy[k] += wi * z * z; l[k] = i;
    } else {
      xs.push(series.x[i]); ws.push(wi); ys.push(wi * z); yy.push(wi * z * z); f.push(i); l.push(i);
    }
  }
  for (let k = 0; k < xs.length; k++) ys[k] /= ws[k];
  return { x: Float64Array.from(xs), w: Float64Array.from(ws), y: Float64Array.from(ys), wyy: Float64Array.from(yy), first: Int32Array.from(f), last: Int32Array.from(l) };
}

/**
 * Fits the L0-penalised continuous piecewise-linear model to a clean series by
 * {@link cpop} and summarises it (see {@link findBreaks} for the public contract).
 * Unchecked options (validated by the caller).
 */
export function slopeBreaks(series: Series, o: ResolvedBreaksOptions): BreaksResult {
  const n = series.n;
  const notes: Warning[] = [];
  const centre = median(series.y);
  const raw = mergePositions(series, 0, 1);
  const m = raw.x.length;
  if (m < 2) throw new KnotwiseError('too-few-points', `model 'slope' needs at least 2 distinct x values; got ${m}.`);
  if (m - 1 < o.minSegment) throw new KnotwiseError('too-few-points', `model 'slope' with minSegment ${o.minSegment} needs at least ${o.minSegment + 1} distinct x values; got ${m}.`);
  const noise = noiseTreatment(raw.y, o);
  const est = givenOrEstimatedSigma(o.sigma, raw.y, 2, notes);
  // second differences of AR(1) noise have variance 2 s^2 (1 - phi)(3 - phi): their
  // scale sqrt(var / 6) is turned back into the marginal noise sd s
  const phi = noise.correlation;
  const sigma = est.source === 'given' ? est.value : est.value / Math.sqrt(((1 - phi) * (3 - phi)) / 3);
  const source = est.source;
  const P = mergePositions(series, centre, sigma);
  let ss = 0;
  for (let k = 0; k < P.wyy.length; k++) ss += P.wyy[k];
  if (!Number.isFinite(ss)) {
    throw new KnotwiseError('bad-data', `the values span more than about 1e150 noise scales (noise scale ${showNumber(sigma)}), so the squared-error cost overflows; remove the far-off values, or use the level model, which sets single far-off values aside as spikes.`);
  }
  const x0 = P.x[0], span = P.x[m - 1] - P.x[0];
  const u = new Float64Array(m);
  for (let k = 0; k < m; k++) u[k] = (P.x[k] - x0) / span;
  const p = parametersPerChange('slope');
  const beta = penaltyValue(o.penalty, n, p) * noise.penaltyFactor;
  const solve = (b: number): SlopeSegmentation => cpop(u, P.y, P.w, P.wyy, b, o.minSegment);
  const seg = solve(beta);
  let runs = 1, evaluations = seg.evaluations, maxCandidates = seg.maxCandidates;
  let inexact = seg.exact ? 0 : 1;
  const warnings: Warning[] = [...series.warnings, ...notes];
  let table: CropsRow[] | undefined;
  if (o.crops) {
    const out = cropsWithCounts((b) => { const r = solve(b); if (!r.exact) inexact++; return r; }, o.crops, o.maxRuns);
    runs += out.runs;
    evaluations += out.evaluations;
    maxCandidates = Math.max(maxCandidates, out.maxCandidates);
    table = out.rows.map((r) => ({ ...r, breaks: r.breaks.map((g) => P.first[g]) }));
    if (out.warning) warnings.push(out.warning);
  }
  if (inexact) {
    warnings.push(warning('not-converged', `the exact search for kinks ran out of its work budget (${inexact} of ${runs} search${runs === 1 ? '' : 'es'}); the broken line returned is the best found, not proven optimal. Long series with many kinks cost most: try a larger penalty, a larger minSegment, or a shorter range.`));
  }
  // broken line through the knots, back in y units
  const knots = [0, ...seg.changes, m - 1];
  const kx = knots.map((g) => P.x[g]);
  const kv = seg.knotValues.map((v) => centre + sigma * v);
  const fitted = new Float64Array(n);
  let seg_k = 0;
  for (let i = 0; i < n; i++) {
    const xi = series.x[i];
    while (seg_k < knots.length - 2 && xi > kx[seg_k + 1]) seg_k++;
    const t = (xi - kx[seg_k]) / (kx[seg_k + 1] - kx[seg_k]);
    fitted[i] = kv[seg_k] + t * (kv[seg_k + 1] - kv[seg_k]);
  }
  const segments: SegmentSummary[] = [];
  for (let k = 0; k + 1 < knots.length; k++) {
    const start = P.first[knots[k]], end = P.last[knots[k + 1]];
    const slope = (kv[k + 1] - kv[k]) / (kx[k + 1] - kx[k]);
    const intercept = kv[k] - slope * kx[k];
    let W = 0, S = 0, R = 0;
    for (let i = start; i <= end; i++) {
      const wi = series.w[i];
      W += wi; S += wi * series.y[i];
      const r = series.y[i] - fitted[i];
      R += wi * r * r;
    }
    segments.push({
      start, end, xStart: series.x[start], xEnd: series.x[end], rowStart: series.firstRow[start], rowEnd: series.firstRow[end],
      n: end - start + 1, mean: S / W, sd: Math.sqrt(R / W), level: NaN, rate: NaN, median: NaN, slope, intercept,
    });
  }
  const breaks: Break[] = seg.changes.map((g, k) => {
    const idx = P.first[g];
    return { index: idx, row: series.firstRow[idx], x: series.x[idx], before: segments[k], after: segments[k + 1], change: segments[k + 1].slope - segments[k].slope, changeSd: segments[k + 1].sd - segments[k].sd, uncertainty: NO_INTERVAL };
  });
  const cn = correlationNote(noise);
  if (cn) warnings.push(cn);
  if (noise.assumption === 'independent') {
    const aw = autocorrelationWarning(residualAutocorrelation(series.y, fitted), n, breaks.length);
    if (aw) warnings.push(aw);
  }
  warnings.push(breakCauseWarning(breaks.length));
  return {
    model: 'slope',
    penalty: { rule: typeof o.penalty === 'number' ? 'manual' : o.penalty, value: beta, parametersPerChange: p },
    sigma: { value: sigma, source },
    breaks, spikes: [], noise: { assumption: noise.assumption, correlation: noise.correlation, penaltyFactor: noise.penaltyFactor },
    season: { adjusted: false, request: 'none', period: NaN, strength: NaN, note: '' },
    segments, fitted,
    cost: seg.cost, penalisedCost: seg.penalisedCost,
    ...(table ? { crops: table } : {}),
    warnings,
    solver: {
      algorithm: 'cpop', converged: inexact === 0, iterations: m, evaluations, maxCandidates, meanCandidates: seg.meanCandidates, runs,
      stoppingRule: 'exact dynamic programme over the fitted value at the latest kink (piecewise-quadratic cost functions), repeated with a rising cost ceiling until a pass proves its line optimal; stops early (converged false) after 2e8 candidate evaluations.',
    },
  };
}
