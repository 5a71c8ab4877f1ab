import { z } from 'zod';

const finite = z.number().refine(Number.isFinite, 'must be a finite number');
const positive = finite.refine((v) => v > 0, 'must be > 0');
const nonNegative = finite.refine((v) => v >= 0, 'must be ≥ 0');

/** Optional validity range carried by every model, nm. */
const range = {
  validFromNm: positive.optional(),
  validToNm: positive.optional(),
};

export const constantModelSchema = z
  .object({ model: z.literal('constant'), n: positive, k: nonNegative.optional(), ...range })
  .strict();

/** n = A + B/λ² + C/λ⁴ with λ in µm (shared/FORMATS.md). */
export const cauchyModelSchema = z
  .object({ model: z.literal('cauchy'), A: positive, B: finite, C: finite.optional(), k: nonNegative.optional(), ...range })
  .strict();

/** n² = 1 + Σ Bᵢλ²/(λ² − Cᵢ²), λ and the resonance wavelengths Cᵢ in µm (as Malitson 1965 publishes them). */
export const sellmeierModelSchema = z
  .object({ model: z.literal('sellmeier'), B: z.array(finite).min(1), C: z.array(nonNegative).min(1), ...range })
  .strict()
  .refine((m) => m.B.length === m.C.length, { message: 'B and C must have the same number of terms', path: ['C'] });

/** [wavelengthNm, n, k] rows, strictly increasing in wavelength, interpolated linearly. */
export const tableModelSchema = z
  .object({
    model: z.literal('table'),
    points: z.array(z.tuple([positive, positive, nonNegative])).min(2),
    ...range,
  })
  .strict()
  .superRefine((m, ctx) => {
    for (let i = 1; i < m.points.length; i++) {
      if (!(m.points[i][0] > m.points[i - 1][0])) {
        ctx.addIssue({ code: 'custom', message: 'wavelengths must be strictly increasing', path: ['points', i, 0] });
        return;
      }
    }
  });

export const materialModelSchema = z
  .discriminatedUnion('model', [constantModelSchema, cauchyModelSchema, sellmeierModelSchema, tableModelSchema])
  .superRefine((m, ctx) => {
    if (m.validFromNm !== undefined && m.validToNm !== undefined && !(m.validFromNm < m.validToNm)) {
      ctx.addIssue({ code: 'custom', message: 'validFromNm must be below validToNm', path: ['validToNm'] });
    }
  });

export type MaterialModel = z.infer<typeof materialModelSchema>;
