/** weightedMoments: integer weights act as repeated points; a constant series has sd 1 by convention. */
import { weightedMoments } from '../../src/engine/weightedMoments';
import { normalStream } from '../helpers/random';

describe('weightedMoments', () => {
  test('with integer weights equals the plain moments of the data repeated that many times', () => {
    const z = normalStream(3);
    const y = Array.from({ length: 50 }, () => 2 + z());
    const w = y.map((_, i) => 1 + (i % 4));
    const rep: number[] = [];
    y.forEach((v, i) => { for (let c = 0; c < w[i]; c++) rep.push(v); });
    const a = weightedMoments(y, w);
    const b = weightedMoments(rep, rep.map(() => 1));
    expect(a.mean).toBeCloseTo(b.mean, 12);
    expect(a.sd).toBeCloseTo(b.sd, 12);
    expect(a.meanWeight).toBeCloseTo(rep.length / y.length, 12);
  });

  test('gives sd 1 for a constant series (the scale then leaves y as it is)', () => {
    expect(weightedMoments([4, 4, 4], [1, 2, 3]).sd).toBe(1);
  });
});
