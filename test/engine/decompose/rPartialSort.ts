/**
 * The partial sort R's stats::stl uses for the median in its robustness weights
 * (subroutine psort of R's src/library/stats/src/stl.f, from netlib's stl), ported
 * goto for goto for the tests only. R calls it with the order statistics
 * ind = (n/2 + 1, n - n/2); for even n that pair is in decreasing order, which the
 * routine does not expect, so the value it leaves at position n/2 need not be the
 * n/2-th order statistic. R's robust STL on an even-length series therefore uses a
 * slightly different scale than the exact median that statsmodels and we use.
 */
export function rPartialSortMedian(r: Float64Array): number {
  const n = r.length;
  const a = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) a[i + 1] = r[i];
  const m1 = Math.floor(n / 2) + 1;
  const m2 = n - m1 + 1;
  psort(a, n, [0, m1, m2], 2);
  return 0.5 * (a[m1] + a[m2]);
}

/** 1-based port; a[0] and ind[0] unused. */
function psort(a: Float64Array, n: number, ind: number[], ni: number): void {
  if (n < 0 || ni < 0) return;
  if (n < 2 || ni === 0) return;
  const indu = new Array(17).fill(0), indl = new Array(17).fill(0), iu = new Array(17).fill(0), il = new Array(17).fill(0);
  let jl = 1, ju = ni;
  indl[1] = 1;
  indu[1] = ni;
  let i = 1, j = n, m = 1;
  let p = 0, k = 0, l = 0, ij = 0;
  let t = 0, tt = 0;
  let label = 161;
  for (;;) {
    switch (label) {
      case 161:
        if (i < j) { label = 10; break; }
        label = 166; break;
      case 166:
        m = m - 1;
        if (m === 0) return;
        i = il[m]; j = iu[m]; jl = indl[m]; ju = indu[m];
        if (!(jl <= ju)) { label = 166; break; }
        label = 173; break;
      case 173:
        if (!(j - i > 10)) { label = 174; break; }
        label = 10; break;
      case 10:
        k = i;
        ij = Math.floor((i + j) / 2);
        t = a[ij];
        if (a[i] > t) { a[ij] = a[i]; a[i] = t; t = a[ij]; }
        l = j;
        if (a[j] < t) {
          a[ij] = a[j]; a[j] = t; t = a[ij];
          if (a[i] > t) { a[ij] = a[i]; a[i] = t; t = a[ij]; }
        }
        label = 181; break;
      case 181:
        l = l - 1;
        if (a[l] <= t) {
          tt = a[l];
          do { k = k + 1; } while (!(a[k] >= t));
          if (k > l) { label = 183; break; }
          a[l] = a[k];
          a[k] = tt;
        }
        label = 181; break;
      case 183:
        indl[m] = jl; indu[m] = ju;
        p = m;
        m = m + 1;
        if (l - i <= j - k) {
          il[p] = k; iu[p] = j; j = l;
          for (;;) {
            if (jl > ju) { label = 166; break; }
            if (ind[ju] > j) { ju = ju - 1; continue; }
            indl[p] = ju + 1;
            label = 173;
            break;
          }
        } else {
          il[p] = i; iu[p] = l; i = k;
          for (;;) {
            if (jl > ju) { label = 166; break; }
            if (ind[jl] < i) { jl = jl + 1; continue; }
            indu[p] = jl - 1;
            label = 173;
            break;
          }
        }
        break;
      case 174:
        if (i !== 1) {
          i = i - 1;
          let back = false;
          for (;;) {
            i = i + 1;
            if (i === j) { back = true; break; }
            t = a[i + 1];
            if (a[i] > t) {
              k = i;
              do { a[k + 1] = a[k]; k = k - 1; } while (!(t >= a[k]));
              a[k + 1] = t;
            }
          }
          if (back) { label = 166; break; }
        }
        label = 161; break;
      default:
        throw new Error(`psort: label ${label}`);
    }
  }
}
