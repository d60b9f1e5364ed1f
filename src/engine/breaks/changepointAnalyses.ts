/**
 * The changepoint models as declared analyses, one per model, sharing the
 * declarations of the options they have in common. Registered in
 * `analyses.ts`; {@link findBreaks} does the work.
 */
import type { AnalysisDefinition } from '../analysis/analysisDefinition';
import type { OptionDeclaration, ResolvedOptions } from '../analysis/optionDeclaration';
import type { RunContext } from '../analysis/runContext';
import type { Series } from '../series';
import { findBreaks } from './findBreaks';
import type { BreaksModel, BreaksOptions } from './types';
import { NOISE_ASSUMPTIONS } from '../types';

const RULE: OptionDeclaration = {
  name: 'rule', kind: 'choice', choices: ['bic', 'mbic'], default: 'bic', group: 'penalty',
  choiceHelp: { bic: 'Bayesian information criterion: parameters per change x log n', mbic: 'modified BIC (Zhang & Siegmund 2007): stricter, fewer false changes on long series' },
  help: 'how the cost of one more change is set when no penalty is given: bic (default) or mbic',
};
const PENALTY: OptionDeclaration = {
  name: 'penalty', kind: 'number', min: 0, group: 'penalty', textGoesTo: 'rule',
  help: 'a fixed cost per change (on the scale of twice the log-likelihood) instead of a rule',
};
const RANGE: OptionDeclaration = {
  name: 'penaltyRange', kind: 'range', min: 0, oldNames: ['crops'],
  help: 'low, high: also list every optimal segmentation for penalties in this range (CROPS), to read changes against cost',
};
const MAX_RUNS: OptionDeclaration = { name: 'maxRuns', kind: 'integer', min: 2, max: 10000, help: 'most penalised searches a penalty range may run (default 200)' };
// a default above the minimum is left to the engine, which lowers it on a series too short for it
const shortest = (min: number, byDefault = min): OptionDeclaration => (byDefault > min
  ? { name: 'shortestSegment', kind: 'integer', min, oldNames: ['minSegment'], help: `fewest points in a segment (default ${byDefault}, or the whole series when shorter; at least ${min})` }
  : { name: 'shortestSegment', kind: 'integer', min, default: min, oldNames: ['minSegment'], help: `fewest points in a segment (default ${min})` });
const SIGMA: OptionDeclaration = { name: 'sigma', kind: 'number', above: 0, help: 'known noise standard deviation in units of y (default: estimated robustly)' };
const ROBUST: OptionDeclaration = {
  name: 'robust', kind: 'switch', default: true, implied: true,
  help: 'true (default): single far-off values are set aside as spikes by an outlier-robust cost (biweight, Fearnhead & Rigaill 2019); false: plain squared errors',
};
const NOISE: OptionDeclaration = {
  name: 'noise', kind: 'choice', choices: NOISE_ASSUMPTIONS, default: 'correlated',
  choiceHelp: { correlated: 'estimate the lag-one correlation of the noise and raise the penalty by the long-run variance ratio (default)', independent: 'assume independent noise' },
  help: 'how the penalty treats the noise: correlated (default) or independent',
};
const SEASON: OptionDeclaration = {
  name: 'season', kind: 'choice', choices: ['auto', 'none'], default: 'auto',
  choiceHelp: { auto: 'remove a season when the series has one, period from the dates (default)', none: 'look for changes in the series as given' },
  help: 'whether changes are looked for in the series without its season: auto (default) or none; give period to set the season length',
};
const PERIOD: OptionDeclaration = {
  name: 'period', kind: 'integer', min: 2, max: 100000, onlyWith: { option: 'season', values: ['auto'] },
  help: 'season length in points (e.g. 7, 12, 52): removes that season before the search, counted by position',
};
const QUANTILES: OptionDeclaration = { name: 'quantiles', kind: 'integer', min: 2, max: 100, default: 10, help: 'number of quantiles the distribution cost compares (default 10)' };

function changepointAnalysis(name: string, model: BreaksModel, label: string, summary: string, extra: OptionDeclaration[], minSegment = 1, defaultSegment = minSegment): AnalysisDefinition {
  return {
    name, oldNames: name === model ? [] : [model], family: 'changepoints', label, summary,
    options: [RULE, PENALTY, shortest(minSegment, defaultSegment), ...extra, RANGE, MAX_RUNS],
    ties: 'keep',
    minPoints: (o: ResolvedOptions) => Math.max(2, (o.shortestSegment as number | undefined) ?? minSegment),
    run(series: Series, o: ResolvedOptions, context: RunContext) {
      context.step(0, 'searching for the optimal segmentation');
      const options: BreaksOptions = { model, penalty: (o.penalty ?? o.rule) as BreaksOptions['penalty'] };
      if (o.shortestSegment !== undefined) options.minSegment = o.shortestSegment as number;
      if (o.sigma !== undefined) options.sigma = o.sigma as number;
      if (model === 'distribution') options.quantiles = o.quantiles as number;
      if (o.penaltyRange !== undefined) options.crops = [...(o.penaltyRange as [number, number])];
      if (o.maxRuns !== undefined) options.maxRuns = o.maxRuns as number;
      if (o.robust !== undefined) options.robust = o.robust as boolean;
      if (o.noise !== undefined) options.noise = o.noise as BreaksOptions['noise'];
      if (o.period !== undefined) options.season = o.period as number;
      else if (o.season !== undefined) options.season = o.season as 'auto' | 'none';
      const breaks = findBreaks(series, options);
      return {
        fitted: breaks.fitted, warnings: breaks.warnings, breaks,
        solver: {
          converged: breaks.solver.converged, iterations: breaks.solver.iterations, tolerance: 0, achieved: 0,
          stoppingRule: breaks.solver.stoppingRule,
        },
      };
    },
  };
}

/** The changepoint models, in the order fronts list them. */
export const CHANGEPOINT_ANALYSES: AnalysisDefinition[] = [
  changepointAnalysis('level', 'mean', 'Jumps in level', 'changes in level, outlier-robust biweight cost (spikes set aside), penalty allowing for correlated noise, season removed when present; exact by FPOP (Maidstone, Hocking, Rigaill & Fearnhead 2017)', [SIGMA, ROBUST, NOISE, SEASON, PERIOD]),
  // segments of at least 5 points by default: a standard deviation read from n points has n - 1 degrees of
  // freedom, and its 95% interval spans a factor of 72 at 2 points, 12 at 3 and 4.8 at 5 (chi-square quantiles);
  // short segments of near-equal values were the model's main false changes (business bench, invented demo)
  changepointAnalysis('volatility', 'meanvar', 'Jumps in level and volatility', 'changes in mean and variance, Gaussian cost; exact by PELT (up to 60,000 points)', [NOISE, SEASON, PERIOD], 2, 5),
  changepointAnalysis('counts', 'poisson', 'Changes in the rate of counts', 'changes in a Poisson rate, a season as a rate factor; exact by PELT (up to 30,000 points)', [SEASON, PERIOD]),
  changepointAnalysis('distribution', 'distribution', 'Any change in distribution', 'nonparametric empirical-distribution cost (Haynes, Fearnhead & Eckley 2017); exact by PELT (up to 30,000 points)', [QUANTILES, SEASON, PERIOD]),
  changepointAnalysis('slope', 'slope', 'Changes in growth rate (a continuous broken line)', 'continuous piecewise-linear trend with an L0 penalty; exact by CPOP (Fearnhead, Maidstone & Letchford 2019; up to 12,000 points)', [SIGMA, NOISE, SEASON, PERIOD]),
];
