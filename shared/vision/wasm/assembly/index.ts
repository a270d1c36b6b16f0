// The engine's WebAssembly SIMD kernels (built by scripts/build-wasm.mjs into
// shared/vision/wasm/module.generated.ts). Every function works on addresses in the module's
// memory, which shared/vision/wasm/heap.ts manages from the JavaScript side.
export { separable, laplacianOfGaussian, separableScratchBytes, separableBytes, separableBytesScratchBytes } from './separable';
export { correlate2d, directScratchBytes } from './direct';
export { correlateFft, fftScratchBytes, largestFiniteMagnitude } from './fft';
export { gradient, gradientScratchBytes } from './gradient';
export { smoothedGradient, smoothedGradientScratchBytes, smoothedGradientBytes, smoothedGradientBytesScratchBytes } from './smoothed-gradient';
export { eightBitLevels, valueRange, histogram, histogramScratchBytes, thresholdAt, thresholdAtPacked, thresholdBinsPacked } from './threshold';
export { extreme, extremeScratchBytes, extremeBytes, extremeBytesScratchBytes, packMask, unpackMask, packedExtreme, packedScratchBytes } from './morphology';
export { packNonZero, countSetBits } from './blobs';
export { qualitySums, qualitySumsWhole8, countNonZero, regionSums, regionSquares, wideRingBytes } from './statistics';
export { lumaRgb8, bytesToFloats } from './channels';
export { lumaRgb8Quality, grey8Quality } from './input-quality';
export { box, boxScratchBytes } from './box';
export { median, medianScratchBytes, medianBytes, medianBytesScratchBytes } from './median';
export { shrinkMeans, greyRgb, firstExtreme } from './evidence';
export { medianHistogram, medianHistogramScratchBytes } from './median-histogram';
export { setReadAhead } from './border';

/** First address the JavaScript side may use: static data ends below it. */
export function heapBase(): usize {
  return __heap_base;
}
