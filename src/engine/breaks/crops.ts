/**
 * CROPS: every optimal segmentation for a range of penalties.
 */
import type { CropsRow } from './types';
import { showNumber } from '../errors';
import { warning, type Warning } from '../warnings';

/** What CROPS needs from one penalised search. */
export interface PenalisedFit {
  changes: number[];
  /** Unpenalised cost. */
  cost: number;
}

/** Result of {@link crops}: the table plus the number of searches run. */
export interface CropsOutcome {
  rows: CropsRow[];
  runs: number;
  /** False when `maxRuns` stopped the search before every interval was resolved. */
  complete: boolean;
}

/**
 * Changepoints for a Range Of PenaltieS (Haynes, Eckley & Fearnhead 2017,
 * "Computationally efficient changepoint detection for a range of penalties",
 * JCGS 26:134-143). The optimal cost Q(beta) = min_m [cost_m + beta m] is concave and
 * piecewise linear in beta; CROPS finds all its pieces in [low, high]:
 * solve at low and high; for an interval whose ends give m0 > m1 + 1 changes, solve at
 * beta* = (cost_1 - cost_0) / (m0 - m1), where the two lines cross; if the result has
 * m1 changes (or cost equal to the crossing value) the interval is resolved, otherwise
 * split it at beta* and repeat. Needs at most m(low) - m(high) + 2 searches.
 *
 * Stopping rule: every interval resolved, or `maxRuns` searches (then `complete` is false).
 *
 * @param solve - runs the exact search at a penalty
 * @param low - smallest penalty (>= 0)
 * @param high - largest penalty (> low)
 * @param maxRuns - search budget
 * @returns rows in increasing penalty, each with the interval of penalties where it is optimal
 * @example
 * ```ts
 * const table = crops((b) => pelt(cost, b, 1), 2, 200, 200).rows;
 * ```
 */
export function crops(solve: (penalty: number) => PenalisedFit, low: number, high: number, maxRuns: number): CropsOutcome {
  const found = new Map<number, { penalty: number; fit: PenalisedFit }>();
  let runs = 0;
  const run = (b: number): PenalisedFit => {
    runs++;
    const fit = solve(b);
    const m = fit.changes.length;
    const prev = found.get(m);
    if (!prev || fit.cost < prev.fit.cost) found.set(m, { penalty: b, fit });
    return fit;
  };
  const fLow = run(low);
  const fHigh = run(high);
  const stack: [number, PenalisedFit, number, PenalisedFit][] = [[low, fLow, high, fHigh]];
  let complete = true;
  while (stack.length) {
    const [b0, f0, b1, f1] = stack.pop()!;
    const m0 = f0.changes.length;
    const m1 = f1.changes.length;
    if (m0 <= m1 + 1) continue;
    if (runs >= maxRuns) { complete = false; break; }
    const bs = (f1.cost - f0.cost) / (m0 - m1);
    if (!(bs > b0 && bs < b1)) continue;
    const fs = run(bs);
    const ms = fs.changes.length;
    const crossing = f1.cost + bs * m1;
    const value = fs.cost + bs * ms;
    if (ms === m1 || ms === m0 || value >= crossing - 1e-10 * (1 + Math.abs(crossing))) continue;
    stack.push([b0, f0, bs, fs], [bs, fs, b1, f1]);
  }
  // keep the lower envelope: segmentations optimal for some penalty in [low, high]
  const cands = [...found.entries()].map(([m, v]) => ({ m, cost: v.fit.cost, penalty: v.penalty, changes: v.fit.changes })).sort((a, b) => b.m - a.m);
  const hull: typeof cands = [];
  for (const c of cands) {
    // drop earlier entries that c dominates over the remaining penalty range
    while (hull.length) {
      const h = hull[hull.length - 1];
      if (c.cost <= h.cost) { hull.pop(); continue; }
      if (hull.length >= 2) {
        const g = hull[hull.length - 2];
        const bgh = (h.cost - g.cost) / (g.m - h.m);
        const bhc = (c.cost - h.cost) / (h.m - c.m);
        if (bhc <= bgh) { hull.pop(); continue; }
      }
      break;
    }
    hull.push(c);
  }
  const rows: CropsRow[] = [];
  for (let i = 0; i < hull.length; i++) {
    const c = hull[i];
    const lo = i === 0 ? low : Math.max(low, (c.cost - hull[i - 1].cost) / (hull[i - 1].m - c.m));
    const hi = i === hull.length - 1 ? high : Math.min(high, (hull[i + 1].cost - c.cost) / (c.m - hull[i + 1].m));
    if (hi < lo) continue;
    rows.push({ penalty: Math.min(Math.max(c.penalty, lo), hi), penaltyLow: lo, penaltyHigh: hi, changes: c.m, cost: c.cost, breaks: c.changes.slice() });
  }
  return { rows, runs, complete };
}

/** Work counters of one exact search, summed by {@link cropsWithCounts}. */
export interface SearchCounts {
  evaluations: number;
  maxCandidates: number;
}

/**
 * {@link crops} over [range[0], range[1]] for a search that reports its work: the table,
 * the searches run, their summed evaluations and largest candidate set, and the
 * 'not-converged' warning when `maxRuns` stopped it. Unchecked.
 */
export function cropsWithCounts(solve: (penalty: number) => PenalisedFit & SearchCounts, range: [number, number], maxRuns: number): CropsOutcome & SearchCounts & { warning?: Warning } {
  let evaluations = 0, maxCandidates = 0;
  const out = crops((b) => {
    const r = solve(b);
    evaluations += r.evaluations;
    maxCandidates = Math.max(maxCandidates, r.maxCandidates);
    return r;
  }, range[0], range[1], maxRuns);
  const warn = out.complete ? undefined : warning('not-converged', `CROPS stopped after ${out.runs} searches (maxRuns); the table may miss some segmentations between penalties ${showNumber(range[0])} and ${showNumber(range[1])}.`);
  return { ...out, evaluations, maxCandidates, ...(warn ? { warning: warn } : {}) };
}
