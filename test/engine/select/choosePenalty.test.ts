import { choosePenalty } from '../../../src/engine/select/choosePenalty';
import { crossValidate } from '../../../src/engine/select/crossValidate';
import { foldOf } from '../../../src/engine/select/foldOf';
import { runAnalysis } from '../../../src/engine';
import { weeklyOrders } from '../../../src/demo/weeklyOrders';

describe('choosePenalty', () => {
  test('choosePenalty takes the minimum and, on ties, the larger penalty', () => {
    const c = [{ penalty: 1, score: 3, df: 9 }, { penalty: 2, score: 1, df: 6 }, { penalty: 3, score: 1, df: 5 }, { penalty: 4, score: 2, df: 3 }];
    expect(choosePenalty(c)).toBe(2);
  });

  test('choosePenalty "simpler" takes the largest penalty within one standard error, never with more df than the minimum', () => {
    const c = [
      { penalty: 1, score: 1.0, se: 0.5, df: 9 },
      { penalty: 2, score: 1.2, se: 0.5, df: 7 },
      { penalty: 3, score: 1.4, se: 0.5, df: 10 }, // within one SE but more complex than the minimum: passed over
      { penalty: 4, score: 3.0, se: 0.5, df: 2 },
    ];
    expect(choosePenalty(c, 'simpler')).toBe(1);
  });
});

describe('crossValidate', () => {
  test('crossValidate scores the mean of fold errors with its standard error, on the shared folds', () => {
    // predictor: the training mean, whatever the penalty; errors checked by hand-free recomputation
    const y = [3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8];
    const w = y.map(() => 1);
    const K = 3;
    const cv = crossValidate(y, w, K, Float64Array.of(1, 2), (tr, te, pens) => {
      const m = Array.from(tr, (i) => y[i]).reduce((a, b) => a + b, 0) / tr.length;
      return Array.from(pens, () => new Float64Array(te.length).fill(m));
    });
    const fold = foldOf(y.length, K);
    const errs: number[] = [];
    for (let f = 0; f < K; f++) {
      const tr = y.filter((_, i) => fold[i] !== f), te = y.filter((_, i) => fold[i] === f);
      const m = tr.reduce((a, b) => a + b, 0) / tr.length;
      errs.push(te.reduce((a, v) => a + (v - m) ** 2, 0) / te.length);
    }
    const mean = errs.reduce((a, b) => a + b, 0) / K;
    const sd = Math.sqrt(errs.reduce((a, e) => a + (e - mean) ** 2, 0) / (K - 1));
    expect(cv.score[0]).toBeCloseTo(mean, 12);
    expect(cv.se[1]).toBeCloseTo(sd / Math.sqrt(K), 12);
  });
});

describe('penalty rules on the demo orders', () => {
  const demo = weeklyOrders();
  const y = demo.map((r) => r.orders ?? '');
  const x = demo.map((r) => r.weekStart);

  test('the one-standard-error rule gives no more knots than the cross-validation minimum', () => {
    const min = runAnalysis({ analysis: 'trend', y, x, options: { rule: 'cv' } }).smooth!;
    const simpler = runAnalysis({ analysis: 'trend', y, x, options: { rule: 'cv-simpler' } }).smooth!;
    expect(simpler.knots.length).toBeLessThanOrEqual(min.knots.length);
    expect(simpler.penalty).toBeGreaterThanOrEqual(min.penalty);
  });

  test('BIC for trend filtering does not interpolate', () => {
    const bic = runAnalysis({ analysis: 'trend', y, x, options: { rule: 'bic' } }).smooth!;
    expect(bic.df).toBeLessThan(153 / 4);
  });
});

describe('crossValidate with a buffer', () => {
  test('crossValidate leaves the neighbours of held-out points out of training, and holds out blocks', () => {
    const n = 60;
    const y = Array.from({ length: n }, (_, i) => Math.sin(i));
    const seen: { train: Int32Array; held: Int32Array }[] = [];
    crossValidate(y, y.map(() => 1), 5, Float64Array.of(1), (train, held, pens) => {
      seen.push({ train: Int32Array.from(train), held: Int32Array.from(held) });
      return Array.from(pens, () => new Float64Array(held.length));
    }, undefined, undefined, { phi: 0.5, buffer: 2, block: 6 });
    expect(seen).toHaveLength(5);
    for (const { train, held } of seen) {
      for (const t of train) for (const h of held) expect(Math.abs(t - h)).toBeGreaterThan(2);
      // blocks of 6 consecutive interior points (the first and last points are never held out)
      const h0 = held[0];
      expect(Array.from(held.slice(0, 6))).toEqual(Array.from({ length: 6 }, (_, j) => h0 + j));
    }
  });
});
