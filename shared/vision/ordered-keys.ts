// float32 samples compared as 32-bit integers: with the magnitude bits flipped for negative values,
// the bit patterns sort as the numbers do (−Infinity lowest, +Infinity highest), so minima and maxima
// of keys are those of the values, computed without branches. Valid for images with no NaN (which no
// order places) and no −0 (whose key would sort below +0's, while the values compare equal).

/** The float32 samples' bit patterns, read as integers (same buffer, no copy). */
export function sampleBits(data: Float32Array): Int32Array {
  return new Int32Array(data.buffer, data.byteOffset, data.length);
}

/**
 * 'unordered' when a sample is NaN or −0; otherwise every value compares with every other one and
 * equal values have equal bits, so any exact selection (minimum, maximum, median) gives the same
 * bits: 'non-negative' when every sample is also +0 or above (then the bit patterns themselves sort
 * as the values, their own keys), else 'ordered'.
 */
export function sampleOrder(data: Float32Array): 'unordered' | 'ordered' | 'non-negative' {
  const bits = sampleBits(data);
  let signs = 0;
  for (let p = 0; p < bits.length; p++) {
    const b = bits[p];
    if ((b & 0x7fffffff) > 0x7f800000 || b === -0x80000000) return 'unordered';
    signs |= b;
  }
  return signs < 0 ? 'ordered' : 'non-negative';
}

/** The key of a float32 bit pattern (its own inverse: floatFromKey). */
export function keyOfFloatBits(bits: number): number {
  return bits ^ ((bits >> 31) & 0x7fffffff);
}

/**
 * Keys that sort as the samples of an ordered image: the bit patterns themselves for samples of +0
 * and above (no copy), otherwise converted into a new array.
 */
export function keysOf(data: Float32Array, order: 'ordered' | 'non-negative'): Int32Array {
  const bits = sampleBits(data);
  return order === 'non-negative' ? bits : bits.map(keyOfFloatBits);
}

/** Keys back into float32 bit patterns, in place. */
export function samplesFromKeys(keys: Int32Array): void {
  for (let p = 0; p < keys.length; p++) keys[p] = floatFromKey(keys[p]);
}

/** The float32 bit pattern of a key. */
export function floatFromKey(key: number): number {
  return key ^ ((key >> 31) & 0x7fffffff);
}

/** The smaller of two integers without a branch: −(q < p) is all ones exactly when q is smaller. */
export function minKey(p: number, q: number): number {
  return p ^ ((p ^ q) & -(q < p));
}

export function maxKey(p: number, q: number): number {
  return p ^ ((p ^ q) & -(q > p));
}
