// The picked photo's brightness as the browser decodes it, so that calibration marks can find the
// target's edges. Only where there is a canvas (the web); elsewhere the marks stay where they are tapped.
import type { GreyImage } from './edgeSnap';

/** BT.601 luma of the decoded RGB samples, the weights the engine uses for `luma` (shared/vision/README.md). */
export async function readPhotoGrey(uri: string): Promise<GreyImage | null> {
  if (typeof document === 'undefined' || typeof window === 'undefined' || !('Image' in window)) return null;
  const image = new window.Image();
  image.src = uri;
  await image.decode();
  const { naturalWidth: width, naturalHeight: height } = image;
  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  const context = canvas.getContext('2d', { willReadFrequently: true });
  if (!context || width === 0 || height === 0) return null;
  context.drawImage(image, 0, 0);
  const rgba = context.getImageData(0, 0, width, height).data;
  const data = new Float32Array(width * height);
  for (let p = 0; p < data.length; p++) data[p] = 0.299 * rgba[4 * p] + 0.587 * rgba[4 * p + 1] + 0.114 * rgba[4 * p + 2];
  return { width, height, data };
}
