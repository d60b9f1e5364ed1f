import { polishDecomposition, activeSetDecomposition } from '../../../src/engine/decompose/polishDecomposition';
import { seasonDesign } from '../../../src/engine/decompose/seasonDesign';
import { seasonPlan } from '../../../src/engine/decompose/seasonPlan';
import { differenceOperator } from '../../../src/engine/linalg/difference';
import { loadFixture, maxAbsDiff } from '../../helpers/fixtures';

/**
 * The exact solve on a given set of knots and spikes, against the optima of Debian's python3-cvxopt
 * (test/reference/gen_decompose_cvxopt.py, fixture decompose_cvxopt.json): given the knots and spikes
 * read off cvxopt's answer, it must reproduce that answer and certify it (no violated condition); from
 * a wrong set, the active-set rounds must find the right one.
 */
describe('polishDecomposition: the exact solve on the knots and spikes of cvxopt optima', () => {
  const fx = loadFixture('decompose_cvxopt');
  for (const c of fx.cases.filter((k: any) => k.order >= 1)) {
    test(`${c.name}: cvxopt's knots and spikes give cvxopt's answer, certified; from no knots the rounds find it`, () => {
      const x = Float64Array.from(c.x as number[]), y = Float64Array.from(c.y as number[]), w = Float64Array.from(c.w as number[]);
      const k = c.order as number;
      const plan = seasonPlan(x, [c.period], false, true)!;
      const design = seasonDesign(x, plan.grid, w, plan.terms);
      // cvxopt stops at a relative gap of about 1e-12: knots are the rows where |D t| is well above its rounding
      const dt = differenceOperator(x, k + 1, Float64Array.from(c.trend as number[]));
      const dmax = Math.max(...Array.from(dt, Math.abs));
      const rows: number[] = [], signs: number[] = [];
      dt.forEach((v, r) => { if (Math.abs(v) > 1e-5 * dmax) { rows.push(r); signs.push(Math.sign(v)); } });
      const omax = Math.max(...(c.spikes as number[]).map(Math.abs));
      const spikeRows: number[] = [], spikeSigns: number[] = [];
      (c.spikes as number[]).forEach((v, i) => { if (Math.abs(v) > 1e-5 * omax) { spikeRows.push(i); spikeSigns.push(Math.sign(v)); } });
      const pol = polishDecomposition(x, y, w, k, c.penalty, c.spikePenalty, design, rows, signs, spikeRows, spikeSigns)!;
      expect(pol).not.toBeNull();
      expect(pol.violation).toBeLessThan(1e-9);
      const n = x.length;
      const mean = (c.y as number[]).reduce((a: number, v: number) => a + v, 0) / n;
      const sd = Math.sqrt((c.y as number[]).reduce((a: number, v: number) => a + (v - mean) ** 2, 0) / n);
      const fit = Float64Array.from(x, (_, i) => pol.trend[i] + pol.season[i] + pol.spikes[i]);
      const ref = Float64Array.from(x, (_, i) => c.trend[i] + c.season[i] + c.spikes[i]);
      expect(maxAbsDiff(fit, ref) / sd).toBeLessThan(1e-6);
      expect(maxAbsDiff(pol.season, Float64Array.from(c.season as number[])) / sd).toBeLessThan(1e-5);
      // from an empty set of knots and spikes, the rounds reach a certified answer with the same fit
      const rounds = activeSetDecomposition(x, y, w, k, c.penalty, c.spikePenalty, design, [], [], [], [], 30, 1e-9)!;
      expect(rounds).not.toBeNull();
      const fit2 = Float64Array.from(x, (_, i) => rounds.trend[i] + rounds.season[i] + rounds.spikes[i]);
      expect(maxAbsDiff(fit2, ref) / sd).toBeLessThan(1e-6);
      // a wrong guess (every spike dropped, when there are spikes) is not certified
      if (spikeRows.length) {
        const wrong = polishDecomposition(x, y, w, k, c.penalty, c.spikePenalty, design, rows, signs, [], []);
        expect(wrong === null || wrong.violation > 1e-6).toBe(true);
      }
    });
  }
});
