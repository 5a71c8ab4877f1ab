import { z } from 'zod';

const positive = z.number().refine((v) => Number.isFinite(v) && v > 0, 'must be a finite number > 0');

export const monitorSchema = z
  .object({
    wavelengthNm: positive,
    mode: z.enum(['T', 'R']),
    chip: z.number().int('must be a whole number').min(1, 'must be ≥ 1'),
    cut: z.enum(['turning-point', 'level']),
  })
  .strict();

/** Acceptance limits of a layer, each optional; what is missing comes from the design, then the shop. */
export const toleranceSchema = z
  .object({
    thicknessPct: positive.optional(),
    indexAbs: positive.optional(),
    cutErrorQwotPct: positive.optional(),
  })
  .strict();

export const designLayerSchema = z
  .object({
    material: z.string().min(1, 'must name a material'),
    // Bounds keep a typo from asking the plan for a curve of 10⁹ points; real layers are far thinner.
    thicknessNm: positive.refine((v) => v <= 100_000, 'must be ≤ 100000 nm').optional(),
    qwot: positive.refine((v) => v <= 1000, 'must be ≤ 1000 quarter-waves').optional(),
    monitor: monitorSchema,
    tolerance: toleranceSchema.optional(),
  })
  .strict()
  .superRefine((layer, ctx) => {
    if ((layer.thicknessNm === undefined) === (layer.qwot === undefined)) {
      ctx.addIssue({
        code: 'custom',
        path: [layer.thicknessNm === undefined ? 'thicknessNm' : 'qwot'],
        message: 'give exactly one of "thicknessNm" (physical, nm) or "qwot" (quarter-waves at referenceWavelengthNm)',
      });
    }
  });

/**
 * "fringelog.design/1" as written in a file (shared/FORMATS.md). Material references are
 * checked separately (a string names a built-in material, anything else must be a model) so
 * their messages name the exact key.
 */
export const designFileSchema = z
  .object({
    format: z.literal('fringelog.design/1', { error: 'must be "fringelog.design/1"' }),
    name: z.string().optional(),
    description: z.string().optional(),
    notes: z.string().optional(),
    referenceWavelengthNm: positive,
    ambient: z.unknown().optional(),
    substrate: z.unknown().refine((v) => v !== undefined, 'is required'),
    substrateBackside: z.boolean().optional(),
    materials: z.record(z.string(), z.unknown()).optional(),
    /** Which shop material (by name) each embedded entry of `materials` was copied from, for the record. */
    materialOrigins: z.record(z.string(), z.string()).optional(),
    tolerance: toleranceSchema.optional(),
    layers: z.array(designLayerSchema),
  })
  .strict();

export type DesignFile = z.infer<typeof designFileSchema>;
export type Tolerance = z.infer<typeof toleranceSchema>;
export type MonitorSpec = z.infer<typeof monitorSchema>;
