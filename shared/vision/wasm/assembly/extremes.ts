// The end of a search for the smallest and largest value: four lanes and a scalar of each, reduced.

/** The smallest of l and lo's four lanes and the largest of g and hi's, as two float32 at out (lanes hold no NaN). */
export function storeExtremes(out: usize, lo: v128, hi: v128, l: f32, g: f32): void {
  for (let lane = 0; lane < 4; lane++) {
    const a = f32x4.extract_lane(lo, 0), b = f32x4.extract_lane(hi, 0);
    if (a < l) l = a;
    if (b > g) g = b;
    lo = v128.shuffle<f32>(lo, lo, 1, 2, 3, 0);
    hi = v128.shuffle<f32>(hi, hi, 1, 2, 3, 0);
  }
  store<f32>(out, l);
  store<f32>(out, g, 4);
}
