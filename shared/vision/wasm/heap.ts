// The engine's WebAssembly memory, managed from JavaScript: image buffers and per-call scratch are
// blocks of it. A block freed is reused by the next request of the same size (a station does not
// change its camera between photos); when no block is in use the whole heap starts again from its base.
import { WASM_PAGE_BYTES, type WasmMemory } from './webassembly';

const ALIGNMENT = 16;
/** Spare bytes after every block, so that a v128 load at the last sample never leaves the memory. */
const SLACK = 16;

export class WasmHeap {
  private top: number;
  private readonly sizes = new Map<number, number>();
  private readonly freeBySize = new Map<number, number[]>();
  private readonly live = new Set<number>();

  constructor(readonly memory: WasmMemory, private readonly base: number) {
    this.top = base;
  }

  /** Address of a block of at least `bytes` bytes, 16-aligned; grows the memory when needed. */
  alloc(bytes: number): number {
    const size = Math.ceil((bytes + SLACK) / ALIGNMENT) * ALIGNMENT;
    const reused = this.freeBySize.get(size)?.pop();
    const address = reused ?? this.bump(size);
    this.live.add(address);
    return address;
  }

  release(address: number): void {
    if (!this.live.delete(address)) throw new Error(`no block in use at ${address}`);
    if (this.live.size === 0) {
      this.top = this.base;
      this.sizes.clear();
      this.freeBySize.clear();
      return;
    }
    const size = this.sizes.get(address)!;
    const list = this.freeBySize.get(size);
    if (list) list.push(address);
    else this.freeBySize.set(size, [address]);
  }

  /** A view of `length` float32 at the address (views end when the memory grows: take a new one after an alloc). */
  f32(address: number, length: number): Float32Array {
    return new Float32Array(this.memory.buffer, address, length);
  }

  i32(address: number, length: number): Int32Array {
    return new Int32Array(this.memory.buffer, address, length);
  }

  /** Copies values into a new block of float32 and returns its address. */
  f32Block(values: ArrayLike<number>): number {
    const address = this.alloc(4 * values.length);
    this.f32(address, values.length).set(values);
    return address;
  }

  inUse(address: number): boolean {
    return this.live.has(address);
  }

  get blocksInUse(): number {
    return this.live.size;
  }

  /** Bytes the memory holds (it never shrinks). */
  get memoryBytes(): number {
    return this.memory.buffer.byteLength;
  }

  private bump(size: number): number {
    const address = this.top;
    const end = address + size;
    const have = this.memory.buffer.byteLength;
    if (end > have) {
      try {
        this.memory.grow(Math.ceil((end - have) / WASM_PAGE_BYTES));
      } catch {
        throw new RangeError(`the engine's WebAssembly memory cannot grow to ${Math.ceil(end / 1048576)} MB`);
      }
    }
    this.top = end;
    this.sizes.set(address, size);
    return address;
  }
}
