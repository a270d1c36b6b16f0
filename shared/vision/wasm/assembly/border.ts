// Border policy of the WebAssembly kernels, the same as shared/vision/border.ts: which source
// position stands in for a position outside the image. Modes travel across the boundary as numbers.
export const REFLECT: i32 = 0;
export const REPLICATE: i32 = 1;
export const CONSTANT: i32 = 2;
/** A position whose value is the constant 0. */
export const OUTSIDE: i32 = -1;

/** Address of element i of an f32 or i32 array at base. */
@inline
export function at(base: usize, i: i32): usize {
  return base + ((<usize>i) << 2);
}

/** reflect: gfedcb|abcdefgh|gfedcba (OpenCV BORDER_REFLECT_101), repeated as often as needed; replicate: aaa|abc|ccc; constant: OUTSIDE. */
export function borderIndex(i: i32, n: i32, mode: i32): i32 {
  if (i >= 0 && i < n) return i;
  if (mode == CONSTANT) return OUTSIDE;
  if (mode == REPLICATE || n == 1) return i < 0 ? 0 : n - 1;
  const period = 2 * n - 2;
  let k = i % period;
  if (k < 0) k += period;
  return k < n ? k : period - k;
}

/** Address of source row y of a w-wide image (border applied); `zeros` stands for an outside row. */
export function rowAddress(src: usize, y: i32, h: i32, w: i32, mode: i32, zeros: usize): usize {
  const sy = borderIndex(y, h, mode);
  return sy == OUTSIDE ? zeros : at(src, sy * w);
}

/** Fills `pad` positions on each side of a float32 line whose n samples sit at line[pad … pad+n−1]. */
export function fillLineBorder(line: usize, n: i32, pad: i32, mode: i32): void {
  fillBorderOf<f32>(line, n, pad, mode);
}

/** fillLineBorder for a line of T (f32, i16, …). */
export function fillBorderOf<T>(line: usize, n: i32, pad: i32, mode: i32): void {
  const size = <usize>sizeof<T>();
  for (let t = 0; t < pad; t++) {
    const left = borderIndex(t - pad, n, mode);
    store<T>(line + <usize>t * size, left == OUTSIDE ? <T>0 : load<T>(line + <usize>(pad + left) * size));
    const right = borderIndex(n + t, n, mode);
    store<T>(line + <usize>(pad + n + t) * size, right == OUTSIDE ? <T>0 : load<T>(line + <usize>(pad + right) * size));
  }
}

/** Rounds an address up to the next multiple of 16 (one v128). */
@inline
export function align16(p: usize): usize {
  return (p + 15) & ~(<usize>15);
}

/** Where `touchAhead` leaves the words it read, so that its loads are not dropped as unused. */
const TOUCHED: usize = memory.data(16, 16);

/**
 * Whether the single-stream loops read ahead of their work: the gradient the output row two below
 * (`gradientRow`), the Otsu pass the group 8 KB on (`countGroupsOn`). Which is faster depends on the
 * processor: on an Intel machine that did not fetch a stream ahead across 4 KB pages the reads made
 * those passes 15–35 % faster; on an AMD one they made the gradient about 22 % and the Otsu pass 8 %
 * slower (shared/vision/README.md). The JavaScript side measures both at load and sets the faster
 * (read-ahead.ts). Off, the loops read their word
 * from a row they are working on: a load that does not wait. The loops over several rows at once
 * (`touchAhead`, the direct and σ ≥ 2 row sweeps) read ahead always: that helped on the Intel
 * machine and made no clear difference on the AMD one.
 */
export let readAhead: bool = true;

export function setReadAhead(on: bool): void {
  readAhead = on;
}

/**
 * Reads one word of every 64-byte line of `bytes` bytes at `address`, so that a row the next
 * iterations need is on its way into the cache while the current one is computed (WebAssembly has
 * no prefetch instruction).
 */
export function touchAhead(address: usize, bytes: i32): void {
  let seen = 0;
  for (let o = 0; o < bytes; o += 64) seen |= load<i32>(address + <usize>o);
  store<i32>(TOUCHED, seen);
}

/** Keeps the words a loop read ahead (`seen`, OR-ed together), so that its loads are not dropped as unused. */
export function keepTouched(seen: i32): void {
  store<i32>(TOUCHED, seen);
}
