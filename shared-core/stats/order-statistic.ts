/**
 * The k-th smallest of `values` (k from 0), found by selection instead of a sort: expected O(n).
 * Quickselect with a median-of-three pivot and Hoare partitioning, in place on `values` (pass a
 * copy to keep the order). NaN is not ordered: the values must be numbers that compare.
 *
 * Source: C. A. R. Hoare, "Algorithm 65: Find", Communications of the ACM 4(7), 1961, p. 321.
 */
export function kthSmallest(values: Float64Array, k: number): number {
  if (!(k >= 0 && k < values.length && Number.isInteger(k)))
    throw new RangeError(`k = ${k} is not an index of ${values.length} values`);
  let low = 0;
  let high = values.length - 1;
  while (high > low) {
    const middle = (low + high) >>> 1;
    // Median of three as the pivot: sorted or reversed input stays O(n).
    if (values[middle] < values[low]) swap(values, middle, low);
    if (values[high] < values[low]) swap(values, high, low);
    if (values[high] < values[middle]) swap(values, high, middle);
    const pivot = values[middle];
    let i = low;
    let j = high;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) swap(values, i++, j--);
    }
    // Now values[low..j] ≤ pivot ≤ values[i..high], and values between j and i equal the pivot.
    if (k <= j) high = j;
    else if (k >= i) low = i;
    else return values[k];
  }
  return values[k];
}

function swap(values: Float64Array, a: number, b: number): void {
  const kept = values[a];
  values[a] = values[b];
  values[b] = kept;
}
