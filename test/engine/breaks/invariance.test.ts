/**
 * Changepoints do not depend on the units of y: the same breaks for c * y and for
 * y + c, for scales c = 10^-300 .. 10^300 wherever the intake accepts the values
 * (largest |y| from 1e-150 to 1e150; beyond, a clear refusal saying how to rescale), and offsets up to 10^6 times the spread (beyond that y + c no longer holds
 * y's digits). The counts model is the exception by nature: a count's noise depends on
 * its size, so scaled counts are a different series (and offsets would make negatives).
 * Also: one huge value, a penalty of 1e308, prices near 1e9 recorded to the cent.
 */
import fc from 'fast-check';
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import type { BreaksModel } from '../../../src/engine/breaks/types';
import { mulberry32, normalStream } from '../../helpers/random';

/** Seeded steps with clear changes (3 to 5 sds), n points, in units near 1. */
function steps(seed: number, n: number, varying = false): number[] {
  const u = mulberry32(seed), z = normalStream(seed + 1);
  let level = 0, sd = 1;
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    if (i > 0 && i % 40 === 0) { level += (u() < 0.5 ? -1 : 1) * (3 + 2 * u()); if (varying) sd = 0.5 + 2 * u(); }
    y.push(level + sd * z());
  }
  return y;
}

const breaksOf = (y: number[], model: BreaksModel): number[] => findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model }).breaks.map((b) => b.index);

describe.each(['mean', 'meanvar', 'distribution', 'slope'] as const)('model %s is free of the units of y', (model) => {
  test('scale c = 10^k, k from -300 to 300 where the doubles allow', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 1000 }), fc.integer({ min: -300, max: 300 }), (seed, k) => {
      const y = steps(seed, 160, model === 'meanvar');
      const c = 10 ** k;
      const max = Math.max(...y.map(Math.abs));
      const scaled = y.map((v) => v * c);
      if (c * max >= 1e150 || c * max < 1e-150) {
        // beyond what squared errors carry, the intake refuses and says how to rescale
        expect(() => breaksOf(scaled, model)).toThrow(/1e150|1e-150|power of ten/);
        return;
      }
      expect(breaksOf(scaled, model)).toEqual(breaksOf(y, model));
    }), { numRuns: 25, seed: 42 });
  });

  test('offset up to 10^6 times the spread', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 1000 }), fc.integer({ min: 0, max: 6 }), fc.boolean(), (seed, j, neg) => {
      const y = steps(seed, 160, model === 'meanvar');
      const c = (neg ? -1 : 1) * 10 ** j;
      expect(breaksOf(y.map((v) => v + c), model)).toEqual(breaksOf(y, model));
    }), { numRuns: 20, seed: 7 });
  });
});

describe('hard values', () => {
  test('level-and-volatility on prices near 1e9 recorded to the cent: the same breaks as the prices minus 1e9, times 1e-9 and times 1e15', () => {
    const y = steps(11, 200, true).map((v) => 1e9 + Math.round(100 * v) / 100);
    const base = breaksOf(y.map((v) => v - 1e9), 'meanvar');
    expect(base.length).toBe(4); // planted at 40, 80, 120, 160
    for (const t of [40, 80, 120, 160]) expect(base.some((b) => Math.abs(b - t) <= 3)).toBe(true);
    expect(breaksOf(y, 'meanvar')).toEqual(base);
    expect(breaksOf(y.map((v) => v * 1e-9), 'meanvar')).toEqual(base);
    expect(breaksOf(y.map((v) => v * 1e15), 'meanvar')).toEqual(base);
  });

  test('one value of 1e140 (the intake refuses 1e150 and above): a spike in the level, counts and distribution models, the same breaks as without it', () => {
    const z = normalStream(3);
    const y = Array.from({ length: 50 }, (_, i) => (i < 30 ? 10 : 14) + z());
    const counts = y.map((v) => Math.max(0, Math.round(v)));
    for (const [model, data] of [['mean', y], ['poisson', counts], ['distribution', y]] as const) {
      const clean = breaksOf([...data], model);
      const hit = [...data];
      hit[20] = 1e140;
      const r = findBreaks(prepareSeries(hit, null, null, { ties: 'keep' }), { model });
      expect(r.breaks.map((b) => b.index)).toEqual(clean);
      expect(r.spikes.map((s) => s.index)).toEqual([20]);
      expect(r.spikes[0].size).toBeGreaterThan(9e139);
      expect(r.warnings.some((w) => /spike/.test(w.message) && w.rows?.includes(20))).toBe(true);
    }
    for (const model of ['meanvar', 'slope'] as const) {
      // no spike handling in these models: the value gets a segment of its own, and the results stay finite
      const hit = [...y];
      hit[20] = 1e140;
      const r = findBreaks(prepareSeries(hit, null, null, { ties: 'keep' }), { model });
      expect(Number.isFinite(r.penalisedCost)).toBe(true);
      expect(r.fitted.every((v) => Number.isFinite(v))).toBe(true);
    }
    expect(() => prepareSeries([...y.slice(0, 20), 1e155, ...y.slice(21)], null, null, { ties: 'keep' })).toThrow(/1e150|rescale|power of ten/);
  });

  test('a penalty of 1e308 gives no break and no advice to raise the penalty', () => {
    const z = normalStream(5);
    let e = 0;
    const y = Array.from({ length: 200 }, (_, i) => (i < 100 ? 0 : 5) + (e = 0.8 * e + z()));
    for (const model of ['mean', 'meanvar', 'slope'] as const) {
      const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model, penalty: 1e308, noise: 'independent' });
      expect(r.breaks).toEqual([]);
      expect(Number.isFinite(r.penalisedCost)).toBe(true);
      for (const w of r.warnings) expect(w.message).not.toMatch(/raise the penalty/i);
      // the Gaussian level and slope models check their residuals: correlated, with advice that fits no break
      if (model !== 'meanvar') expect(r.warnings.find((w) => w.code === 'autocorrelation')?.message).toMatch(/no change was found/);
    }
  });
});
