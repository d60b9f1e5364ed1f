/**
 * A small least-recently-used cache of fits, keyed by the data and the
 * options, so several worksheet functions over the same range and options fit
 * once. Keys are built by {@link cacheKey}: a 53-bit hash of every value
 * (type-tagged) plus the options, with the full length, so different data
 * cannot share a key short of a hash collision (about 2^-53 per pair).
 */
export class FitCache<V> {
  private readonly map = new Map<string, V>();
  constructor(readonly capacity = 16) {}

  /** The cached value for `key`, computing and storing it on a miss. */
  get(key: string, compute: () => V): V {
    const hit = this.map.get(key);
    if (hit !== undefined) {
      this.map.delete(key);
      this.map.set(key, hit);
      return hit;
    }
    const v = compute();
    this.map.set(key, v);
    while (this.map.size > this.capacity) this.map.delete(this.map.keys().next().value as string);
    return v;
  }

  get size(): number {
    return this.map.size;
  }

  clear(): void {
    this.map.clear();
  }

  /** Forgets one key (a failed computation). */
  delete(key: string): void {
    this.map.delete(key);
  }
}

/** cyrb53-style string/number hashing (public-domain mixing constants), two 32-bit lanes. */
export function cacheKey(parts: readonly unknown[]): string {
  let h1 = 0xdeadbeef, h2 = 0x41c6ce57;
  const mix = (code: number) => {
    h1 = Math.imul(h1 ^ code, 2654435761);
    h2 = Math.imul(h2 ^ code, 1597334677);
  };
  const f64 = new Float64Array(1);
  const u32 = new Uint32Array(f64.buffer);
  let count = 0;
  const visit = (v: unknown): void => {
    count++;
    if (typeof v === 'number') { mix(1); f64[0] = v; mix(u32[0]); mix(u32[1]); }
    else if (typeof v === 'string') { mix(2); for (let i = 0; i < v.length; i++) mix(v.charCodeAt(i)); mix(v.length); }
    else if (typeof v === 'boolean') mix(v ? 3 : 4);
    else if (v === null || v === undefined) mix(5);
    else if (Array.isArray(v) || ArrayBuffer.isView(v)) { mix(6); const a = v as ArrayLike<unknown>; for (let i = 0; i < a.length; i++) visit(a[i]); mix(7); }
    else if (typeof v === 'object') { mix(8); for (const k of Object.keys(v as object).sort()) { visit(k); visit((v as Record<string, unknown>)[k]); } mix(9); }
    else mix(10);
  };
  for (const p of parts) visit(p);
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507) ^ Math.imul(h2 ^ (h2 >>> 13), 3266489909);
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  return `${count}:${(h2 >>> 0).toString(16)}${(h1 >>> 0).toString(16)}`;
}
