// edge-fraction reads float32 bit patterns; it must count exactly the pixels that are not 0 as
// numbers (DESIGN.md, gauges: "share of region pixels that are 1 in a mask", non-zero counted).
import fc from 'fast-check';
import { measurePixels, regionSpans } from '../../../shared/vision/gauges';
import { imageFromSamples } from '../../../shared/vision/image';

test('the share counts every non-zero value (−0 is zero, NaN is not) inside the region', () => {
  const sample = fc.constantFrom(0, -0, 1, NaN, 0.5, -3, 1e-30, Infinity);
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 30 }).chain((w) =>
        fc.integer({ min: 1, max: 10 }).chain((h) => fc.array(sample, { minLength: w * h, maxLength: w * h }).map((v) => ({ w, h, v }))),
      ),
      fc.record({ x: fc.double({ min: 0, max: 0.5, noNaN: true }), y: fc.double({ min: 0, max: 0.5, noNaN: true }), w: fc.double({ min: 0.1, max: 0.5, noNaN: true }), h: fc.double({ min: 0.1, max: 0.5, noNaN: true }) }),
      ({ w, h, v }, rect) => {
        const spans = regionSpans(w, h, { shape: 'rect', ...rect });
        let n = 0;
        let set = 0;
        for (let y = 0; y < h; y++) {
          for (let x = spans.start[y]; x < spans.end[y]; x++) {
            n++;
            if (Math.fround(v[y * w + x]) !== 0) set++;
          }
        }
        const share = measurePixels(imageFromSamples(w, h, v), 'edge-fraction', spans);
        if (n === 0) expect(share).toBeNaN();
        else expect(share).toBe(set / n);
      },
    ),
    { numRuns: 300 },
  );
});
