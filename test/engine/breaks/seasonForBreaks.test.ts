/**
 * The season changepoints set aside on weekly dates: the yearly pattern's number of
 * harmonics chosen by BIC, and the decomposition's trend shaped like the change looked for.
 */
import { harmonicsByBic, seasonFor } from '../../../src/engine/breaks/seasonForBreaks';
import { prepareSeries } from '../../../src/engine/series';
import { findBreaks } from '../../../src/engine/breaks/findBreaks';
import { normalStream } from '../../helpers/random';

/** Serial date of Monday 6 January 2020. */
const START = 43836;

describe('harmonicsByBic', () => {
  test('a yearly pattern of two harmonics plus noise: two harmonics chosen, the fit close to the pattern', () => {
    const z = normalStream(4);
    const n = 156;
    const angle = Float64Array.from({ length: n }, (_, i) => (2 * Math.PI * 7 * i) / 365.25);
    const truth = Array.from(angle, (a) => 80 * Math.sin(a + 1) + 32 * Math.cos(2 * a + 2));
    const r = Float64Array.from(truth, (v) => v + 20 * z());
    const h = harmonicsByBic(r, angle, 10);
    expect(h.harmonics).toBe(2);
    const mean = truth.reduce((a, b) => a + b, 0) / n;
    let se = 0;
    for (let i = 0; i < n; i++) se += (h.fit[i] - (truth[i] - mean)) ** 2;
    // 5 least-squares coefficients on 156 points of noise sd 20: rms error near 20 sqrt(5 / 156) = 3.6
    expect(Math.sqrt(se / n)).toBeLessThan(7);
    expect(Math.abs(h.fit.reduce((a, b) => a + b, 0))).toBeLessThan(1e-9);
  });

  test('pure noise: at most one harmonic', () => {
    const z = normalStream(9);
    const angle = Float64Array.from({ length: 156 }, (_, i) => (2 * Math.PI * 7 * i) / 365.25);
    expect(harmonicsByBic(Float64Array.from(angle, () => z()), angle, 10).harmonics).toBeLessThanOrEqual(1);
  });
});

describe('seasonFor on weekly dates', () => {
  test('a yearly swing and a level step: the season is found, refitted with few harmonics, and does not carry the step', () => {
    const z = normalStream(12);
    const n = 156, at = 100;
    const x = Array.from({ length: n }, (_, i) => START + 7 * i);
    const season = (i: number) => 80 * Math.sin((2 * Math.PI * 7 * i) / 365.25) + 32 * Math.cos((4 * Math.PI * 7 * i) / 365.25);
    const y = Array.from({ length: n }, (_, i) => 1000 + season(i) + (i >= at ? 80 : 0) + 20 * z());
    const s = seasonFor(prepareSeries(y, x, null, { ties: 'keep' }), 'auto', false, false);
    expect(s.seasonal).toBe(true);
    expect(s.how).toMatch(/refitted with [1-4] harmonics? \(chosen by BIC\)/);
    // a season that took up part of the step would differ between the weeks before and after it a year apart
    const c = s.component!;
    let worst = 0;
    for (let i = at; i < n; i++) worst = Math.max(worst, Math.abs(c[i] - c[i - 52]));
    expect(worst).toBeLessThan(20); // one noise sd; the step is 80
  });
});

describe('findBreaks with a refitted season', () => {
  test('weekly sales with a yearly swing and one kink: the season refitted against the fitted line, the kink found within 3 weeks', () => {
    const z = normalStream(31);
    const n = 156, at = 70;
    const x = Array.from({ length: n }, (_, i) => START + 7 * i);
    const y = Array.from({ length: n }, (_, i) => 2000 + (i > at ? 4 * (i - at) : 0) + 80 * Math.sin((2 * Math.PI * 7 * i) / 365.25 + 0.5) + 20 * z());
    const r = findBreaks(prepareSeries(y, x, null, { ties: 'keep' }), { model: 'slope' });
    expect(r.season.adjusted).toBe(true);
    expect(r.season.note).toMatch(/then once more against the fitted changes/);
    expect(r.breaks.length).toBe(1);
    expect(Math.abs(r.breaks[0].index - at)).toBeLessThanOrEqual(3);
    // fitted values include the season used by the last search: residuals without a yearly swing left
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (y[i] - r.fitted[i]) ** 2;
    expect(Math.sqrt(ss / n)).toBeLessThan(25);
  });
});
