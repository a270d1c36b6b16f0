// The plain engine's workspace image. A mask written by the packed-bit morphology may keep its
// samples in packed bits (one bit per pixel) until something reads `data` (a step about to overwrite
// the image drops them unread: imageLike in image.ts): the edge fraction and the
// blobs read the bits themselves, so a run whose last step is such a mask, and whose images stay in
// the workspace, never writes its float32 samples (20 MB at 5 MP). The SIMD engine's counterpart is
// wasm/resident-image.ts.
import type { PackedMask } from './binary-morphology';
import type { Image } from './image';
import { sampleBits } from './ordered-keys';

/** Bit pattern of the float32 value 1 (IEEE 754 binary32). */
export const FLOAT_ONE_BITS = 0x3f800000;

/** An all-zero packed mask of this size, for a step that writes its mask in both forms. */
export function createPackedMask(width: number, height: number): PackedMask {
  const wordsPerRow = (width + 31) >>> 5;
  return { width, height, wordsPerRow, words: new Int32Array(wordsPerRow * height) };
}

export class DeferrableImage implements Image {
  private pending: PackedMask | null = null;
  private own: PackedMask | null = null;

  constructor(
    readonly width: number,
    readonly height: number,
    private readonly samples: Float32Array,
  ) {}

  get data(): Float32Array {
    const mask = this.pending;
    if (mask) {
      this.pending = null;
      unpackMask(mask, this.samples);
    }
    return this.samples;
  }

  /** The packed bits standing for the samples, while they are not written. */
  get packedMask(): PackedMask | null {
    return this.pending;
  }

  /** The samples will come from these bits (a mask of this size) when first read. */
  defer(mask: PackedMask): void {
    this.pending = mask;
  }

  /**
   * Packed storage of this image's size that stays with the image, for a step that writes its mask
   * in bits and then defers to them; reused from one run to the next (its words are undefined).
   */
  ownPackedMask(): PackedMask {
    this.own ??= createPackedMask(this.width, this.height);
    return this.own;
  }

  /** Drops deferred samples unwritten (before the image is overwritten or given up). */
  discard(): void {
    this.pending = null;
  }
}

/** The packed bits an image's samples are waiting in, or null when its samples are written. */
export function pendingMask(image: Image): PackedMask | null {
  return image instanceof DeferrableImage ? image.packedMask : null;
}

/** Writes the mask as float32 0 and 1 through the bit patterns (integer stores, no conversion). */
export function unpackMask(mask: PackedMask, out: Float32Array): void {
  const { width: w, height: h, wordsPerRow, words } = mask;
  const bits = sampleBits(out);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const wordRow = y * wordsPerRow;
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const n = Math.min(32, w - (k << 5));
      const word = words[wordRow + k];
      if (word === 0) {
        bits.fill(0, x0, x0 + n);
      } else {
        for (let i = 0; i < n; i++) bits[x0 + i] = ((word >>> i) & 1) * FLOAT_ONE_BITS;
      }
    }
  }
}
