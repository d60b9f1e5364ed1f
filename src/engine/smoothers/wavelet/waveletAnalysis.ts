/**
 * Wavelet shrinkage as a declared analysis: filter, levels, threshold rule, soft or
 * hard shrinkage, boundary and cycle spinning. Registered in `analyses.ts`.
 * Kernel: {@link waveletShrink}. Needs equally spaced x: other series are refused.
 */
import { showNumber } from '../../errors';
import type { Series } from '../../series';
import type { FitResult, NoiseAssumption } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { waveletShrink, type WaveletShrinkOptions, type WaveletShrinkResult } from './waveletShrink';
import { waveletCrossValidate, waveletDf } from './waveletCrossValidate';
import type { Criterion } from '../../types';
import { QUIET, type RunContext } from '../../analysis/runContext';
import { noiseOption } from '../../analysis/penaltyOptions';

/** Settings of {@link fitWavelet}: the shrinkage's shape, and the threshold rule including cross-validation. */
export interface WaveletSettings extends Omit<WaveletShrinkOptions, 'threshold' | 'x' | 'fixedThreshold'> {
  /** 'sure', 'universal', or chosen by cross-validation ('cv', 'cv-simpler'). */
  threshold?: 'sure' | 'universal' | 'cv' | 'cv-simpler';
  /** Folds for 'cv' and 'cv-simpler' (default 10, fewer on short series). */
  folds?: number;
  /** What cross-validation assumes of the noise (default 'correlated'). */
  noise?: NoiseAssumption;
}
import { WAVELET_FILTER_NAMES, type WaveletFilterName } from './waveletFilters';
import { interpolateFit } from '../whittaker/interpolateFit';

/**
 * Runs wavelet shrinkage on a clean series. df is reported as the number of coefficients
 * kept (approximation plus nonzero details) times n / transform length: exact for the
 * periodic boundary on lengths divisible by 2^levels (Stein's df of soft thresholding;
 * Donoho & Johnstone 1995), approximate otherwise.
 *
 * @example
 * ```ts
 * fitWavelet(series, { filter: 'sym8', threshold: 'sure' }).fitted;
 * ```
 */
export function fitWavelet(series: Series, o: WaveletSettings, context: RunContext = QUIET): FitResult {
  const n = series.n;
  const { folds, noise, ...shape } = o;
  let r: WaveletShrinkResult;
  let criterion: Criterion;
  const warnings: Warning[] = [...series.warnings];
  if (o.threshold === 'cv' || o.threshold === 'cv-simpler') {
    const k = Math.max(2, Math.min(folds ?? 10, n - 2));
    const choice = waveletCrossValidate(series, { ...shape, threshold: undefined, x: series.x }, k, o.threshold === 'cv' ? 'minimum' : 'simpler', context, noise);
    r = choice.shrink;
    criterion = choice.criterion;
    if (choice.side === 'rough') warnings.push(warning('penalty-at-edge', `The cross-validation choice is the smallest wavelet threshold tried (${showNumber(choice.threshold)}): nearly every detail is kept, so the fit may follow noise.`));
    if (choice.side === 'smooth') warnings.push(warning('penalty-at-edge', `The cross-validation choice removes every wavelet detail (threshold ${showNumber(choice.threshold)}): the fit is the coarsest approximation of ${r.levels} levels; the data show no detail above the noise at finer scales.`));
  } else {
    r = waveletShrink(series.y, { ...shape, threshold: o.threshold, x: series.x });
    criterion = { name: o.threshold ?? 'universal', value: r.thresholds[0] };
  }
  const df = waveletDf(r, n);
  const resid = new Float64Array(n);
  let rss = 0;
  for (let i = 0; i < n; i++) { resid[i] = series.y[i] - r.fitted[i]; rss += series.w[i] * resid[i] * resid[i]; }
  let unequal = false;
  for (let i = 1; i < n; i++) if (series.w[i] !== series.w[0]) { unequal = true; break; }
  if (unequal) warnings.push(warning('note', 'Wavelet shrinkage does not use weights: rows that were merged (equal x) count once, like every other row.'));
  warnings.push(...fitWarnings(n, df, resid, true));
  warnings.push(boundaryWarning());
  return {
    method: 'wavelet', options: { method: 'wavelet' }, x: series.x, fitted: r.fitted, penalty: r.thresholds[0], df,
    sigma: n > df + 1e-9 ? Math.sqrt(rss / (n - df)) : NaN,
    criterion,
    knots: [], warnings, solver: r.status,
    model: { x: series.x, fitted: r.fitted, sigma: r.sigma, thresholds: r.thresholds, levels: r.levels, note: `noise ${showNumber(r.sigma)} from the finest details` },
  };
}

/** The declared analysis 'wavelet'. */
export const waveletAnalysis: AnalysisDefinition = {
  name: 'wavelet',
  family: 'smoother',
  label: 'Denoised curve that keeps jumps and spikes (wavelet shrinkage; equally spaced x only)',
  summary: 'wavelet shrinkage: orthogonal Daubechies or symmlet transform, detail coefficients shrunk by the universal (VisuShrink) or SURE (SureShrink) threshold, optional cycle spinning (Donoho & Johnstone 1994, 1995; Coifman & Donoho 1995)',
  options: [
    { name: 'filter', kind: 'choice', choices: WAVELET_FILTER_NAMES, default: 'sym8', help: 'wavelet: db1 (Haar, blocky) to db10, or the more symmetric sym4 to sym10 (default sym8)' },
    { name: 'levels', kind: 'integer', min: 1, max: 30, help: 'number of detail levels shrunk (default: as many as the filter length allows)' },
    {
      name: 'threshold', kind: 'choice', choices: ['sure', 'universal', 'cv', 'cv-simpler'], default: 'sure',
      choiceHelp: {
        sure: "a threshold per level from Stein's unbiased risk estimate (SureShrink)",
        universal: 'one threshold sigma * sqrt(2 log n) for all levels (VisuShrink): smoother, removes more',
        cv: 'one threshold for all levels that best predicts held-out points (cross-validation)',
        'cv-simpler': 'the largest threshold within one standard error of the best cross-validated one',
      },
      help: 'how the threshold is set: sure (default), universal, cv or cv-simpler',
    },
    { name: 'folds', kind: 'integer', min: 2, max: 50, onlyWith: { option: 'threshold', values: ['cv', 'cv-simpler'] }, help: 'number of cross-validation folds (default 10, fewer on short series)' },
    noiseOption('threshold', ['cv', 'cv-simpler']),
    { name: 'shrink', kind: 'choice', choices: ['soft', 'hard'], default: 'soft', help: 'soft (default) pulls every kept coefficient toward zero by the threshold; hard keeps it whole (universal threshold only)' },
    { name: 'boundary', kind: 'choice', choices: ['reflect', 'periodic'], default: 'reflect', help: 'how the ends are treated: reflect (default) mirrors the series, periodic wraps the end to the start' },
    { name: 'shifts', kind: 'integer', min: 1, max: 64, default: 1, help: 'average over this many shifted copies (cycle spinning) to remove the blockiness of one transform (default 1)' },
  ],
  ties: 'merge',
  minPoints: () => 8,
  autoVariants: [{ label: 'a denoised curve that keeps jumps and spikes (wavelet shrinkage)', options: { threshold: 'cv' }, simplicity: 2, cost: 2.5 }],
  run(series: Series, o: ResolvedOptions, context: RunContext) {
    const smooth = fitWavelet(series, {
      filter: o.filter as WaveletFilterName,
      ...(o.levels !== undefined ? { levels: o.levels as number } : {}),
      threshold: o.threshold as WaveletSettings['threshold'],
      ...(o.folds !== undefined ? { folds: o.folds as number } : {}),
      ...(o.noise !== undefined ? { noise: o.noise as NoiseAssumption } : {}),
      shrink: o.shrink as 'soft' | 'hard',
      boundary: o.boundary as 'reflect' | 'periodic',
      shifts: o.shifts as number,
    }, context);
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => {
    const m = result.smooth!.model as { x: Float64Array; fitted: Float64Array };
    return interpolateFit(m.x, m.fitted, x);
  },
};
