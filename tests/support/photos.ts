import sharp from 'sharp';

/**
 * A 64×48 grey PNG with a little texture that depends on the seed (so each seed gives different
 * bytes), an optional bright square "defect" of the given side at (20, 10), at the given grey level
 * (a level of 20 makes a photo too dark for a quality gate asking a mean of 60).
 */
export async function spotPhoto(seed: number, defectSide: number, level = 120): Promise<Buffer> {
  const w = 64;
  const h = 48;
  const px = Buffer.alloc(w * h);
  for (let i = 0; i < px.length; i++) px[i] = level + ((i * 13 + seed * 7) % 5);
  for (let y = 10; y < 10 + defectSide; y++) for (let x = 20; x < 20 + defectSide; x++) px[y * w + x] = 250;
  return sharp(px, { raw: { width: w, height: h, channels: 1 } }).png().toBuffer();
}

/** Finds bright squares: threshold at 200, largest blob; RETAKE below a mean of 60. */
export const SPOT_RULE = {
  format: 'kernwright-rule/1',
  name: 'Bright spot',
  quality: { minMean: 60 },
  steps: [{ op: 'threshold', method: 'fixed', value: 200 }],
  gauges: [{ name: 'Spot area', measure: 'largest-blob-area', unit: 'px2', limits: { max: 20 } }],
};
