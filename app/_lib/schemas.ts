import { z } from 'zod';
import { roles } from '@/db/schema';

export const emailField = z
  .string()
  .trim()
  .min(1, 'Enter an e-mail address.')
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email('That is not an e-mail address.'))
  .transform((s) => s.toLowerCase());

/**
 * bcrypt reads only the first 72 bytes of a password (Provos and Mazières, "A Future-Adaptable
 * Password Scheme", 1999, §6; bcryptjs does the same), so a longer one would be cut silently:
 * refuse it at the field, counting UTF-8 bytes, not characters.
 */
export const PASSWORD_MAX_BYTES = 72;
export const TOO_LONG_PASSWORD = `Use at most ${PASSWORD_MAX_BYTES} bytes: ${PASSWORD_MAX_BYTES} plain letters, digits or symbols; accented letters and other scripts take 2 to 4 bytes each.`;

/** Common practice: length beats composition rules; ask for 10+ characters with a non-letter. */
export const newPasswordField = z
  .string()
  .min(10, 'Use at least 10 characters.')
  .refine((s) => Buffer.byteLength(s, 'utf8') <= PASSWORD_MAX_BYTES, TOO_LONG_PASSWORD)
  .refine((s) => /[^A-Za-z]/.test(s), 'Add at least one digit or symbol.')
  .refine((s) => new Set(s).size >= 5, 'Use more varied characters.');

export const signInSchema = z.object({
  email: emailField,
  // Longer than bcrypt reads: no stored password can match it (see PASSWORD_MAX_BYTES), so it
  // goes on as a wrong guess rather than being cut to 72 bytes and compared.
  password: z.string().min(1, 'Enter your password.'),
});

/**
 * A person's name on one line: letters and combining marks of any script, digits, spaces and
 * . , ’ ' - ( ). No control, format (bidirectional, zero-width), separator or other characters,
 * so a name cannot carry a line break, reorder text or hide a link into the invitation mail.
 */
const NAME_PATTERN = /^[\p{L}\p{M}\p{N} .,'’()-]+$/u;
export const personNameField = z
  .string()
  .transform((s) => s.normalize('NFC').replace(/ {2,}/g, ' ').trim())
  .pipe(
    z
      .string()
      .min(2, { error: 'Enter the person’s name.', abort: true })
      .max(120, { error: 'That name is too long.', abort: true })
      .regex(NAME_PATTERN, 'Use one line of letters, digits, spaces and . , ’ \' - ( ) only.'),
  );

export const inviteSchema = z.object({
  email: emailField,
  name: personNameField,
  role: z.enum(roles, { error: 'Choose a role.' }),
});

/** Ids are PostgreSQL `integer`s: anything past 2³¹ − 1 is no id of ours (and would be a database error). */
export const idField = z.coerce
  .number({ error: 'Not a valid id.' })
  .int('Not a valid id.')
  .positive('Not a valid id.')
  .max(2147483647, 'Not a valid id.');

export const changeRoleSchema = z.object({
  userId: idField,
  role: z.enum(roles, { error: 'Choose a role.' }),
});

export const userIdSchema = z.object({ userId: idField });

export const setActiveSchema = z.object({ userId: idField, active: z.enum(['true', 'false'], { error: 'Say whether the account is to be active.' }).transform((v) => v === 'true') });

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

/** A checkbox: present ("on") when ticked, absent otherwise. */
const checkbox = z.enum(['on']).optional().transform((v) => v === 'on');

export const alertPreferencesSchema = z.object({
  outOfTolerance: checkbox,
  controlRules: checkbox,
  shiftDigest: checkbox,
});

const noteBody = z.string().trim().min(1, 'Write something first.').max(4000, 'Keep it under 4000 characters.');
const optionalNumber = z.preprocess((v) => (v === '' || v === undefined || v === null ? null : v), z.coerce.number().finite().nullable());

export const annotationSchema = z
  .object({
    runId: idField,
    body: noteBody,
    timeS: optionalNumber.refine((v) => v === null || v >= 0, 'A time into the run, 0 s or later.'),
    layer: optionalNumber.refine((v) => v === null || (Number.isInteger(v) && v >= 1), 'A layer number, 1 or more.'),
  })
  .refine((a) => a.timeS !== null || a.layer !== null, { message: 'Pin the note to a time or a layer.', path: ['timeS'] });

export const commentSchema = z.object({ runId: idField, body: noteBody });

export const noteChangeSchema = z.object({
  runId: idField,
  noteId: idField,
  kind: z.enum(['annotation', 'comment']),
  /** Absent to delete. */
  body: noteBody.optional(),
});

export const dispositionSchema = z.object({
  runId: idField,
  disposition: z.enum(['accepted', 'on_hold', 'rejected'], { error: 'Choose a decision.' }),
  reason: z.string().trim().min(3, 'Give the reason for the decision.').max(2000, 'Keep the reason under 2000 characters.'),
});
export const createChamberTokenSchema = z.object({
  chamberId: idField,
  label: z.string().trim().min(2, 'Say where the token will be used, e.g. “Bay 1 controller PC”.').max(120, 'That label is too long.'),
});

export const chamberTokenIdSchema = z.object({ tokenId: idField });
