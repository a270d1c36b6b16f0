// Benchmark photos generated in memory: a fictional stamped washer on a textured background,
// 8-bit grey, with a few scratches and a burr, so that every step has realistic work to do.
import type { RawPhoto } from '../../shared/vision/image';

export function washerPhoto(width: number, height: number, seed = 7): RawPhoto {
  const samples = new Uint8Array(width * height);
  let state = seed >>> 0;
  const cx = width / 2;
  const cy = height / 2;
  const outer = Math.min(width, height) * 0.4;
  const inner = outer * 0.45;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
      const noise = ((state >>> 24) - 128) / 16;
      const r = Math.hypot(x - cx, y - cy);
      let v = r < outer && r > inner ? 170 : 60 + 20 * Math.sin(x / 37) * Math.cos(y / 53);
      if (Math.abs(x - y * 0.7 - width * 0.1) < 1.5 && r < outer && r > inner) v = 90; // scratch
      if (r > outer && r < outer + 6 && Math.abs(Math.atan2(y - cy, x - cx) - 0.8) < 0.05) v = 165; // burr
      samples[y * width + x] = Math.max(0, Math.min(255, Math.round(v + noise)));
    }
  }
  return { width, height, channels: 1, bitDepth: 8, samples };
}
