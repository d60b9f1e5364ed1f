/**
 * The change-in-level model ('mean') by FPOP, robust to spikes and to correlated noise.
 */
import { KnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning, listRows, type Warning } from '../warnings';
import { median } from '../median';
import { cropsWithCounts } from './crops';
import { fpop, type LevelLoss, type LevelSegmentation } from './fpop';
import { correlationNote, noiseTreatment } from './noiseCorrelation';
import { parametersPerChange, penaltyValue } from './penaltyValue';
import { changeAllowed, givenOrEstimatedSigma } from './stepBreaks';
import { autocorrelationWarning, breakCauseWarning, residualAutocorrelation } from './summariseSegment';
import type { Break, BreaksResult, SegmentSummary, Spike } from './types';
import type { ResolvedBreaksOptions } from './validateBreaksOptions';

/** Biweight threshold K in noise standard deviations. */
export const BIWEIGHT_K = 3;

const NO_INTERVAL = { given: false as const, note: 'FPOP returns the optimal location only; no confidence interval is computed.' };

/**
 * Upper standard normal quantile z with P(Z > z) = p, 0 < p < 0.5, by the rational
 * approximation 26.2.23 of Abramowitz & Stegun (1964), absolute error < 4.5e-4.
 * Unchecked.
 */
export function upperNormalQuantile(p: number): number {
  const t = Math.sqrt(-2 * Math.log(p));
  return t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
}

/**
 * Residual size (noise sds) above which a point set aside by the biweight cost is
 * reported as a spike: max(K, z) with P(|Z| > z) = 0.05 / n, a Bonferroni bound, so
 * on Gaussian noise without spikes about 5% of series report one. Unchecked.
 */
export function spikeThreshold(n: number): number {
  return Math.max(BIWEIGHT_K, upperNormalQuantile(0.025 / Math.max(n, 1)));
}

/**
 * Segments a clean series with the change-in-level model by {@link fpop} and
 * summarises it (see {@link findBreaks} for the public contract). Unchecked options.
 */
export function levelBreaks(series: Series, o: ResolvedBreaksOptions): BreaksResult {
  const { n, y, w } = series;
  const notes: Warning[] = [];
  const noise = noiseTreatment(y, o);
  const diff = givenOrEstimatedSigma(o.sigma, y, 1, notes);
  const sigma = diff.source === 'given' ? diff.value : diff.value * noise.marginalFactor;
  const centre = median(y);
  const z = new Float64Array(n);
  let ss = 0;
  for (let i = 0; i < n; i++) { z[i] = (y[i] - centre) / sigma; ss += w[i] * z[i] * z[i]; }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(z[i])) throw new KnotwiseError('bad-data', `row ${series.firstRow[i] + 1} holds ${showNumber(y[i])}, which is beyond what doubles can hold once divided by the noise scale ${showNumber(sigma)}; remove it or give a larger sigma.`);
  }
  if (!o.robust && !Number.isFinite(ss)) {
    throw new KnotwiseError('bad-data', `the values span more than about 1e150 noise scales (noise scale ${showNumber(sigma)}), so squared errors overflow; use robust true (the default), which sets such values aside as spikes, or remove the far-off values.`);
  }
  const loss: LevelLoss = o.robust ? { kind: 'biweight', K: BIWEIGHT_K } : { kind: 'square' };
  const allowed = changeAllowed(series.x);
  const p = parametersPerChange('mean');
  const beta = penaltyValue(o.penalty, n, p) * noise.penaltyFactor;
  const solve = (b: number): LevelSegmentation => fpop(z, w, loss, b, o.minSegment, allowed);
  const seg = solve(beta);
  let runs = 1, evaluations = seg.evaluations, maxCandidates = seg.maxCandidates;
  const warnings: Warning[] = [...series.warnings, ...notes];
  let table;
  if (o.crops) {
    const out = cropsWithCounts(solve, o.crops, o.maxRuns);
    runs += out.runs; evaluations += out.evaluations; maxCandidates = Math.max(maxCandidates, out.maxCandidates);
    table = out.rows;
    if (out.warning) warnings.push(out.warning);
  }
  const bounds = [0, ...seg.changes, n];
  const fitted = new Float64Array(n);
  const spikes: Spike[] = [];
  const segments: SegmentSummary[] = [];
  const limit = spikeThreshold(n);
  const isSpike = new Uint8Array(n);
  for (let k = 0; k + 1 < bounds.length; k++) {
    const s = bounds[k], e = bounds[k + 1];
    let level = centre + sigma * seg.levels[k];
    if (!o.robust) {
      // the weighted mean in y units (the level in z units carries the centring's rounding)
      let W = 0, S = 0;
      for (let i = s; i < e; i++) { W += w[i]; S += w[i] * y[i]; }
      level = S / W;
    }
    let W = 0, S = 0;
    for (let i = s; i < e; i++) {
      fitted[i] = level;
      if (o.robust && Math.abs(z[i] - seg.levels[k]) > limit) {
        isSpike[i] = 1;
        spikes.push({ index: i, row: series.firstRow[i], x: series.x[i], size: y[i] - level });
        continue;
      }
      W += w[i]; S += w[i] * y[i];
    }
    const mean = W > 0 ? S / W : level;
    let V = 0;
    for (let i = s; i < e; i++) if (!isSpike[i]) { const d = y[i] - mean; V += w[i] * d * d; }
    segments.push({
      start: s, end: e - 1, xStart: series.x[s], xEnd: series.x[e - 1], rowStart: series.firstRow[s], rowEnd: series.firstRow[e - 1],
      n: e - s, mean, sd: W > 0 ? Math.sqrt(V / W) : 0, level, rate: NaN, median: NaN, slope: NaN, intercept: NaN,
    });
  }
  const breaks: Break[] = seg.changes.map((c, k) => {
    const before = segments[k], after = segments[k + 1];
    return { index: c, row: series.firstRow[c], x: series.x[c], before, after, change: after.level - before.level, changeSd: after.sd - before.sd, uncertainty: NO_INTERVAL };
  });
  if (spikes.length) {
    const rows = spikes.map((s) => s.row);
    warnings.push(warning('note', `${spikes.length} spike${spikes.length === 1 ? '' : 's'} (row${spikes.length === 1 ? '' : 's'} ${listRows(rows)}): single values more than ${limit.toFixed(1)} noise sds from their segment's level, set aside by the robust cost and listed in spikes, not counted as breaks. Check them for entry errors or one-off events.`, rows));
  }
  const cn = correlationNote(noise);
  if (cn) warnings.push(cn);
  if (noise.assumption === 'independent') {
    const resid = Float64Array.from(fitted, (f, i) => (isSpike[i] ? y[i] : f));
    const aw = autocorrelationWarning(residualAutocorrelation(y, resid), n, breaks.length);
    if (aw) warnings.push(aw);
  }
  warnings.push(breakCauseWarning(breaks.length));
  return {
    model: 'mean',
    penalty: { rule: typeof o.penalty === 'number' ? 'manual' : o.penalty, value: beta, parametersPerChange: p },
    sigma: { value: sigma, source: diff.source },
    breaks, spikes, noise: { assumption: noise.assumption, correlation: noise.correlation, penaltyFactor: noise.penaltyFactor },
    season: { adjusted: false, request: 'none', period: NaN, strength: NaN, note: '' },
    segments, fitted,
    cost: seg.cost, penalisedCost: seg.penalisedCost,
    ...(table ? { crops: table } : {}),
    warnings,
    solver: {
      algorithm: 'fpop', converged: true, iterations: n, evaluations, maxCandidates, meanCandidates: seg.meanCandidates, runs,
      stoppingRule: 'exact dynamic programme with functional pruning: one pass over the points carrying the best cost as a piecewise quadratic in the level (no tolerance).',
    },
  };
}
