/**
 * The penalty options every smoother declares alike: a rule, a fixed penalty
 * or a df target (alternatives), cross-validation folds and the size of the
 * search grid. One builder so the words and ranges are the same everywhere.
 */
import { type FitOptions, type SelectRule, NOISE_ASSUMPTIONS, type NoiseAssumption } from '../types';
import type { OptionDeclaration, ResolvedOptions } from './optionDeclaration';

/** Plain-language help for each penalty rule a smoother may accept. */
export const RULE_HELP: Readonly<Record<string, string>> = {
  gcv: 'generalised cross-validation (Craven & Wahba 1979): fast, for smoothers that are linear in y',
  cv: 'K-fold cross-validation: the penalty whose fits best predict held-out points',
  'cv-simpler': 'the simplest fit whose cross-validation error is within one standard error of the best (the one-standard-error rule)',
  sure: "Stein's unbiased risk estimate with a robust noise estimate",
  bic: 'Bayesian information criterion',
};

/**
 * Declarations of rule, penalty, df, folds and searchPoints for a smoother.
 *
 * @param o - the rules it accepts, its default rule, default folds and grid size
 */
export function PENALTY_OPTIONS(o: { rules: readonly string[]; defaultRule: string; folds: number; searchPoints: number }): OptionDeclaration[] {
  const cvRules = o.rules.filter((r) => r === 'cv' || r === 'cv-simpler');
  return [
    {
      name: 'rule', kind: 'choice', choices: o.rules, default: o.defaultRule, group: 'penalty',
      choiceHelp: Object.fromEntries(o.rules.map((r) => [r, RULE_HELP[r]])),
      oldValues: { 'cv-1se': 'cv-simpler' }, oldNames: ['select'],
      help: `how to choose the penalty when none is given: ${o.rules.join(', ')} (default ${o.defaultRule})`,
    },
    { name: 'penalty', kind: 'number', min: 0, group: 'penalty', oldNames: ['lambda'], help: 'a fixed penalty lambda instead of a rule (units: see the method)' },
    { name: 'df', kind: 'number', above: 0, group: 'penalty', help: 'a target equivalent degrees of freedom instead of a rule' },
    ...(cvRules.length ? [{
      name: 'folds', kind: 'integer', min: 2, max: 50, onlyWith: { option: 'rule', values: cvRules },
      help: `number of cross-validation folds (default ${o.folds}, fewer on short series)`,
    } as OptionDeclaration, noiseOption('rule', cvRules)] : []),
    { name: 'searchPoints', kind: 'integer', min: 5, max: 400, default: o.searchPoints, oldNames: ['gridSize'], help: `number of penalties tried on the search grid (default ${o.searchPoints})` },
  ];
}

/**
 * What cross-validation assumes of the noise (the words of the changepoint models' setting of the
 * same name): 'correlated' reads the lag-one dependence of the noise from the variogram of the series
 * and of two wavelet pilots' residuals and, when it is clear, holds out blocks and leaves their
 * neighbours out of training (select/noiseDependence.ts); 'independent' uses ordinary folds. The
 * reading can still mistake fast structure that the pilots do not follow for correlated
 * noise, and then over-smooths: 'independent' is the way out when the noise is known to be independent.
 *
 * @param rule - the option that selects cross-validation, and its values that do
 */
export function noiseOption(rule: string, cvRules: readonly string[]): OptionDeclaration {
  return {
    name: 'noise', kind: 'choice', choices: NOISE_ASSUMPTIONS, default: 'correlated',
    ...(cvRules.length ? { onlyWith: { option: rule, values: cvRules } } : {}),
    choiceHelp: {
      correlated: 'read from the data (default)',
      independent: 'independent (ordinary folds)',
    },
    help: 'what cross-validation assumes of the noise: correlated (default: how far it is correlated is read from the data, and blocks of points are held out when that is clear) or independent (ordinary folds, for noise known to be independent)',
  };
}

/**
 * The season setting of smoothers: 'auto' (default) fits the series without a
 * strong season found from the dates ({@link seasonForSmoothing}), 'none' fits it as given.
 */
export const SEASON_OPTION: OptionDeclaration = {
  name: 'season', kind: 'choice', choices: ['auto', 'none'], default: 'auto',
  choiceHelp: { auto: 'when x are dates and the series has a strong yearly, weekly or weekday season, smooth the series without it (default)', none: 'smooth the series as given' },
  help: 'what to do with a season: auto (default: take a strong season found from the dates out first) or none',
};

/** Resolved options as the smoothers' {@link FitOptions}. Unchecked: the resolver has validated them. */
export function fitOptionsOf(r: ResolvedOptions): FitOptions {
  const o: FitOptions = {};
  if (r.penalty !== undefined) o.penalty = r.penalty as number;
  else if (r.df !== undefined) o.df = r.df as number;
  else if (r.rule !== undefined) {
    const rule = r.rule as string;
    o.select = (rule === 'cv-simpler' ? 'cv' : rule) as SelectRule;
    if (rule === 'cv-simpler') o.oneSE = true;
  }
  if (r.folds !== undefined) o.folds = r.folds as number;
  if (r.searchPoints !== undefined) o.gridSize = r.searchPoints as number;
  if (r.order !== undefined) o.order = r.order as number;
  if (r.refit !== undefined) o.relaxed = r.refit as number;
  if (r.tolerance !== undefined) o.tolerance = r.tolerance as number;
  if (r.maxIterations !== undefined) o.maxIterations = r.maxIterations as number;
  if (r.noise !== undefined) o.noise = r.noise as NoiseAssumption;
  return o;
}
