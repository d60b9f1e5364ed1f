/**
 * The catalogue of hostile inputs: every case is run through every worksheet
 * function and every command-line command (fit with each smoothing method,
 * breaks with each changepoint model), and each keeps its expected outcome:
 * a result (with the warning codes it must carry and, where it matters, a
 * pattern its warnings must match) or a clear error (a pattern of its message).
 *
 * Ranges are given as Excel passes them to a custom function: rows of values;
 * error cells as objects with a code ({ code: '#N/A' }, as the Office runtime
 * passes them). The command line gets the same columns written as a CSV file
 * (see {@link csvOf}), except for shapes a CSV cannot hold (marked cli: false).
 */
import { mulberry32 } from '../../src/demo/weeklyOrders';

export const SMOOTHERS = ['spline', 'trend', 'auto'] as const;
export const MODELS = ['level', 'volatility', 'counts', 'distribution', 'slope'] as const;
export type Target = (typeof SMOOTHERS)[number] | (typeof MODELS)[number];
export const TARGETS: readonly Target[] = [...SMOOTHERS, ...MODELS];
export const familyOf = (t: Target): 'smoothers' | 'changepoints' => ((SMOOTHERS as readonly string[]).includes(t) ? 'smoothers' : 'changepoints');

/** An expected outcome. */
export type Outcome =
  | { result: true; warnings: string[]; message?: RegExp; absent?: string[]; notSaying?: RegExp }
  | { result: false; error: RegExp };

/** A result carrying (at least) these warning codes; `message` must match the joined warning messages. */
export const ok = (...warnings: string[]): Outcome => ({ result: true, warnings });
export const okSaying = (message: RegExp, ...warnings: string[]): Outcome => ({ result: true, warnings, message });
/** A result that must not carry these warning codes. */
export const okWithout = (absent: string[], ...warnings: string[]): Outcome => ({ result: true, warnings, absent });
/** A result whose warnings must not say this. */
export const okNotSaying = (notSaying: RegExp, ...warnings: string[]): Outcome => ({ result: true, warnings, notSaying });
/** A clear error whose message matches. */
export const refused = (error: RegExp): Outcome => ({ result: false, error });

/**
 * Expected outcomes, most specific first: `sheet:trend` / `cli:trend`, then
 * `trend`, then `sheet:smoothers`, `smoothers`, then `sheet`, `cli`, then `all`.
 */
export type Expectations = Partial<Record<string, Outcome>>;

export interface Case {
  name: string;
  /** y as Excel passes it (normally a column: rows of one value). */
  y: unknown;
  x?: unknown;
  w?: unknown;
  /** Settings as name = value (the settings text on the sheet, flags on the command line). */
  options?: Record<string, string>;
  /** Only these targets (default: all). */
  targets?: readonly Target[];
  /** The command line cannot express this case (shapes a CSV does not have). */
  cli?: false;
  expect: Expectations;
  /** A known fault outside the catalogue's reach: the case is run as an expected failure until it is fixed. */
  knownFault?: string;
}

export function expected(c: Case, front: 'sheet' | 'cli', t: Target, fn?: string): Outcome {
  const f = familyOf(t);
  const keys = [...(fn ? [fn] : []), `${front}:${t}`, t, `${front}:${f}`, f, front, 'all'];
  for (const k of keys) { const o = c.expect[k]; if (o) return o; }
  throw new Error(`case "${c.name}" has no expectation for ${front}:${t}`);
}

// ---------------------------------------------------------------- data

const N = 40;
const rnd = mulberry32(20261202);
/** Counts-like base series (whole numbers 8..40) with a step in level at row 21: every model accepts it. */
export const BASE_Y: number[] = Array.from({ length: N }, (_, i) => Math.round(14 + (i >= 20 ? 10 : 0) + 3 * Math.sin(i / 3) + 4 * (rnd() - 0.5)));
export const BASE_X: number[] = Array.from({ length: N }, (_, i) => i + 1);
const col = (a: readonly unknown[]): unknown[][] => a.map((v) => [v]);
const withAt = (a: readonly unknown[], at: Record<number, unknown>): unknown[] => a.map((v, i) => (i + 1 in at ? at[i + 1] : v));
const err = (code: string) => ({ code });
const shuffled = (n: number, seed: number): number[] => {
  const u = mulberry32(seed);
  const p = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) { const j = Math.floor(u() * (i + 1)); [p[i], p[j]] = [p[j], p[i]]; }
  return p;
};
const perm = shuffled(N, 7);

const ALL_OK = ok();
const DROPPED = ok('dropped-cells');

export const DATA_CASES: Case[] = [
  { name: 'a clean series', y: col(BASE_Y), x: col(BASE_X), expect: { all: ALL_OK } },
  { name: 'x omitted (row positions)', y: col(BASE_Y), expect: { all: ALL_OK } },
  {
    name: 'numbers stored as text: "1,234", "12%", " 12 "', y: col(withAt(BASE_Y, { 5: '1,234', 9: '12%', 13: ' 12 ' })), x: col(BASE_X),
    expect: { all: okSaying(/3 a number stored as text [^;]*\(row 5, 9, 13\)/, 'dropped-cells') },
  },
  {
    name: 'plain numbers stored as text: "12", "1e1"', y: col(withAt(BASE_Y, { 6: '12', 8: '1e1' })), x: col(BASE_X),
    // a CSV field has no type: 12 and 1e1 written plainly are numbers there (the documented rule)
    expect: { sheet: okSaying(/2 a number stored as text [^;]*\(row 6, 8\)/, 'dropped-cells'), cli: ALL_OK },
  },
  { name: 'blanks in the middle', y: col(withAt(BASE_Y, { 10: '', 11: null, 25: '' })), x: col(BASE_X), expect: { all: okSaying(/3 blank \(row 10, 11, 25\)/, 'dropped-cells') } },
  { name: 'blanks at both ends', y: col(withAt(BASE_Y, { 1: '', 2: null, 39: '', 40: '' })), x: col(BASE_X), expect: { all: okSaying(/4 blank \(row 1, 2, 39, 40\)/, 'dropped-cells') } },
  { name: 'blank x cells', y: col(BASE_Y), x: col(withAt(BASE_X, { 3: '', 30: null })), expect: { all: okSaying(/2 blank \(row 3, 30\)/, 'dropped-cells') } },
  {
    name: 'error values #N/A and #DIV/0!', y: col(withAt(BASE_Y, { 3: err('#N/A'), 17: err('#DIV/0!') })), x: col(BASE_X),
    expect: { all: okSaying(/2 an error value \(row 3, 17\)/, 'dropped-cells') },
  },
  {
    name: 'error values in x', y: col(BASE_Y), x: col(withAt(BASE_X, { 12: err('#VALUE!'), 13: err('#REF!') })),
    expect: { all: okSaying(/2 an error value \(row 12, 13\)/, 'dropped-cells') },
  },
  { name: 'booleans TRUE and FALSE', y: col(withAt(BASE_Y, { 4: true, 8: false })), x: col(BASE_X), expect: { all: okSaying(/2 TRUE\/FALSE \(row 4, 8\)/, 'dropped-cells') } },
  {
    name: 'Infinity and NaN', y: col(withAt(BASE_Y, { 7: Infinity, 15: NaN, 22: -Infinity })), x: col(BASE_X),
    expect: { all: okSaying(/3 not finite \(row 7, 15, 22\)/, 'dropped-cells') },
  },
  {
    name: 'Excel rich values (a number, an error, a text, a boolean)',
    y: col(withAt(BASE_Y, { 2: { type: 'Double', basicValue: 17 }, 5: { type: 'Error', basicValue: '#N/A', errorType: 'NotAvailable' }, 9: { type: 'String', basicValue: 'n/a' }, 12: { type: 'Boolean', basicValue: true } })),
    x: col(BASE_X), cli: false,
    expect: { all: okSaying(/1 an error value \(row 5\).*1 text \(row 9\).*1 TRUE\/FALSE \(row 12\)|1 text \(row 9\).*1 an error value \(row 5\)/, 'dropped-cells') },
  },
  { name: 'every y is text', y: col(BASE_Y.map(() => 'n/a')), x: col(BASE_X), expect: { all: refused(/need at least \d+ usable points.*got 0 \(40 of 40 rows were not usable numbers\)/) } },
  { name: 'one point', y: col([12]), x: col([1]), expect: { all: refused(/need at least \d+ usable points.*got 1/) } },
  {
    name: 'two points', y: col([12, 15]), x: col([1, 2]),
    expect: { smoothers: refused(/need at least 3 usable points.*got 2/), changepoints: ok(), volatility: ok() },
  },
  {
    name: 'three points', y: col([12, 15, 11]), x: col([1, 2, 3]),
    expect: { smoothers: ok(), trend: ok('penalty-at-edge'), auto: okSaying(/No methods were compared: 3 points are too few for 5-fold cross-validation .* The smoothing spline was fitted instead/, 'note', 'penalty-at-edge'), changepoints: ok() },
  },
  // a constant has no noise to follow: no warning may say so
  { name: 'all y equal', y: col(BASE_Y.map(() => 17)), x: col(BASE_X), expect: { all: okSaying(/all 40 usable y values equal 17: every method returns that constant/), smoothers: { result: true, warnings: ['note'], message: /all 40 usable y values equal 17/, absent: ['few-points-per-df', 'autocorrelation'] } } },
  { name: 'all y equal, no warning of following noise', y: col(BASE_Y.map(() => 17)), x: col(BASE_X), targets: ['spline'], knownFault: 'the penalty chooser (select/) still says the fit may follow noise', expect: { all: okNotSaying(/follow(s)? noise/) } },
  { name: 'all x equal', y: col(BASE_Y), x: col(BASE_X.map(() => 5)), expect: { all: refused(/all 40 usable x values equal 5; x must vary/) } },
  {
    name: 'every x appears twice', y: col(BASE_Y), x: col(BASE_X.map((v) => Math.ceil(v / 2))),
    expect: { smoothers: okSaying(/20 rows share an x value/, 'ties-merged'), changepoints: ALL_OK },
  },
  { name: 'unsorted x', y: col(perm.map((i) => BASE_Y[i])), x: col(perm.map((i) => BASE_X[i])), expect: { all: ok('unsorted-x') } },
  { name: 'reverse-sorted x', y: col([...BASE_Y].reverse()), x: col([...BASE_X].reverse()), expect: { all: ok('unsorted-x') } },
  { name: 'x as dates with hourly spacing', y: col(BASE_Y), x: col(BASE_X.map((v) => 46023 + v / 24)), expect: { all: ALL_OK } },
  { name: 'x as dates with one-second spacing', y: col(BASE_Y), x: col(BASE_X.map((v) => 46023 + v / 86400)), expect: { all: ALL_OK } },
  { name: 'y and x of different lengths', y: col(BASE_Y), x: col(BASE_X.slice(0, 39)), cli: false, expect: { all: refused(/x has 39 rows but y has 40; give x and y the same number of rows/) } },
  { name: 'y and weights of different lengths', y: col(BASE_Y), w: col(BASE_Y.slice(0, 30).map(() => 1)), cli: false, expect: { all: refused(/weights have 30 rows but y has 40/) } },
  { name: 'a 2-D block for y', y: BASE_Y.map((v, i) => [v, BASE_X[i]]), cli: false, expect: { all: refused(/y must be a single column or a single row; got 40 rows by 2 columns/) } },
  { name: 'a 2-D block for x', y: col(BASE_Y), x: BASE_X.map((v) => [v, v]), cli: false, expect: { all: refused(/x must be a single column or a single row; got 40 rows by 2 columns/) } },
  { name: 'a row instead of a column', y: [BASE_Y], x: [BASE_X], cli: false, expect: { all: ALL_OK } },
  { name: 'y a row, x a column', y: [BASE_Y], x: col(BASE_X), cli: false, expect: { all: ALL_OK } },
  { name: 'a scalar y', y: 12, cli: false, expect: { all: refused(/y must be a range of cells \(a column or a row\); got the single value 12/) } },
  { name: 'a scalar x', y: col(BASE_Y), x: 3, cli: false, expect: { all: refused(/x must be a range of cells \(a column or a row\); got the single value 3/) } },
  { name: 'a 1 x 1 range', y: [[12]], cli: false, expect: { all: refused(/need at least \d+ usable points.*got 1/) } },
  { name: 'weights with zeros', y: col(BASE_Y), x: col(BASE_X), w: col(withAt(BASE_Y.map(() => 1), { 4: 0, 20: 0 })), expect: { all: okSaying(/2 weight 0 \(row 4, 20\)/, 'dropped-cells') } },
  { name: 'a negative weight', y: col(BASE_Y), x: col(BASE_X), w: col(withAt(BASE_Y.map(() => 1), { 9: -1 })), expect: { all: refused(/weight in row 9 is -1; weights must be zero or positive/) } },
  { name: 'a NaN weight', y: col(BASE_Y), x: col(BASE_X), w: col(withAt(BASE_Y.map(() => 1), { 9: NaN })), expect: { all: okSaying(/1 not finite \(row 9\)/, 'dropped-cells') } },
  { name: 'all weights zero', y: col(BASE_Y), x: col(BASE_X), w: col(BASE_Y.map(() => 0)), expect: { all: refused(/need at least \d+ usable points.*got 0/) } },
  { name: 'weights alternating 1e300 and 1e-300', y: col(BASE_Y), x: col(BASE_X), w: col(BASE_Y.map((_, i) => (i % 2 ? 1e300 : 1e-300))), expect: { all: refused(/weights range from 1e-300 \(row 1\) to 1e\+300 \(row 2\)/) } },
  { name: 'y near 1e300', y: col(BASE_Y.map((v) => v * 1e300)), x: col(BASE_X), expect: { all: refused(/values beyond 1e\+150 in size cannot be analysed.*Divide the column/) } },
  { name: 'y near 1e-300', y: col(BASE_Y.map((v) => v * 1e-300)), x: col(BASE_X), expect: { all: refused(/values all below 1e-150 in size underflow.*Multiply the column/) } },
  { name: 'x near 1e300', y: col(BASE_Y), x: col(BASE_X.map((v) => v * 1e300)), expect: { all: refused(/positions beyond 1e\+75 in size overflow/) } },
  { name: 'x a multiple of 5e-324 (the smallest double)', y: col(BASE_Y), x: col(BASE_X.map((v) => v * 5e-324)), expect: { all: refused(/x spans only .*: positions this close underflow the penalties' units\. Multiply x by a power of ten/) } },
  { name: 'y of 9.9e307 (the largest number a cell holds) in one row', y: col(withAt(BASE_Y, { 30: 9.9e307 })), x: col(BASE_X), expect: { all: refused(/y in row 30 is 9\.9e\+307: values beyond 1e\+150/) } },
  { name: 'one outlier of 1e140', y: col(withAt(BASE_Y, { 25: 1e140 })), x: col(BASE_X), expect: { all: ALL_OK } },
  { name: 'prices near 1e9 with cents', y: col(BASE_Y.map((v, i) => 1e9 + v + ((i * 37) % 100) / 100)), x: col(BASE_X), expect: { all: ALL_OK, counts: okSaying(/the counts model is meant for counts, but \d+ values are not whole/, 'note', 'break-cause') } },
  { name: 'x spacing 1e-9 of the range', y: col(BASE_Y), x: col(BASE_X.map((v, i) => (i === 20 ? BASE_X[19] + 39e-9 : v))), expect: { all: ALL_OK } },
  { name: 'counts with a negative entry', y: col(withAt(BASE_Y, { 11: -3 })), x: col(BASE_X), expect: { all: ALL_OK, counts: refused(/row 11.*-3/) } },
  { name: 'counts with a fractional entry', y: col(withAt(BASE_Y, { 14: 2.5 })), x: col(BASE_X), expect: { all: ALL_OK, counts: okSaying(/1 spike \(row 14\)/, 'note', 'break-cause') } }, // the one fractional value, far below its neighbours, is set aside as a spike
];

// ---------------------------------------------------------------- options

const base = { y: col(BASE_Y), x: col(BASE_X) };
const changepoints = MODELS;

export const OPTION_CASES: Case[] = [
  { name: 'order 7', ...base, options: { order: '7' }, targets: ['trend'], expect: { all: refused(/order \(trend\) must be a whole number from 0 to 3; got "?7"?/) } },
  {
    name: 'order on a method without orders', ...base, options: { order: '2' }, targets: ['spline', 'level'],
    // --order is a flag of fit only: a usage error (exit 2) for breaks
    expect: { all: refused(/unknown option "order" for (spline|level); \1 accepts: /), 'cli:level': refused(/unknown option --order for "breaks"; see knotwise help/) },
  },
  { name: 'folds 1', ...base, options: { folds: '1' }, targets: ['trend', 'auto'], expect: { all: refused(/folds \((trend|auto)\) must be a whole number from 2 to \d+; got "?1"?/) } },
  { name: 'folds with GCV', ...base, options: { folds: '5' }, targets: ['spline'], expect: { all: refused(/folds applies only when rule is "cv" or "cv-simpler"/) } },
  // trend filtering falls back to SURE and says so; the spline refuses
  { name: 'folds more than the points', ...base, options: { folds: '50' }, targets: ['trend'], expect: { all: okSaying(/40 points are too few for 50-fold cross-validation at order 1; the penalty was chosen by SURE instead/, 'note') } },
  { name: 'folds more than the points (spline)', ...base, options: { rule: 'cv', folds: '50' }, targets: ['spline'], expect: { all: refused(/folds must be a whole number from 2 to 38; got 50/) } },
  { name: 'df more than the points', ...base, options: { df: '100' }, targets: ['spline', 'trend'], expect: { all: ok('target-clamped') } },
  { name: 'df below 2', ...base, options: { df: '1' }, targets: ['spline', 'trend'], expect: { all: ok('target-clamped') } },
  { name: 'a negative penalty', ...base, options: { penalty: '-1' }, targets: ['spline', 'trend', ...changepoints], expect: { all: refused(/penalty \(\w+\) must be a number from 0; got "?-1"?/) } },
  { name: 'a text penalty', ...base, options: { penalty: 'abc' }, targets: ['spline', 'trend'], expect: { all: refused(/penalty \(\w+\) must be a number from 0; got "abc"/) } },
  {
    name: 'a text penalty for a changepoint model', ...base, options: { penalty: 'abc' }, targets: changepoints,
    knownFault: 'the resolver sends text in the penalty to the rule and blames the rule', expect: { all: refused(/penalty.*"abc"|"abc".*penalty/) },
  },
  { name: 'an unknown rule', ...base, options: { rule: 'magic' }, expect: { all: refused(/rule \(\w+\) must be one of .*; got "magic"/) } },
  { name: 'shortest segment longer than the series', ...base, options: { 'shortest-segment': '100' }, targets: changepoints, expect: { all: refused(/need at least 100 usable points for \w+; got 40/) } },
  { name: 'a huge penalty (no breaks)', ...base, options: { penalty: '1e308' }, targets: ['volatility', 'counts', 'distribution'], expect: { all: okNotSaying(/[Rr]aise the penalty/, 'break-cause') } },
  {
    name: 'a huge penalty (no breaks), autocorrelated residuals', ...base, options: { penalty: '1e308' }, targets: ['level', 'slope'],
    expect: { all: okNotSaying(/[Rr]aise the penalty/, 'break-cause') },
  },
  { name: 'a zero penalty', ...base, options: { penalty: '0' }, targets: ['spline', 'trend', 'level', 'counts'], expect: { all: ALL_OK } },
  { name: 'a noise level of zero', ...base, options: { sigma: '0' }, targets: ['level', 'slope'], expect: { all: refused(/sigma \(\w+\) must be a number greater than 0; got "?0"?/) } },
  {
    name: 'a reversed penalty range', ...base, options: { 'penalty-range': '200,2' }, targets: ['level'],
    // BREAKSCAN sets the range itself: the settings' range is a second one
    expect: { all: refused(/penalty-range \(level\) must be two numbers low, high with low < high/), BREAKSCAN: refused(/penalty-range was given twice/) },
  },
  // the exact refinement finishes what the interior point started, so one iteration still gives the optimum on 40 points
  { name: 'an iteration limit of 1', ...base, options: { 'max-iterations': '1', penalty: '1' }, targets: ['trend'], expect: { all: ok() } },
  { name: 'a rule and a penalty together', ...base, options: { rule: 'bic', penalty: '5' }, targets: ['level', 'trend'], expect: { all: refused(/give only one of rule or penalty/) } },
];

export const CASES: Case[] = [...DATA_CASES, ...OPTION_CASES];
