// NumPy .npy files of step outputs (format version 1.0, numpy/lib/format.py): little-endian
// float32 ('<f4'), C order, shape (height, width), so that engineers can load them with numpy.load.
import type { Image } from '../../shared/vision/image';

const MAGIC = Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]); // \x93NUMPY
/** Header and preamble together are padded to a multiple of 64 bytes, as NumPy writes them. */
const ALIGNMENT = 64;

export function npyFloat32(image: Image): Buffer {
  const dict = `{'descr': '<f4', 'fortran_order': False, 'shape': (${image.height}, ${image.width}), }`;
  const preamble = MAGIC.length + 2 + 2;
  const unpadded = preamble + dict.length + 1;
  const padding = (ALIGNMENT - (unpadded % ALIGNMENT)) % ALIGNMENT;
  const header = dict + ' '.repeat(padding) + '\n';
  const out = Buffer.alloc(preamble + header.length + image.data.length * 4);
  MAGIC.copy(out, 0);
  out[6] = 1; // major version
  out[7] = 0; // minor version
  out.writeUInt16LE(header.length, 8);
  out.write(header, preamble, 'latin1');
  const view = new DataView(out.buffer, out.byteOffset + preamble + header.length, image.data.length * 4);
  for (let p = 0; p < image.data.length; p++) view.setFloat32(p * 4, image.data[p], true);
  return out;
}

export interface NpyArray {
  readonly descr: string;
  readonly fortranOrder: boolean;
  readonly shape: number[];
  readonly data: Float32Array;
}

/** Reads a version 1.0 '<f4' file written by npyFloat32 (or NumPy). */
export function parseNpyFloat32(file: Uint8Array): NpyArray {
  const buf = Buffer.from(file.buffer, file.byteOffset, file.byteLength);
  if (!buf.subarray(0, 6).equals(MAGIC)) throw new Error('not a .npy file (magic string missing)');
  if (buf[6] !== 1) throw new Error(`unsupported .npy version ${buf[6]}.${buf[7]}`);
  const headerLength = buf.readUInt16LE(8);
  const header = buf.subarray(10, 10 + headerLength).toString('latin1');
  const descr = /'descr':\s*'([^']+)'/.exec(header)?.[1] ?? '';
  const fortranOrder = /'fortran_order':\s*True/.test(header);
  const shape = (/'shape':\s*\(([^)]*)\)/.exec(header)?.[1] ?? '').split(',').map((s) => s.trim()).filter(Boolean).map(Number);
  if (descr !== '<f4') throw new Error(`expected '<f4' data, found '${descr}'`);
  const count = shape.reduce((a, b) => a * b, 1);
  const view = new DataView(buf.buffer, buf.byteOffset + 10 + headerLength, count * 4);
  const data = new Float32Array(count);
  for (let p = 0; p < count; p++) data[p] = view.getFloat32(p * 4, true);
  return { descr, fortranOrder, shape, data };
}
