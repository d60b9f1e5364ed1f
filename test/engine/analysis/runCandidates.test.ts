/**
 * The automatic choice split into its candidates (runCandidates, one call per candidate as
 * workers would run them, then runAnalysis with their outcomes) gives the same answer as one
 * runAnalysis; autoSplit says which requests split and in what order. Seeded series of our own.
 */
import { runAnalysis, runCandidates, autoSplit, analysisDefinitions, CandidateOutcome, AnalysisResult } from '../../../src/engine';
import { autoCandidates, AUTO_LIMIT } from '../../../src/engine/smoothers/auto';
import { normalStream } from '../../helpers/random';

// A wave with a level shift halfway, noise sd 0.3 (invented).
function wave(n: number, seed: number): number[] {
  const z = normalStream(seed);
  return Array.from({ length: n }, (_, i) => Math.sin(i / 20) + (i > n / 2 ? 1 : 0) + 0.3 * z());
}

/** A result as plain text, with the candidates' timings (which differ run to run) left out; typed arrays as lists (isView: a structured clone's arrays may come from another realm). */
function plain(r: AnalysisResult): string {
  const rows = r.comparison?.rows.map((q) => ({ ...q, milliseconds: 0 }));
  return JSON.stringify({ ...r, comparison: r.comparison && { ...r.comparison, rows } }, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
}

describe('runCandidates and runAnalysis with candidates', () => {
  const y = wave(240, 11);

  test('every candidate computed on its own, then the choice from their outcomes, equals one runAnalysis', () => {
    const one = runAnalysis({ y });
    const parts = autoSplit({ y })!;
    const done = parts.flatMap((i) => runCandidates({ y }, [i]));
    expect(done.map((o) => o.index).sort((a, b) => a - b)).toEqual(autoCandidates().map((_c, i) => i));
    // the outcomes cross a thread boundary as structured clones: do the same here
    const split = runAnalysis({ y, candidates: structuredClone(done) });
    expect(plain(split)).toBe(plain(one));
    expect(one.comparison!.rows.filter((r) => !r.skipped).length).toBeGreaterThan(5);
  });

  test('given outcomes are used as they are: no candidate runs again', () => {
    const done = runCandidates({ y }, autoSplit({ y })!);
    const spies = analysisDefinitions('smoother').filter((d) => d.name !== 'auto').map((d) => jest.spyOn(d, 'run'));
    try {
      const r = runAnalysis({ y, candidates: done });
      for (const s of spies) expect(s).not.toHaveBeenCalled();
      expect(r.comparison!.rows.map((q) => q.label)).toEqual(autoCandidates().map((c) => c.v.label));
    } finally {
      for (const s of spies) s.mockRestore();
    }
  });

  test('an outcome that is not the candidate at its index (another build\'s list) is computed again, and a missing one too', () => {
    const done = runCandidates({ y }, autoSplit({ y })!);
    const one = runAnalysis({ y });
    // index 0's outcome relabelled as another candidate's; index 1's left out; index 2's without its fit
    const stale: CandidateOutcome[] = done.filter((o) => o.index !== 1).map((o) => (o.index === 0 ? { ...o, row: { ...o.row, label: 'something else' } } : o.index === 2 ? { ...o, core: null } : o));
    const defs = [0, 1, 2].map((i) => analysisDefinitions('smoother').find((d) => d.name === autoCandidates()[i].def.name)!);
    const spies = [...new Set(defs)].map((d) => jest.spyOn(d, 'run'));
    try {
      const r = runAnalysis({ y, candidates: stale });
      // those three are computed again, and only they (two of them may share a definition: spies count runs per definition)
      expect(spies.reduce((a, s) => a + s.mock.calls.length, 0)).toBe(3);
      expect(plain(r)).toBe(plain(one));
    } finally {
      for (const s of spies) s.mockRestore();
    }
  });

  test('candidates are refused with a message for a request that is not an automatic choice, a position that is no candidate\'s, or a list that is not one', () => {
    expect(() => runCandidates({ analysis: 'spline', y }, [0])).toThrow('candidates are computed for the automatic choice only; this request runs "spline".');
    const last = autoCandidates().length - 1;
    expect(() => runCandidates({ y }, [last + 1])).toThrow(`candidate ${last + 1} does not exist: positions run from 0 to ${last}.`);
    expect(() => runCandidates({ y }, [1.5])).toThrow(/candidate 1.5 does not exist/);
    expect(() => runAnalysis({ y, candidates: 'all' as never })).toThrow(/candidates must be a list of the automatic choice's computed candidates; got "all"/);
  });

  test('on too few points for the folds nothing is computed, and the choice says why as one runAnalysis does', () => {
    const short = wave(10, 3);
    expect(runCandidates({ y: short }, [0, 1])).toEqual([]);
    expect(runAnalysis({ y: short, candidates: [] }).uncompared).toBe(runAnalysis({ y: short }).uncompared);
  });
});

describe('autoSplit', () => {
  test('an automatic choice splits into every candidate, the costliest first', () => {
    const parts = autoSplit({ y: wave(300, 5) })!;
    const list = autoCandidates();
    expect([...parts].sort((a, b) => a - b)).toEqual(list.map((_c, i) => i));
    const costs = parts.map((i) => list[i].v.cost ?? 1);
    expect(costs).toEqual([...costs].sort((a, b) => b - a));
    // trend filtering of order 3 is declared the costliest
    expect(list[parts[0]].def.name).toBe('trend');
    expect(list[parts[0]].v.options.order).toBe(3);
  });

  test('candidates the series is too long for are left out (the choice lists them at no cost)', () => {
    const list = autoCandidates();
    const n = 1500; // above the mixed trend's limit of 1,000 points, below order 2's and 3's
    const parts = autoSplit({ y: wave(n, 5) })!;
    const out = list.map((c, i) => i).filter((i) => list[i].v.maxPoints !== undefined && n > list[i].v.maxPoints!);
    expect(out.map((i) => list[i].def.name)).toEqual(['mixed']);
    expect(parts.some((i) => out.includes(i))).toBe(false);
    expect(parts.length).toBe(list.length - out.length);
  });

  test('no split for another method, a named changepoint model, too few or too many rows, bad settings, or a request that already carries candidates', () => {
    const y = wave(300, 5);
    expect(autoSplit({ analysis: 'spline', y })).toBeNull();
    expect(autoSplit({ analysis: 'level', y })).toBeNull();
    expect(autoSplit({ y, options: { df: 8 } })).toBeNull(); // no method named, spline-only settings: the spline runs
    expect(autoSplit({ y: wave(11, 5) })).toBeNull(); // 5 folds need 12 points
    expect(autoSplit({ y: new Array(AUTO_LIMIT + 1).fill(1) })).toBeNull();
    expect(autoSplit({ y, options: { folds: 99 } })).toBeNull(); // the one job reports the bad setting
    expect(autoSplit({ y, candidates: [] })).toBeNull();
    expect(autoSplit({ analysis: 'auto', y, options: { folds: 3 } })).not.toBeNull();
  });
});
