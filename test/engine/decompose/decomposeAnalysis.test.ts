import { runAnalysis } from '../../../src/engine/analysis/runAnalysis';
import '../../../src/engine/analyses';
import { decompose } from '../../../src/engine/decompose/decompose';
import { seriesFromArrays } from '../../../src/engine/series';
import { loadFixture, maxAbsDiff } from '../../helpers/fixtures';
import { normalStream, ar1Noise } from '../../helpers/random';

/** Invented quarterly revenue, 10 years from 2014 (first days of quarters as Excel serials), with blank rows. */
function quarterly(seed: number) {
  const z = normalStream(seed);
  const effect = [-5, 2, 6, -3];
  const x: (number | null)[] = [], y: (number | null)[] = [];
  for (let q = 0; q < 40; q++) {
    x.push(Math.round(Date.UTC(2014, 3 * q, 1) / 86400000) + 25569);
    y.push(q === 13 || q === 27 ? null : 120 + 1.5 * q + effect[q % 4] + z());
  }
  return { x, y };
}

/** Invented monthly costs, 12 years from 2012: a slow trend with one bend, a month-of-year swing, AR(1) noise (phi 0.7). */
function monthlyAr1(seed: number) {
  const n = 144;
  const e = ar1Noise(n, 0.7, seed);
  const x: number[] = [], y: number[] = [];
  for (let t = 0; t < n; t++) {
    x.push(Math.round(Date.UTC(2012, t, 1) / 86400000) + 25569);
    y.push(50 + 0.1 * t - 0.15 * Math.max(0, t - 80) + 3 * Math.sin((2 * Math.PI * t) / 12) + e[t]);
  }
  return { x, y };
}

describe("the 'decompose' analysis through runAnalysis", () => {
  test('noise=independent gives the trend penalty ordinary folds: on AR(1) noise they take the noise for trend, where the default reads the dependence and holds out blocks', () => {
    const { x, y } = monthlyAr1(91);
    const read = runAnalysis({ analysis: 'decompose', y, x });
    const told = runAnalysis({ analysis: 'decompose', y, x, options: { noise: 'independent' } });
    expect(read.decomposition!.period).toEqual([12]);
    expect(read.criterion!.name).toBe('cv');
    // the trend has one bend; with the dependence read it keeps a few knots, with ordinary folds many times more
    const knotsRead = (read.decomposition!.knots as unknown[]).length, knotsTold = (told.decomposition!.knots as unknown[]).length;
    expect(knotsRead).toBeLessThanOrEqual(5);
    expect(knotsTold).toBeGreaterThan(5 * knotsRead);
  });

  test('noise is refused where it cannot act, naming what to change: with method stl (rule applies only to the adaptive method) and with a fixed penalty', () => {
    const { x, y } = monthlyAr1(92);
    expect(() => runAnalysis({ analysis: 'decompose', y, x, options: { method: 'stl', noise: 'independent' } }))
      .toThrow('noise applies only when rule is "cv" or "cv-simpler", and rule only when method is "adaptive"; method is "stl". Remove noise or change method.');
    expect(() => runAnalysis({ analysis: 'decompose', y, x, options: { penalty: 5, noise: 'independent' } })).toThrow(/noise applies only when rule is .*rule is not set/);
  });

  test('quarterly dates with blank rows: a quarter-of-year season, components per clean point, rows mapped', () => {
    const { x, y } = quarterly(81);
    const r = runAnalysis({ analysis: 'decompose', y, x });
    expect(r.family).toBe('decomposition');
    const d = r.decomposition!;
    expect(d.spacing).toBe('quarterly');
    expect(d.seasonal).toBe(true);
    expect(d.period).toEqual([4]);
    expect(r.series.n).toBe(38);
    const { trend, season, spikes, remainder } = d.components;
    for (let i = 0; i < 38; i++) expect(Math.abs(trend[i] + season[i] + spikes[i] + remainder[i] - r.series.y[i])).toBeLessThan(1e-9);
    // rows 13 and 27 were blank: dropped, and the quarters around them keep their phase
    expect(r.series.rowOf[13]).toBe(-1);
    const q3 = d.components.season[r.series.rowOf[14]], q3b = d.components.season[r.series.rowOf[2]];
    expect(Math.abs(q3 - q3b)).toBeLessThan(1e-12);
    expect(r.fitted).toBe(trend);
  });

  test('options resolve to the engine call: stl with a seasonal window equals decompose directly', () => {
    const c = loadFixture('stl_r').cases.find((k: any) => k.name === 'nottem-periodic');
    const x = c.y.map((_: number, i: number) => i + 1);
    const r = runAnalysis({ analysis: 'decompose', y: c.y, x, options: { method: 'stl', period: 12, seasonalWindow: 7 } });
    const direct = decompose(seriesFromArrays(x, c.y), { method: 'stl', period: 12, stl: { seasonalWindow: 7 } });
    expect(maxAbsDiff(r.decomposition!.components.trend, direct.trend)).toBe(0);
    expect(r.decomposition!.method).toBe('stl');
  });

  test('spikes off gives no spike component', () => {
    const { x, y } = quarterly(82);
    y[20] = (y[20] as number) + 40;
    // a fixed trend penalty stiff enough that a one-off jump of 40 costs the trend more than a spike
    // (x in days: a quarter is about 91 days, so slope changes are small numbers)
    const on = runAnalysis({ analysis: 'decompose', y, x, options: { penalty: 5000, season: 'on' } });
    const off = runAnalysis({ analysis: 'decompose', y, x, options: { penalty: 5000, season: 'on', spikes: false } });
    expect(on.decomposition!.spikeIndex).toEqual([on.series.rowOf[20]]);
    expect((on.decomposition!.spikeIndex as number[]).length).toBeGreaterThan(0);
    expect((off.decomposition!.spikeIndex as number[]).length).toBe(0);
  });
});
