// Image buffers reused from one run to the next. A 5 MP float32 image is 20 MB: allocating it
// costs page faults and garbage-collection pressure that can exceed the filtering itself, so a
// batch (a trial, a worker thread, the preview) keeps a few spare buffers of the last image size.
// With the SIMD engine the buffers live in its WebAssembly memory, where the kernels work in place.
// Either engine's buffers may hold a mask in packed bits until it is read (deferrable-image.ts).
import type { PackedMask } from './binary-morphology';
import { createPackedMask, DeferrableImage } from './deferrable-image';
import { simdKernels } from './engine';
import { createImage, type Image } from './image';
import { isResident, ResidentImage } from './wasm/resident-image';

/** Spare buffers kept at most; a run of the standard pipeline needs two intermediates. */
const DEFAULT_SPARE_LIMIT = 4;

export class ImageWorkspace {
  private spare: Image[] = [];
  private packed: PackedMask | null = null;

  constructor(private readonly spareLimit = DEFAULT_SPARE_LIMIT) {}

  /** An image of this size, where the active engine computes; its previous contents are undefined (every step overwrites its output). */
  take(width: number, height: number): Image {
    const simd = simdKernels();
    const pixels = width * height;
    // width × height, not data.length: reading a deferred mask's data would write its samples.
    const index = this.spare.findIndex((b) => (simd ? simd.owns(b) : !isResident(b)) && b.width * b.height === pixels);
    if (index >= 0) {
      const [image] = this.spare.splice(index, 1);
      const ready = image.width === width && image.height === height && (simd !== null || image instanceof DeferrableImage);
      return ready ? image : reshape(image, width, height);
    }
    return simd ? simd.takeImage(width, height) : new DeferrableImage(width, height, new Float32Array(pixels));
  }

  /**
   * A packed mask of this size for the steps that hand a mask over in packed bits, the same one run
   * after run: its words are undefined (every writer sets all of them). A fresh one per run costs
   * more than the step that fills it (0.6 MB at 5 MP: new pages, then garbage).
   */
  packedMask(width: number, height: number): PackedMask {
    if (this.packed?.width !== width || this.packed.height !== height) this.packed = createPackedMask(width, height);
    return this.packed;
  }

  /** Hands a buffer back; the caller must not use the image afterwards. Detached buffers are ignored. */
  give(image: Image): void {
    if (isResident(image) || image instanceof DeferrableImage) image.discard();
    if (this.spare.some((b) => sameBuffer(b, image))) return;
    if (!isResident(image) && image.data.length === 0) return;
    // Keep the buffers of the latest size only: a station does not change its camera between photos.
    if (this.spare.length > 0 && this.spare[0].width * this.spare[0].height !== image.width * image.height) this.dispose();
    if (this.spare.length < this.spareLimit) this.spare.push(image);
    else free(image);
  }

  /**
   * An image in ordinary memory with the same samples, its samples written (for results that leave
   * the workspace): a resident image is copied out and its buffer handed back, a plain workspace
   * image becomes an ordinary one on the same buffer, any other image is returned as it is.
   */
  detach(image: Image): Image {
    if (image instanceof DeferrableImage) return createImage(image.width, image.height, image.data);
    if (!isResident(image)) return image;
    const copy = createImage(image.width, image.height, image.data.slice());
    this.give(image);
    return copy;
  }

  /** Lets go of every spare buffer (those in the engine's WebAssembly memory return to it). */
  dispose(): void {
    for (const image of this.spare) free(image);
    this.spare = [];
  }

  get spareCount(): number {
    return this.spare.length;
  }
}

/** True when two images hold their samples in the same buffer (resident ones compared by address: their `data` would drop an 8-bit copy). */
export function sameBuffer(a: Image, b: Image): boolean {
  if (isResident(a) || isResident(b)) return isResident(a) && isResident(b) && a.heap === b.heap && a.address === b.address;
  return a.data === b.data;
}

function free(image: Image): void {
  if (!isResident(image)) return;
  image.discard();
  if (image.heap.inUse(image.address)) image.heap.release(image.address);
}

/** The same buffer seen with another width and height of the same pixel count. */
function reshape(image: Image, width: number, height: number): Image {
  if (isResident(image)) return new ResidentImage(image.heap, image.address, width, height);
  return new DeferrableImage(width, height, image.data);
}
