// Loops written for one kernel's weights. The plain engine's general loops keep a kernel's weights
// in variables, which take the registers its samples need, and multiply every tap, zeros included.
// Here the loop's source is generated with the weights as literals and compiled once per kernel
// (new Function, cached), so that zero taps drop out, weights 1, −1 and 2 need no multiplication and
// each iteration makes several outputs from one load of the samples they share. The symmetric row
// loop reads its other weights into locals before the loop (`WeightTable`); the rest keep literals.
// Every loop adds in the order of the general loop it stands for: the same sums, the same bits (only
// the sign of a zero sum can differ, and the callers add the offset after it, which makes it +0 in
// both).
// Where the runtime forbids compiling code (a Content-Security-Policy without 'unsafe-eval'), or
// with setKernelLoops(false), the callers keep their general loops.

/** Outputs per iteration of a generated row loop (5 MP, one core: 24 beat 32, 16, 8 and 4 for 3×3 to 7×7 and the Gaussians' rows). */
const PIXELS_PER_ITERATION = 24;
/** Rows a generated column loop makes from one pass over the source rows they share (12 beat 16, 10, 8, 6 and 4 for σ = 1 and 3). */
export const COLUMN_LOOP_ROWS = 12;
/** Kernels with more weights than this keep the general loops (the generated code would mostly spill). */
export const MOST_GENERATED_TAPS = 7 * 7;

const compiles = probeCompiling();
let enabled = compiles;
const cache = new Map<string, unknown>();
const CACHE_SIZE = 64;

function probeCompiling(): boolean {
  try {
    return new Function('return 1')() === 1;
  } catch {
    return false;
  }
}

/** Turns the generated loops on or off (tests and benchmarks compare them with the general loops); stays off where compiling is forbidden. */
export function setKernelLoops(on: boolean): void {
  enabled = on && compiles;
}

export function kernelLoopsEnabled(): boolean {
  return enabled;
}

/** Whether every weight can be written as a literal (an infinite or NaN weight keeps the general loop). */
function allFinite(weights: ArrayLike<number>): boolean {
  for (let i = 0; i < weights.length; i++) if (!Number.isFinite(weights[i])) return false;
  return true;
}

/** The weight as a literal that reads back as the same double. */
function literal(k: number): string {
  if (!Number.isFinite(k)) throw new RangeError(`kernel weight ${k} is not finite`);
  return Object.is(k, -0) ? '-0' : String(k);
}

/** k·v as written by the general loops, with the multiplications that give the same bits without them left out; k a literal, or the table's local. */
function term(k: number, v: string, table?: WeightTable): string {
  if (k === 1) return v;
  if (k === -1) return `-${v}`;
  if (k === 2) return `(${v} + ${v})`;
  if (k === -2) return `-(${v} + ${v})`;
  return `${table ? table.local(k) : literal(k)} * ${v}`;
}

/**
 * The weights a generated loop multiplies by, one local each, read from an array before the loop.
 * Written as literals in the loop, V8 makes each double again wherever it cannot keep it in a
 * register: its bits into a general register, then into a vector register, two instructions (one on
 * the floating-point units) for a product; a local that does not fit the registers is reloaded from
 * the stack as the product's operand instead. That pays in the symmetric row loop, whose long rows
 * leave no register for a weight (σ = 3, both passes, 5 MP, one CPU, the AMD EPYC, the two versions
 * in turn in one process: 8.09 → 7.72 ns/px, the same bits). Elsewhere it did not: with the column
 * loop's weights named too σ = 3 gained only 8.06 → 7.95, the 5×5 direct kernel went 3.80 → 3.95
 * (with fractions 4.18 → 4.38), and σ = 1 and the LoG did not change.
 */
class WeightTable {
  private readonly locals = new Map<string, string>();

  /** The local that holds k (one per distinct value; 0 and −0 apart). */
  local(k: number): string {
    const text = literal(k);
    let name = this.locals.get(text);
    if (!name) {
      name = `w${this.locals.size}`;
      this.locals.set(text, name);
    }
    return name;
  }

  /** Source before the loop's function: the weights' array (none when no weight was named). */
  array(): string {
    return this.locals.size === 0 ? '' : `const W = Float64Array.of(${[...this.locals.keys()].join(', ')});`;
  }

  /** Source at the top of the loop's function: the locals. */
  declarations(): string {
    const names = [...this.locals.values()];
    return names.length === 0 ? '' : `const ${names.map((name, i) => `${name} = W[${i}]`).join(', ')};`;
  }
}

/** Terms added left to right; a negative term subtracted instead (a + (−b) and a − b are the same bits; the negation would cost an instruction). */
function sumOf(terms: readonly string[]): string {
  return terms.reduce((sum, next) => (next.startsWith('-') ? `${sum} - ${next.slice(1)}` : `${sum} + ${next}`));
}

/**
 * The loads and the outputs in the order that keeps the fewest samples alive: each output right
 * after the loads of the samples it is the first to need (output p needs columns up to reach(p)).
 * Loading every sample of an iteration first spilled most of them (5×5: 4.5 against 4.2 ns/px).
 */
function interleaved(loads: readonly { text: string; column: number }[], outputs: readonly string[], reach: (p: number) => number): string {
  const pending = [...loads].sort((a, b) => a.column - b.column);
  const lines: string[] = [];
  let next = 0;
  outputs.forEach((output, p) => {
    while (next < pending.length && pending[next].column <= reach(p)) lines.push(pending[next++].text);
    lines.push(output);
  });
  return lines.join('\n');
}

function compiled<T>(key: string, source: () => string): T {
  const known = cache.get(key);
  if (known) return known as T;
  if (cache.size >= CACHE_SIZE) cache.clear();
  const made = new Function(source())() as T;
  cache.set(key, made);
  return made;
}

/**
 * One output row of a direct correlation: o[base + x] = (Σⱼ Σᵢ k[j][i]·lines[j][x+i])·scale + offset,
 * the lines padded (x + i from 0), each row's taps added left to right and the rows' sums top to
 * bottom, as correlateDirect's general loop adds them.
 */
export type DirectRowLoop = (lines: readonly Float64Array[], o: Float32Array, base: number, w: number, scale: number, offset: number) => void;

/** The direct row loop for this kernel, or null where the general loop is to run; `unscaled` when scale is 1 (x·1 is x: no multiplication). */
export function directRowLoop(weights: ArrayLike<number>, rows: number, cols: number, unscaled: boolean): DirectRowLoop | null {
  if (!enabled || !allFinite(weights) || rows * cols > MOST_GENERATED_TAPS) return null;
  const k = Array.from(weights, (v) => literal(v)).join(',');
  return compiled<DirectRowLoop>(`direct ${rows}x${cols} ${unscaled} ${k}`, () => directSource(weights, rows, cols, unscaled));
}

/** How correlateDirect's general loop groups a kernel row's taps: 1, 3, 5 or 7 in one sum, wider rows in sums of five and then tap by tap. */
function tapGroups(cols: number): number[][] {
  const all = Array.from({ length: cols }, (_, i) => i);
  if (cols === 1 || cols === 3 || cols === 7) return [all];
  const groups: number[][] = [];
  let i = 0;
  for (; i + 4 < cols; i += 5) groups.push(all.slice(i, i + 5));
  for (; i < cols; i++) groups.push([i]);
  return groups;
}

function directSource(weights: ArrayLike<number>, rows: number, cols: number, unscaled: boolean): string {
  const groups = tapGroups(cols);
  const usedRows = Array.from({ length: rows }, (_, j) => j).filter((j) => Array.from({ length: cols }, (_, i) => weights[j * cols + i]).some((v) => v !== 0));
  // Each output's whole sum as one expression (accumulators kept across the rows spilled).
  const step = (pixels: number): string => {
    const loads = new Map<string, number>();
    const outputs: string[] = [];
    for (let p = 0; p < pixels; p++) {
      const sums: string[] = [];
      for (const j of usedRows) {
        for (const group of groups) {
          const taps = group.filter((i) => weights[j * cols + i] !== 0);
          if (taps.length === 0) continue;
          for (const i of taps) loads.set(`const s${j}_${p + i} = L${j}[x + ${p + i}];`, p + i);
          sums.push(sumOf(taps.map((i) => term(weights[j * cols + i], `s${j}_${p + i}`))));
        }
      }
      const total = sums.length === 0 ? '0' : sums.reduce((acc, next) => `(${acc}) + (${next})`);
      outputs.push(`o[base + x + ${p}] = (${total})${unscaled ? '' : ' * scale'} + offset;`);
    }
    return interleaved([...loads].map(([text, column]) => ({ text, column })), outputs, (p) => p + cols - 1);
  };
  return rowFunctionSource('directRow(lines, o, base, w, scale, offset)', usedRows.map((j) => `const L${j} = lines[${j}];`).join('\n'), step);
}

/** A function along a row: the weights' locals and the prologue, then `step(P)` for P outputs at a time and `step(1)` for the last ones. */
function rowFunctionSource(signature: string, prologue: string, step: (pixels: number) => string, table = new WeightTable()): string {
  const P = PIXELS_PER_ITERATION;
  // The steps first: they name the weights the table declares.
  const many = step(P);
  const one = step(1);
  return `${table.array()}
return function ${signature} {
${table.declarations()}
${prologue}
let x = 0;
for (; x + ${P - 1} < w; x += ${P}) {
${many}
}
for (; x < w; x++) {
${one}
}
};`;
}

/**
 * Σ k[r+j]·(a_j + b_j) for a symmetric kernel of radius r, with `pair(j)` the sum of the samples j
 * to either side (j = 0: the centre), grouped as the plain engine's separable loops add: the centre
 * and pairs 1–3, then four pairs at a time, each group summed left to right before it joins the total.
 */
function foldedSum(k: ArrayLike<number>, r: number, centre: string, pair: (j: number) => string, table?: WeightTable): string {
  const groups: string[] = [];
  let group: string[] = [term(k[r], centre, table)];
  for (let j = 1; j <= r; j++) {
    if (j >= 4 && (j - 4) % 4 === 0) {
      groups.push(sumOf(group));
      group = [];
    }
    group.push(term(k[r + j], `(${pair(j)})`, table));
  }
  groups.push(sumOf(group));
  return groups.reduce((total, next) => `(${total}) + (${next})`);
}

/**
 * Output rows y … y+rows−1 of a symmetric column over consecutive image rows: lines[q][pad + x] =
 * Σ k[r+j]·(d[c_q − j·w + x] + d[c_q + j·w + x]) with c_q = centre + q·w, summed as foldedSum.
 */
export type ColumnLoop = (d: Float32Array, centre: number, w: number, lines: readonly Float64Array[], pad: number) => void;

/** The symmetric column loop for these weights (2r+1 of them), or null where the general loops are to run. */
export function symmetricColumnLoop(k: ArrayLike<number>): ColumnLoop | null {
  if (!enabled || !allFinite(k)) return null;
  const r = (k.length - 1) >> 1;
  const key = `column ${Array.from(k, (v) => literal(v)).join(',')}`;
  const R = COLUMN_LOOP_ROWS;
  return compiled<ColumnLoop>(key, () => {
    // Source rows centre − r … centre + R − 1 + r as s0 … s(R − 1 + 2r).
    const loads = Array.from({ length: R + 2 * r }, (_, q) => ({ text: `const s${q} = d[p + ${q - r} * w];`, column: q }));
    const outputs = Array.from({ length: R }, (_, q) => `l${q}[pad + x] = ${foldedSum(k, r, `s${q + r}`, (j) => `s${q + r - j} + s${q + r + j}`)};`);
    const body = [interleaved(loads, outputs, (q) => q + 2 * r)];
    return `return function symmetricColumn(d, centre, w, lines, pad) {
${Array.from({ length: R }, (_, q) => `const l${q} = lines[${q}];`).join('\n')}
for (let x = 0, p = centre; x < w; x++, p++) {
${body.join('\n')}
}
};`;
  });
}

/**
 * One output row of a symmetric row kernel over a padded line (centre of pixel x at line[x + r]):
 * o[base + x] = foldedSum + offset.
 */
export type RowLoop = (line: Float64Array, o: Float32Array, base: number, w: number, offset: number) => void;

/** The symmetric row loop for these weights (2r+1 of them), or null where the general loops are to run. */
export function symmetricRowLoop(k: ArrayLike<number>): RowLoop | null {
  if (!enabled || !allFinite(k)) return null;
  const r = (k.length - 1) >> 1;
  const key = `row ${Array.from(k, (v) => literal(v)).join(',')}`;
  return compiled<RowLoop>(key, () => {
    const table = new WeightTable();
    const step = (pixels: number): string => {
      const loads = Array.from({ length: pixels + 2 * r }, (_, q) => ({ text: `const s${q} = line[x + ${q}];`, column: q }));
      const outputs = Array.from({ length: pixels }, (_, p) => `o[base + x + ${p}] = ${foldedSum(k, r, `s${p + r}`, (j) => `s${p + r - j} + s${p + r + j}`, table)} + offset;`);
      return interleaved(loads, outputs, (p) => p + 2 * r);
    };
    return rowFunctionSource('symmetricRow(line, o, base, w, offset)', '', step, table);
  });
}

/**
 * The running-histogram median's step along a row for one window size (median.ts), x = 1 … w−1:
 * each row of the window drops its left sample and adds the next on the right, then the median m
 * moves until `below` (the count of samples < m) brackets the rank. Returns nothing; writes o.
 */
export type MedianRowLoop = (padded: Int32Array, rowsAt: Int32Array, w: number, hist: Int32Array, o: Float32Array, base: number, m: number, below: number, rank: number) => void;

/** The median step for size × size windows with the window's rows unrolled, or null where the general loop is to run. */
export function histogramMedianRowLoop(size: number): MedianRowLoop | null {
  if (!enabled) return null;
  const known = cache.get(`median ${size}`);
  if (known) return known as MedianRowLoop;
  const loop = compiled<MedianRowLoop>(`median ${size}`, () => {
    const rows = Array.from({ length: size }, (_, j) => j);
    return `return function histogramMedianRow(padded, rowsAt, w, hist, o, base, m, below, rank) {
${rows.map((j) => `const t${j} = rowsAt[${j}];`).join('\n')}
for (let x = 1; x < w; x++) {
${rows.map((j) => `const r${j} = t${j} + x;`).join('\n')}
${rows.map((j) => `const o${j} = padded[r${j} - 1], i${j} = padded[r${j} + ${size - 1}];`).join('\n')}
${rows.map((j) => `hist[o${j}]--; hist[i${j}]++;`).join('\n')}
below += ${rows.map((j) => `((o${j} - m) >> 31) - ((i${j} - m) >> 31)`).join(' + ')};
while (below > rank) below -= hist[--m];
while (below + hist[m] <= rank) below += hist[m++];
o[base + x] = m;
}
};`;
  });
  // A few short rows first, so that the optimising compiler sees every statement with type feedback
  // instead of compiling the first photo's long row on-stack (as median.ts warms its own loop).
  const w = 8;
  const pw = w + size - 1;
  const padded = Int32Array.from({ length: size * pw }, (_, i) => (i * 7) % 11);
  const rowsAt = Int32Array.from({ length: size }, (_, j) => j * pw);
  const hist = new Int32Array(16);
  for (let i = 0; i < 6; i++) {
    hist.fill(0);
    for (let j = 0; j < size; j++) for (let q = 0; q < size; q++) hist[padded[j * pw + q]]++;
    let m = 0;
    let below = 0;
    const rank = (size * size - 1) >> 1;
    while (below + hist[m] <= rank) below += hist[m++];
    loop(padded, rowsAt, w, hist, new Float32Array(w), 0, m, below, rank);
  }
  return loop;
}

/** Σ k[r+j]·pair(j) added left to right from k[r]·centre, one addition per tap pair (the LoG's general loops add so). */
function pairwiseSum(k: ArrayLike<number>, r: number, centre: string, pair: (j: number) => string): string {
  return sumOf([term(k[r], centre), ...Array.from({ length: r }, (_, i) => term(k[r + i + 1], `(${pair(i + 1)})`))]);
}

/**
 * Output rows y … y+COLUMN_LOOP_ROWS−1 of the Laplacian of Gaussian's vertical pass over consecutive
 * image rows: smooth[q] = Σ g·rows and curve[q] = Σ g″·rows from the same loads (laplacian.ts).
 */
export type LogColumnLoop = (d: Float32Array, centre: number, w: number, smooth: readonly Float64Array[], curve: readonly Float64Array[], pad: number) => void;

/** The LoG's vertical loop for these weights (g and g″, symmetric, 2r+1 each), or null where the general loop is to run. */
export function logColumnLoop(g: ArrayLike<number>, g2: ArrayLike<number>): LogColumnLoop | null {
  if (!enabled || !allFinite(g) || !allFinite(g2)) return null;
  const r = (g.length - 1) >> 1;
  const key = `log column ${Array.from(g, literal).join(',')} ${Array.from(g2, literal).join(',')}`;
  return compiled<LogColumnLoop>(key, () => {
    const R = COLUMN_LOOP_ROWS;
    const loads = Array.from({ length: R + 2 * r }, (_, q) => ({ text: `const s${q} = d[p + ${q - r} * w];`, column: q }));
    const outputs = Array.from({ length: R }, (_, q) => {
      const c = q + r;
      const pair = (j: number) => `s${c - j} + s${c + j}`;
      return `m${q}[pad + x] = ${pairwiseSum(g, r, `s${c}`, pair)};\nc${q}[pad + x] = ${pairwiseSum(g2, r, `s${c}`, pair)};`;
    });
    return `return function logColumn(d, centre, w, smooth, curve, pad) {
${Array.from({ length: R }, (_, q) => `const m${q} = smooth[${q}], c${q} = curve[${q}];`).join('\n')}
for (let x = 0, p = centre; x < w; x++, p++) {
${interleaved(loads, outputs, (q) => q + 2 * r)}
}
};`;
  });
}

/** One output row of the LoG's horizontal pass: o[base + x] = g″ across `smooth` + g across `curve` (padded lines, centre of x at x + r). */
export type LogRowLoop = (smooth: Float64Array, curve: Float64Array, o: Float32Array, base: number, w: number) => void;

/** The LoG's horizontal loop for these weights, or null where the general loop is to run. */
export function logRowLoop(g: ArrayLike<number>, g2: ArrayLike<number>): LogRowLoop | null {
  if (!enabled || !allFinite(g) || !allFinite(g2)) return null;
  const r = (g.length - 1) >> 1;
  const key = `log row ${Array.from(g, literal).join(',')} ${Array.from(g2, literal).join(',')}`;
  return compiled<LogRowLoop>(key, () => {
    // Per output: g″c·s + gc·u, then for each distance i the pair (g″ᵢ·(s pair) + gᵢ·(u pair)) added as one term.
    const step = (pixels: number): string => {
      const loads = Array.from({ length: pixels + 2 * r }, (_, q) => ({ text: `const s${q} = smooth[x + ${q}], u${q} = curve[x + ${q}];`, column: q }));
      const outputs = Array.from({ length: pixels }, (_, p) => {
        const c = p + r;
        let total = sumOf([term(g2[r], `s${c}`), term(g[r], `u${c}`)]);
        for (let i = 1; i <= r; i++) total = `(${total}) + (${sumOf([term(g2[r + i], `(s${c - i} + s${c + i})`), term(g[r + i], `(u${c - i} + u${c + i})`)])})`;
        return `o[base + x + ${p}] = ${total};`;
      });
      return interleaved(loads, outputs, (p) => p + 2 * r);
    };
    return rowFunctionSource('logRow(smooth, curve, o, base, w)', '', step);
  });
}

/**
 * One row of the box filter's window sums (smoothing.ts, windowMeans and windowMask): the running
 * sums of the even and odd windows, each step adding (b₀ + b₁) − (a₀ + a₁) as the general loop does,
 * written out for 24 outputs per iteration with the window's size as a literal. The output is the
 * mean, or with `masked` flip ^ (src > fround(mean) − c).
 * With `sliding`, the loop also moves the column sums down for the next row from the values it has
 * just loaded: sums[i] += data[addShift + i] − data[dropShift + i] (the slide's own operation) for
 * i < boxSlidUpTo(w), border entries included (fillRowBorder writes those again); the caller
 * slides the rest.
 */
export type BoxWindowLoop = (
  sums: Float64Array, w: number, scale: number, o: Float32Array, base: number, src: Float32Array, c: number, flip: number,
  data: Float32Array, addShift: number, dropShift: number,
) => void;

/**
 * The same row as a mask in packed bits (binary-morphology.ts, PackedMask): 32 windows per
 * iteration, one word each, flip applied to the whole word; bits past the last column stay 0.
 */
export type BoxBitsLoop = (
  sums: Float64Array, w: number, scale: number, words: Int32Array, wordBase: number, base: number, src: Float32Array, c: number, flip: number,
  data: Float32Array, addShift: number, dropShift: number,
) => void;

/** Windows per iteration of the bits loop: one packed word. */
const BITS_PER_WORD = 32;

/** How many column sums a sliding box window loop moves down: those its full iterations load. */
export function boxSlidUpTo(w: number, bits = false): number {
  return w - (w % (bits ? BITS_PER_WORD : PIXELS_PER_ITERATION));
}

/** The box filter's row loop for this window size, or null where the general loop is to run. */
export function boxWindowLoop(size: number, masked: boolean, sliding = false): BoxWindowLoop | null {
  if (!enabled) return null;
  return compiled<BoxWindowLoop>(`box ${size} ${masked} ${sliding}`, () => boxWindowSource(size, masked ? 'mask' : 'mean', sliding));
}

/** The box threshold's row loop writing packed bits, or null where the float loops are to run. */
export function boxBitsLoop(size: number, sliding: boolean): BoxBitsLoop | null {
  if (!enabled) return null;
  return compiled<BoxBitsLoop>(`box bits ${size} ${sliding}`, () => boxWindowSource(size, 'bits', sliding));
}

/** The source of a box row loop: the means, the mask as float32 samples, or the mask as packed bits. */
function boxWindowSource(size: number, output: 'mean' | 'mask' | 'bits', sliding: boolean): string {
  // Every index is truncated with | 0: a plain sum of int32s may leave the int32 range, so V8 checks
  // each addition for overflow and widens the result; a truncated one is a bare 32-bit add (5 MP, one
  // CPU: box 5 2.58 → 2.32 ns/px, adaptive mean 15 3.06 → 2.90, the same bits). An index past the
  // array still fails its bounds check.
  const at = (offset: string, q: number) => `(${offset} + ${q}) | 0`;
  const above = (p: number, sum: string) => `+(src[${at('base + x', p)}] > Math.fround(${sum} * scale) - c)`;
  // In the tail the bit's place in its word follows x; in the full iterations it is p itself.
  const write = (p: number, sum: string, tail = false) =>
    output === 'bits' ? `word |= ${above(p, sum)} << ${tail ? `(x + ${p} & 31)` : p};`
    : output === 'mask' ? `o[${at('base + x', p)}] = flip ^ ${above(p, sum)};` : `o[${at('base + x', p)}] = ${sum} * scale;`;
  const P = output === 'bits' ? BITS_PER_WORD : PIXELS_PER_ITERATION;
  const body: string[] = output === 'bits' ? ['let word = 0;'] : [];
  const loaded = new Set<number>();
  const sum = (q: number) => {
    if (!loaded.has(q)) {
      loaded.add(q);
      body.push(`const s${q} = sums[${at('x', q)}];`);
    }
    return `s${q}`;
  };
  const slide = (q: number) => `sums[${at('x', q)}] = ${sum(q)} + (data[${at('addShift + x', q)}] - data[${at('dropShift + x', q)}]);`;
  for (let p = 0; p < P; p += 2) {
    body.push(write(p, 'even'), write(p + 1, 'odd'));
    const a0 = sum(p), a1 = sum(p + 1), a2 = sum(p + 2), b0 = sum(p + size), b1 = sum(p + size + 1), b2 = sum(p + size + 2);
    body.push(`even += ${b0} + ${b1} - (${a0} + ${a1});`, `odd += ${b1} + ${b2} - (${a1} + ${a2});`);
    // Entries p and p+1 are read by no later step. The bits loop moves them down here (5 MP, one
    // CPU: adaptive mean 15 3.2 → 3.0 ns/px); the others after the last step (box 5 2.7 at once, 2.5 after).
    if (sliding && output === 'bits') for (const q of [p, p + 1]) body.push(slide(q));
  }
  if (output === 'bits') body.push('o[(wordBase + (x >>> 5)) | 0] = word ^ flipWord;');
  if (sliding && output !== 'bits') for (let q = 0; q < P; q++) body.push(slide(q));
  const bits = output === 'bits';
  return `return function boxWindow(sums, w, scale, o, ${bits ? 'wordBase, ' : ''}base, src, c, flip, data, addShift, dropShift) {
let even = 0;
for (let i = 0; i < ${size}; i++) even += sums[i];
let odd = even + sums[${size}] - sums[0];
${bits ? 'const flipWord = flip ? -1 : 0;' : ''}
let x = 0;
for (; x + ${P - 1} < w; x += ${P}) {
${body.join('\n')}
}
${bits ? 'const tail = x;\nlet word = 0;' : ''}
for (; x + 1 < w; x += 2) {
${write(0, 'even', true)}
${write(1, 'odd', true)}
even += sums[x + ${size}] + sums[x + ${size + 1}] - (sums[x] + sums[x + 1]);
odd += sums[x + ${size + 1}] + sums[x + ${size + 2}] - (sums[x + 1] + sums[x + 2]);
}
if (x < w) {
${write(0, 'even', true)}
}
${bits ? `if (tail < w) o[wordBase + (tail >>> 5)] = word ^ (flip ? (1 << (w - tail)) - 1 : 0);` : ''}
};`;
}

/**
 * The whole words of one row of non-zero bits: bit i of words[out + k] set when the sample at
 * bits[row + 32k + i] is not ±0 (bit patterns, as `sampleBits` gives them), for k < full.
 */
export type NonZeroWordsLoop = (bits: Int32Array, words: Int32Array, row: number, out: number, full: number) => void;

/**
 * The non-zero words' row loop, or null where the general loop is to run. The 32 patterns of a word
 * are loaded once; their OR and AND answer the common words first: none with magnitude bits (all ±0:
 * word 0) or all one non-zero pattern (a mask's run of ones: every bit). The rest set bit i from the
 * sign of 0 − (pattern without its sign bit). 5 MP, one CPU, against one bit per step of a loop:
 * an edge mask 2.2 → 1.4 ns/px, its inverse 2.3 → 1.3, random bits 2.3 → 1.7.
 */
export function nonZeroWordsLoop(): NonZeroWordsLoop | null {
  if (!enabled) return null;
  return compiled<NonZeroWordsLoop>('non-zero words', () => {
    const lanes = wordLanes();
    return `return function nonZeroWords(bits, words, row, out, full) {
for (let k = 0; k < full; k++) {
${wordLoads(lanes)}
const any = ${lanes.map((i) => `v${i}`).join(' | ')};
const all = ${lanes.map((i) => `v${i}`).join(' & ')};
if ((any & 0x7fffffff) === 0) { words[out + k] = 0; continue; }
if (any === all) { words[out + k] = -1; continue; }
let word = 0;
${lanes.map((i) => `word |= ((0 - (v${i} & 0x7fffffff)) >>> 31) << ${i};`).join('\n')}
words[out + k] = word;
}
};`;
  });
}

/**
 * The whole words of one row of a 0/1 mask (bit patterns: +0 is 0, 1.0 is 0x3f800000) from word k0
 * on: bit i of words[out + k] is bit 29 of the pattern at bits[row + 32k + i]. Stops at the first
 * word holding another pattern (−0 included, which the caller compares as a number) and returns
 * its k; returns full when every word up to full is done.
 */
export type MaskWordsLoop = (bits: Int32Array, words: Int32Array, row: number, out: number, k0: number, full: number) => number;

/**
 * The 0/1 mask's packing loop, or null where the general loop is to run: the 32 patterns of a word
 * loaded once, all +0 (word 0) and all 1.0 (every bit) answered from their OR and AND, the rest bit
 * by bit with the check for other patterns. 5 MP, one CPU: opening r = 1 of an edge mask 4.6 → 2.0–2.3 ns/px.
 */
export function maskWordsLoop(oneBits: number): MaskWordsLoop | null {
  if (!enabled) return null;
  return compiled<MaskWordsLoop>(`mask words ${oneBits}`, () => {
    const lanes = wordLanes();
    return `return function maskWords(bits, words, row, out, k0, full) {
for (let k = k0; k < full; k++) {
${wordLoads(lanes)}
const any = ${lanes.map((i) => `v${i}`).join(' | ')};
if (any === 0) { words[out + k] = 0; continue; }
const all = ${lanes.map((i) => `v${i}`).join(' & ')};
if (all === ${oneBits} && any === ${oneBits}) { words[out + k] = -1; continue; }
let word = 0;
let stray = 0;
${lanes.map((i) => `const b${i} = (v${i} >>> 29) & 1; word |= b${i} << ${i}; stray |= v${i} ^ (-b${i} & ${oneBits});`).join('\n')}
if (stray !== 0) return k;
words[out + k] = word;
}
return full;
};`;
  });
}

/** The lanes 0 … 31 of a packed word. */
function wordLanes(): number[] {
  return Array.from({ length: BITS_PER_WORD }, (_, i) => i);
}

/** The packing loops' loads of word k's 32 patterns into v0 … v31 (x0 its first sample). */
function wordLoads(lanes: number[]): string {
  return [`const x0 = row + (k << 5);`, ...lanes.map((i) => `const v${i} = bits[x0 + ${i}];`)].join('\n');
}
