/**
 * Wavelet shrinkage as a declared analysis: filter, levels, threshold rule, soft or
 * hard shrinkage, boundary and cycle spinning. Registered in `analyses.ts`.
 * Kernel: {@link waveletShrink}. Needs equally spaced x: other series are refused.
 */
import { showNumber } from '../../errors';
import type { Series } from '../../series';
import type { FitResult } from '../../types';
import { Warning, warning } from '../../warnings';
import type { AnalysisDefinition } from '../../analysis/analysisDefinition';
import type { ResolvedOptions } from '../../analysis/optionDeclaration';
import { boundaryWarning, fitWarnings } from '../../diagnostics/commonWarnings';
import { waveletShrink, type WaveletShrinkOptions } from './waveletShrink';
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
export function fitWavelet(series: Series, o: WaveletShrinkOptions): FitResult {
  const n = series.n;
  const r = waveletShrink(series.y, { ...o, x: series.x });
  const warnings: Warning[] = [...series.warnings];
  const df = ((r.kept + (r.transformLength >> r.levels)) * n) / r.transformLength;
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
    criterion: { name: o.threshold ?? 'universal', value: r.thresholds[0] },
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
      name: 'threshold', kind: 'choice', choices: ['sure', 'universal'], default: 'sure',
      choiceHelp: { sure: "a threshold per level from Stein's unbiased risk estimate (SureShrink)", universal: 'one threshold sigma * sqrt(2 log n) for all levels (VisuShrink): smoother, removes more' },
      help: 'how the threshold is set: sure (default) or universal',
    },
    { name: 'shrink', kind: 'choice', choices: ['soft', 'hard'], default: 'soft', help: 'soft (default) pulls every kept coefficient toward zero by the threshold; hard keeps it whole (universal threshold only)' },
    { name: 'boundary', kind: 'choice', choices: ['reflect', 'periodic'], default: 'reflect', help: 'how the ends are treated: reflect (default) mirrors the series, periodic wraps the end to the start' },
    { name: 'shifts', kind: 'integer', min: 1, max: 64, default: 1, help: 'average over this many shifted copies (cycle spinning) to remove the blockiness of one transform (default 1)' },
  ],
  ties: 'merge',
  minPoints: () => 8,
  run(series: Series, o: ResolvedOptions) {
    const smooth = fitWavelet(series, {
      filter: o.filter as WaveletFilterName,
      ...(o.levels !== undefined ? { levels: o.levels as number } : {}),
      threshold: o.threshold as 'sure' | 'universal',
      shrink: o.shrink as 'soft' | 'hard',
      boundary: o.boundary as 'reflect' | 'periodic',
      shifts: o.shifts as number,
    });
    return { fitted: smooth.fitted, warnings: smooth.warnings, solver: smooth.solver, criterion: smooth.criterion, smooth };
  },
  evaluate: (result, x) => {
    const m = result.smooth!.model as { x: Float64Array; fitted: Float64Array };
    return interpolateFit(m.x, m.fitted, x);
  },
};
