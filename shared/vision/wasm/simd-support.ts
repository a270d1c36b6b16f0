// Whether this runtime runs WebAssembly SIMD (128-bit): validates the smallest module that uses a
// v128 instruction, a function returning i32x4.splat(0) (WebAssembly Core Specification 2.0, §5).
import { webAssembly } from './webassembly';

const SIMD_PROBE = new Uint8Array([
  0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00, // magic, version 1
  0x01, 0x05, 0x01, 0x60, 0x00, 0x01, 0x7b, // type section: one function type () → v128
  0x03, 0x02, 0x01, 0x00, // function section: one function of type 0
  0x0a, 0x08, 0x01, 0x06, 0x00, 0x41, 0x00, 0xfd, 0x11, 0x0b, // code: i32.const 0, i32x4.splat, end
]);

export function simdSupported(): boolean {
  const api = webAssembly();
  try {
    return api !== null && api.validate(SIMD_PROBE);
  } catch {
    return false;
  }
}
