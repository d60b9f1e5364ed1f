/**
 * Piecewise-constant models ('meanvar', 'poisson', 'distribution') by PELT; 'mean' has
 * its own FPOP search ({@link levelBreaks}).
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning, listRows, type Warning } from '../warnings';
import { meanVarCost, MEANVAR_FLOOR } from './costMeanVar';
import { recordingResolution } from './recordingResolution';
import { poissonCost } from './costPoisson';
import { distributionCost } from './costDistribution';
import { cropsWithCounts } from './crops';
import { pelt } from './pelt';
import { parametersPerChange, penaltyValue } from './penaltyValue';
import { noiseScale } from '../robustSigma';
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
      const { mean: m, sd: scale } = weightedMoments(y, w);
      const q = recordingResolution(y);
      const floor = q > 0 ? (q / scale) ** 2 / 12 : MEANVAR_FLOOR;
      return { cost: meanVarCost(y, w, m, scale, floor), notes, floorNote: q > 0 && floor > MEANVAR_FLOOR ? `the rounding variance (${showNumber(q)})^2 / 12 of values recorded to ${showNumber(q)}` : `${MEANVAR_FLOOR} times the series variance` };
    }
    case 'poisson': {
      const fractional: number[] = [];
      for (let i = 0; i < series.n; i++) {
        const v = y[i];
        if (v < 0) {
          throw new KnotwiseError('bad-data', `model 'poisson' needs counts (whole numbers >= 0); row ${series.firstRow[i] + 1} holds ${showNumber(v)}. Use model 'mean' for measurements.`);
        }
        if (!Number.isInteger(v)) fractional.push(series.firstRow[i]);
      }
      if (fractional.length) {
        notes.push(warning('note', `model 'poisson' is meant for counts, but ${fractional.length} value${fractional.length === 1 ? ' is' : 's are'} not whole (row${fractional.length === 1 ? '' : 's'} ${listRows(fractional)}, e.g. ${showNumber(y[series.rowOf[fractional[0]]])}); the rate model still runs, but its penalty assumes count noise (variance equal to the mean). For measurements or rates use model 'mean' or 'meanvar'.`, fractional));
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
    warnings.push(warning('note', `${flooredRows.length} segment${flooredRows.length === 1 ? '' : 's'} starting at row ${listRows(flooredRows)} ${flooredRows.length === 1 ? 'has' : 'have'} (near-)zero spread; the variance was floored at ${floorNote}. Such segments often come from rounded or repeated values; consider model 'mean' or a larger minSegment.`, flooredRows));
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
  return warning('note', `the counts vary about ${dispersion.toFixed(1)} times as much as Poisson counts would about the fitted rates (over-dispersion), so some of the ${breaks} break${breaks === 1 ? '' : 's'} may be noise: consider model 'mean' (or 'meanvar'), a season setting if there is a weekly or yearly pattern, or a higher penalty.`);
}
