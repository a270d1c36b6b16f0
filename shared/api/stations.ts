import { z } from 'zod';
import { codeSchema } from './catalogue';

export const stationSchema = z.object({
  id: z.string(),
  lineId: z.string(),
  lineName: z.string(),
  name: z.string(),
  cameraNote: z.string(),
  mmPerPx: z.number().nullable(),
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

/** Calibration from a photo of a target of known size: two edges a known distance apart. */
export const calibrationRequestSchema = z.strictObject({
  referenceLengthMm: z.number().positive('Enter the target’s length in mm').max(10_000),
  distancePx: z.number().positive('Mark two edges at least a pixel apart').max(100_000),
});
