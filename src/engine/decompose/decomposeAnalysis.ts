/**
 * The seasonal decomposition as a declared analysis: options once, as data, for
 * every front (worksheet settings, CLI flags, pane), and one run on a clean series.
 * See decompose.ts for the model, the rules and the references.
 */
import type { Series } from '../series';
import { KnotwiseError } from '../errors';
import type { AnalysisDefinition } from '../analysis/analysisDefinition';
import type { ResolvedOptions } from '../analysis/optionDeclaration';
import type { RunContext } from '../analysis/runContext';
import { decompose, DecomposeOptions } from './decompose';
import { noiseOption } from '../analysis/penaltyOptions';
import type { NoiseAssumption } from '../types';

/** Resolved options as {@link DecomposeOptions}. Unchecked: the resolver has validated them. */
export function decomposeOptionsOf(r: ResolvedOptions): DecomposeOptions {
  const o: DecomposeOptions = {};
  if (r.method !== undefined) o.method = r.method as 'adaptive' | 'stl';
  if (r.period !== undefined) o.period = r.period as number;
  if (r.dates !== undefined) o.dates = r.dates === 'auto' ? 'auto' : r.dates === 'yes';
  if (r.season !== undefined) o.season = r.season as 'auto' | 'on' | 'off';
  if (r.order !== undefined) o.order = r.order as number;
  if (r.penalty !== undefined) o.penalty = r.penalty as number;
  else if (r.rule !== undefined) o.select = r.rule as DecomposeOptions['select'];
  if (r.noise !== undefined) o.noise = r.noise as NoiseAssumption;
  if (r.spikes === false) o.spikePenalty = Infinity;
  else if (r.spikePenalty !== undefined) o.spikePenalty = r.spikePenalty as number;
  if (r.tolerance !== undefined) o.tolerance = r.tolerance as number;
  if (r.maxIterations !== undefined) o.maxIterations = r.maxIterations as number;
  if (o.method === 'stl') {
    o.stl = {};
    if (r.seasonalWindow !== undefined) o.stl.seasonalWindow = r.seasonalWindow as number;
    if (r.robust !== undefined) o.stl.robust = r.robust as boolean;
  }
  return o;
}

/**
 * Longest series the adaptive decomposition takes: with its penalty search, 10,000 daily points took
 * 1.8 s of CPU time, 20,000 took 7.2 s and 30,000 11.6 s (single runs on a shared 2-core machine), the
 * penalty search growing faster than linearly; past 20,000 points a worksheet would wait well over 10 s.
 */
export const ADAPTIVE_LIMIT = 20000;

/** The analysis registered as 'decompose'. */
export const decomposeAnalysis: AnalysisDefinition = {
  name: 'decompose',
  family: 'decomposition',
  label: 'Trend, season, spikes and the rest, taken apart (seasonal decomposition)',
  summary: 'trend filtering + seasonal pattern + sparse spikes as one convex problem (Kim, Koh, Boyd & Gorinevsky 2009), or STL (Cleveland, Cleveland, McRae & Terpenning 1990); season found from dates and kept when its strength reaches 0.64 (Wang, Smith & Hyndman 2006)',
  options: [
    {
      name: 'method', kind: 'choice', choices: ['adaptive', 'stl'], default: 'adaptive',
      choiceHelp: { adaptive: 'a trend with knots chosen by the data, a fixed seasonal pattern and one-off spikes (default)', stl: 'STL: LOESS trend and a slowly changing season' },
      help: 'how to take the series apart: adaptive (default) or stl',
    },
    { name: 'period', kind: 'number', min: 2, help: 'season length in steps of x (12 for monthly, 7 for a weekday pattern); default: found from dates' },
    {
      name: 'dates', kind: 'choice', choices: ['auto', 'yes', 'no'], default: 'auto',
      help: 'read x as dates: auto (default: whole numbers from 10000 to 2958465 are dates), yes or no',
    },
    {
      name: 'season', kind: 'choice', choices: ['auto', 'on', 'off'], default: 'auto',
      choiceHelp: { auto: 'keep a season only when its strength is at least 0.64 (default)', on: 'keep every season the dates or period allow', off: 'no season: trend and spikes only' },
      help: 'whether to take a season out: auto (default), on or off',
    },
    { name: 'order', kind: 'integer', min: 0, max: 3, default: 1, onlyWith: { option: 'method', values: ['adaptive'] }, help: 'shape of the trend pieces: 0 level shifts, 1 straight pieces with kinks (default), 2 or 3 smooth bends' },
    {
      name: 'rule', kind: 'choice', choices: ['cv', 'cv-simpler', 'sure', 'bic'], default: 'cv', group: 'penalty', onlyWith: { option: 'method', values: ['adaptive'] },
      help: 'how to choose the trend penalty when none is given: cv (default), cv-simpler, sure or bic, on the series without its season',
    },
    noiseOption('rule', ['cv', 'cv-simpler']),
    { name: 'penalty', kind: 'number', min: 0, group: 'penalty', onlyWith: { option: 'method', values: ['adaptive'] }, help: 'a fixed trend penalty lambda instead of a rule (units as for trend filtering)' },
    { name: 'spikes', kind: 'switch', default: true, implied: true, onlyWith: { option: 'method', values: ['adaptive'] }, help: 'separate one-off spikes from the trend (default yes)' },
    { name: 'spikePenalty', kind: 'number', above: 0, onlyWith: { option: 'method', values: ['adaptive'] }, help: 'penalty per unit of spike (default: sqrt(2 ln n) times the robust sd of the remainder, the universal threshold)' },
    { name: 'seasonalWindow', kind: 'integer', min: 3, max: 1000001, onlyWith: { option: 'method', values: ['stl'] }, help: 'STL seasonal window in cycles (odd; default 13)' },
    { name: 'robust', kind: 'switch', implied: true, onlyWith: { option: 'method', values: ['stl'] }, help: 'STL robustness passes that resist outliers (default yes)' },
    { name: 'tolerance', kind: 'number', above: 0, max: 0.001, onlyWith: { option: 'method', values: ['adaptive'] }, help: 'largest change of the trend in a final step, relative to the sd of y (default 1e-7)' },
    { name: 'maxIterations', kind: 'integer', min: 1, max: 100000, onlyWith: { option: 'method', values: ['adaptive'] }, help: 'step limit of the solver (default 500)' },
  ],
  ties: 'merge',
  minPoints: (o: ResolvedOptions) => (o.method === 'stl' ? 5 : (typeof o.order === 'number' ? o.order : 1) + 3),
  run(series: Series, options: ResolvedOptions, context: RunContext) {
    // refused at once beyond ADAPTIVE_LIMIT rather than left running for minutes
    if ((options.method ?? 'adaptive') === 'adaptive' && series.n > ADAPTIVE_LIMIT) {
      throw new KnotwiseError('bad-data', `the adaptive decomposition takes at most ${ADAPTIVE_LIMIT.toLocaleString('en-US')} points; this series has ${series.n.toLocaleString('en-US')}, which would take minutes. Use method=stl (LOESS trend and season, fast at any length) or a shorter range of rows.`);
    }
    const r = decompose(series, decomposeOptionsOf(options), context);
    return {
      fitted: r.trend, warnings: r.warnings, solver: r.solver, criterion: r.criterion,
      decomposition: {
        components: { trend: r.trend, season: r.season, spikes: r.spikes, remainder: r.remainder, adjusted: r.adjusted },
        method: r.method,
        seasons: r.seasons.map((q) => ({ label: q.label, length: q.length, strength: q.strength, kept: q.kept, values: q.values })),
        seasonal: r.seasonal, strengthThreshold: r.strengthThreshold, spacing: r.spacing, dates: r.dates,
        period: r.seasons.filter((q) => q.kept).map((q) => q.length),
        knots: r.knots, bends: r.bends, spikeIndex: r.spikeIndex, penalty: r.penalty, spikePenalty: r.spikePenalty, noiseScale: r.noiseScale,
      },
    };
  },
};
