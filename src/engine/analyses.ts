/**
 * Registers the built-in analyses. One line per analysis; the fronts, the
 * resolver and the cache pick them up by name.
 */
import { registerAnalysis } from './analysis/analysisRegistry';
import { splineAnalysis } from './smoothers/spline';
import { trendAnalysis } from './smoothers/trend';
import { autoAnalysis } from './smoothers/auto';
import { CHANGEPOINT_ANALYSES } from './breaks/changepointAnalyses';
import { decomposeAnalysis } from './decompose/decomposeAnalysis';
import { whittakerAnalysis } from './smoothers/whittaker/whittakerAnalysis';
import { loessAnalysis } from './smoothers/loess/loessAnalysis';
import { waveletAnalysis } from './smoothers/wavelet/waveletAnalysis';
import { mixedAnalysis } from './smoothers/mixed/mixedAnalysis';

registerAnalysis(splineAnalysis);
registerAnalysis(trendAnalysis);
registerAnalysis(whittakerAnalysis);
registerAnalysis(loessAnalysis);
registerAnalysis(waveletAnalysis);
registerAnalysis(mixedAnalysis);
registerAnalysis(autoAnalysis);
for (const a of CHANGEPOINT_ANALYSES) registerAnalysis(a);
registerAnalysis(decomposeAnalysis);
