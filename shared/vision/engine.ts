// Which engine runs the steps: the WebAssembly SIMD kernels (shared/vision/wasm/) or the plain
// TypeScript path, which stays the reference. 'auto' takes SIMD where WebAssembly SIMD validates
// and plain otherwise; 'simd' and 'plain' force one (the server reads KW_ENGINE, the browser and
// tests call setEngine). Steps without a SIMD kernel run the plain code on the same buffers.
import { instantiateAsync, instantiateSync } from './wasm/loader';
import { chooseReadAhead, type ReadAheadChoice } from './wasm/read-ahead';
import type { SimdKernels } from './wasm/simd-kernels';
import { simdSupported } from './wasm/simd-support';
import { warmUp } from './wasm/warm-up';

export type EngineChoice = 'auto' | 'simd' | 'plain';
export type EngineName = 'simd' | 'plain';

export const ENGINE_CHOICES: readonly EngineChoice[] = ['auto', 'simd', 'plain'];

let choice: EngineChoice = 'auto';
let kernels: SimdKernels | null = null;
/** Why the SIMD kernels cannot run here, once known. */
let unavailable: Error | null = null;
let loading: Promise<SimdKernels | null> | null = null;
/** True once the runtime refused to compile the module synchronously. */
let onlyAsync = false;
let readAhead: ReadAheadChoice | null = null;
/** A choice made elsewhere (another thread's probe), taken at load instead of probing. */
let presetChoice: ReadAheadChoice | null = null;

export function setEngine(next: EngineChoice): void {
  if (!ENGINE_CHOICES.includes(next)) throw new RangeError(`unknown engine "${String(next)}": expected one of ${ENGINE_CHOICES.join(', ')}`);
  choice = next;
}

export function engineChoice(): EngineChoice {
  return choice;
}

/**
 * The SIMD kernels when they are to run, else null (plain path). With 'simd' forced, throws when they
 * cannot run here, or in a browser's main thread before prepareEngine() has finished.
 */
export function simdKernels(): SimdKernels | null {
  if (choice === 'plain') return null;
  if (!kernels && !unavailable && !onlyAsync) loadNow();
  if (kernels) return kernels;
  if (choice === 'simd') throw unavailable ?? new Error('the SIMD engine is still loading: await prepareEngine() first');
  return null;
}

/** The engine the next step will run on. */
export function activeEngine(): EngineName {
  return simdKernels() ? 'simd' : 'plain';
}

/** Loads the SIMD kernels where only asynchronous compilation is allowed (a browser's main thread); resolves to the engine in use. */
export async function prepareEngine(): Promise<EngineName> {
  if (choice !== 'plain' && !kernels && !unavailable) {
    loading ??= instantiateAsync().then(
      (loaded) => (kernels = ready(loaded)),
      (error: unknown) => {
        unavailable = error instanceof Error ? error : new Error(String(error));
        return null;
      },
    );
    await loading;
  }
  return activeEngine();
}

function loadNow(): void {
  if (!simdSupported()) {
    unavailable = new Error('WebAssembly SIMD is not available in this runtime');
    return;
  }
  let loaded: SimdKernels;
  try {
    loaded = instantiateSync();
  } catch (error) {
    // A browser's main thread refuses to compile it synchronously: prepareEngine() loads it.
    if (error instanceof RangeError) onlyAsync = true;
    else unavailable = error instanceof Error ? error : new Error(String(error));
    return;
  }
  try {
    kernels = ready(loaded);
  } catch (error) {
    unavailable = error instanceof Error ? error : new Error(String(error));
  }
}

/** Warms the kernels up, then sets the read-ahead that is faster on this processor (or the preset one). */
function ready(loaded: SimdKernels): SimdKernels {
  warmUp(loaded);
  keepReadAhead(loaded, presetChoice ?? chooseReadAhead(loaded));
  return loaded;
}

function keepReadAhead(loaded: SimdKernels, kept: ReadAheadChoice): void {
  loaded.setReadAhead(kept.readAhead);
  readAhead = kept;
}

/**
 * Takes a read-ahead choice measured in another thread instead of probing at load (now, when the
 * kernels are loaded already). The worker pool's threads start at once, and their probes, each
 * disturbing the other's, chose differently from load to load; the pool's own thread probes alone
 * before they start.
 */
export function presetReadAhead(choice: ReadAheadChoice): void {
  presetChoice = choice;
  if (kernels) keepReadAhead(kernels, choice);
}

/** This thread's read-ahead choice, loading the SIMD kernels to probe when they are not loaded yet; null where they cannot run. */
export function measuredReadAhead(): ReadAheadChoice | null {
  if (!kernels && !unavailable && !onlyAsync) loadNow();
  return kernels ? readAhead : null;
}

/** What the SIMD kernels' load measured of reading ahead (null before they are loaded); for the benchmark. */
export function readAheadChoice(): ReadAheadChoice | null {
  return readAhead;
}
