import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { KnotwiseError } from '../../../src/engine/errors';
import { loadFixture } from '../../helpers/fixtures';
import { mulberry32, normalStream, poissonStream } from '../../helpers/random';

interface NileFixture {
  years: number[];
  flow: number[];
  singleChange: { firstIndexOfSecondSegment: number; year: number; rss: number };
  sigma: { value: number };
  optimalPartitioning: { bic: { penalty: number; changes: number[]; penalisedCost: number }; mbic: { penalty: number; changes: number[]; penalisedCost: number } };
}

describe('findBreaks on the Nile flow (R datasets::Nile, fixture from test/reference/gen_breaks.R)', () => {
  const nile = loadFixture<NileFixture>('breaks_nile');
  const series = prepareSeries(nile.flow, nile.years, null, { ties: 'keep' });

  test('mean model with BIC finds the level shift of 1898-1899 documented by Cobb (1978)', () => {
    const r = findBreaks(series, { model: 'mean', penalty: 'bic' });
    expect(r.breaks.length).toBeGreaterThanOrEqual(1);
    const main = r.breaks.reduce((a, b) => (Math.abs(b.change) > Math.abs(a.change) ? b : a));
    expect([1898, 1899]).toContain(main.x);
    expect(main.change).toBeLessThan(0); // the flow dropped
    expect(main.row).toBe(main.x - 1871);
  });

  // The reference is the plain Gaussian cost with independent noise: robust false and noise 'independent'.
  test('agrees with base R: the sigma estimate, and optimal partitioning under BIC and MBIC', () => {
    for (const rule of ['bic', 'mbic'] as const) {
      const r = findBreaks(series, { model: 'mean', penalty: rule, robust: false, noise: 'independent' });
      const ref = nile.optimalPartitioning[rule];
      expect(r.sigma!.source).toBe('estimated');
      expect(r.sigma!.value).toBeCloseTo(nile.sigma.value, 10);
      expect(r.penalty.value).toBeCloseTo(ref.penalty, 12);
      expect(r.breaks.map((b) => b.index)).toEqual(ref.changes);
      expect(r.penalisedCost).toBeCloseTo(ref.penalisedCost, 8);
    }
  });

  test('a single forced change (CROPS row with one change) sits where exhaustive least squares in base R puts it', () => {
    const r = findBreaks(series, { model: 'mean', penalty: 'bic', crops: [1, 200], robust: false, noise: 'independent' });
    const one = r.crops!.find((row) => row.changes === 1)!;
    expect(one.breaks).toEqual([nile.singleChange.firstIndexOfSecondSegment]);
    // unpenalised cost = RSS / sigma^2 of that split
    expect(one.cost * r.sigma!.value ** 2).toBeCloseTo(nile.singleChange.rss, 4);
  });

  test('always warns that a break is not proof of its cause', () => {
    for (const model of ['mean', 'meanvar', 'distribution', 'slope'] as const) {
      const r = findBreaks(series, { model });
      expect(r.warnings.filter((w) => w.code === 'break-cause').length).toBe(1);
    }
  });
});

/** Mean shifts of size 1 at known places, noise sd at several levels: hit rate within 5 rows. */
describe('findBreaks hit rate on seeded series with known breaks', () => {
  const n = 600;
  const truth = [100, 220, 350, 480];
  const levels = [0, 1, -0.5, 0.8, -0.2];
  const simulate = (seed: number, sd: number): number[] => {
    const z = normalStream(seed);
    const y: number[] = [];
    for (let i = 0; i < n; i++) {
      let k = 0;
      while (k < truth.length && i >= truth[k]) k++;
      y.push(levels[k] * 3 + sd * z());
    }
    return y;
  };
  const rate = (sd: number, model: 'mean' | 'distribution'): { hit: number; extra: number } => {
    let hits = 0, found = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const r = findBreaks(prepareSeries(simulate(seed * 31, sd), null, null, { ties: 'keep' }), { model, penalty: 'mbic' });
      const idx = r.breaks.map((b) => b.index);
      found += idx.length;
      for (const t of truth) if (idx.some((i) => Math.abs(i - t) <= 5)) hits++;
    }
    return { hit: hits / (20 * truth.length), extra: found / 20 - truth.length };
  };
  // Measured on these seeds: 1.00, 1.00, 0.9875 (mean) and 1.00, 1.00 (distribution);
  // each floor sits just under its measured rate, so a real loss of power fails.
  test.each([
    [0.5, 'mean', 0.99], [1, 'mean', 0.99], [2, 'mean', 0.95],
    [0.5, 'distribution', 0.99], [1, 'distribution', 0.95],
  ] as const)('noise sd %s, model %s: hit rate >= %s within 5 rows', (sd, model, floor) => {
    const r = rate(sd, model);
    expect(r.hit).toBeGreaterThanOrEqual(floor);
    expect(Math.abs(r.extra)).toBeLessThan(1.5);
  });
});

describe('findBreaks with the Poisson model', () => {
  test('recovers a change in the rate of seeded counts', () => {
    let ok = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const draw = poissonStream(seed);
      const y = Array.from({ length: 300 }, (_, i) => draw(i < 180 ? 4 : 7));
      const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'poisson', penalty: 'bic' });
      if (r.breaks.length === 1 && Math.abs(r.breaks[0].index - 180) <= 8) ok++;
      // each reported rate is the mean count of its segment, computed here from the data
      for (const seg of r.segments) {
        let sum = 0;
        for (let i = seg.start; i <= seg.end; i++) sum += y[i];
        expect(seg.rate).toBeCloseTo(sum / (seg.end - seg.start + 1), 10);
      }
    }
    expect(ok).toBeGreaterThanOrEqual(17);
  });

  test('reports the rates of the segments and a fitted step function', () => {
    const y = [...Array(50).fill(2), ...Array(50).fill(9)];
    const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'poisson' });
    expect(r.breaks.map((b) => b.index)).toEqual([50]);
    expect(r.segments.map((s) => s.rate)).toEqual([2, 9]);
    expect(r.fitted[0]).toBe(2);
    expect(r.fitted[99]).toBe(9);
    expect(r.breaks[0].change).toBe(7);
  });

  test('warns about non-integer counts naming the row, rejects negative ones', () => {
    const s = prepareSeries([1, 2, 2.5, 3], null, null, { ties: 'keep' });
    const r = findBreaks(s, { model: 'poisson' });
    expect(r.warnings.find((w) => /not whole \(row 3, e\.g\. 2\.5\)/.test(w.message))?.rows).toEqual([2]);
    const t = prepareSeries([1, 2, 'x', -1], null, null, { ties: 'keep' });
    expect(() => findBreaks(t, { model: 'poisson' })).toThrow(/row 4 holds -1/);
    try { findBreaks(t, { model: 'poisson' }); } catch (e) { expect((e as KnotwiseError).code).toBe('bad-data'); }
  });
});

describe('findBreaks maps results to input rows', () => {
  test('with dropped and unsorted rows, break rows point at the input cells', () => {
    const z = normalStream(8);
    const n = 120;
    const y: (number | string)[] = [];
    const x: number[] = [];
    for (let i = 0; i < n; i++) { x.push(n - i); y.push((n - i > 60 ? 5 : 0) + 0.3 * z()); }
    y[10] = 'n/a';
    const s = prepareSeries(y, x, null, { ties: 'keep' });
    const r = findBreaks(s, { model: 'mean' });
    expect(r.breaks.length).toBe(1);
    expect(r.breaks[0].x).toBe(61);
    expect(x[r.breaks[0].row]).toBe(61);
    expect(r.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['dropped-cells', 'unsorted-x', 'break-cause']));
  });

  test('never puts a change between rows with equal x', () => {
    const x = [1, 2, 3, 4, 5, 5, 5, 6, 7, 8];
    const y = [0, 0, 0, 0, 0, 10, 10, 10, 10, 10];
    const s = prepareSeries(y, x, null, { ties: 'keep' });
    const r = findBreaks(s, { model: 'mean', sigma: 0.1 });
    // the jump sits inside the tie group x = 5 (points 4..6), so a change is needed but may only go at its edges
    expect(r.breaks.length).toBeGreaterThanOrEqual(1);
    for (const b of r.breaks) expect(s.x[b.index]).not.toBe(s.x[b.index - 1]);
    expect(r.breaks.map((b) => b.index)).toContain(4);
  });
});

describe('findBreaks CROPS', () => {
  const z = normalStream(99);
  const y = Array.from({ length: 400 }, (_, i) => (i < 80 ? 0 : i < 200 ? 1.2 : i < 260 ? -0.4 : i < 330 ? 0.6 : 0) + z() * 0.8);
  const s = prepareSeries(y, null, null, { ties: 'keep' });

  test.each(['mean', 'meanvar', 'distribution', 'slope'] as const)('model %s: the table agrees with a search at each row penalty and changes fall as the penalty rises', (model) => {
    const r = findBreaks(s, { model, crops: [2, 60] });
    const rows = r.crops!;
    expect(rows.length).toBeGreaterThanOrEqual(2);
    for (let i = 1; i < rows.length; i++) {
      expect(rows[i].penaltyLow).toBeGreaterThanOrEqual(rows[i - 1].penaltyLow);
      expect(rows[i].changes).toBeLessThanOrEqual(rows[i - 1].changes);
      expect(rows[i].cost).toBeGreaterThanOrEqual(rows[i - 1].cost - 1e-9);
      expect(rows[i].penaltyLow).toBeCloseTo(rows[i - 1].penaltyHigh, 8);
    }
    expect(rows[0].penaltyLow).toBe(2);
    expect(rows[rows.length - 1].penaltyHigh).toBe(60);
    for (const row of rows) {
      // re-run at the middle of the row's penalty interval: same segmentation
      const mid = (row.penaltyLow + row.penaltyHigh) / 2;
      const again = findBreaks(s, { model, penalty: mid });
      expect(again.breaks.map((b) => b.index)).toEqual(row.breaks);
      expect(again.cost).toBeCloseTo(row.cost, 6);
      const atRow = findBreaks(s, { model, penalty: row.penalty });
      expect(atRow.penalisedCost).toBeCloseTo(row.cost + row.penalty * row.changes, 6);
    }
  });

  test('any penalty in the range gets the segmentation of the row whose interval holds it', () => {
    const r = findBreaks(s, { model: 'mean', crops: [2, 60] });
    for (let b = 2.5; b < 60; b *= 1.37) {
      const row = r.crops!.find((c) => c.penaltyLow <= b && b <= c.penaltyHigh)!;
      expect(findBreaks(s, { model: 'mean', penalty: b }).breaks.map((x) => x.index)).toEqual(row.breaks);
    }
  });
});

describe('findBreaks options', () => {
  const s = prepareSeries(Array.from({ length: 30 }, (_, i) => (i < 15 ? 0 : 3) + Math.sin(i)), null, null, { ties: 'keep' });
  test.each([
    [{ model: 'level' }, /model must be one of .*got "level"/],
    [{ model: 'mean', penalty: 'aic' }, /penalty must be 'bic', 'mbic' or a number >= 0; got "aic"/],
    [{ model: 'mean', penalty: -1 }, /got -1/],
    [{ model: 'mean', minSegment: 1.5 }, /minSegment must be a whole number >= 1; got 1.5/],
    [{ model: 'meanvar', minSegment: 1 }, /at least 2 for the volatility model/],
    [{ model: 'mean', sigma: 0 }, /sigma \(noise standard deviation in y units\) must be a finite number > 0; got 0/],
    [{ model: 'poisson', sigma: 1 }, /sigma applies to models 'mean' and 'slope' only/],
    [{ model: 'mean', crops: [5, 1] }, /crops must be \[low, high\].*got \[5, 1\]/],
    [{ model: 'distribution', quantiles: 1 }, /quantiles must be a whole number from 2 to 100; got 1/],
    [{ model: 'mean', maxRuns: 5 }, /maxRuns applies only with crops/],
    [{ model: 'mean', penalti: 3 }, /unknown option "penalti"/],
  ])('rejects %j', (opts, msg) => {
    expect(() => findBreaks(s, opts as never)).toThrow(msg);
    try { findBreaks(s, opts as never); } catch (e) { expect((e as KnotwiseError).code).toBe('bad-option'); }
  });

  test('minSegment is respected by every segment', () => {
    const u = mulberry32(3);
    const y = Array.from({ length: 200 }, () => u() * 10);
    const r = findBreaks(prepareSeries(y, null, null, { ties: 'keep' }), { model: 'mean', penalty: 0.5, minSegment: 7 });
    expect(r.segments.length).toBeGreaterThan(2);
    for (const seg of r.segments) expect(seg.n).toBeGreaterThanOrEqual(7);
  });

  test('too few points for minSegment is an error saying how many are needed', () => {
    expect(() => findBreaks(s, { model: 'mean', minSegment: 40 })).toThrow(/at least 40 usable points/);
  });
});

describe('findBreaks on long series', () => {
  test('models whose search grows with the square of the length refuse at once above their limit, saying what to do', () => {
    const y = Array.from({ length: 60001 }, (_, i) => i % 3);
    const s = prepareSeries(y, null, null, { ties: 'keep' });
    for (const model of ['meanvar', 'poisson', 'distribution', 'slope'] as const) {
      expect(() => findBreaks(s, { model })).toThrow(/is refused: .* Use at most [\d,]+ points .* or the level model/);
    }
    expect(() => findBreaks(s, { model: 'mean', crops: [1, 100], maxRuns: 10000 })).toThrow(/give maxRuns \d+ or less/);
  });
});
