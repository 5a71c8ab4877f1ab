import { z } from 'zod';

const schema = z.object({
  DATABASE_URL: z.string({ error: 'DATABASE_URL is missing (npm start sets it; see README.md)' }).regex(/^postgres(ql)?:\/\//, 'DATABASE_URL must be a postgres:// URL'),
  SESSION_SECRET: z.string({ error: 'SESSION_SECRET is missing (npm start generates one into .data/)' }).min(32, 'SESSION_SECRET must be at least 32 characters'),
  SMTP_URL: z.string({ error: 'SMTP_URL is missing (npm start points it at the local mail sink)' }).regex(/^smtps?:\/\//, 'SMTP_URL must be an smtp:// or smtps:// URL'),
  APP_URL: z.url({ error: 'APP_URL must be the absolute URL the app is served on, e.g. http://localhost:3000' }).default('http://localhost:3000'),
  MAIL_FROM: z.string().default('Fringelog <fringelog@larkspur-optical.example>'),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

/** The validated environment; throws once with one line per problem. */
export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Fringelog configuration is invalid:\n${lines.join('\n')}`);
  }
  cached = parsed.data;
  return cached;
}
