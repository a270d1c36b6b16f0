// Image buffers reused from one run to the next. A 5 MP float32 image is 20 MB: allocating it
// costs page faults and garbage-collection pressure that can exceed the filtering itself, so a
// batch (a trial, a worker thread) keeps a few spare buffers of the last image size.
import { createImage, type Image } from './image';

/** Spare buffers kept at most; a run of the standard pipeline needs two intermediates. */
const DEFAULT_SPARE_LIMIT = 4;

export class ImageWorkspace {
  private spare: Float32Array[] = [];

  constructor(private readonly spareLimit = DEFAULT_SPARE_LIMIT) {}

  /** An image of this size; its previous contents are undefined (every step overwrites its output). */
  take(width: number, height: number): Image {
    const pixels = width * height;
    const index = this.spare.findIndex((b) => b.length === pixels);
    if (index < 0) return createImage(width, height);
    const [data] = this.spare.splice(index, 1);
    return createImage(width, height, data);
  }

  /** Hands a buffer back; the caller must not use the image afterwards. Detached buffers are ignored. */
  give(image: Image): void {
    const data = image.data;
    if (data.length === 0 || this.spare.includes(data)) return;
    // Keep the buffers of the latest size only: a station does not change its camera between photos.
    if (this.spare.length > 0 && this.spare[0].length !== data.length) this.spare = [];
    if (this.spare.length < this.spareLimit) this.spare.push(data);
  }

  get spareCount(): number {
    return this.spare.length;
  }
}
