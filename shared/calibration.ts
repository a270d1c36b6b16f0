// Station calibration and the sampling check (DESIGN.md, "Calibration", "Sampling check").

/** Scale from a reference of known length: s [mm/px] = L_ref [mm] / d [px]. */
export function scaleFromReference(referenceLengthMm: number, distancePx: number): number {
  if (!(referenceLengthMm > 0) || !(distancePx > 0)) throw new RangeError('the reference length and the pixel distance must be positive');
  return referenceLengthMm / distancePx;
}

/**
 * Standard uncertainty of a length from quantisation to one pixel: s/√12, a rectangular
 * distribution of width s (GUM, JCGM 100:2008, §4.3.7 and F.2.2.1).
 */
export function pixelQuantisationUncertaintyMm(mmPerPx: number): number {
  return mmPerPx / Math.sqrt(12);
}

/** The smallest defect must span at least this many pixels: 2 is Nyquist's limit, 3 is common practice. */
export const NYQUIST_MIN_PX = 2;
export const RECOMMENDED_MIN_PX = 3;

export type SamplingVerdict = 'ok' | 'below-recommended' | 'below-nyquist';

export interface SamplingCheck {
  spanPx: number;
  verdict: SamplingVerdict;
  message: string;
}

/** Whether a station's camera can see a defect of the given size at all. */
export function samplingCheck(smallestDefectMm: number, mmPerPx: number, recommendedPx = RECOMMENDED_MIN_PX): SamplingCheck {
  // Rounded to 1e-9 px so that 0.075 mm at 0.025 mm/px counts as the 3 px it is.
  const spanPx = Math.round((smallestDefectMm / mmPerPx) * 1e9) / 1e9;
  const span = spanPx.toFixed(1);
  if (spanPx < NYQUIST_MIN_PX)
    return { spanPx, verdict: 'below-nyquist', message: `A ${smallestDefectMm} mm defect spans ${span} px: fewer than ${NYQUIST_MIN_PX}, so this camera cannot resolve it (Nyquist). Move closer or use a finer camera.` };
  if (spanPx < recommendedPx)
    return { spanPx, verdict: 'below-recommended', message: `A ${smallestDefectMm} mm defect spans ${span} px: fewer than the ${recommendedPx} px common practice asks for; detection will be unreliable.` };
  return { spanPx, verdict: 'ok', message: `A ${smallestDefectMm} mm defect spans ${span} px.` };
}

export interface PhotoSize {
  widthPx: number;
  heightPx: number;
}

/** The photo size a station's scale holds for, or null when its calibration recorded none. */
export function calibratedPhotoSize(station: { photoWidthPx: number | null; photoHeightPx: number | null }): PhotoSize | null {
  return station.photoWidthPx !== null && station.photoHeightPx !== null ? { widthPx: station.photoWidthPx, heightPx: station.photoHeightPx } : null;
}

/** "2592×1944": a photo size as the screens and messages write it. */
export function formatPhotoSize(size: PhotoSize): string {
  return `${size.widthPx}×${size.heightPx}`;
}

/**
 * Why a photo cannot be measured with a station's scale, or null when it can. A scale in mm/px holds
 * only for photos of the size the target was marked in (common practice): a photo of another size
 * did not come from that camera set-up, so it asks for a retake (DESIGN.md, "Image quality gate":
 * size). A calibration that recorded no size checks nothing.
 */
export function photoSizeProblem(photo: PhotoSize, calibratedFor: PhotoSize | null): string | null {
  if (!calibratedFor || (photo.widthPx === calibratedFor.widthPx && photo.heightPx === calibratedFor.heightPx)) return null;
  return `wrong size: the photo is ${formatPhotoSize(photo)} px; this station’s calibration holds for photos of ${formatPhotoSize(calibratedFor)} px`;
}
