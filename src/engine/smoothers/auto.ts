/**
 * The automatic choice among smoothers: every registered smoother's variants
 * (the spline; trend filtering of orders 0 to 3; the mixed trend; any method that declares
 * `autoVariants`) choose their own penalty by K-fold cross-validation on the
 * same deterministic folds ({@link crossValidate}), so their scores are the
 * same quantity on the same held-out points. The winner is the candidate with
 * the lowest cross-validation error or, with the default rule, the simplest
 * candidate (fewest degrees of freedom) whose error is within one standard
 * error of the lowest (the one-standard-error rule applied across methods;
 * Hastie, Tibshirani & Friedman 2009, section 7.10), by the shared rule of
 * {@link choosePenalty} applied to the candidates ordered from most to fewest df.
 * Knot bends ({@link knotBends}) are computed for the winner only. From
 * {@link AUTO_COARSE_FROM} points the candidates search shorter penalty grids
 * ({@link AUTO_SEARCH_POINTS}), said in a note of the result.
 *
 * Caveat, stated in the result: each candidate's score is the minimum of its
 * own cross-validation curve, so it is slightly optimistic (the penalty was
 * chosen on the same folds); the comparison favours no method by this, since
 * every candidate gets the same treatment.
 */
import type { AnalysisCore, AnalysisDefinition, AutoVariant, CandidateOutcome, CandidateRow } from '../analysis/analysisDefinition';
import { analysisDefinitions, findAnalysis } from '../analysis/analysisRegistry';
import type { ResolvedOptions } from '../analysis/optionDeclaration';
import { declarationsByKey, optionKey, resolveOptions } from '../analysis/resolveOptions';
import { SEASON_OPTION, noiseOption } from '../analysis/penaltyOptions';
import type { RunContext } from '../analysis/runContext';
import { KnotwiseError, isKnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning } from '../warnings';
import type { CriterionPoint, FitResult } from '../types';
import { choosePenalty } from '../select/choosePenalty';
import { knotBends } from '../diagnostics/knotBends';
import { mixedKnotBends, MixedModel } from './mixed/mixedAnalysis';

const pct = (v: number) => `${Math.round(100 * v)}%`;

/**
 * The plain sentence: what won, against what, by how much. `noKinks`: the chosen fit is a mixed trend whose
 * kink part has no kinks (a smooth-bends fit in effect), so the sentence may not say the series has kinks. Unchecked.
 */
export function explain(rows: CandidateRow[], chosen: number, best: number, rule: string, noKinks = false): string {
  const c = rows[chosen];
  const ok = rows.filter((r) => !r.skipped);
  if (ok.length === 1) return `Only ${c.label} could be fitted to these data, so it was used.`;
  const others = ok.filter((r) => r !== c).sort((a, b) => a.cv - b.cv);
  const runnerUp = others[0];
  const spline = ok.find((r) => r.method === 'spline');
  if (chosen !== best) {
    return `${cap(c.label)} was chosen: its cross-validation error is within one standard error of the best (${rows[best].label}) with fewer degrees of freedom (${showNumber(round(c.df))} against ${showNumber(round(rows[best].df))}), so the simpler fit is preferred.`;
  }
  const vs = spline && spline !== c ? spline : runnerUp;
  const gain = 1 - c.cv / vs.cv;
  const shape = c.method === 'trend' && c.options.order === 0 ? 'the series moves in steps'
    : c.method === 'trend' && c.options.order === 1 ? 'the series has sharp bends'
      : c.method === 'spline' ? 'the series bends smoothly'
        : c.method === 'mixed' ? (noKinks ? 'the series bends smoothly (this fit found no kinks, so it is a smooth-bends trend in effect)' : 'the series has sharp kinks in places and smooth bends in others')
        : 'its shape fits the series';
  return `${cap(c.label)} predicted held-out points best: ${shape}; its cross-validation error is ${pct(gain)} lower than ${vs.label}'s${rule === 'cv-simpler' ? ', and no simpler fit came within one standard error' : ''}.`;
}

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/**
 * Standard error of a candidate's cross-validation score: that of the curve point at its chosen
 * penalty, found as the point nearest in log(penalty) (the chosen penalty is a point of the
 * curve; nearest rather than equal so that rounding in unit conversions cannot lose it). NaN
 * when the curve carries no standard error. Unchecked.
 */
function chosenPointSe(curve: readonly CriterionPoint[] | undefined, penalty: number): number {
  if (!curve || !curve.length) return NaN;
  let best = curve[0];
  const d = (p: CriterionPoint) => Math.abs(Math.log(p.penalty) - Math.log(penalty));
  for (const p of curve) if (d(p) < d(best)) best = p;
  return best.se ?? NaN;
}
const round = (v: number) => Number(v.toPrecision(3));

/**
 * Longest series the automatic choice compares methods on. Every candidate chooses its penalty by
 * cross-validation; those whose cross-validation grows faster than the number of points declare how
 * far they take part (`maxPoints`: trend filtering of orders 2 and 3, the mixed trend) and are listed
 * as not compared beyond it. The rest grow about linearly: together they took 1.4 to 2.1 s at 10,001
 * points (order 2 left out from there, order 3 from 5,001), 2.7 to 3.8 s at 20,000 and 7.3 to 8.7 s at
 * 50,000 (the two seeded shapes of the bench, one run each in one process, 2-core machine). Beyond
 * this length no methods are compared: the smoothing spline is fitted by its own default rule
 * ({@link fitWithoutComparison}), with a note that says so, because the automatic choice is the
 * default of the fronts and a long column must still get a fit.
 */
export const AUTO_LIMIT = 50000;

/**
 * The smoother the fronts run when none is named (the worksheet functions that fit a curve, the
 * command line's fit, the pane's first entry): the automatic choice, which on long series fits
 * without comparing ({@link AUTO_LIMIT}).
 */
export const DEFAULT_SMOOTHER = 'auto';

/**
 * The smoother the automatic choice falls back on: it takes settings given without a method that the
 * automatic choice does not accept (a penalty, `df=8`, `gcv`), since it was the default before, so such
 * settings keep their meaning; and it is fitted, linear in n, where no methods are compared
 * ({@link fitWithoutComparison}).
 */
export const FALLBACK_SMOOTHER = 'spline';

/**
 * The smoother to run when none is named: {@link DEFAULT_SMOOTHER}, or {@link FALLBACK_SMOOTHER} with a
 * note when the settings are not the automatic choice's but are the spline's. `optionsFor` gives the
 * settings as they read for one method (a front that parses settings text per method parses them
 * there). When neither takes them, the automatic choice's refusal is thrown, saying that no method
 * was named.
 *
 * @throws {@link KnotwiseError} `bad-option`
 * @example
 * ```ts
 * defaultSmoother(() => ({ df: 8 })); // { name: 'spline', note: 'No method was named ...' }
 * ```
 */
export function defaultSmoother(optionsFor: (def: AnalysisDefinition) => Readonly<Record<string, unknown>> | undefined): { name: string; note?: string } {
  const first = findAnalysis(DEFAULT_SMOOTHER).def;
  let refusal: KnotwiseError;
  try {
    resolveOptions(first.options, optionsFor(first), first.name);
    return { name: first.name };
  } catch (e) {
    if (!isKnotwiseError(e) || e.code !== 'bad-option') throw e;
    refusal = e;
  }
  const unnamed = () => new KnotwiseError('bad-option', `${refusal.message} No method was named, so the automatic choice ran; name a method to use these settings.`);
  const other = findAnalysis(FALLBACK_SMOOTHER).def;
  let raw: Readonly<Record<string, unknown>> | undefined;
  try {
    raw = optionsFor(other);
  } catch {
    throw unnamed();
  }
  // settings that name anything the spline does not declare are not the spline's either
  if (!declaresEvery(other, raw)) throw unnamed();
  try {
    resolveOptions(other.options, raw, other.name);
  } catch (e) {
    if (!isKnotwiseError(e) || e.code !== 'bad-option') throw e;
    throw new KnotwiseError('bad-option', `${e.message} (No method was named; settings the automatic choice does not take go to the smoothing spline.)`);
  }
  return { name: other.name, note: `No method was named and these settings are not the automatic choice's, so they were applied to the smoothing spline (the default for such settings). Name a method to use them with another.` };
}

/** Whether every setting given (non-empty) names an option `def` declares, in any accepted spelling. Unchecked. */
function declaresEvery(def: AnalysisDefinition, raw: Readonly<Record<string, unknown>> | undefined): boolean {
  const byKey = declarationsByKey(def.options);
  return Object.entries(raw ?? {}).every(([k, v]) => v === undefined || v === null || v === '' || byKey.has(optionKey(k)));
}

/** Fewest points on which every candidate can be cross-validated with this many folds. Unchecked. */
const foldsMinimum = (folds: number): number => 2 * folds + 2;

/**
 * Why no methods are compared on a series of n points with this many folds, or undefined when they
 * are: more than {@link AUTO_LIMIT} points, or too few for the folds ({@link foldsMinimum}). Unchecked.
 */
export function noComparisonReason(n: number, folds: number): string | undefined {
  const count = (v: number) => v.toLocaleString('en-US');
  if (n > AUTO_LIMIT) return `no methods were compared: on ${count(n)} points comparing them by cross-validation would take minutes (the automatic choice compares methods on at most ${count(AUTO_LIMIT)} points). Choose a method yourself, or compare on a range of at most ${count(AUTO_LIMIT)} rows.`;
  if (n < foldsMinimum(folds)) return `no methods were compared: ${count(n)} points are too few for ${folds}-fold cross-validation (it needs at least ${foldsMinimum(folds)}). Use fewer folds (folds=2 needs ${foldsMinimum(2)} points) or more data.`;
  return undefined;
}

/**
 * Most penalties a candidate's search grid tries during the automatic choice on series of at least
 * {@link AUTO_COARSE_FROM} points. A method whose own default grid is longer is run on this many,
 * log-spaced over its usual range: trend filtering (30 penalties from lambda_max down to 1e-5 to
 * 1e-9 of it), whose cross-validation costs one fit per penalty and fold and is where the time of
 * the choice goes; the spline and Whittaker (25), which refine their grid minimum by Brent's method
 * anyway. The minimum of a cross-validation curve is flat on the scale of its standard error: on
 * the seeded series of the benchmark at 5,000 points the minimum of trend filtering on 15 penalties
 * was within 0.1 standard error of the minimum on 30 (orders 1 to 3), and the whole choice took a third
 * to nearly a half less CPU time. Trend filtering's candidates then also solve only every other
 * penalty of their grid and the skipped ones beside the lowest score (`fillNearBest` of trendPath):
 * the same lowest grid score wherever the curve has one minimum (on 36 seeded cross-validations at
 * 2,000 and 5,000 points, two shapes, three seeds, orders 1 to 3: in every one), in 7 to 20% less time
 * for orders 2 and 3 at 5,000 points. Not on shorter series: there a cross-validation curve can dip
 * at a penalty between two others (the demo's 156 weeks, order 3: its lowest score, at a skipped
 * penalty, was missed, and the choice moved from order 3 to the spline).
 */
export const AUTO_SEARCH_POINTS = 15;

/**
 * Shortest series on which the automatic choice uses the shorter grids of {@link AUTO_SEARCH_POINTS}.
 * Below it every candidate runs its own grid: the whole choice takes a few seconds at most there,
 * and on short series a trend filter's df at the minimum, which the one-standard-error rule across
 * methods compares, moves by a knot or two with the grid, which changed the pick among fits of
 * nearly equal error on 3 of the 8 series of the automatic choice's tests (measured with 15 penalties).
 */
export const AUTO_COARSE_FROM = 2000;

/** The candidates of the automatic choice in their fixed order: every smoother's declared variants. */
export function autoCandidates(): { def: AnalysisDefinition; v: AutoVariant }[] {
  return analysisDefinitions('smoother').flatMap((def) => (def.autoVariants ?? []).map((v) => ({ def, v })));
}

/**
 * One candidate of the automatic choice: its variant run with cross-validation on the shared folds
 * (its rule set to 'cv', or its variant's options; the season off, since it was taken out once before
 * the candidates; `noise` passed on), knot bends left out. A candidate that cannot be compared (too
 * few points for the folds, longer than its `maxPoints`, or not cross-validated) gets a row saying
 * why and no result; a cancellation is thrown.
 *
 * @param series - the clean series the candidates share (season taken out)
 * @param options - the automatic choice's resolved options (`folds`, `noise`)
 * @param context - progress and cancellation of this candidate
 * @param index - position in {@link autoCandidates}
 * Unchecked.
 */
export function candidateOutcome(series: Series, options: ResolvedOptions, context: RunContext, index: number, candidates = autoCandidates()): CandidateOutcome {
  const { def, v } = candidates[index];
  const folds = options.folds as number;
  const noise = options.noise as string | undefined;
  const t0 = Date.now();
  const row: CandidateRow = { method: def.name, options: { ...v.options }, label: v.label, penalty: NaN, df: NaN, cv: NaN, se: NaN, milliseconds: 0 };
  let core: AnalysisCore | null = null;
  // candidates leave out the knot bends (only the winner's are shown); restored in any case
  const wasComparing = context.comparing, wasFilling = context.fillNearBest;
  context.comparing = true;
  context.fillNearBest = series.n >= AUTO_COARSE_FROM;
  try {
    // every candidate chooses by cross-validation: through its rule, or through its variant's options (wavelet: threshold=cv)
    const declares = (name: string) => def.options.some((o) => o.name === name);
    const grid = def.options.find((o) => o.name === 'searchPoints')?.default;
    const coarser = series.n >= AUTO_COARSE_FROM && typeof grid === 'number' && grid > AUTO_SEARCH_POINTS ? { searchPoints: AUTO_SEARCH_POINTS } : {};
    const opts = resolveOptions(def.options, { ...v.options, ...(declares('rule') ? { rule: 'cv' } : {}), folds, ...coarser, ...(declares('season') ? { season: 'none' } : {}), ...(noise !== undefined && declares('noise') ? { noise } : {}) }, def.name).options;
    if (v.maxPoints !== undefined && series.n > v.maxPoints) throw new KnotwiseError('bad-data', `its cross-validation grows faster than the series; the automatic choice includes it on at most ${v.maxPoints.toLocaleString('en-US')} points (run it on its own with a penalty, or on a shorter range of rows).`);
    if (series.n < def.minPoints(opts) || series.n < foldsMinimum(folds)) throw new KnotwiseError('too-few-points', `${series.n} points are too few for ${folds}-fold cross-validation of ${v.label}.`);
    const run = def.run(series, opts, context);
    const fit = run.smooth!;
    if (fit.criterion.name !== 'cv') throw new KnotwiseError('too-few-points', `${v.label} could not be cross-validated on these data (${fit.criterion.name} was used instead).`);
    row.penalty = fit.penalty; row.df = fit.df; row.cv = fit.criterion.value; row.se = chosenPointSe(fit.criterion.curve, fit.penalty);
    core = run;
  } catch (e) {
    if (!isKnotwiseError(e) || e.code === 'cancelled') throw e;
    row.skipped = e.message;
  } finally {
    context.comparing = wasComparing;
    context.fillNearBest = wasFilling;
  }
  row.milliseconds = Date.now() - t0;
  return { index, row, core };
}

/**
 * Whether an outcome computed elsewhere can stand for the candidate at `index` of this build's list:
 * the same method and label, a row with a score (or why it was skipped) and, unless skipped, a fit.
 * Anything else is computed again here. Unchecked.
 */
function outcomeFits(o: CandidateOutcome | undefined, index: number, c: { def: AnalysisDefinition; v: AutoVariant }): o is CandidateOutcome {
  if (!o || typeof o !== 'object' || o.index !== index || !o.row || o.row.method !== c.def.name || o.row.label !== c.v.label) return false;
  if (typeof o.row.skipped === 'string') return o.core === null;
  return typeof o.row.cv === 'number' && typeof o.row.df === 'number' && !!o.core && typeof o.core === 'object' && !!o.core.smooth;
}

/**
 * Runs every candidate and picks one.
 *
 * @param series - clean series (ties merged)
 * @param options - resolved: `rule` 'cv-simpler' (default) or 'cv'; `folds` (default 5); `noise`
 *   ('correlated' by default, passed to every candidate that declares it)
 * @param context - progress: one part per candidate. Candidates computed elsewhere (on other workers,
 *   {@link autoSplit}) come in `context.candidates` and are used as they are; any missing one is computed here
 * @returns the winner's fit (its `smooth`, `criterion`, warnings) with `comparison`; where no methods
 *   can be compared (too few points for the folds, more than {@link AUTO_LIMIT}, or no candidate
 *   cross-validated) the spline's, saying why ({@link fitWithoutComparison})
 */
export function chooseSmoother(series: Series, options: ResolvedOptions, context: RunContext): AnalysisCore {
  const folds = options.folds as number;
  const refusal = noComparisonReason(series.n, folds);
  if (refusal) return fitWithoutComparison(series, context, refusal);
  const rule = options.rule as string;
  const variants = autoCandidates();
  const given = context.candidates;
  // the season (if any) was taken out once, before the candidates: they smooth the series as it is now
  const outcomes = variants.map((c, i) => {
    const o = given?.get(i);
    return outcomeFits(o, i, c) ? o : context.part(i / variants.length, (i + 1) / variants.length, () => candidateOutcome(series, options, context, i, variants));
  });
  const rows: CandidateRow[] = outcomes.map((o) => o.row);
  const fits: (AnalysisCore | null)[] = outcomes.map((o) => o.core);
  const ok = rows.map((r, i) => i).filter((i) => !rows[i].skipped);
  if (ok.length === 0) return fitWithoutComparison(series, context, `no methods were compared: none could be cross-validated with ${folds} folds on ${series.n.toLocaleString('en-US')} points. Choose a method and a penalty yourself, or use fewer folds.`);
  // the shared rule of choosePenalty on the candidates ordered from the most complex to the simplest
  // (more df first; at equal df the higher declared simplicity first): its minimum is the lowest
  // error (ties to the simpler), its one-standard-error pick the simplest within one se of it
  // with no more df
  const order = ok.slice().sort((i, j) => rows[j].df - rows[i].df || variants[j].v.simplicity - variants[i].v.simplicity);
  const curve: CriterionPoint[] = order.map((i) => ({ penalty: NaN, score: rows[i].cv, df: rows[i].df, se: rows[i].se }));
  const best = order[choosePenalty(curve, 'minimum')];
  const chosen = rule === 'cv-simpler' ? order[choosePenalty(curve, 'simpler')] : best;
  // knot bends, left out while comparing: the winner's and the runner-up's (a front draws both)
  const withBends = (fit: FitResult): FitResult => {
    if (fit.bends !== undefined) return fit;
    const bends = fit.method === 'trend' ? knotBends(series, fit.options.order ?? 1, fit.knots)
      : fit.method === 'mixed' ? mixedKnotBends(series, fit.knots, fit.model as MixedModel) : undefined;
    return bends ? { ...fit, bends } : fit;
  };
  const win = { ...fits[chosen]! };
  if (win.smooth) win.smooth = withBends(win.smooth);
  const reason = explain(rows, chosen, best, rule, win.smooth?.method === 'mixed' && win.smooth.knots.length === 0);
  const notes = [
    warning('note', `Automatic choice among ${ok.length} fits by ${folds}-fold cross-validation on the same held-out points: ${reason} Each score is the minimum of its own curve, so all are slightly optimistic alike.`),
  ];
  if (series.n >= AUTO_COARSE_FROM) notes.push(warning('note', `On ${series.n.toLocaleString('en-US')} points each candidate searched at most ${AUTO_SEARCH_POINTS} penalties (its own default range); run a method on its own for its full search grid.`));
  for (const r of rows) if (r.skipped) notes.push(warning('note', `Not compared: ${r.label}: ${r.skipped}`));
  // the runner-up: the lowest cross-validation error after the chosen candidate, with its fit as compared
  let second = -1;
  for (const i of ok) if (i !== chosen && Number.isFinite(rows[i].cv) && (second < 0 || rows[i].cv < rows[second].cv)) second = i;
  const runnerUp = second >= 0 && fits[second]?.smooth ? { row: second, fit: withBends(fits[second]!.smooth!) } : undefined;
  return { ...win, warnings: [...notes, ...win.warnings], comparison: { rows, chosen, best, folds, reason, ...(runnerUp ? { runnerUp } : {}) } };
}

/**
 * The fit when no methods are compared (`why`: {@link noComparisonReason}, or no candidate could be
 * cross-validated): {@link FALLBACK_SMOOTHER} by its own default rule, with `why` as a note and as
 * `uncompared`; no `comparison`. Should the spline refuse the data too, its refusal is thrown. Unchecked.
 */
export function fitWithoutComparison(series: Series, context: RunContext, why: string): AnalysisCore {
  const def = findAnalysis(FALLBACK_SMOOTHER).def;
  const core = def.run(series, resolveOptions(def.options, { season: 'none' }, def.name).options, context);
  const rule = core.smooth?.criterion.name ?? '';
  const note = warning('note', `${cap(why)} The smoothing spline was fitted instead, its penalty chosen by ${rule.toUpperCase()} (its default rule).`);
  return { ...core, warnings: [note, ...core.warnings], uncompared: why };
}

/** The automatic choice as a declared analysis. */
export const autoAnalysis: AnalysisDefinition = {
  name: 'auto',
  family: 'smoother',
  label: 'Let the data choose the method',
  summary: 'every smoother and order chooses its penalty by K-fold cross-validation on the same folds; the lowest error wins, or the simplest within one standard error of it',
  options: [
    {
      name: 'rule', kind: 'choice', choices: ['cv-simpler', 'cv'], default: 'cv-simpler', oldValues: { 'cv-1se': 'cv-simpler' },
      choiceHelp: { 'cv-simpler': 'the simplest fit within one standard error of the best (default)', cv: 'the lowest cross-validation error' },
      help: 'how the winner is picked: cv-simpler (default) or cv',
    },
    { name: 'folds', kind: 'integer', min: 2, max: 20, default: 5, help: 'number of cross-validation folds shared by every candidate (default 5)' },
    // every candidate is cross-validated, so the setting always applies (and is passed to each)
    noiseOption('rule', []),
    SEASON_OPTION,
  ],
  ties: 'merge',
  minPoints: () => 3,
  run: chooseSmoother,
  evaluate(result, x) {
    const m = result.smooth!.method;
    return findAnalysis(m).def.evaluate!(result, x);
  },
};
