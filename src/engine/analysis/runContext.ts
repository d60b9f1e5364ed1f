/**
 * The link between a long computation and its caller: progress reports and
 * cancellation, checked at the places a method names (grid points, folds,
 * batches of iterations). Solvers take an optional context and call
 * {@link RunContext.step}; with no context nothing is reported.
 */
import type { CandidateOutcome } from './analysisDefinition';
import { KnotwiseError } from '../errors';
import type { RunControl } from './optionDeclaration';

/** Smallest interval between two progress reports, in milliseconds. */
const REPORT_EVERY_MS = 50;

export class RunContext {
  private lastReport = -Infinity;
  private readonly spans: [number, number][] = [];

  /**
   * True while the automatic choice compares candidates: methods then leave out diagnostics that
   * only the returned fit needs (the knot bends, {@link knotBends}); the winner's are added after.
   */
  comparing = false;

  /**
   * True while the automatic choice compares candidates on a long series (from AUTO_COARSE_FROM points):
   * cross-validated trend filtering then solves every other penalty of its grid and the skipped ones
   * beside the lowest score (`fillNearBest` of trendPath), not the whole grid.
   */
  fillNearBest = false;

  /**
   * Candidates of the automatic choice already computed elsewhere (on other workers: {@link autoSplit}),
   * by their index: the choice uses them instead of computing them again.
   */
  candidates?: ReadonlyMap<number, CandidateOutcome>;

  constructor(private readonly control: RunControl = {}) {}

  /**
   * Marks progress: `fraction` (0..1) of the current part of the work, with
   * the stage in plain words. Throws a `cancelled` {@link KnotwiseError} when
   * the caller's signal is aborted. Cheap when called often.
   */
  step(fraction: number, stage: string): void {
    if (this.control.signal?.aborted) throw new KnotwiseError('cancelled', 'the analysis was cancelled before it finished; nothing was returned.');
    const report = this.control.onProgress;
    if (!report) return;
    const now = Date.now();
    if (now - this.lastReport < REPORT_EVERY_MS && fraction < 1) return;
    this.lastReport = now;
    let f = Math.min(1, Math.max(0, fraction));
    for (let i = this.spans.length - 1; i >= 0; i--) f = this.spans[i][0] + f * (this.spans[i][1] - this.spans[i][0]);
    report({ fraction: f, stage });
  }

  /** Runs `work` as the part [from, to] of the whole: its own fractions 0..1 are mapped into that span. */
  part<T>(from: number, to: number, work: () => T): T {
    this.spans.push([from, to]);
    try {
      return work();
    } finally {
      this.spans.pop();
    }
  }
}

/** A context that reports nothing and never cancels (for callers without one). */
export const QUIET = new RunContext();
