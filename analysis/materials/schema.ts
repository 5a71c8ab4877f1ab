// zod's mini build (the same checks and messages as the classic API, written as functions): the
// analysis is bundled into `analyze`, whose two threads each loaded the classic build's 0.75 MB
// (see zodLocale.ts).
import * as z from 'zod/mini';
import './zodLocale';

const finite = z.number().check(z.refine(Number.isFinite, 'must be a finite number'));
const positive = finite.check(z.refine((v) => v > 0, 'must be > 0'));
const nonNegative = finite.check(z.refine((v) => v >= 0, 'must be ≥ 0'));

/** Optional validity range carried by every model, nm. */
const range = {
  validFromNm: z.optional(positive),
  validToNm: z.optional(positive),
};

export const constantModelSchema = z.strictObject({ model: z.literal('constant'), n: positive, k: z.optional(nonNegative), ...range });

/** n = A + B/λ² + C/λ⁴ with λ in µm (shared/FORMATS.md). */
export const cauchyModelSchema = z.strictObject({ model: z.literal('cauchy'), A: positive, B: finite, C: z.optional(finite), k: z.optional(nonNegative), ...range });

/** n² = 1 + Σ Bᵢλ²/(λ² − Cᵢ²), λ and the resonance wavelengths Cᵢ in µm (as Malitson 1965 publishes them). */
export const sellmeierModelSchema = z
  .strictObject({ model: z.literal('sellmeier'), B: z.array(finite).check(z.minLength(1)), C: z.array(nonNegative).check(z.minLength(1)), ...range })
  .check(z.refine((m) => m.B.length === m.C.length, { message: 'B and C must have the same number of terms', path: ['C'] }));

/** [wavelengthNm, n, k] rows, strictly increasing in wavelength, interpolated linearly. */
export const tableModelSchema = z
  .strictObject({
    model: z.literal('table'),
    points: z.array(z.tuple([positive, positive, nonNegative])).check(z.minLength(2)),
    ...range,
  })
  .check(
    z.superRefine((m, ctx) => {
      for (let i = 1; i < m.points.length; i++) {
        if (!(m.points[i][0] > m.points[i - 1][0])) {
          ctx.addIssue({ code: 'custom', message: 'wavelengths must be strictly increasing', path: ['points', i, 0] });
          return;
        }
      }
    }),
  );

export const materialModelSchema = z
  .discriminatedUnion('model', [constantModelSchema, cauchyModelSchema, sellmeierModelSchema, tableModelSchema])
  .check(
    z.superRefine((m, ctx) => {
      if (m.validFromNm !== undefined && m.validToNm !== undefined && !(m.validFromNm < m.validToNm)) {
        ctx.addIssue({ code: 'custom', message: 'validFromNm must be below validToNm', path: ['validToNm'] });
      }
    }),
  );

export type MaterialModel = z.infer<typeof materialModelSchema>;
