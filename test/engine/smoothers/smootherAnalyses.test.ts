/**
 * The Whittaker, LOESS and wavelet analyses through runAnalysis: they give the kernels'
 * results, choose penalties by the shared rules, and refuse what they cannot do.
 */
import { runAnalysis, evaluateAnalysis } from '../../../src/engine';
import { whittakerFit } from '../../../src/engine/smoothers/whittaker/whittakerFit';
import { whittakerOneSided } from '../../../src/engine/smoothers/whittaker/whittakerOneSided';
import { loessFit } from '../../../src/engine/smoothers/loess/loessFit';
import { waveletShrink } from '../../../src/engine/smoothers/wavelet/waveletShrink';
import { normalStream } from '../../helpers/random';
import { maxAbsDiff } from '../../helpers/fixtures';

const z = normalStream(606);
const n = 160;
const x = Array.from({ length: n }, (_, i) => i + 1);
const y = x.map((t) => Math.sin(t / 12) + 0.002 * t * t / 10 + 0.25 * z());

describe('whittaker analysis', () => {
  test('frequency preset = the kernel at lambda 1600; one-sided option gives the Kalman-filter trend', () => {
    const r = runAnalysis({ analysis: 'whittaker', y, x, options: { frequency: 'quarterly' } });
    expect(r.smooth!.penalty).toBe(1600);
    expect(maxAbsDiff(r.fitted, whittakerFit(x, y, null, 1600, 2).fitted)).toBeLessThan(1e-12);
    const p = runAnalysis({ analysis: 'whittaker', y, x, options: { frequency: 'quarterly', pastOnly: true } });
    expect(maxAbsDiff(p.fitted, whittakerOneSided(x, y, null, 1600, 2).trend)).toBe(0);
    expect(p.warnings.some((w) => /only data up to its own row/.test(w.message))).toBe(true);
  });

  test('GCV choice is the minimum of the GCV curve it reports; df target is met', () => {
    const r = runAnalysis({ analysis: 'whittaker', y, x });
    const c = r.smooth!.criterion;
    expect(c.name).toBe('gcv');
    for (const p of c.curve!) expect(c.value).toBeLessThanOrEqual(p.score + 1e-12);
    expect(c.atEdge).toBe(false);
    const d = runAnalysis({ analysis: 'whittaker', y, x, options: { df: 8 } });
    expect(Math.abs(d.smooth!.df - 8)).toBeLessThan(1e-6);
  });

  test('cross-validation on the shared folds picks an interior penalty; cv-simpler picks a penalty at least as large', () => {
    const a = runAnalysis({ analysis: 'whittaker', y, x, options: { rule: 'cv', folds: 5 } });
    const b = runAnalysis({ analysis: 'whittaker', y, x, options: { rule: 'cv-simpler', folds: 5 } });
    expect(a.smooth!.criterion.name).toBe('cv');
    expect(a.smooth!.criterion.atEdge).toBe(false);
    expect(b.smooth!.penalty).toBeGreaterThanOrEqual(a.smooth!.penalty);
  });

  test('presets need order 2; evaluation interpolates and flags extrapolation', () => {
    expect(() => runAnalysis({ analysis: 'whittaker', y, x, options: { frequency: 'monthly', order: 3 } })).toThrow(/presets are Hodrick-Prescott penalties for order 2; got order 3/);
    const r = runAnalysis({ analysis: 'whittaker', y, x, options: { penalty: 50 } });
    const e = evaluateAnalysis(r, [10.5, 200]);
    expect(e.value[0]).toBeCloseTo((r.fitted[9] + r.fitted[10]) / 2, 12);
    expect(Array.from(e.extrapolated)).toEqual([0, 1]);
  });
});

describe('loess analysis', () => {
  test('a given span is the kernel; AICc is the default rule; robustness passes are applied', () => {
    const r = runAnalysis({ analysis: 'loess', y, x, options: { span: 0.3, robustness: 3 } });
    expect(maxAbsDiff(r.fitted, loessFit(x, y, null, { span: 0.3, degree: 1, robustnessIterations: 3 }).fitted)).toBe(0);
    const e = evaluateAnalysis(r, [x[20], 170]);
    expect(e.value[0]).toBeCloseTo(r.fitted[20], 10);
    expect(Array.from(e.extrapolated)).toEqual([0, 1]);
    const a = runAnalysis({ analysis: 'loess', y, x, options: { degree: 2 } });
    expect(a.smooth!.criterion.name).toBe('aicc');
    for (const p of a.smooth!.criterion.curve!) expect(a.smooth!.criterion.value).toBeLessThanOrEqual(p.score);
  });

  test('cross-validation on the shared folds picks an interior span; cv-simpler a span at least as large', () => {
    const a = runAnalysis({ analysis: 'loess', y, x, options: { rule: 'cv', folds: 5 } });
    const b = runAnalysis({ analysis: 'loess', y, x, options: { rule: 'cv-simpler', folds: 5 } });
    const c = a.smooth!.criterion;
    expect(c.name).toBe('cv');
    expect(c.atEdge).toBe(false);
    for (const p of c.curve!) expect(c.value).toBeLessThanOrEqual(p.score);
    expect(b.smooth!.penalty).toBeGreaterThanOrEqual(a.smooth!.penalty);
  });

  test('refuses a span together with a rule, and a span above 1', () => {
    expect(() => runAnalysis({ analysis: 'loess', y, x, options: { span: 0.5, rule: 'gcv' } })).toThrow(/give only one of/);
    expect(() => runAnalysis({ analysis: 'loess', y, x, options: { span: 2 } })).toThrow(/span/);
  });
});

describe('wavelet analysis', () => {
  test('is the kernel on equally spaced x, and refuses uneven x saying why', () => {
    const r = runAnalysis({ analysis: 'wavelet', y, x, options: { threshold: 'universal' } });
    expect(maxAbsDiff(r.fitted, waveletShrink(y, { threshold: 'universal' }).fitted)).toBe(0);
    const uneven = x.map((t) => (t > 100 ? t + 0.5 : t));
    expect(() => runAnalysis({ analysis: 'wavelet', y, x: uneven })).toThrow(/needs equally spaced x; the step from position 100 to 101 is 1.5/);
  });
});
