/** Seeded pseudo-random numbers for the demo generator: the same seed always draws the same sequence. */

export interface Random {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number;
  /** Uniform in [min, max). */
  between(min: number, max: number): number;
  /** Integer in [0, n). */
  index(n: number): number;
  /** Standard normal draw (mean 0, standard deviation 1). */
  normal(): number;
  pick<T>(items: readonly T[]): T;
  chance(probability: number): boolean;
}

/** MurmurHash3 32-bit finaliser (fmix32; A. Appleby, MurmurHash3, 2011), used to spread seeds apart. */
export function mixBits(value: number): number {
  let h = value >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** Derives an independent 32-bit seed from a parent seed and any number of integer labels. */
export function deriveSeed(seed: number, ...labels: number[]): number {
  let h = mixBits(seed ^ 0x9e3779b9);
  for (const label of labels) h = mixBits(h ^ Math.imul(label + 1, 0x9e3779b9));
  return h;
}

/** Mulberry32 generator (T. Ettinger, 2017, public domain): 32-bit state, period 2^32. */
export function createRandom(seed: number): Random {
  let state = seed >>> 0;
  let spareNormal: number | undefined;

  const nextUint32 = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  };
  const next = (): number => nextUint32() / 4294967296;

  // Box-Muller transform (G. E. P. Box and M. E. Muller, Ann. Math. Statist. 29(2), 1958).
  const normal = (): number => {
    if (spareNormal !== undefined) {
      const value = spareNormal;
      spareNormal = undefined;
      return value;
    }
    const u = 1 - next();
    const radius = Math.sqrt(-2 * Math.log(u));
    const angle = 2 * Math.PI * next();
    spareNormal = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  };

  return {
    next,
    nextUint32,
    normal,
    between: (min, max) => min + (max - min) * next(),
    index: (n) => Math.floor(next() * n),
    pick: (items) => items[Math.floor(next() * items.length)],
    chance: (probability) => next() < probability,
  };
}

/** Fisher-Yates shuffle (R. A. Fisher and F. Yates, 1938; Durstenfeld's in-place form, CACM 7(7), 1964). */
export function shuffle<T>(items: readonly T[], random: Random): T[] {
  const out = items.slice();
  for (let i = out.length - 1; i > 0; i--) {
    const j = random.index(i + 1);
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** A fixed pseudo-random value in [-1, 1] for an integer lattice point; used for surface grain. */
export function latticeNoise(x: number, y: number, salt: number): number {
  const h = mixBits(Math.imul(x | 0, 0x27d4eb2d) ^ Math.imul(y | 0, 0x165667b1) ^ salt);
  return h / 2147483648 - 1;
}
