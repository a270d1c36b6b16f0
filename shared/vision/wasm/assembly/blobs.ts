// The pre-pass of blob labelling: which pixels are not 0, packed 32 to a word, so that the
// labelling walks runs of set bits instead of pixels.
import { at } from './border';

/**
 * Bit i of word k of row y is set when pixel (32k + i, y) is not 0 (NaN counts as set, −0 as 0);
 * bits past the last column are 0.
 */
export function packNonZero(src: usize, w: i32, h: i32, words: usize): void {
  const zero = f32x4.splat(0);
  const wordsPerRow = (w + 31) >>> 5;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const count = min(32, w - (k << 5));
      let word = 0;
      if (count == 32) {
        for (let g = 0; g < 8; g++) word |= i32x4.bitmask(f32x4.ne(v128.load(at(src, x0 + (g << 2))), zero)) << (g << 2);
      } else {
        for (let i = 0; i < count; i++) word |= (load<f32>(at(src, x0 + i)) != 0 ? 1 : 0) << i;
      }
      store<i32>(at(words, y * wordsPerRow + k), word);
    }
  }
}

/**
 * Number of set bits of packed rows (as packNonZero writes them; bits past the last column ignored)
 * in row y's columns start[y] … end[y]−1, summed over the rows: a mask's edge fraction from its bits.
 */
export function countSetBits(words: usize, wordsPerRow: i32, w: i32, h: i32, starts: usize, ends: usize): i32 {
  let count = 0;
  for (let y = 0; y < h; y++) {
    const x0 = max(0, load<i32>(at(starts, y)));
    const x1 = min(w, load<i32>(at(ends, y)));
    if (x1 <= x0) continue;
    const row = at(words, y * wordsPerRow);
    const first = x0 >>> 5, last = (x1 - 1) >>> 5;
    // Bits from x0 in the first word, up to x1 − 1 in the last.
    const head = -1 << (x0 & 31);
    const tail = <i32>(<u32>-1 >>> (31 - ((x1 - 1) & 31)));
    if (first == last) {
      count += popcnt(load<i32>(at(row, first)) & head & tail);
      continue;
    }
    count += popcnt(load<i32>(at(row, first)) & head);
    for (let k = first + 1; k < last; k++) count += popcnt(load<i32>(at(row, k)));
    count += popcnt(load<i32>(at(row, last)) & tail);
  }
  return count;
}
