/**
 * Strict validation of {@link BreaksOptions}.
 */
import { KnotwiseError } from '../errors';
import { checkChoice, checkInteger, checkPositive, describeValue } from '../options';
import type { BreaksModel, BreaksOptions, NoiseAssumption } from './types';
import { NOISE_ASSUMPTIONS } from '../types';

/** The models {@link findBreaks} accepts. */
export const BREAKS_MODELS: readonly BreaksModel[] = ['mean', 'meanvar', 'poisson', 'distribution', 'slope'];

const KEYS = ['model', 'penalty', 'crops', 'minSegment', 'sigma', 'quantiles', 'maxRuns', 'robust', 'noise', 'season'];

/** Options with defaults filled in. */
export interface ResolvedBreaksOptions {
  model: BreaksModel;
  penalty: 'bic' | 'mbic' | number;
  crops?: [number, number];
  minSegment: number;
  sigma?: number;
  quantiles: number;
  maxRuns: number;
  /** Biweight cost ('mean' only; false for the other models). */
  robust: boolean;
  /** Noise assumption ('independent' for the models it does not apply to). */
  noise: NoiseAssumption;
  /** 'auto', 'none' or a period in points. */
  season: 'auto' | 'none' | number;
}

const show = describeValue;

/**
 * Checks every option of {@link findBreaks} and fills defaults: penalty 'bic',
 * minSegment 1 (5 for 'meanvar', lowered by findBreaks on shorter series), quantiles 10, maxRuns 200, robust true ('mean'),
 * noise 'correlated' ('mean', 'meanvar', 'slope'), season 'auto'.
 *
 * @throws {@link KnotwiseError} `bad-option` naming the option and printing the offending value
 * @example
 * ```ts
 * validateBreaksOptions({ model: 'mean', penalty: 'mbic' }); // { model: 'mean', penalty: 'mbic', minSegment: 1, ... }
 * ```
 */
export function validateBreaksOptions(options: BreaksOptions): ResolvedBreaksOptions {
  if (typeof options !== 'object' || options === null) {
    throw new KnotwiseError('bad-option', `options must be an object with at least a model; got ${show(options)}.`);
  }
  for (const k of Object.keys(options)) {
    if (!KEYS.includes(k)) throw new KnotwiseError('bad-option', `unknown option "${k}" for changepoints; use: ${KEYS.join(', ')}.`);
  }
  const model = checkChoice(options.model, 'model', BREAKS_MODELS);
  const penalty = options.penalty ?? 'bic';
  if (typeof penalty === 'number') {
    if (!Number.isFinite(penalty) || penalty < 0) throw new KnotwiseError('bad-option', `penalty must be 'bic', 'mbic' or a number >= 0; got ${show(penalty)}.`);
  } else if (penalty !== 'bic' && penalty !== 'mbic') {
    throw new KnotwiseError('bad-option', `penalty must be 'bic', 'mbic' or a number >= 0; got ${show(penalty)}.`);
  }
  let crops: [number, number] | undefined;
  if (options.crops !== undefined) {
    const c = options.crops as unknown;
    if (!Array.isArray(c) || c.length !== 2 || typeof c[0] !== 'number' || typeof c[1] !== 'number' || !Number.isFinite(c[0]) || !Number.isFinite(c[1]) || c[0] < 0 || c[1] <= c[0]) {
      throw new KnotwiseError('bad-option', `crops must be [low, high] with 0 <= low < high, both finite; got ${show(c)}.`);
    }
    crops = [c[0], c[1]];
  }
  // volatility: 5 by default (a variance from fewer points is too uncertain to report; see changepointAnalyses), at least 2
  const minDefault = model === 'meanvar' ? 5 : 1;
  const minSegment = options.minSegment ?? minDefault;
  if (typeof minSegment !== 'number' || !Number.isInteger(minSegment) || minSegment < 1) {
    throw new KnotwiseError('bad-option', `minSegment must be a whole number >= 1; got ${show(minSegment)}.`);
  }
  if (model === 'meanvar' && minSegment < 2) {
    throw new KnotwiseError('bad-option', `shortest-segment must be at least 2 for the volatility model (a variance needs two points); got ${show(minSegment)}.`);
  }
  let sigma: number | undefined;
  if (options.sigma !== undefined) {
    if (model !== 'mean' && model !== 'slope') {
      throw new KnotwiseError('bad-option', `sigma applies to models 'mean' and 'slope' only; model is '${model}' (remove sigma).`);
    }
    sigma = checkPositive(options.sigma, 'sigma (noise standard deviation in y units)');
  }
  let quantiles = 10;
  if (options.quantiles !== undefined) {
    if (model !== 'distribution') throw new KnotwiseError('bad-option', `quantiles applies to model 'distribution' only; model is '${model}' (remove quantiles).`);
    quantiles = checkInteger(options.quantiles, 'quantiles', 2, 100);
  }
  let maxRuns = 200;
  if (options.maxRuns !== undefined) {
    if (!crops) throw new KnotwiseError('bad-option', `maxRuns applies only with crops [low, high]; got maxRuns ${show(options.maxRuns)} without crops.`);
    maxRuns = checkInteger(options.maxRuns, 'maxRuns', 2, 10000);
  }
  let robust = model === 'mean';
  if (options.robust !== undefined) {
    if (typeof options.robust !== 'boolean') throw new KnotwiseError('bad-option', `robust must be true or false; got ${show(options.robust)}.`);
    if (model !== 'mean' && options.robust) throw new KnotwiseError('bad-option', `robust applies to the level model only (remove robust).`);
    robust = options.robust;
  }
  const gaussian = model === 'mean' || model === 'meanvar' || model === 'slope';
  let noise: NoiseAssumption = gaussian ? 'correlated' : 'independent';
  if (options.noise !== undefined) {
    noise = checkChoice(options.noise, 'noise', NOISE_ASSUMPTIONS);
    if (!gaussian && noise === 'correlated') throw new KnotwiseError('bad-option', `noise 'correlated' applies to the level, volatility and slope models only (remove noise).`);
  }
  let season: 'auto' | 'none' | number = 'auto';
  if (options.season !== undefined) {
    const v = options.season as unknown;
    if (v === 'auto' || v === 'none') season = v;
    else if (typeof v === 'number' && Number.isInteger(v) && v >= 2 && v <= 100000) season = v;
    else throw new KnotwiseError('bad-option', `season must be 'auto', 'none' or a whole number of points per cycle from 2 to 100000; got ${show(v)}.`);
  }
  return { model, penalty, crops, minSegment, sigma, quantiles, maxRuns, robust, noise, season };
}
