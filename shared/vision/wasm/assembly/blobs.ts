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
