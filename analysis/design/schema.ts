// zod's mini build, as analysis/materials/schema.ts (why: analysis/materials/zodLocale.ts).
import * as z from 'zod/mini';
import '../materials/zodLocale';

const positive = z.number().check(z.refine((v) => Number.isFinite(v) && v > 0, 'must be a finite number > 0'));

export const monitorSchema = z.strictObject({
  wavelengthNm: positive,
  mode: z.enum(['T', 'R']),
  chip: z.number().check(z.int('must be a whole number'), z.minimum(1, 'must be ≥ 1')),
  cut: z.enum(['turning-point', 'level']),
});

/** Acceptance limits of a layer, each optional; what is missing comes from the design, then the shop. */
export const toleranceSchema = z.strictObject({
  thicknessPct: z.optional(positive),
  indexAbs: z.optional(positive),
  cutErrorQwotPct: z.optional(positive),
});

export const designLayerSchema = z
  .strictObject({
    material: z.string().check(z.minLength(1, 'must name a material')),
    // Bounds keep a typo from asking the plan for a curve of 10⁹ points; real layers are far thinner.
    thicknessNm: z.optional(positive.check(z.refine((v) => v <= 100_000, 'must be ≤ 100000 nm'))),
    qwot: z.optional(positive.check(z.refine((v) => v <= 1000, 'must be ≤ 1000 quarter-waves'))),
    monitor: monitorSchema,
    tolerance: z.optional(toleranceSchema),
  })
  .check(
    z.superRefine((layer, ctx) => {
      if ((layer.thicknessNm === undefined) === (layer.qwot === undefined)) {
        ctx.addIssue({
          code: 'custom',
          path: [layer.thicknessNm === undefined ? 'thicknessNm' : 'qwot'],
          message: 'give exactly one of "thicknessNm" (physical, nm) or "qwot" (quarter-waves at referenceWavelengthNm)',
        });
      }
    }),
  );

/**
 * "fringelog.design/1" as written in a file (shared/FORMATS.md). Material references are
 * checked separately (a string names a built-in material, anything else must be a model) so
 * their messages name the exact key.
 */
export const designFileSchema = z.strictObject({
  format: z.literal('fringelog.design/1', { error: 'must be "fringelog.design/1"' }),
  name: z.optional(z.string()),
  description: z.optional(z.string()),
  notes: z.optional(z.string()),
  referenceWavelengthNm: positive,
  ambient: z.optional(z.unknown()),
  substrate: z.unknown().check(z.refine((v) => v !== undefined, 'is required')),
  substrateBackside: z.optional(z.boolean()),
  materials: z.optional(z.record(z.string(), z.unknown())),
  /** Which shop material (by name) each embedded entry of `materials` was copied from, for the record. */
  materialOrigins: z.optional(z.record(z.string(), z.string())),
  tolerance: z.optional(toleranceSchema),
  layers: z.array(designLayerSchema),
});

export type DesignFile = z.infer<typeof designFileSchema>;
export type Tolerance = z.infer<typeof toleranceSchema>;
export type MonitorSpec = z.infer<typeof monitorSchema>;
