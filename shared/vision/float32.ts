// Float32 values in order: the SIMD kernels compare float32 samples with a float32 cut, chosen so
// that the comparison decides exactly as the plain engine's double-precision one does.

const scratch = new DataView(new ArrayBuffer(4));

/** Position of a float32 in the order of the numbers (−0 and +0 share 0); NaN is not ordered. */
function ordinal(f: number): number {
  scratch.setFloat32(0, f);
  const bits = scratch.getInt32(0);
  return bits >= 0 ? bits : -(bits & 0x7fffffff);
}

function fromOrdinal(n: number): number {
  scratch.setInt32(0, n >= 0 ? n : -n | 0x80000000);
  return scratch.getFloat32(0);
}

/** The smallest float32 greater than `value` (any number): for float32 v, v > value ⇔ v ≥ result. NaN when nothing is greater. */
export function float32Above(value: number): number {
  if (Number.isNaN(value) || value === Infinity) return NaN;
  const f = Math.fround(value);
  if (f > value) return f;
  return f === Infinity ? NaN : fromOrdinal(ordinal(f) + 1);
}

/**
 * The smallest float32 v in [lo, hi] with test(v) true, for a test that is false then true as v
 * grows (lo and hi float32, test(hi) true): binary search over the float32 values in between.
 */
export function firstFloat32Where(lo: number, hi: number, test: (v: number) => boolean): number {
  let a = ordinal(lo);
  let b = ordinal(hi);
  while (a < b) {
    const mid = Math.floor((a + b) / 2);
    if (test(fromOrdinal(mid))) b = mid;
    else a = mid + 1;
  }
  return fromOrdinal(a);
}
