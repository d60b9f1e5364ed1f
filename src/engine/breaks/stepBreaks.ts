/**
 * Piecewise-constant models ('mean', 'meanvar', 'poisson', 'distribution') by PELT.
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning, listRows, type Warning } from '../warnings';
import { meanCost } from './costMean';
import { meanVarCost, MEANVAR_FLOOR } from './costMeanVar';
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
import { autocorrelationWarning, breakCauseWarning, residualAutocorrelation, summariseSegment } from './summariseSegment';
import type { Break, BreaksResult, SegmentSummary } from './types';
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

/** Builds the segment cost of a piecewise-constant model, with its scale notes. Unchecked options (validated). */
export function stepCost(series: Series, o: ResolvedBreaksOptions): { cost: SegmentCost & { floored?(s: number, t: number): boolean }; sigma?: { value: number; source: 'given' | 'estimated' }; notes: Warning[]; floorNote?: string } {
  const { y, w } = series;
  const notes: Warning[] = [];
  switch (o.model) {
    case 'mean': {
      const sigma = givenOrEstimatedSigma(o.sigma, y, 1, notes);
      return { cost: meanCost(y, w, sigma.value, median(y)), sigma, notes };
    }
    case 'meanvar': {
      const { mean: m, sd: scale } = weightedMoments(y, w);
      const q = recordingResolution(y);
      const floor = q > 0 ? (q / scale) ** 2 / 12 : MEANVAR_FLOOR;
      return { cost: meanVarCost(y, w, m, scale, floor), notes, floorNote: q > 0 && floor > MEANVAR_FLOOR ? `the rounding variance (${showNumber(q)})^2 / 12 of values recorded to ${showNumber(q)}` : `${MEANVAR_FLOOR} times the series variance` };
    }
    case 'poisson': {
      for (let i = 0; i < series.n; i++) {
        const v = y[i];
        if (v < 0 || !Number.isInteger(v)) {
          throw new KnotwiseError('bad-data', `model 'poisson' needs counts (whole numbers >= 0); row ${series.firstRow[i] + 1} holds ${showNumber(v)}. Use model 'mean' for measurements.`);
        }
      }
      return { cost: poissonCost(y, w), notes };
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
export function stepBreaks(series: Series, o: ResolvedBreaksOptions): BreaksResult {
  const n = series.n;
  const { cost, sigma, notes, floorNote } = stepCost(series, o);
  const allowed = changeAllowed(series.x);
  const p = parametersPerChange(o.model);
  const beta = penaltyValue(o.penalty, n, p);
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
    if (cost.floored?.(s, e)) flooredRows.push(series.firstRow[s]);
    const level = o.model === 'distribution' ? sum.median : sum.mean;
    for (let i = s; i < e; i++) fitted[i] = level;
    segments.push(sum);
  }
  if (flooredRows.length) {
    warnings.push(warning('note', `${flooredRows.length} segment${flooredRows.length === 1 ? '' : 's'} starting at row ${listRows(flooredRows)} ${flooredRows.length === 1 ? 'has' : 'have'} (near-)zero spread; the variance was floored at ${floorNote}. Such segments often come from rounded or repeated values; consider model 'mean' or a larger minSegment.`, flooredRows));
  }
  const breaks: Break[] = seg.changes.map((c, k) => {
    const before = segments[k], after = segments[k + 1];
    const change = o.model === 'poisson' ? after.rate - before.rate : o.model === 'distribution' ? after.median - before.median : after.mean - before.mean;
    return { index: c, row: series.firstRow[c], x: series.x[c], before, after, change, uncertainty: NO_INTERVAL };
  });
  if (o.model === 'mean') {
    const aw = autocorrelationWarning(residualAutocorrelation(series.y, fitted), n);
    if (aw) warnings.push(aw);
  }
  warnings.push(breakCauseWarning(breaks.length));
  return {
    model: o.model,
    penalty: { rule: typeof o.penalty === 'number' ? 'manual' : o.penalty, value: beta, parametersPerChange: p },
    ...(sigma ? { sigma } : {}),
    breaks, segments, fitted,
    cost: seg.cost, penalisedCost: seg.penalisedCost,
    ...(table ? { crops: table } : {}),
    warnings,
    solver: {
      algorithm: 'pelt', converged: true, iterations: n, evaluations, maxCandidates, meanCandidates: seg.meanCandidates, runs,
      stoppingRule: 'exact dynamic programme: one pass over the points, pruning candidates that can no longer be optimal (no tolerance).',
    },
  };
}
