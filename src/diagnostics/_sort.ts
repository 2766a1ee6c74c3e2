/**
 * Least-significant-digit radix sort of float64 values with their indices.
 * Private to `src/diagnostics/`.
 *
 * Method: an IEEE-754 double maps to an unsigned 64-bit key with the same
 * order by flipping all bits of negatives and only the sign bit of
 * non-negatives (e.g. Knuth, TAOCP vol. 3, 2nd ed., sec. 5.2.5 for LSD radix
 * sorting; the key map is common practice, no source). Eight stable counting
 * passes of one byte each; passes whose byte is the same for every key are
 * skipped. NaN must not occur (callers check finiteness first).
 * @module
 */

/** Values in ascending order and, for each position, the index it came from. */
export interface SortedWithIndex {
  readonly sorted: Float64Array;
  readonly order: Uint32Array;
}

/** Sort `x` ascending, returning the values and the permutation. */
export function sortWithIndex(x: Float64Array): SortedWithIndex {
  const n = x.length;
  const copy = x.slice();
  const words = new Uint32Array(copy.buffer); // little-endian: [lo, hi] per value
  let lo = new Uint32Array(n);
  let hi = new Uint32Array(n);
  let idx = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const l = words[2 * i]!;
    const h = words[2 * i + 1]!;
    if (h & 0x80000000) {
      lo[i] = ~l >>> 0;
      hi[i] = ~h >>> 0;
    } else {
      lo[i] = l;
      hi[i] = (h | 0x80000000) >>> 0;
    }
    idx[i] = i;
  }
  let lo2 = new Uint32Array(n);
  let hi2 = new Uint32Array(n);
  let idx2 = new Uint32Array(n);
  const count = new Uint32Array(256);
  for (let pass = 0; pass < 8; pass++) {
    const src = pass < 4 ? lo : hi;
    const shift = (pass % 4) * 8;
    count.fill(0);
    for (let i = 0; i < n; i++) count[(src[i]! >>> shift) & 255]!++;
    if (n > 0 && count[(src[0]! >>> shift) & 255] === n) continue;
    let sum = 0;
    for (let b = 0; b < 256; b++) {
      const c = count[b]!;
      count[b] = sum;
      sum += c;
    }
    for (let i = 0; i < n; i++) {
      const b = (src[i]! >>> shift) & 255;
      const j = count[b]!++;
      lo2[j] = lo[i]!;
      hi2[j] = hi[i]!;
      idx2[j] = idx[i]!;
    }
    [lo, lo2] = [lo2, lo];
    [hi, hi2] = [hi2, hi];
    [idx, idx2] = [idx2, idx];
  }
  const sorted = new Float64Array(n);
  for (let i = 0; i < n; i++) sorted[i] = x[idx[i]!]!;
  return { sorted, order: idx };
}
