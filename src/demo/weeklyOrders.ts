/**
 * The demo data: an invented scenario, generated from a fixed seed so every
 * copy of the add-in, the README and the tests see the same numbers.
 *
 * Scenario (fictional): three years of weekly figures at "Depot North", one
 * depot of an example distributor. Week 70 a second delivery route opens
 * (orders step up); from week 110 a price change bends the growth of orders
 * upward; returned parcels are counts whose rate rises after week 90; the unit
 * cost becomes more volatile after week 100. Two weeks are missing (closures)
 * and one cell holds the text "n/a", as real exports do.
 */

import { serialToIso } from '../present/isoDate';

/** mulberry32: a 32-bit seeded generator (public-domain algorithm by Tommy Ettinger). */
export function mulberry32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal draws by the Box-Muller transform. */
export function normal(rand: () => number): () => number {
  return () => {
    const u = Math.max(rand(), 1e-300);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
  };
}

/** Poisson draw by inversion (fine for the small rates used here). */
function poisson(rand: () => number, rate: number): number {
  let k = 0;
  let p = Math.exp(-rate);
  let cdf = p;
  const u = rand();
  while (u > cdf && k < 1000) { k++; p *= rate / k; cdf += p; }
  return k;
}

export interface DemoRow {
  /** Monday of the week as an Excel serial date (44928 = 2023-01-02). */
  weekStart: number;
  orders: number | string | null;
  returns: number;
  unitCost: number;
}

export const DEMO_SEED = 20261201;
export const DEMO_WEEKS = 156;

/** The demo rows, identical on every call. */
export function weeklyOrders(seed = DEMO_SEED): DemoRow[] {
  const rand = mulberry32(seed);
  const z = normal(rand);
  const rows: DemoRow[] = [];
  for (let i = 0; i < DEMO_WEEKS; i++) {
    const week = i + 1;
    let level = 420 + 0.4 * i + 12 * Math.sin((2 * Math.PI * i) / 52);
    if (week >= 70) level += 60;
    if (week >= 110) level += 2.2 * (week - 110);
    const orders = Math.round(level + 14 * z());
    const returns = poisson(rand, week >= 90 ? 9 : 5);
    const unitCost = Math.round((3.2 + 0.002 * i + (week >= 100 ? 0.12 : 0.04) * z()) * 100) / 100;
    rows.push({ weekStart: 44928 + 7 * i, orders, returns, unitCost });
  }
  rows[33].orders = null;
  rows[34].orders = null;
  rows[120].orders = 'n/a';
  return rows;
}

/**
 * The demo as CSV text (header week_start, orders, returns, unit_cost), with
 * week_start as ISO 8601 dates (2023-01-02, ...), which Excel and the command
 * line both read as dates.
 */
export function weeklyOrdersCsv(seed = DEMO_SEED): string {
  const lines = ['week_start,orders,returns,unit_cost'];
  for (const r of weeklyOrders(seed)) lines.push([serialToIso(r.weekStart), r.orders ?? '', r.returns, r.unitCost].join(','));
  return lines.join('\n') + '\n';
}
