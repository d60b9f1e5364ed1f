/** Knotwise engine: re-exports only. */
export * from './errors';
export * from './warnings';
export * from './series';
export * from './types';
export * from './registry';
export * from './options';
export * from './fit';
export { fitSpline, evaluateSpline, splineMethod } from './smoothers/spline';
export type { SplineModel } from './smoothers/spline';
export { bandedLDL, bandedSolve, bandedInverseBand, bandedMultiply } from './linalg/banded';
export type { BandedLDL } from './linalg/banded';
export { FitCache, cacheKey } from './cache/fitCache';
export { breaksFromCells } from './segment';
export type { SeriesBreaks } from './segment';
export { fitTrend, evaluateTrend, trendMethod, trendCriterionPath, trendSettings } from './smoothers/trend';
export type { TrendModel, TrendSettings } from './smoothers/trend';
export type { TrendPath, TrendPathPoint } from './smoothers/trend/trendPath';
export { differenceOperator, differenceTranspose } from './linalg/difference';
