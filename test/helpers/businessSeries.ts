/**
 * Seeded invented business series with planted changes, for the changepoint
 * benchmark (test/bench/business.bench.ts) and unit tests.
 *
 * Every scenario is an invented figure of a fictional business (no real company or
 * data): weekly orders with a yearly swing, daily ticket counts with a weekday
 * pattern, monthly costs with one-off spikes, daily readings with AR(1) noise,
 * volatile daily prices, and weekly sales whose growth bends. Each comes with its
 * no-change control. x are spreadsheet serial dates (days since 1899-12-30), so a
 * method can infer the spacing as an analyst's sheet would give it.
 *
 * `truth` holds the planted changes as the first index of the new regime ('slope':
 * the kink index). Sizes are stated in noise standard deviations (sd) so the
 * difficulty is plain: level steps 3 to 4.5 sd, rate changes of 35 to 60%, volatility
 * doubling to tripling, slope changes of 0.12 to 0.2 sd per point.
 */
import type { BreaksModel } from '../../src/engine/breaks/types';
import { mulberry32, normalStream, poissonStream } from './random';

/** One generated series. */
export interface BusinessSeries {
  scenario: string;
  model: BreaksModel;
  y: number[];
  x: number[];
  /** Planted changes (indices); empty for controls. */
  truth: number[];
  /** Planted spikes (indices), for scenarios that have them. */
  spikes: number[];
}

/** A scenario: a name, the model an analyst would pick, and a seeded generator. */
export interface BusinessScenario {
  name: string;
  model: BreaksModel;
  control: boolean;
  make(seed: number): BusinessSeries;
}

/** Serial date of Monday 6 January 2020. */
const START = 43836;

const weeks = (n: number): number[] => Array.from({ length: n }, (_, i) => START + 7 * i);
const days = (n: number): number[] => Array.from({ length: n }, (_, i) => START + i);
/** Serial dates of the first of each month from January 2015. */
function months(n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const y = 2015 + Math.floor(i / 12), m = i % 12;
    out.push(Math.round((Date.UTC(y, m, 1) - Date.UTC(1899, 11, 30)) / 86400000));
  }
  return out;
}

/** AR(1) noise of marginal sd `sd` and coefficient phi. */
function ar1(n: number, phi: number, sd: number, seed: number): number[] {
  const z = normalStream(seed);
  const innov = sd * Math.sqrt(1 - phi * phi);
  const e: number[] = [];
  let prev = sd * z();
  for (let i = 0; i < n; i++) { if (i > 0) prev = phi * prev + innov * z(); e.push(prev); }
  return e;
}

/** Yearly swing with a second harmonic, amplitude a, for position t of `perYear` points per year. */
const yearly = (t: number, perYear: number, a: number, phase: number): number =>
  a * Math.sin((2 * Math.PI * t) / perYear + phase) + 0.4 * a * Math.cos((4 * Math.PI * t) / perYear + 2 * phase);

/** A change position uniform in [lo, hi]. */
const between = (u: () => number, lo: number, hi: number): number => lo + Math.floor(u() * (hi - lo + 1));

function weeklySeason(control: boolean): BusinessScenario {
  return {
    name: control ? 'weekly orders, yearly swing, no change' : 'weekly orders, yearly swing, level step',
    model: 'mean', control,
    make(seed) {
      const u = mulberry32(seed), z = normalStream(seed + 1);
      const n = 156, sd = 20, phase = 2 * Math.PI * u();
      const at = between(u, 26, 130), step = (u() < 0.5 ? -1 : 1) * sd * (3 + 1.5 * u());
      const y = Array.from({ length: n }, (_, i) => 1000 + yearly(i, 365.25 / 7, 4 * sd, phase) + (!control && i >= at ? step : 0) + sd * z());
      return { scenario: this.name, model: 'mean', y, x: weeks(n), truth: control ? [] : [at], spikes: [] };
    },
  };
}

const WEEKDAY = [1.15, 1.1, 1.05, 1.05, 1.2, 0.75, 0.7];

function dailyCounts(control: boolean): BusinessScenario {
  return {
    name: control ? 'daily ticket counts, weekday pattern, no change' : 'daily ticket counts, weekday pattern, rate change',
    model: 'poisson', control,
    make(seed) {
      const u = mulberry32(seed), draw = poissonStream(seed + 1);
      const n = 364, base = 20 + 20 * u();
      const at = between(u, 60, 300), factor = u() < 0.5 ? 1 / (1.35 + 0.25 * u()) : 1.35 + 0.25 * u();
      const y = Array.from({ length: n }, (_, i) => draw(base * WEEKDAY[i % 7] * (!control && i >= at ? factor : 1)));
      return { scenario: this.name, model: 'poisson', y, x: days(n), truth: control ? [] : [at], spikes: [] };
    },
  };
}

function monthlySpikes(control: boolean): BusinessScenario {
  return {
    name: control ? 'monthly costs, spikes, no change' : 'monthly costs, spikes, level step',
    model: 'mean', control,
    make(seed) {
      const u = mulberry32(seed), z = normalStream(seed + 1);
      const n = 96, sd = 10;
      const at = between(u, 18, 78), step = (u() < 0.5 ? -1 : 1) * sd * (3 + 1.5 * u());
      const y = Array.from({ length: n }, (_, i) => 400 + (!control && i >= at ? step : 0) + sd * z());
      const spikes: number[] = [];
      for (let k = 0; k < 2; k++) {
        let s = between(u, 2, n - 3);
        while (spikes.includes(s) || Math.abs(s - at) <= 1) s = between(u, 2, n - 3);
        spikes.push(s);
        y[s] += (u() < 0.5 ? -1 : 1) * sd * (6 + 6 * u());
      }
      return { scenario: this.name, model: 'mean', y, x: months(n), truth: control ? [] : [at], spikes: spikes.sort((a, b) => a - b) };
    },
  };
}

function correlated(control: boolean): BusinessScenario {
  return {
    name: control ? 'daily readings, AR(1) noise phi <= 0.5, no change' : 'daily readings, AR(1) noise phi <= 0.5, level step',
    model: 'mean', control,
    make(seed) {
      const u = mulberry32(seed);
      const n = 250, sd = 5, phi = 0.5 * u();
      const at = between(u, 40, 210), step = (u() < 0.5 ? -1 : 1) * sd * (3 + 1.5 * u());
      const e = ar1(n, phi, sd, seed + 1);
      const y = e.map((v, i) => 120 + (!control && i >= at ? step : 0) + v);
      return { scenario: this.name, model: 'mean', y, x: days(n), truth: control ? [] : [at], spikes: [] };
    },
  };
}

function volatility(control: boolean): BusinessScenario {
  return {
    name: control ? 'daily price changes, steady volatility' : 'daily price changes, volatility change',
    model: 'meanvar', control,
    make(seed) {
      const u = mulberry32(seed), z = normalStream(seed + 1);
      const n = 250, sd = 0.8;
      const at = between(u, 50, 200), factor = u() < 0.5 ? 2 + u() : 1 / (2 + u());
      const y = Array.from({ length: n }, (_, i) => Math.round(100 * (0.05 + sd * (!control && i >= at ? factor : 1) * z())) / 100);
      return { scenario: this.name, model: 'meanvar', y, x: days(n), truth: control ? [] : [at], spikes: [] };
    },
  };
}

function slopeKink(control: boolean): BusinessScenario {
  return {
    name: control ? 'weekly sales, yearly swing, straight trend' : 'weekly sales, yearly swing, growth bends',
    model: 'slope', control,
    make(seed) {
      const u = mulberry32(seed), z = normalStream(seed + 1);
      const n = 156, sd = 20, phase = 2 * Math.PI * u();
      const at = between(u, 35, 120), slope0 = sd * 0.1 * (u() - 0.5), bend = (u() < 0.5 ? -1 : 1) * sd * (0.12 + 0.08 * u());
      const y = Array.from({ length: n }, (_, i) => 2000 + slope0 * i + (!control && i > at ? bend * (i - at) : 0) + yearly(i, 365.25 / 7, 4 * sd, phase) + sd * z());
      return { scenario: this.name, model: 'slope', y, x: weeks(n), truth: control ? [] : [at], spikes: [] };
    },
  };
}

/** Every scenario, each change scenario followed by its control. */
export const BUSINESS_SCENARIOS: readonly BusinessScenario[] = [
  weeklySeason(false), weeklySeason(true),
  dailyCounts(false), dailyCounts(true),
  monthlySpikes(false), monthlySpikes(true),
  correlated(false), correlated(true),
  volatility(false), volatility(true),
  slopeKink(false), slopeKink(true),
];

/** Planted changes found within `tol` points, and found changes matched to no planted one. */
export function scoreChanges(found: readonly number[], truth: readonly number[], tol = 3): { detected: number; falseChanges: number } {
  const used = new Set<number>();
  let detected = 0;
  for (const t of truth) {
    let best = -1;
    for (let k = 0; k < found.length; k++) if (!used.has(k) && Math.abs(found[k] - t) <= tol && (best < 0 || Math.abs(found[k] - t) < Math.abs(found[best] - t))) best = k;
    if (best >= 0) { used.add(best); detected++; }
  }
  return { detected, falseChanges: found.length - used.size };
}
