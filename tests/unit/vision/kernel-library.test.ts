// Every file of the built-in kernel library loads, and has the properties its kind requires.
import { loadKernelLibrary, parseKernelFile } from '../../../server/vision/kernel-library';
import type { KernelDefinition } from '../../../shared/vision/kernels';

let library: Map<string, KernelDefinition>;
beforeAll(async () => {
  library = await loadKernelLibrary();
});

const sum = (k: KernelDefinition) => k.matrix.flat().reduce((a, b) => a + b, 0);
const transpose = (m: readonly (readonly number[])[]) => m[0].map((_, i) => m.map((row) => row[i]));
const rotate180 = (m: readonly (readonly number[])[]) => [...m].reverse().map((row) => [...row].reverse());

test('the library holds every kernel the vision engine issue lists', () => {
  expect([...library.keys()].sort()).toEqual(
    [
      'identity', 'box-3', 'box-5', 'gaussian-3', 'gaussian-5', 'gaussian-7',
      'sobel-x', 'sobel-y', 'scharr-x', 'scharr-y', 'prewitt-x', 'prewitt-y',
      'laplacian-4', 'laplacian-8', 'log-5', 'log-9', 'sharpen',
      'line-horizontal', 'line-vertical', 'line-plus-45', 'line-minus-45',
    ].sort(),
  );
});

test('every kernel has odd sides, a source and a description', () => {
  for (const k of library.values()) {
    expect({ name: k.name, rowsOdd: k.matrix.length % 2, colsOdd: k.matrix[0].length % 2 }).toEqual({ name: k.name, rowsOdd: 1, colsOdd: 1 });
    expect(k.source.length).toBeGreaterThan(10);
    expect(k.description.length).toBeGreaterThan(20);
  }
});

test('smoothing kernels sum to their divisor (unit gain: a flat area keeps its brightness)', () => {
  for (const name of ['identity', 'box-3', 'box-5', 'gaussian-3', 'gaussian-5', 'gaussian-7', 'sharpen']) {
    const k = library.get(name)!;
    expect({ name, sum: sum(k) }).toEqual({ name, sum: k.divisor });
  }
});

test('derivative, Laplacian, LoG and line kernels sum to 0 (no response on a flat area)', () => {
  const zeroSum = [...library.keys()].filter((n) => /^(sobel|scharr|prewitt|laplacian|log|line)-/.test(n));
  expect(zeroSum).toHaveLength(14);
  for (const name of zeroSum) expect({ name, sum: sum(library.get(name)!) }).toEqual({ name, sum: 0 });
});

test('smoothing, Laplacian and LoG kernels are symmetric under transpose and 180° rotation', () => {
  for (const name of ['box-3', 'box-5', 'gaussian-3', 'gaussian-5', 'gaussian-7', 'laplacian-4', 'laplacian-8', 'log-5', 'log-9', 'sharpen']) {
    const m = library.get(name)!.matrix;
    expect({ name, m: transpose(m) }).toEqual({ name, m });
    expect({ name, m: rotate180(m) }).toEqual({ name, m });
  }
});

test('the y derivatives are the transposes of the x derivatives, and x kernels are antisymmetric left to right', () => {
  for (const op of ['sobel', 'scharr', 'prewitt']) {
    const x = library.get(`${op}-x`)!.matrix;
    expect(library.get(`${op}-y`)!.matrix).toEqual(transpose(x));
    expect(x.map((row) => [...row].reverse().map((v) => -v + 0))).toEqual(x.map((row) => row.map((v) => v + 0)));
  }
});

test('published values: Sobel x (OpenCV Sobel doc), Scharr x (OpenCV Scharr doc), binomial 5 = [1 4 6 4 1]⊗[1 4 6 4 1]/256 (OpenCV getGaussianKernel table)', () => {
  expect(library.get('sobel-x')!.matrix).toEqual([[-1, 0, 1], [-2, 0, 2], [-1, 0, 1]]);
  expect(library.get('scharr-x')!.matrix).toEqual([[-3, 0, 3], [-10, 0, 10], [-3, 0, 3]]);
  const b = [1, 4, 6, 4, 1];
  expect(library.get('gaussian-5')!.matrix).toEqual(b.map((r) => b.map((c) => r * c)));
  expect(library.get('gaussian-5')!.divisor).toBe(256);
  // HIPR2 LoG, sigma 1.4, centre value −40 (REFERENCES.md §1, math.stackexchange q/2445994).
  expect(library.get('log-9')!.matrix[4][4]).toBe(-40);
  expect(library.get('log-5')!.matrix[2][2]).toBe(16);
});

test('a kernel file whose name differs from its file name, or with an even size, is refused', () => {
  const good = JSON.stringify({ name: 'a-b', matrix: [[1]], divisor: 1, offset: 0, description: 'a kernel for a test', source: 'this test' });
  expect(() => parseKernelFile('other.json', good)).toThrow(/differs from the file name/);
  const even = good.replace('[[1]]', '[[1,1]]');
  expect(() => parseKernelFile('a-b.json', even)).toThrow(/odd rows and columns/);
  expect(() => parseKernelFile('a-b.json', '{')).toThrow(/not valid JSON/);
});
