/**
 * Median of a copy of `a` (NaN when empty), by selection (Hoare's quickselect with a
 * median-of-three pivot), O(n) expected: sorting a full column only to read its middle
 * costs a second or more per call. Unchecked: values are not NaN.
 */
export function median(a: ArrayLike<number>): number {
  return a.length === 0 ? NaN : medianInPlace(Float64Array.from(a));
}

/**
 * {@link median} of `s` itself, reordering it (no copy, for loops that reuse one scratch
 * array). The same value as median(s). Unchecked: s not empty, no NaN.
 */
export function medianInPlace(s: Float64Array): number {
  const n = s.length;
  const hi = select(s, n >> 1);
  if (n % 2) return hi;
  // the largest value below position n/2 is the maximum of the left part
  let lo = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (s[i] > lo) lo = s[i];
  return 0.5 * (lo + hi);
}

/** Puts the k-th smallest value at position k, smaller ones before it, larger after; returns it. Unchecked. */
function select(a: Float64Array, k: number): number {
  let left = 0, right = a.length - 1;
  while (right > left) {
    const mid = (left + right) >> 1;
    if (a[mid] < a[left]) swap(a, mid, left);
    if (a[right] < a[left]) swap(a, right, left);
    if (a[right] < a[mid]) swap(a, right, mid);
    const pivot = a[mid];
    let i = left, j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) { swap(a, i, j); i++; j--; }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return a[k];
  }
  return a[k];
}

function swap(a: Float64Array, i: number, j: number): void { const t = a[i]; a[i] = a[j]; a[j] = t; }
