// The parts of the WebAssembly JavaScript interface the engine uses, typed here because the
// server's TypeScript settings carry no DOM library. Absent where the runtime has no WebAssembly.
export interface WasmMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}

export interface WasmInstance {
  readonly exports: Record<string, unknown>;
}

interface WebAssemblyApi {
  validate(bytes: Uint8Array): boolean;
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => WasmInstance;
  instantiate(bytes: Uint8Array, imports: object): Promise<{ instance: WasmInstance }>;
}

export function webAssembly(): WebAssemblyApi | null {
  return (globalThis as { WebAssembly?: WebAssemblyApi }).WebAssembly ?? null;
}

export const WASM_PAGE_BYTES = 65536;
