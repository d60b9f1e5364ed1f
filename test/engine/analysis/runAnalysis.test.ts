import { KnotwiseError, analysisDefinitions, evaluateAnalysis, fitCells, runAnalysis, breaksFromCells } from '../../../src/engine';
import { normalStream } from '../../helpers/random';

const noisy = (n: number, seed: number) => {
  const z = normalStream(seed);
  return Array.from({ length: n }, (_, i) => Math.sin(i / 8) + (i > n / 2 ? 1 : 0) + 0.2 * z());
};

describe('runAnalysis', () => {
  const y = noisy(120, 3);

  test('runAnalysis gives the same spline as the direct fit', () => {
    const r = runAnalysis({ analysis: 'spline', y });
    const d = fitCells(y, null, null, { method: 'spline' }).result;
    expect(r.family).toBe('smoother');
    expect(r.smooth!.penalty).toBe(d.penalty);
    expect(Array.from(r.fitted)).toEqual(Array.from(d.fitted));
  });

  test('runAnalysis resolves text numbers and any spelling of option names', () => {
    const r = runAnalysis({ analysis: 'Trend', y, options: { ORDER: '2', 'search-points': 12, Rule: 'SURE' } });
    expect(r.options.order).toBe(2);
    expect(r.options.searchPoints).toBe(12);
    expect(r.smooth!.criterion.name).toBe('sure');
  });

  test('runAnalysis refuses an unknown option and lists what the method accepts', () => {
    expect(() => runAnalysis({ analysis: 'spline', y, options: { order: 1 } })).toThrow(/unknown option "order" for spline; spline accepts: rule, penalty, df, folds, noise, search-points/);
  });

  test('runAnalysis refuses folds with a rule that does not use them', () => {
    expect(() => runAnalysis({ analysis: 'spline', y, options: { folds: 5 } })).toThrow(/folds applies only when rule is "cv" or "cv-simpler"; rule is "gcv"/);
  });

  test('runAnalysis refuses a rule together with a penalty', () => {
    expect(() => runAnalysis({ analysis: 'spline', y, options: { rule: 'cv', penalty: 5 } })).toThrow(/give only one of rule or penalty/);
  });

  test('runAnalysis accepts old spellings with a note', () => {
    const r = runAnalysis({ analysis: 'trend', y, options: { rule: 'cv-1se', relaxed: 1 } });
    expect(r.options.rule).toBe('cv-simpler');
    expect(r.options.refit).toBe(1);
    expect(r.warnings.filter((w) => w.code === 'note' && /still accepted/.test(w.message))).toHaveLength(2);
  });

  test('runAnalysis finds changepoint models by old and new names alike', () => {
    const a = runAnalysis({ analysis: 'mean', y, family: 'changepoints' });
    const b = runAnalysis({ analysis: 'level', y, options: { penalty: 'bic' } });
    const d = breaksFromCells(y, null, null, { model: 'mean' }).result;
    expect(a.analysis).toBe('level');
    expect(a.breaks!.breaks.map((x) => x.index)).toEqual(d.breaks.map((x) => x.index));
    expect(b.breaks!.breaks.map((x) => x.index)).toEqual(d.breaks.map((x) => x.index));
  });

  test('runAnalysis refuses a changepoint model asked of a smoothing front', () => {
    expect(() => runAnalysis({ analysis: 'level', y, family: 'smoother' })).toThrow(/unknown method "level"; use one of: spline, trend/);
  });

  test('runAnalysis refuses a y that is not a range', () => {
    expect(() => runAnalysis({ analysis: 'spline', y: 5 as never })).toThrow(/y must be a range of cells/);
  });

  test('runAnalysis results survive a structured clone', () => {
    const r = runAnalysis({ analysis: 'trend', y, options: { order: 1, penalty: 2 } });
    const c = structuredClone(r);
    expect(Array.from(c.fitted)).toEqual(Array.from(r.fitted));
    expect(Array.from(evaluateAnalysis(c, [10.5]).value)).toEqual(Array.from(evaluateAnalysis(r, [10.5]).value));
  });

  test('runAnalysis reports progress and stops when cancelled', () => {
    const seen: number[] = [];
    runAnalysis({ analysis: 'trend', y, options: { order: 1 } }, { onProgress: (p) => seen.push(p.fraction) });
    expect(seen[seen.length - 1]).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
    const signal = { aborted: false };
    let calls = 0;
    const run = () => runAnalysis({ analysis: 'trend', y, options: { order: 1 } }, { signal, onProgress: () => { if (++calls === 2) signal.aborted = true; } });
    expect(run).toThrow(KnotwiseError);
    signal.aborted = false; calls = 0;
    try { run(); } catch (e) { expect((e as KnotwiseError).code).toBe('cancelled'); }
  });

  test('every declared option has help and a kind the fronts know', () => {
    for (const d of analysisDefinitions()) {
      expect(d.label.length).toBeGreaterThan(5);
      for (const o of d.options) {
        expect(o.help.length).toBeGreaterThan(10);
        expect(['number', 'integer', 'choice', 'switch', 'range']).toContain(o.kind);
      }
    }
  });
});

describe('long series', () => {
  test('runAnalysis refuses at once a data-driven trend penalty on a series past its limit, saying what to do', () => {
    const n = 6000;
    const y = Array.from({ length: n }, (_, i) => Math.sin(i / 300));
    expect(() => runAnalysis({ analysis: 'trend', y, options: { order: 3 } })).toThrow(/trend filtering of order 3 chooses its penalty by cross-validation on at most 5,000 points; this series has 6,000.*Give a penalty/);
    expect(() => runAnalysis({ analysis: 'decompose', y: Array.from({ length: 20001 }, (_, i) => i % 7) })).toThrow(/at most 20,000 points.*Use method=stl/);
  });
});
