/**
 * What a client may ask of a measurement: the same requests for the browser worker and for
 * `POST /api/uploads/:id/fit`. One schema for both.
 */
import { z } from 'zod';

const finite = z.number().finite();

export const regionSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('box'), uMin: finite, uMax: finite, vMin: finite, vMax: finite }),
  z.strictObject({ kind: z.literal('polygon'), points: z.array(z.strictObject({ u: finite, v: finite })).min(3).max(2000) }),
]);

const limitsSchema = z
  .strictObject({
    minPoints: z.number().int().min(3).optional(),
    minArcDeg: z.number().min(0).max(360).optional(),
    maxRmsMm: z.number().positive().optional(),
    maxRoundnessMm: z.number().positive().optional(),
    maxOvalityMm: z.number().positive().optional(),
    maxDentMm: z.number().positive().optional(),
  })
  .optional();

const selection = {
  region: regionSchema.optional(),
  /** points of one label of a labelled (probed) file */
  label: z.string().min(1).max(32).optional(),
};

export const fitRequestSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('plane'), thresholdMm: z.number().positive().optional() }),
  z.strictObject({
    kind: z.literal('holes'),
    minDiameterMm: z.number().positive().optional(),
    maxDiameterMm: z.number().positive().optional(),
    limits: limitsSchema,
  }),
  z
    .strictObject({ kind: z.literal('circle'), ...selection, rim: z.enum(['edge', 'all']).optional(), limits: limitsSchema })
    .refine((r) => (r.region === undefined) !== (r.label === undefined), { message: 'give a region (box or lasso) or a label, not both', path: ['region'] }),
  z
    .strictObject({
      kind: z.literal('cylinder'),
      ...selection,
      /** keep only points this far below/above the face (mm along the normal) */
      wMinMm: finite.optional(),
      wMaxMm: finite.optional(),
      /** also use points on the face plane (default: only points off it, i.e. on the bore wall) */
      includeFace: z.boolean().optional(),
    })
    .refine((r) => (r.region === undefined) !== (r.label === undefined), { message: 'give a region (box or lasso) or a label, not both', path: ['region'] }),
]);

export type FitRequest = z.infer<typeof fitRequestSchema>;
export type RegionInput = z.infer<typeof regionSchema>;
