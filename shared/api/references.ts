import { z } from 'zod';
import { codeSchema } from './catalogue';

export const IMAGE_LABELS = ['unlabelled', 'good', 'defective', 'retake'] as const;
export const imageLabelSchema = z.enum(IMAGE_LABELS);
export type ImageLabel = z.infer<typeof imageLabelSchema>;

export const referenceSetSchema = z.object({
  id: z.string(),
  name: z.string(),
  partType: z.string(),
  description: z.string(),
  createdBy: z.string(),
  createdAt: z.string(),
  counts: z.object({ total: z.number(), good: z.number(), defective: z.number(), retake: z.number(), unlabelled: z.number() }),
});
export type ReferenceSet = z.infer<typeof referenceSetSchema>;

export const createReferenceSetRequestSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter a name').max(120),
  partType: codeSchema,
  description: z.string().trim().max(2000).default(''),
});

export const referenceImageSchema = z.object({
  id: z.string(),
  setId: z.string(),
  contentHash: z.string(),
  fileName: z.string(),
  mediaType: z.string(),
  width: z.number(),
  height: z.number(),
  bitDepth: z.number(),
  label: imageLabelSchema,
  defectKind: z.string().nullable(),
  partType: z.string(),
  note: z.string(),
  imageUrl: z.string(),
  thumbnailUrl: z.string().nullable(),
  createdAt: z.string(),
});
export type ReferenceImage = z.infer<typeof referenceImageSchema>;

/** Labels: a defect kind only with "defective". */
export const labelChangeSchema = z
  .strictObject({
    label: imageLabelSchema.optional(),
    defectKind: codeSchema.nullable().optional(),
    note: z.string().trim().max(2000).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Change at least one field' })
  .refine((v) => !(v.defectKind && v.label && v.label !== 'defective'), { message: 'Only a defective part has a defect kind', path: ['defectKind'] });

export const bulkLabelRequestSchema = z.strictObject({
  imageIds: z.array(z.uuid()).min(1, 'Choose at least one image').max(1000),
  change: labelChangeSchema,
});

export const listReferenceImagesQuerySchema = z.strictObject({
  label: imageLabelSchema.optional(),
  defectKind: codeSchema.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(60),
  offset: z.coerce.number().int().min(0).default(0),
});

export const referenceImagePageSchema = z.object({ items: z.array(referenceImageSchema), total: z.number() });

/** One file's outcome in an upload: stored, already in the set, or refused with the reason. */
export const uploadOutcomeSchema = z.discriminatedUnion('status', [
  z.object({ status: z.literal('stored'), fileName: z.string(), image: referenceImageSchema }),
  z.object({ status: z.literal('duplicate'), fileName: z.string(), existingImageId: z.string() }),
  z.object({ status: z.literal('refused'), fileName: z.string(), code: z.string(), message: z.string() }),
]);
export type UploadOutcome = z.infer<typeof uploadOutcomeSchema>;
export const uploadResultSchema = z.object({ outcomes: z.array(uploadOutcomeSchema) });
