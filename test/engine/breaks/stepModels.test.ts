import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { normalStream } from '../../helpers/random';

describe('findBreaks with the mean-and-variance model', () => {
  test('finds a change in variance that the mean does not show', () => {
    let ok = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const z = normalStream(seed * 13);
      const y = Array.from({ length: 400 }, (_, i) => (i < 250 ? 1 : 3) * z());
      const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'meanvar', penalty: 'mbic' });
      if (r.breaks.length === 1 && Math.abs(r.breaks[0].index - 250) <= 15) ok++;
      for (const s of r.segments) expect(s.n).toBeGreaterThanOrEqual(2);
    }
    expect(ok).toBeGreaterThanOrEqual(16);
  });

  test('floors the variance of a constant stretch and says so', () => {
    const z = normalStream(5);
    const y = Array.from({ length: 120 }, (_, i) => (i >= 40 && i < 70 ? 2 : z()));
    const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'meanvar' });
    const idx = r.breaks.map((b) => b.index);
    expect(idx).toEqual(expect.arrayContaining([40, 70]));
    const note = r.warnings.find((w) => w.code === 'note' && /at or below the floor/.test(w.message));
    expect(note).toBeDefined();
    expect(note!.rows).toContain(40);
  });
});

describe('findBreaks with the distribution model', () => {
  test('finds a change in spread with equal means and medians', () => {
    let ok = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const z = normalStream(seed * 7);
      const y = Array.from({ length: 400 }, (_, i) => (i < 200 ? 0.5 : 3) * z());
      const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'distribution', penalty: 'mbic' });
      if (r.breaks.some((b) => Math.abs(b.index - 200) <= 15)) ok++;
    }
    expect(ok).toBeGreaterThanOrEqual(8);
  });

  test('is unchanged by a monotone transform of the data (it uses ranks only)', () => {
    const z = normalStream(3);
    const y = Array.from({ length: 300 }, (_, i) => (i < 120 ? 0 : 1.5) + z());
    const a = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'distribution' });
    const b = findBreaks(prepareSeries(y.map((v) => Math.exp(v)), null, null, { ties: 'keep' }), { model: 'distribution' });
    expect(a.breaks.map((k) => k.index)).toEqual(b.breaks.map((k) => k.index));
    expect(a.cost).toBeCloseTo(b.cost, 10);
  });

  test('says it ignores weights', () => {
    const r = findBreaks(prepareSeries([1, 2, 3, 4, 5, 6], null, [1, 1, 2, 2, 1, 1], { ties: 'keep' }), { model: 'distribution' });
    expect(r.warnings.some((w) => w.code === 'note' && /ignores weights/.test(w.message))).toBe(true);
  });
});

describe('findBreaks with the mean model and weights', () => {
  test('a weight of 2 acts as a repeated row', () => {
    const z = normalStream(21);
    const y = Array.from({ length: 60 }, (_, i) => (i < 30 ? 0 : 2) + 0.5 * z());
    const w = y.map((_, i) => (i % 3 === 0 ? 2 : 1));
    const yy: number[] = [];
    y.forEach((v, i) => { yy.push(v); if (w[i] === 2) yy.push(v); });
    const a = findBreaks(prepareSeries(y, null, w, { ties: 'keep' }), { model: 'mean', sigma: 0.5, penalty: 10 });
    const b = findBreaks(prepareSeries(yy, null, null, { ties: 'keep' }), { model: 'mean', sigma: 0.5, penalty: 10 });
    expect(a.cost).toBeCloseTo(b.cost, 8);
    expect(a.segments.map((s) => s.mean)).toEqual(b.segments.map((s) => expect.closeTo(s.mean, 10)));
  });

  test('assuming independent noise, warns when residuals are autocorrelated; by default the penalty allows for it and says so', () => {
    const z = normalStream(4);
    let e = 0;
    const y = Array.from({ length: 300 }, () => (e = 0.9 * e + z()));
    const s = prepareSeries(y, null, null, { ties: 'keep' });
    const r = findBreaks(s, { model: 'mean', sigma: 3, noise: 'independent' });
    expect(r.warnings.some((w) => w.code === 'autocorrelation')).toBe(true);
    const d = findBreaks(s, { model: 'mean' });
    expect(d.noise!.correlation).toBeGreaterThan(0.6);
    expect(d.noise!.penaltyFactor).toBeCloseTo((1 + d.noise!.correlation) / (1 - d.noise!.correlation), 12);
    expect(d.penalty.value).toBeCloseTo(2 * Math.log(300) * d.noise!.penaltyFactor, 10);
    expect(d.warnings.some((w) => w.code === 'note' && /autocorrelated/.test(w.message))).toBe(true);
    expect(d.warnings.some((w) => w.code === 'autocorrelation')).toBe(false);
  });
});

describe('findBreaks on tiny or constant series', () => {
  test('a constant series has no break and a note on the noise scale', () => {
    for (const model of ['mean', 'slope'] as const) {
      const r = findBreaks(prepareSeries([4, 4, 4, 4, 4, 4], null, null, { ties: 'keep' }), { model });
      expect(r.breaks).toEqual([]);
      expect(r.warnings.some((w) => w.code === 'note' && /sigma = 1/.test(w.message))).toBe(true);
      expect(Array.from(r.fitted)).toEqual([4, 4, 4, 4, 4, 4].map((v) => expect.closeTo(v, 10)));
    }
  });

  test('two points give a result for every model, one segment under a large penalty', () => {
    for (const model of ['mean', 'poisson', 'distribution', 'slope', 'meanvar'] as const) {
      const s = prepareSeries([1, 3], null, null, { ties: 'keep' });
      const r = findBreaks(s, { model });
      expect(r.fitted.length).toBe(2);
      expect(r.segments.length).toBe(r.breaks.length + 1);
      expect(findBreaks(s, { model, penalty: 1000 }).segments.length).toBe(1);
    }
  });
});
