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
import type { AnalysisCore, AnalysisDefinition, CandidateRow } from '../analysis/analysisDefinition';
import { analysisDefinitions, findAnalysis } from '../analysis/analysisRegistry';
import type { ResolvedOptions } from '../analysis/optionDeclaration';
import { resolveOptions } from '../analysis/resolveOptions';
import { SEASON_OPTION, noiseOption } from '../analysis/penaltyOptions';
import type { RunContext } from '../analysis/runContext';
import { KnotwiseError, isKnotwiseError, showNumber } from '../errors';
import type { Series } from '../series';
import { warning } from '../warnings';
import type { CriterionPoint } from '../types';
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
 * Longest series the automatic choice compares methods on. Every candidate chooses its
 * penalty by cross-validation, and trend filtering's cross-validation dominates: with the
 * shorter grids of {@link AUTO_SEARCH_POINTS}, 8.6 to 9.6 s of CPU time for all candidates at
 * 5,000 points (order 3 about four fifths of it) and 5.9 to 6.0 s at 10,000 (order 2 about
 * nine tenths; order 3 is refused there), medians of 3 on a shared 2-core machine at a load
 * average of 4 to 6 (`npm run bench -- --only=smoothers`, part auto; 13 to 14 s and 10 to 11 s
 * with the full grids); 36 s at 16,384 with the full grids (fullcolumn), so beyond this length
 * the choice is refused at once with what to do instead, rather than left running for minutes.
 */
export const AUTO_LIMIT = 10000;

/**
 * Most penalties a candidate's search grid tries during the automatic choice on series of at least
 * {@link AUTO_COARSE_FROM} points. A method whose own default grid is longer is run on this many,
 * log-spaced over its usual range: trend filtering (30 penalties from lambda_max down to 1e-5 to
 * 1e-9 of it), whose cross-validation costs one fit per penalty and fold and is where the time of
 * the choice goes; the spline and Whittaker (25), which refine their grid minimum by Brent's method
 * anyway. The minimum of a cross-validation curve is flat on the scale of its standard error: on
 * the seeded series of the benchmark at 5,000 points the minimum of trend filtering on 15 penalties
 * was within 0.1 standard error of the minimum on 30 (orders 1 to 3), and the whole choice took a third
 * to nearly a half less CPU time.
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

/**
 * Runs every candidate and picks one.
 *
 * @param series - clean series (ties merged)
 * @param options - resolved: `rule` 'cv-simpler' (default) or 'cv'; `folds` (default 5); `noise`
 *   ('correlated' by default, passed to every candidate that declares it)
 * @param context - progress: one part per candidate
 * @returns the winner's fit (its `smooth`, `criterion`, warnings) with `comparison`
 * @throws {@link KnotwiseError} `too-few-points` when no candidate can be cross-validated;
 *   `bad-data` when the series is longer than {@link AUTO_LIMIT}
 */
export function chooseSmoother(series: Series, options: ResolvedOptions, context: RunContext): AnalysisCore {
  if (series.n > AUTO_LIMIT) {
    throw new KnotwiseError('bad-data', `the automatic choice compares every method by cross-validation on at most ${AUTO_LIMIT.toLocaleString('en-US')} points; this series has ${series.n.toLocaleString('en-US')}, which would take minutes. Choose a method yourself (spline, whittaker, loess and wavelet fit a full column in seconds; trend with a penalty), or compare on a shorter range of rows.`);
  }
  const folds = options.folds as number;
  const rule = options.rule as string;
  const noise = options.noise as string | undefined;
  const variants = analysisDefinitions('smoother').flatMap((def) => (def.autoVariants ?? []).map((v) => ({ def, v })));
  const rows: CandidateRow[] = [];
  const fits: (AnalysisCore | null)[] = [];
  // candidates leave out the knot bends (only the winner's are shown); restored in any case
  const wasComparing = context.comparing;
  context.comparing = true;
  try {
    variants.forEach(({ def, v }, i) => {
      const t0 = Date.now();
      const row: CandidateRow = { method: def.name, options: { ...v.options }, label: v.label, penalty: NaN, df: NaN, cv: NaN, se: NaN, milliseconds: 0 };
      try {
        // the season (if any) was taken out once, before the candidates: they smooth the series as it is now
        // every candidate chooses by cross-validation: through its rule, or through its variant's options (wavelet: threshold=cv)
        const declares = (name: string) => def.options.some((o) => o.name === name);
        const grid = def.options.find((o) => o.name === 'searchPoints')?.default;
        const coarser = series.n >= AUTO_COARSE_FROM && typeof grid === 'number' && grid > AUTO_SEARCH_POINTS ? { searchPoints: AUTO_SEARCH_POINTS } : {};
        const opts = resolveOptions(def.options, { ...v.options, ...(declares('rule') ? { rule: 'cv' } : {}), folds, ...coarser, ...(declares('season') ? { season: 'none' } : {}), ...(noise !== undefined && declares('noise') ? { noise } : {}) }, def.name).options;
        if (series.n < def.minPoints(opts) || series.n < 2 * folds + 2) throw new KnotwiseError('too-few-points', `${series.n} points are too few for ${folds}-fold cross-validation of ${v.label}.`);
        const core = context.part(i / variants.length, (i + 1) / variants.length, () => def.run(series, opts, context));
        const fit = core.smooth!;
        if (fit.criterion.name !== 'cv') throw new KnotwiseError('too-few-points', `${v.label} could not be cross-validated on these data (${fit.criterion.name} was used instead).`);
        row.penalty = fit.penalty; row.df = fit.df; row.cv = fit.criterion.value; row.se = chosenPointSe(fit.criterion.curve, fit.penalty);
        fits.push(core);
      } catch (e) {
        if (!isKnotwiseError(e) || e.code === 'cancelled') throw e;
        row.skipped = e.message;
        fits.push(null);
      }
      row.milliseconds = Date.now() - t0;
      rows.push(row);
    });
  } finally {
    context.comparing = wasComparing;
  }
  const ok = rows.map((r, i) => i).filter((i) => !rows[i].skipped);
  if (ok.length === 0) throw new KnotwiseError('too-few-points', `no method could be cross-validated with ${folds} folds on ${series.n} points; choose a method and a penalty yourself, or use fewer folds.`);
  // the shared rule of choosePenalty on the candidates ordered from the most complex to the simplest
  // (more df first; at equal df the higher declared simplicity first): its minimum is the lowest
  // error (ties to the simpler), its one-standard-error pick the simplest within one se of it
  // with no more df
  const order = ok.slice().sort((i, j) => rows[j].df - rows[i].df || variants[j].v.simplicity - variants[i].v.simplicity);
  const curve: CriterionPoint[] = order.map((i) => ({ penalty: NaN, score: rows[i].cv, df: rows[i].df, se: rows[i].se }));
  const best = order[choosePenalty(curve, 'minimum')];
  const chosen = rule === 'cv-simpler' ? order[choosePenalty(curve, 'simpler')] : best;
  const win = { ...fits[chosen]! };
  // the winner's knot bends, left out while comparing
  if (win.smooth && win.smooth.bends === undefined) {
    const fit = win.smooth;
    const bends = fit.method === 'trend' ? knotBends(series, fit.options.order ?? 1, fit.knots)
      : fit.method === 'mixed' ? mixedKnotBends(series, fit.knots, fit.model as MixedModel) : undefined;
    if (bends) win.smooth = { ...fit, bends };
  }
  const reason = explain(rows, chosen, best, rule, win.smooth?.method === 'mixed' && win.smooth.knots.length === 0);
  const notes = [
    warning('note', `Automatic choice among ${ok.length} fits by ${folds}-fold cross-validation on the same held-out points: ${reason} Each score is the minimum of its own curve, so all are slightly optimistic alike.`),
  ];
  if (series.n >= AUTO_COARSE_FROM) notes.push(warning('note', `On ${series.n.toLocaleString('en-US')} points each candidate searched at most ${AUTO_SEARCH_POINTS} penalties (its own default range); run a method on its own for its full search grid.`));
  for (const r of rows) if (r.skipped) notes.push(warning('note', `Not compared: ${r.label}: ${r.skipped}`));
  return { ...win, warnings: [...notes, ...win.warnings], comparison: { rows, chosen, best, folds, reason } };
}

/** The automatic choice as a declared analysis. */
export const autoAnalysis: AnalysisDefinition = {
  name: 'auto',
  family: 'smoother',
  label: 'Let the data choose the method (compares every smoother by cross-validation)',
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
