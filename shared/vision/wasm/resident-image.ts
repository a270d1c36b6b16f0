// An image whose samples live in the engine's WebAssembly memory, so that the SIMD kernels read and
// write it in place. `data` is a view of that memory, renewed when the memory has grown (growing
// replaces the memory's buffer and empties older views).
import type { Image } from '../image';
import type { WasmHeap } from './heap';

export class ResidentImage implements Image {
  private view: Float32Array;

  constructor(
    readonly heap: WasmHeap,
    readonly address: number,
    readonly width: number,
    readonly height: number,
  ) {
    this.view = heap.f32(address, width * height);
  }

  get data(): Float32Array {
    if (this.view.buffer !== this.heap.memory.buffer) this.view = this.heap.f32(this.address, this.width * this.height);
    return this.view;
  }
}

export function isResident(image: Image): image is ResidentImage {
  return image instanceof ResidentImage;
}
