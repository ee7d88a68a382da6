/**
 * Orderings of number arrays without comparator calls (a native sort of the values does the comparing): the same
 * order a sort by `values[a] - values[b] || a - b` gives, for values that are not NaN.
 */

/** First position in ascending `a` whose value is >= v (a.length when none). */
export function lowerBound(a: Float64Array, v: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Positions 0..n-1 ordered by (value, position) ascending (equal values, +0 and -0 too, in position order); null when
 * a value is NaN (no such order). A native sort of the values, then each position takes the next free slot of its value's run.
 */
export function orderByValue(values: ArrayLike<number>): Int32Array | null {
  const n = values.length;
  const sorted = Float64Array.from(values).sort();
  if (n > 0 && Number.isNaN(sorted[n - 1])) return null;
  const order = new Int32Array(n), taken = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const p = lowerBound(sorted, values[i]);
    order[p + taken[p]++] = i;
  }
  return order;
}

/** Positions 0..n-1 ordered by (value, position) ascending: orderByValue, or with a NaN a sort by `values[a] - values[b] || a - b`. */
export function orderOf(values: ArrayLike<number>): Int32Array {
  return orderByValue(values) ?? Int32Array.from({ length: values.length }, (_, i) => i).sort((a, b) => values[a] - values[b] || a - b);
}
