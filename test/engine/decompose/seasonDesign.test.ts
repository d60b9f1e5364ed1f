import { seasonDesign, fitSeasonAndSpikes, SeasonTerm } from '../../../src/engine/decompose/seasonDesign';
import { normalStream } from '../../helpers/random';

/**
 * The (season, spikes) block is a Huber regression of r on the season (threshold rho / w_i) under
 * each cycle's zero-sum constraint. Its optimality conditions, checked from the result alone with
 * psi_i = w_i e_i inside the threshold and rho sign(e_i) outside (e = r - season): the gradient
 * A^T psi is orthogonal to every feasible direction, i.e. the sums of psi over the phases of a cycle
 * are all equal (the constraint's multiplier) and psi is orthogonal to every Fourier column; and the
 * spikes are the soft-thresholded residuals.
 */
function huberConditions(r: Float64Array, w: Float64Array, rho: number, season: Float64Array, spikes: Float64Array, phase: Int32Array, P: number, fourier: Float64Array[]) {
  const n = r.length;
  const psi = new Float64Array(n);
  let scale = 0, spikeError = 0;
  for (let i = 0; i < n; i++) {
    const e = r[i] - season[i], c = rho / w[i];
    psi[i] = Math.abs(e) <= c ? w[i] * e : rho * Math.sign(e);
    scale = Math.max(scale, Math.abs(psi[i]));
    const soft = e > c ? e - c : e < -c ? e + c : 0;
    spikeError = Math.max(spikeError, Math.abs(spikes[i] - soft));
  }
  const sums = new Float64Array(P);
  for (let i = 0; i < n; i++) sums[phase[i]] += psi[i];
  const spread = (Math.max(...sums) - Math.min(...sums)) / (scale * n);
  let fourierGradient = 0;
  for (const col of fourier) {
    let g = 0;
    for (let i = 0; i < n; i++) g += col[i] * psi[i];
    fourierGradient = Math.max(fourierGradient, Math.abs(g) / (scale * n));
  }
  return { spread, fourierGradient, spikeError };
}

function setup(seed: number, n: number, P: number, fourierLength: number) {
  const z = normalStream(seed);
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const phase = Int32Array.from(x, (v) => v % P);
  const terms: SeasonTerm[] = [{ kind: 'cycle', label: 'cycle', period: P, phase }];
  const fourier: Float64Array[] = [];
  if (fourierLength > 0) {
    terms.push({ kind: 'fourier', label: 'long', length: fourierLength, harmonics: 2, onGrid: false });
    for (let j = 1; j <= 2; j++) {
      fourier.push(Float64Array.from(x, (v) => Math.cos((2 * Math.PI * j * v) / fourierLength)));
      fourier.push(Float64Array.from(x, (v) => Math.sin((2 * Math.PI * j * v) / fourierLength)));
    }
  }
  const w = Float64Array.from(x, (_, i) => 1 + (i % 3) * 0.5);
  const r = Float64Array.from(x, (v) => [-5, 2, 6, -3, 1][v % P] + 4 * Math.sin((2 * Math.PI * v) / (fourierLength || 50)) + 3 * z());
  r[7] += 30;
  return { x, phase, terms, fourier, w, r };
}

describe('fitSeasonAndSpikes: exact Huber regression on the season (optimality conditions, invented data)', () => {
  // small rho: most points beyond the threshold, so whole phases can be outside, where Newton's
  // Hessian is singular and the majorant's step must take over; large rho: no spike at all
  for (const rho of [0.05, 0.5, 3, 1e6]) {
    test(`cycle of 5 and a Fourier term, rho = ${rho}: phase sums of psi equal, Fourier gradient zero, spikes soft-thresholded`, () => {
      const { x, phase, terms, fourier, w, r } = setup(7, 120, 5, 40);
      const d = seasonDesign(x, Int32Array.from(x), w, terms);
      const season = new Float64Array(x.length), spikes = new Float64Array(x.length);
      const parts = [new Float64Array(x.length), new Float64Array(x.length)];
      fitSeasonAndSpikes(d, r, w, rho, new Float64Array(d.q), season, spikes, parts);
      const c = huberConditions(r, w, rho, season, spikes, phase, 5, fourier);
      expect(c.spread).toBeLessThan(1e-12);
      expect(c.fourierGradient).toBeLessThan(1e-12);
      expect(c.spikeError).toBeLessThan(1e-12);
      // the cycle's effects (points 0..4 are its five phases) sum to zero, and the parts add up to the season
      expect(Math.abs(parts[0][0] + parts[0][1] + parts[0][2] + parts[0][3] + parts[0][4])).toBeLessThan(1e-12);
      for (let i = 0; i < x.length; i++) expect(Math.abs(parts[0][i] + parts[1][i] - season[i])).toBeLessThan(1e-12);
      if (rho === 1e6) expect(spikes.every((v) => v === 0)).toBe(true);
      if (rho === 3) expect(spikes[7]).toBeGreaterThan(10);
    });
  }
});
