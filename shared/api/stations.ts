import { z } from 'zod';
import { codeSchema } from './catalogue';

export const stationSchema = z.object({
  id: z.string(),
  lineId: z.string(),
  lineName: z.string(),
  name: z.string(),
  cameraNote: z.string(),
  mmPerPx: z.number().nullable(),
  /** The photo size the scale holds for; null when the calibration did not record it (no size check then). */
  photoWidthPx: z.number().int().nullable(),
  photoHeightPx: z.number().int().nullable(),
  /** Standard uncertainty of one pixel's quantisation, s/√12, in mm. */
  quantisationUncertaintyMm: z.number().nullable(),
  calibratedAt: z.string().nullable(),
  calibratedBy: z.string().nullable(),
  active: z.boolean(),
  /** Codes of the part types inspected here, sorted; empty = not assigned yet (every released rule is offered). */
  partTypes: z.array(z.string()),
});
export type Station = z.infer<typeof stationSchema>;

export const lineSchema = z.object({ id: z.string(), name: z.string(), stations: z.array(stationSchema) });
export type Line = z.infer<typeof lineSchema>;

const name = z.string().trim().min(1, 'Enter a name').max(80, 'Use at most 80 characters');
/** Part type codes from the catalogue; each listed once (whether each exists is checked against the catalogue). */
const partTypes = z
  .array(codeSchema)
  .max(100, 'Assign at most 100 part types')
  .refine((codes) => new Set(codes).size === codes.length, { message: 'Name each part type once' });

export const createLineRequestSchema = z.strictObject({ name });
export const createStationRequestSchema = z.strictObject({
  lineId: z.uuid('Choose a line'),
  name,
  cameraNote: z.string().trim().max(500).default(''),
  partTypes: partTypes.default([]),
});
export const updateStationRequestSchema = z
  .strictObject({ name: name.optional(), cameraNote: z.string().trim().max(500).optional(), active: z.boolean().optional(), partTypes: partTypes.optional() })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one field' });

const photoSidePx = (side: 'width' | 'height') =>
  z.number(`Enter the photos’ ${side} in pixels`).int(`Enter the photos’ ${side} in whole pixels`).positive(`Enter the photos’ ${side} in pixels, at least 1`).max(100_000);

/**
 * Calibration from a photo of a target of known size: two edges a known distance apart, in a photo of
 * the station's size (the scale holds only for photos of that size). The calibration screen always
 * asks for the size.
 */
export const calibrationFormSchema = z.strictObject({
  referenceLengthMm: z.number().positive('Enter the target’s length in mm').max(10_000),
  distancePx: z.number().positive('Mark two edges at least a pixel apart').max(100_000),
  photoWidthPx: photoSidePx('width'),
  photoHeightPx: photoSidePx('height'),
});
/** The API's calibration: older scripts may leave the photo size out (no size check at inspection then). */
export const calibrationRequestSchema = calibrationFormSchema.partial({ photoWidthPx: true, photoHeightPx: true }).superRefine((c, ctx) => {
  // One side alone names no photo size.
  if (c.photoWidthPx === undefined && c.photoHeightPx !== undefined) ctx.addIssue({ code: 'custom', path: ['photoWidthPx'], message: 'Enter the photos’ width in pixels too' });
  if (c.photoHeightPx === undefined && c.photoWidthPx !== undefined) ctx.addIssue({ code: 'custom', path: ['photoHeightPx'], message: 'Enter the photos’ height in pixels too' });
});
export type CalibrationRequest = z.input<typeof calibrationRequestSchema>;
