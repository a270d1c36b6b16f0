// A minimal PNG writer for tests (PNG specification, W3C Recommendation, 2nd ed. 2003): lets a test
// produce 8- and 16-bit grey, RGB or RGBA files without going through the decoder under test.
import { crc32, deflateSync } from 'node:zlib';

function chunk(type: string, body: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(body.length, 0);
  head.write(type, 4, 'latin1');
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), body])) >>> 0, 0);
  return Buffer.concat([head, body, crc]);
}

/** samples: interleaved, channels 1 (grey), 3 (RGB) or 4 (RGBA), bitDepth 8 or 16 (big-endian in the file). */
export function encodePng(width: number, height: number, channels: 1 | 3 | 4, bitDepth: 8 | 16, samples: ArrayLike<number>): Buffer {
  const bytesPerSample = bitDepth / 8;
  const stride = width * channels * bytesPerSample;
  const raw = Buffer.alloc((stride + 1) * height);
  for (let y = 0; y < height; y++) {
    raw[y * (stride + 1)] = 0; // filter: none
    for (let i = 0; i < width * channels; i++) {
      const v = samples[y * width * channels + i];
      const at = y * (stride + 1) + 1 + i * bytesPerSample;
      if (bitDepth === 16) raw.writeUInt16BE(v, at);
      else raw[at] = v;
    }
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = bitDepth;
  ihdr[9] = channels === 1 ? 0 : channels === 3 ? 2 : 6; // colour type: grey / truecolour / truecolour with alpha
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return Buffer.concat([signature, chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw)), chunk('IEND', Buffer.alloc(0))]);
}
