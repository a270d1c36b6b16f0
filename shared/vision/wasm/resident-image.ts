// An image whose samples live in the engine's WebAssembly memory, so that the SIMD kernels read and
// write it in place. `data` is a view of that memory, renewed when the memory has grown (growing
// replaces the memory's buffer and empties older views).
// A mask written by the packed-bit morphology may keep its samples in packed bits (one bit per
// pixel) until something reads them: the edge fraction and the blobs read the bits themselves, so
// a rule run whose last step is such a mask never writes its float32 samples (20 MB at 5 MP).
// A photo's input image may likewise wait for its samples when the first step reads the photo itself.
// An 8-bit grey photo's input image also keeps the photo's bytes beside its samples (`eightBit`), for
// the kernels that can read them (a quarter of the memory traffic): until the image is overwritten,
// given back, or its `data` is handed out (whoever holds the array may write it).
import type { Image } from '../image';
import type { WasmHeap } from './heap';

/** Samples not written yet, held as packed bits (32 pixels per int32, row by row) in a heap block. */
export interface DeferredMask {
  readonly words: number;
  readonly wordsPerRow: number;
  /** Writes the samples from the bits. */
  unpack(): void;
}

export class ResidentImage implements Image {
  private view: Float32Array;
  private deferred: DeferredMask | null = null;
  private pendingFill: (() => void) | null = null;
  private bytes = 0;

  constructor(
    readonly heap: WasmHeap,
    readonly address: number,
    readonly width: number,
    readonly height: number,
  ) {
    this.view = heap.f32(address, width * height);
  }

  get data(): Float32Array {
    this.settle();
    this.dropEightBit();
    if (this.view.buffer !== this.heap.memory.buffer) this.view = this.heap.f32(this.address, this.width * this.height);
    return this.view;
  }

  /** The packed bits standing for the samples, while they are not written. */
  get packedMask(): DeferredMask | null {
    return this.deferred;
  }

  /** Address of a block of width × height bytes equal to the samples, or 0. */
  get eightBit(): number {
    return this.bytes;
  }

  /** The samples are these bytes (whole numbers 0 … 255); the image owns the block from now on. */
  keepEightBit(address: number): void {
    this.dropEightBit();
    this.bytes = address;
  }

  /** The samples will come from these bits when first read; the image owns the bits' block from now on. */
  defer(mask: DeferredMask): void {
    this.discard();
    this.deferred = mask;
  }

  /** The samples will be written by `fill` (into this image) when first read. */
  fillLater(fill: () => void): void {
    this.discard();
    this.pendingFill = fill;
  }

  /** Writes deferred samples now (before a kernel reads the image's memory). */
  settle(): void {
    const fill = this.pendingFill;
    if (fill) {
      this.pendingFill = null;
      fill();
      return;
    }
    const mask = this.deferred;
    if (!mask) return;
    this.deferred = null;
    mask.unpack();
    this.heap.release(mask.words);
  }

  /** Drops deferred samples unwritten, and the bytes (before the image is overwritten or given up). */
  discard(): void {
    this.pendingFill = null;
    this.dropEightBit();
    const mask = this.deferred;
    if (!mask) return;
    this.deferred = null;
    this.heap.release(mask.words);
  }

  private dropEightBit(): void {
    if (this.bytes === 0) return;
    this.heap.release(this.bytes);
    this.bytes = 0;
  }
}

export function isResident(image: Image): image is ResidentImage {
  return image instanceof ResidentImage;
}
