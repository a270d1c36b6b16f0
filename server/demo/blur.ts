/**
 * Optical blur of an interleaved float image, in place, with the edge pixel repeated beyond the frame.
 * Small sigmas use a sampled Gaussian; large ones three box passes, which approach a Gaussian closely
 * (W. M. Wells, "Efficient synthesis of Gaussian filters by cascaded uniform filters", IEEE PAMI 8(2), 1986).
 */

const LARGEST_EXACT_SIGMA = 3;

export function blurImage(data: Float32Array, width: number, height: number, channels: number, sigma: number): void {
  if (sigma <= 0) return;
  const weightSets =
    sigma <= LARGEST_EXACT_SIGMA
      ? [gaussianWeights(sigma)]
      : boxSizesForGaussian(sigma, 3).map((size) => new Float32Array(size).fill(1 / size));
  const scratch = new Float32Array(data.length);
  for (const weights of weightSets) {
    filterRows(data, scratch, width, height, channels, weights);
    filterColumns(scratch, data, width, height, channels, weights);
  }
}

function gaussianWeights(sigma: number): Float32Array {
  const radius = Math.ceil(3 * sigma);
  const weights = new Float32Array(2 * radius + 1);
  let sum = 0;
  for (let i = -radius; i <= radius; i++) {
    const w = Math.exp(-(i * i) / (2 * sigma * sigma));
    weights[i + radius] = w;
    sum += w;
  }
  for (let i = 0; i < weights.length; i++) weights[i] /= sum;
  return weights;
}

/** Odd box widths whose cascade has the variance of the Gaussian (P. Kovesi, "Fast almost-Gaussian filtering", DICTA 2010). */
export function boxSizesForGaussian(sigma: number, passes: number): number[] {
  const ideal = Math.sqrt((12 * sigma * sigma) / passes + 1);
  let lower = Math.floor(ideal);
  if (lower % 2 === 0) lower -= 1;
  const upper = lower + 2;
  const lowerCount = Math.round(
    (12 * sigma * sigma - passes * lower * lower - 4 * passes * lower - 3 * passes) / (-4 * lower - 4),
  );
  return Array.from({ length: passes }, (_, i) => (i < lowerCount ? lower : upper));
}

/** Horizontal pass: each row is copied into a padded line so the inner loop needs no bounds checks. */
function filterRows(
  source: Float32Array,
  target: Float32Array,
  width: number,
  height: number,
  channels: number,
  weights: Float32Array,
): void {
  const radius = (weights.length - 1) / 2;
  const taps = weights.length;
  const padded = new Float32Array(width + 2 * radius);
  for (let y = 0; y < height; y++) {
    const rowStart = y * width * channels;
    for (let c = 0; c < channels; c++) {
      for (let x = 0; x < padded.length; x++) {
        const sx = Math.min(width - 1, Math.max(0, x - radius));
        padded[x] = source[rowStart + sx * channels + c];
      }
      for (let x = 0; x < width; x++) {
        let sum = 0;
        for (let k = 0; k < taps; k++) sum += weights[k] * padded[x + k];
        target[rowStart + x * channels + c] = sum;
      }
    }
  }
}

/** Vertical pass, walked row by row so that memory is read in order. */
function filterColumns(
  source: Float32Array,
  target: Float32Array,
  width: number,
  height: number,
  channels: number,
  weights: Float32Array,
): void {
  const radius = (weights.length - 1) / 2;
  const stride = width * channels;
  const taps = weights.length;
  const rowStarts = new Int32Array(taps);
  for (let y = 0; y < height; y++) {
    for (let k = 0; k < taps; k++) rowStarts[k] = Math.min(height - 1, Math.max(0, y + k - radius)) * stride;
    const out = y * stride;
    for (let i = 0; i < stride; i++) {
      let sum = 0;
      for (let k = 0; k < taps; k++) sum += weights[k] * source[rowStarts[k] + i];
      target[out + i] = sum;
    }
  }
}
