// Kernels as data: the 2-D matrix type, the published operators' weights and the kernels built
// from a parameter (Gaussian, Laplacian of Gaussian). Applying them is convolve.ts's job.

/** A correlation kernel: out = Σ weights·neighbourhood / divisor + offset. Odd rows and columns. */
export interface Kernel {
  readonly rows: number;
  readonly cols: number;
  /** Row-major, rows × cols. */
  readonly weights: Float64Array;
  readonly divisor: number;
  readonly offset: number;
}

/** A kernel as JSON carries it (the library files and rule documents). */
export interface KernelDefinition {
  readonly name: string;
  readonly matrix: readonly (readonly number[])[];
  readonly divisor: number;
  readonly offset: number;
  readonly description: string;
  readonly source: string;
}

export function kernelFromMatrix(matrix: readonly (readonly number[])[], divisor = 1, offset = 0): Kernel {
  const rows = matrix.length;
  const cols = rows > 0 ? matrix[0].length : 0;
  if (rows % 2 === 0 || cols % 2 === 0) throw new RangeError(`a kernel needs odd rows and columns, got ${rows}x${cols}`);
  if (divisor === 0 || !Number.isFinite(divisor)) throw new RangeError('a kernel divisor must be a finite number other than 0');
  const weights = new Float64Array(rows * cols);
  matrix.forEach((row, j) => {
    if (row.length !== cols) throw new RangeError(`kernel row ${j} has ${row.length} values, expected ${cols}`);
    row.forEach((v, i) => (weights[j * cols + i] = v));
  });
  // An offset of −0 is +0: the loops may differ in the sign of a zero sum (kernel-loops.ts), and
  // adding +0 makes it +0 in all of them (−0 + −0 would keep one sign and not the other).
  return { rows, cols, weights, divisor, offset: offset + 0 };
}

/** The kernel as a matrix of rows (for display and export). */
export function kernelMatrix(kernel: Kernel): number[][] {
  const out: number[][] = [];
  for (let j = 0; j < kernel.rows; j++) out.push(Array.from(kernel.weights.subarray(j * kernel.cols, (j + 1) * kernel.cols)));
  return out;
}

/** Outer product column ⊗ row: the 2-D kernel of a separable pair. */
export function outerProduct(column: ArrayLike<number>, row: ArrayLike<number>): number[][] {
  return Array.from(column, (c) => Array.from(row, (r) => c * r));
}

export interface SeparableKernel {
  /** Weights along y (rows). */
  readonly column: Float64Array;
  /** Weights along x (columns). */
  readonly row: Float64Array;
}

/**
 * Splits a rank-1 kernel into column ⊗ row (divisor folded into the row), or returns null.
 * Pivot on the largest weight and check every weight against the product, relative to the largest.
 */
export function separate(kernel: Kernel, tolerance = 1e-9): SeparableKernel | null {
  const { rows, cols, weights, divisor } = kernel;
  let pivot = 0;
  for (let k = 1; k < weights.length; k++) if (Math.abs(weights[k]) > Math.abs(weights[pivot])) pivot = k;
  const peak = weights[pivot];
  if (peak === 0) return { column: new Float64Array(rows), row: new Float64Array(cols) };
  const pj = Math.floor(pivot / cols);
  const pi = pivot % cols;
  const column = new Float64Array(rows);
  const row = new Float64Array(cols);
  for (let j = 0; j < rows; j++) column[j] = weights[j * cols + pi];
  for (let i = 0; i < cols; i++) row[i] = weights[pj * cols + i] / peak;
  const limit = tolerance * Math.abs(peak);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < cols; i++) {
      if (Math.abs(weights[j * cols + i] - column[j] * row[i]) > limit) return null;
    }
  }
  for (let i = 0; i < cols; i++) row[i] /= divisor;
  return { column, row };
}

/** Kernel radius for a Gaussian of standard deviation sigma: ceil(3·sigma) (DESIGN.md, rule format v1). */
export function gaussianRadius(sigma: number): number {
  return Math.ceil(3 * sigma);
}

/** Sampled Gaussian exp(−x²/2σ²), x = −r…r, normalised to sum 1 (as OpenCV getGaussianKernel for σ > 0). */
export function gaussianWeights(sigma: number, radius = gaussianRadius(sigma)): Float64Array {
  const w = new Float64Array(2 * radius + 1);
  let sum = 0;
  for (let x = -radius; x <= radius; x++) sum += w[x + radius] = Math.exp(-(x * x) / (2 * sigma * sigma));
  for (let k = 0; k < w.length; k++) w[k] /= sum;
  return w;
}

/**
 * Second derivative of the sampled, normalised Gaussian: (x²/σ⁴ − 1/σ²)·g(x), as
 * scipy.ndimage.gaussian_filter1d(order=2) builds it (scipy/ndimage/_filters.py, _gaussian_kernel1d).
 */
export function gaussianSecondDerivativeWeights(sigma: number, radius = gaussianRadius(sigma)): Float64Array {
  const g = gaussianWeights(sigma, radius);
  const s2 = sigma * sigma;
  for (let x = -radius; x <= radius; x++) g[x + radius] *= (x * x) / (s2 * s2) - 1 / s2;
  return g;
}

// Derivative operators, correlation form, x to the right and y downwards (REFERENCES.md §1).
// Each is smoothing ⊗ difference: x kernel = smoothing (column) ⊗ [-1 0 1] (row).
export const DIFFERENCE = [-1, 0, 1] as const;
/** Sobel & Feldman (1968), printed in Duda & Hart (1973), pp. 271–272. */
export const SOBEL_SMOOTHING = [1, 2, 1] as const;
/** Scharr (2000), PhD thesis, Univ. Heidelberg; OpenCV FILTER_SCHARR. */
export const SCHARR_SMOOTHING = [3, 10, 3] as const;
/** Prewitt (1970), "Object enhancement and extraction". */
export const PREWITT_SMOOTHING = [1, 1, 1] as const;

/** 4-neighbour discrete Laplacian (Gonzalez & Woods, 3rd ed., §3.6.2). */
export const LAPLACIAN_4 = [[0, 1, 0], [1, -4, 1], [0, 1, 0]] as const;
/** 8-neighbour discrete Laplacian (Gonzalez & Woods, 3rd ed., §3.6.2). */
export const LAPLACIAN_8 = [[1, 1, 1], [1, -8, 1], [1, 1, 1]] as const;
