import { z } from 'zod';

const finite = z.coerce.number({ error: 'must be a number' }).finite('must be a finite number');

export const seriesQuery = z
  .object({
    id: z.string().regex(/^[1-9]\d{0,8}$/, 'the run id must be a positive whole number').transform(Number),
    analysis: z.string().regex(/^[1-9]\d{0,8}$/, 'analysis must be a positive whole number').transform(Number).optional(),
    from: finite.optional(),
    to: finite.optional(),
  })
  .refine((q) => (q.from === undefined) === (q.to === undefined), { message: 'give both from and to (seconds), or neither', path: ['from'] })
  .refine((q) => q.from === undefined || q.to === undefined || q.from < q.to, { message: 'from must be before to', path: ['from'] });
