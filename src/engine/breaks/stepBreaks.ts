/**
 * Piecewise-constant models ('meanvar', 'poisson', 'distribution') by PELT; 'mean' has
 * its own FPOP search ({@link levelBreaks}).
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning, listRows, type Warning } from '../warnings';
import { meanVarCost, MEANVAR_FLOOR } from './costMeanVar';
import { differenceSigma } from '../robustSigma';

/**
 * The volatility model's quietest segment, as a share of the series' noise
 * standard deviation read from its differences (robust to level shifts and
 * trends): no segment's standard deviation is taken below a tenth of it. A segment of a few near-equal values otherwise has a likelihood that grows
 * without bound as its variance shrinks, and was reported as a change in its own
 * right (three weekly values within one unit of each other in a series whose noise
 * sd is 13). Real calm spells (a third or a fifth of the usual spread) stay well
 * above the floor; a spell calmer than a tenth is still found, reported at this
 * floor, with a note. Because the floored cost is a minimum over variances at or
 * above the floor, PELT's pruning stays exact.
 */
export const QUIETEST_SEGMENT = 0.1;
import { recordingResolution } from './recordingResolution';
import { poissonCost } from './costPoisson';
import { distributionCost } from './costDistribution';
import { cropsWithCounts } from './crops';
import { pelt } from './pelt';
import { parametersPerChange, penaltyValue } from './penaltyValue';
import { noiseScale } from '../robustSigma';
import { median } from '../median';
import { weightedMoments } from '../weightedMoments';
import type { SegmentCost } from './segmentCost';
import { breakCauseWarning, summariseSegment } from './summariseSegment';
import type { Break, BreaksResult, NoiseTreatment, SegmentSummary } from './types';
import { correlationNote, noiseTreatment } from './noiseCorrelation';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';

const NO_INTERVAL = { given: false as const, note: 'PELT returns the optimal location only; no confidence interval is computed.' };

/** Mask of points where a change may start: not between rows with equal x. Unchecked. */
export function changeAllowed(x: Float64Array): Uint8Array {
  const a = new Uint8Array(x.length);
  for (let i = 1; i < x.length; i++) a[i] = x[i] !== x[i - 1] ? 1 : 0;
  return a;
}

/**
 * The noise scale of a model: `given` when set, else {@link noiseScale} of y with its
 * fallback note (if any) added to `notes`. Unchecked.
 */
export function givenOrEstimatedSigma(given: number | undefined, y: ArrayLike<number>, order: 1 | 2, notes: Warning[]): { value: number; source: 'given' | 'estimated' } {
  if (given !== undefined) return { value: given, source: 'given' };
  const est = noiseScale(y, order);
  if (est.note) notes.push(warning('note', est.note));
  return { value: est.value, source: 'estimated' };
}

/** Builds the segment cost of a PELT model ('meanvar', 'poisson', 'distribution'), with its notes. Unchecked options (validated). */
export function stepCost(series: Series, o: ResolvedBreaksOptions, exposure?: Float64Array): { cost: SegmentCost & { floored?(s: number, t: number): boolean }; notes: Warning[]; floorNote?: string } {
  const { y, w } = series;
  const notes: Warning[] = [];
  switch (o.model) {
    case 'meanvar': {
      // a robust centre and spread (one far-off value must not set the scale of all others)
      const m = median(y);
      const mad = 1.4826 * median(Float64Array.from(y, (v) => Math.abs(v - m)));
      const scale = mad > 0 ? mad : weightedMoments(y, w).sd;
      let ss = 0;
      for (let i = 0; i < y.length; i++) { const z = (y[i] - m) / scale; ss += w[i] * z * z; }
      if (!Number.isFinite(ss)) {
        throw new KnotwiseError('bad-data', `the values span more than about 1e150 times their typical spread (${showNumber(scale)}), so the variance cost overflows; remove the far-off values, or use the level model, which sets single far-off values aside as spikes.`);
      }
      const q = recordingResolution(y);
      const rounding = q > 0 ? (q / scale) ** 2 / 12 : 0;
      // the noise scale from differences (level shifts and trends barely move it), on the standardised scale
      const noise = differenceSigma(y, 1, series.weighted ? w : undefined) / scale;
      const quiet = noise > 0 && Number.isFinite(noise) ? (QUIETEST_SEGMENT * noise) ** 2 : 0;
      const floor = Math.max(rounding, quiet, MEANVAR_FLOOR);
      const floorNote = floor === rounding ? `the rounding variance (${showNumber(q)})^2 / 12 of values recorded to ${showNumber(q)}`
        : floor === quiet ? `(${QUIETEST_SEGMENT} x ${showNumber(noise * scale)})^2, a tenth of the noise standard deviation read from the differences of the series`
          : `${MEANVAR_FLOOR} times the series variance`;
      return { cost: meanVarCost(y, w, m, scale, floor), notes, floorNote };
    }
    case 'poisson': {
      const fractional: number[] = [];
      for (let i = 0; i < series.n; i++) {
        const v = y[i];
        if (v < 0) {
          throw new KnotwiseError('bad-data', `the counts model needs counts (whole numbers >= 0); row ${series.firstRow[i] + 1} holds ${showNumber(v)}. Use the level model for measurements.`);
        }
        if (!Number.isInteger(v)) fractional.push(series.firstRow[i]);
      }
      if (fractional.length) {
        notes.push(warning('note', `the counts model is meant for counts, but ${fractional.length} value${fractional.length === 1 ? ' is' : 's are'} not whole (row${fractional.length === 1 ? '' : 's'} ${listRows(fractional)}, e.g. ${showNumber(y[series.rowOf[fractional[0]]])}); the rate model still runs, but its penalty assumes count noise (variance equal to the mean). For measurements or rates use the level or volatility model.`, fractional));
      }
      return { cost: poissonCost(y, w, exposure), notes };
    }
    default:
      if (series.weighted) notes.push(warning('note', "model 'distribution' ignores weights: its cost compares empirical distributions of the values."));
      return { cost: distributionCost(y, o.quantiles), notes };
  }
}

/**
 * Segments a clean series with a piecewise-constant model by {@link pelt} and
 * summarises the result (see {@link findBreaks} for the public contract). Unchecked
 * options (validated by the caller).
 */
export function stepBreaks(series: Series, o: ResolvedBreaksOptions, exposure?: Float64Array): BreaksResult {
  const first = stepBreaksOnce(series, o, exposure);
  if (o.minSegment !== 1 || o.crops || typeof o.penalty === 'number') return first;
  // with a named penalty rule, a segment of one point between two changes is a spike,
  // not two breaks: set such points aside, search again without them, and report them in
  // spikes (a manual penalty or CROPS gives the exact optimum of the stated cost instead)
  const single: number[] = [];
  for (const seg of first.segments) if (seg.n === 1 && seg.start > 0 && seg.end < series.n - 1) single.push(seg.start);
  if (!single.length || series.n - single.length < 2) return first;
  const keep: number[] = [];
  const drop = new Set(single);
  for (let i = 0; i < series.n; i++) if (!drop.has(i)) keep.push(i);
  const sub = subSeries(series, keep);
  const r = stepBreaksOnce(sub, o, exposure ? Float64Array.from(keep, (i) => exposure[i]) : undefined);
  return withSpikesBack(r, series, keep, single, exposure);
}

/** The points `keep` of a series, as a series of their own. Unchecked. */
export function subSeries(series: Series, keep: readonly number[]): Series {
  const rowOf = new Int32Array(series.rowOf.length).fill(-1);
  keep.forEach((i, k) => { rowOf[series.firstRow[i]] = k; });
  return {
    ...series,
    x: Float64Array.from(keep, (i) => series.x[i]), y: Float64Array.from(keep, (i) => series.y[i]), w: Float64Array.from(keep, (i) => series.w[i]),
    firstRow: Int32Array.from(keep, (i) => series.firstRow[i]), rowOf, n: keep.length,
  };
}

/** Maps a result on the kept points back to the full series, the dropped points reported as spikes of their segment. Unchecked. */
function withSpikesBack(r: BreaksResult, series: Series, keep: readonly number[], dropped: readonly number[], exposure?: Float64Array): BreaksResult {
  const n = series.n;
  const starts = r.segments.map((sg, k) => (k === 0 ? 0 : keep[sg.start]));
  const segments = r.segments.map((sg, k) => {
    const start = starts[k], end = k + 1 < starts.length ? starts[k + 1] - 1 : n - 1;
    return { ...sg, start, end, xStart: series.x[start], xEnd: series.x[end], rowStart: series.firstRow[start], rowEnd: series.firstRow[end], n: end - start + 1 };
  });
  const fitted = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    while (k + 1 < segments.length && i > segments[k].end) k++;
    const lv = r.model === 'poisson' ? segments[k].rate : r.model === 'distribution' ? segments[k].median : segments[k].mean;
    fitted[i] = exposure ? lv * exposure[i] : lv;
  }
  const breaks = r.breaks.map((b, j) => ({ ...b, index: keep[b.index], before: segments[j], after: segments[j + 1] }));
  const spikes = dropped.map((i) => ({ index: i, row: series.firstRow[i], x: series.x[i], size: series.y[i] - fitted[i] }));
  const rows = spikes.map((sp) => sp.row);
  const warnings = [...r.warnings];
  warnings.splice(warnings.length - 1, 0, warning('note', `${spikes.length} spike${spikes.length === 1 ? '' : 's'} (row${spikes.length === 1 ? '' : 's'} ${listRows(rows)}): single values that formed a segment of their own, set aside and listed in spikes, not counted as breaks. Check them for entry errors or one-off events.`, rows));
  return { ...r, breaks, spikes, segments, fitted, warnings };
}

/** One PELT search and its summary. Unchecked. */
function stepBreaksOnce(series: Series, o: ResolvedBreaksOptions, exposure?: Float64Array): BreaksResult {
  const n = series.n;
  const { cost, notes, floorNote } = stepCost(series, o, exposure);
  const allowed = changeAllowed(series.x);
  const p = parametersPerChange(o.model);
  const noise: NoiseTreatment | undefined = o.model === 'meanvar' ? noiseTreatment(series.y, o) : undefined;
  const beta = penaltyValue(o.penalty, n, p) * (noise ? noise.penaltyFactor : 1);
  const seg = pelt(cost, beta, o.minSegment, allowed);
  let runs = 1;
  let evaluations = seg.evaluations;
  let maxCandidates = seg.maxCandidates;
  const warnings: Warning[] = [...series.warnings, ...notes];
  let table;
  if (o.crops) {
    const out = cropsWithCounts((b) => pelt(cost, b, o.minSegment, allowed), o.crops, o.maxRuns);
    runs += out.runs;
    evaluations += out.evaluations;
    maxCandidates = Math.max(maxCandidates, out.maxCandidates);
    table = out.rows;
    if (out.warning) warnings.push(out.warning);
  }
  // segments and fitted step function
  const bounds = [0, ...seg.changes, n];
  const segments: SegmentSummary[] = [];
  const fitted = new Float64Array(n);
  const flooredRows: number[] = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const s = bounds[k], e = bounds[k + 1];
    const sum = summariseSegment(series, s, e - 1, o.model);
    if (exposure) {
      // rate per unit of the seasonal factor: sum w y / sum w e
      let S = 0, E = 0;
      for (let i = s; i < e; i++) { S += series.w[i] * series.y[i]; E += series.w[i] * exposure[i]; }
      sum.rate = S / E; sum.level = sum.rate;
    }
    if (cost.floored?.(s, e)) flooredRows.push(series.firstRow[s]);
    const level = o.model === 'distribution' ? sum.median : o.model === 'poisson' ? sum.rate : sum.mean;
    for (let i = s; i < e; i++) fitted[i] = exposure ? level * exposure[i] : level;
    segments.push(sum);
  }
  if (flooredRows.length) {
    warnings.push(warning('note', `${flooredRows.length} segment${flooredRows.length === 1 ? '' : 's'} starting at row ${listRows(flooredRows)} ${flooredRows.length === 1 ? 'has' : 'have'} a spread at or below the floor; the variance was taken as ${floorNote}. Such segments often come from rounded or repeated values; consider the level model or a larger shortest-segment.`, flooredRows));
  }
  const breaks: Break[] = seg.changes.map((c, k) => {
    const before = segments[k], after = segments[k + 1];
    const change = o.model === 'poisson' ? after.rate - before.rate : o.model === 'distribution' ? after.median - before.median : after.mean - before.mean;
    return { index: c, row: series.firstRow[c], x: series.x[c], before, after, change, changeSd: after.sd - before.sd, uncertainty: NO_INTERVAL };
  });
  if (noise) {
    const cn = correlationNote(noise);
    if (cn) warnings.push(cn);
  }
  if (o.model === 'poisson') {
    const ow = overdispersionWarning(series, fitted, breaks.length);
    if (ow) warnings.push(ow);
  }
  warnings.push(breakCauseWarning(breaks.length));
  return {
    model: o.model,
    penalty: { rule: typeof o.penalty === 'number' ? 'manual' : o.penalty, value: beta, parametersPerChange: p },
    breaks, spikes: [],
    ...(noise ? { noise: { assumption: noise.assumption, correlation: noise.correlation, penaltyFactor: noise.penaltyFactor } } : {}),
    season: { adjusted: false, request: 'none', period: NaN, strength: NaN, note: '' },
    segments, fitted,
    cost: seg.cost, penalisedCost: seg.penalisedCost,
    ...(table ? { crops: table } : {}),
    warnings,
    solver: {
      algorithm: 'pelt', converged: true, iterations: n, evaluations, maxCandidates, meanCandidates: seg.meanCandidates, runs,
      stoppingRule: 'exact dynamic programme: one pass over the points, pruning candidates that can no longer be optimal (no tolerance).',
    },
  };
}

/**
 * A note when counts vary far more than Poisson counts would about the fitted rates:
 * the Pearson dispersion sum w (y - rate)^2 / rate / (n - segments) above 2 (common
 * practice for over-dispersion; no single source). Over-dispersed counts (day-of-week
 * swings, clustered events) make the Poisson penalty too small, so some breaks may be
 * noise. Unchecked.
 */
export function overdispersionWarning(series: Series, fitted: Float64Array, breaks: number): Warning | null {
  let chi = 0;
  for (let i = 0; i < series.n; i++) {
    const r = fitted[i];
    if (r > 0) { const d = series.y[i] - r; chi += (series.w[i] * d * d) / r; }
  }
  const dof = series.n - breaks - 1;
  if (dof < 10) return null;
  const dispersion = chi / dof;
  if (!(dispersion > 2)) return null;
  return warning('note', `the counts vary about ${dispersion.toFixed(1)} times as much as Poisson counts would about the fitted rates (over-dispersion), so some of the ${breaks} break${breaks === 1 ? '' : 's'} may be noise: consider the level (or volatility) model, a season setting if there is a weekly or yearly pattern, or a higher penalty.`);
}
