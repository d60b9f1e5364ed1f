/**
 * Changepoints at default settings on seeded invented business series
 * (test/helpers/businessSeries.ts): per scenario, the detection rate (a planted
 * change found within 3 points), false changes per series, and for no-change
 * controls the share of series reporting no change; then the averages against
 * the targets (detection >= 90%, <= 0.3 false changes per series, >= 90% of
 * controls clean).
 *
 * Two independent sets of seeds: set 1 (the default, seed = 7919 k + 13) and set 2
 * (`npm run bench -- --only=business --seed-set=2`, seed = 104729 k + 7), so that a
 * change to the method can be checked on series it was not looked at on.
 */
import { findBreaks } from '../../src/engine/breaks/findBreaks';
import { prepareSeries } from '../../src/engine/series';
import { BUSINESS_SCENARIOS, scoreChanges } from '../helpers/businessSeries';

/** Seed of series k (1-based) in seed set 1 or 2. */
export function businessSeed(set: 1 | 2, k: number): number {
  return set === 1 ? k * 7919 + 13 : k * 104729 + 7;
}

export function run(emit: (record: Record<string, unknown>) => void, quick: boolean): void {
  const seeds = quick ? 10 : 50;
  const set: 1 | 2 = process.argv.includes('--seed-set=2') ? 2 : 1;
  let detected = 0, planted = 0, falseTotal = 0, series = 0, controls = 0, clean = 0, spikesFound = 0, spikesPlanted = 0;
  for (const sc of BUSINESS_SCENARIOS) {
    let d = 0, p = 0, f = 0, c = 0, errors = 0, sf = 0, sp = 0, d10 = 0;
    const t0 = performance.now();
    for (let seed = 1; seed <= seeds; seed++) {
      const s = sc.make(businessSeed(set, seed));
      let found: number[];
      let spikes: number[] = [];
      try {
        const r = findBreaks(prepareSeries(s.y, s.x, null, { ties: 'keep' }), { model: sc.model });
        found = r.breaks.map((b) => b.index);
        spikes = (r.spikes ?? []).map((k) => k.index);
      } catch {
        errors++;
        continue;
      }
      const score = scoreChanges(found, s.truth);
      d += score.detected; p += s.truth.length; f += score.falseChanges;
      d10 += scoreChanges(found, s.truth, 10).detected;
      if (sc.control && found.length === 0) c++;
      sp += s.spikes.length;
      sf += s.spikes.filter((k) => spikes.includes(k)).length;
    }
    const ran = seeds - errors;
    emit({
      bench: 'business', scenario: sc.name, model: sc.model, seedSet: set, series: seeds, errors,
      detection: sc.control ? undefined : d / Math.max(1, p),
      detectionWithin10: sc.control ? undefined : d10 / Math.max(1, p),
      falsePerSeries: f / Math.max(1, ran),
      controlsClean: sc.control ? c / Math.max(1, ran) : undefined,
      spikesReported: sp ? sf / sp : undefined,
      msPerSeries: (performance.now() - t0) / seeds,
    });
    detected += d; planted += p; falseTotal += f; series += ran;
    if (sc.control) { controls += ran; clean += c; }
    spikesFound += sf; spikesPlanted += sp;
  }
  emit({
    bench: 'business', scenario: 'all', seedSet: set, seedsPerScenario: seeds,
    detection: detected / planted, falsePerSeries: falseTotal / series, controlsClean: clean / controls,
    spikesReported: spikesPlanted ? spikesFound / spikesPlanted : undefined,
    target: 'detection >= 0.9, falsePerSeries <= 0.3, controlsClean >= 0.9 (default settings)',
  });
}
