import { z } from 'zod';
import { roles } from '@/db/schema';

export const emailField = z
  .string()
  .trim()
  .min(1, 'Enter an e-mail address.')
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email('That is not an e-mail address.'))
  .transform((s) => s.toLowerCase());

/** Common practice: length beats composition rules; ask for 10+ characters with a non-letter. */
export const newPasswordField = z
  .string()
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.')
  .refine((s) => /[^A-Za-z]/.test(s), 'Add at least one digit or symbol.')
  .refine((s) => new Set(s).size >= 5, 'Use more varied characters.');

export const signInSchema = z.object({
  email: emailField,
  password: z.string().min(1, 'Enter your password.'),
});

export const inviteSchema = z.object({
  email: emailField,
  name: z.string().trim().min(2, 'Enter the person’s name.').max(120, 'That name is too long.'),
  role: z.enum(roles, { error: 'Choose a role.' }),
});

export const changeRoleSchema = z.object({
  userId: z.coerce.number().int().positive(),
  role: z.enum(roles, { error: 'Choose a role.' }),
});

export const userIdSchema = z.object({ userId: z.coerce.number().int().positive() });

export const resetRequestSchema = z.object({ email: emailField });

export const setPasswordSchema = z
  .object({
    token: z.string().min(20, 'This link is incomplete. Open the link from the e-mail again.'),
    password: newPasswordField,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });

export const changePasswordSchema = z
  .object({
    current: z.string().min(1, 'Enter your current password.'),
    password: newPasswordField,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' })
  .refine((v) => v.password !== v.current, { path: ['password'], message: 'Choose a password different from the current one.' });

export const createChamberTokenSchema = z.object({
  chamberId: z.coerce.number({ error: 'Choose a chamber.' }).int().positive('Choose a chamber.'),
  label: z.string().trim().min(2, 'Say where the token will be used, e.g. “Bay 1 controller PC”.').max(120, 'That label is too long.'),
});

export const chamberTokenIdSchema = z.object({ tokenId: z.coerce.number().int().positive() });
