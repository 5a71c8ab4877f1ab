import { sql } from 'drizzle-orm';
import { boolean, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';

export const roleEnum = pgEnum('role', ['operator', 'engineer', 'supervisor', 'admin']);
export const userStatusEnum = pgEnum('user_status', ['invited', 'active', 'deactivated']);
export const tokenKindEnum = pgEnum('token_kind', ['invite', 'reset']);

export const users = pgTable(
  'users',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    role: roleEnum('role').notNull(),
    status: userStatusEnum('status').notNull().default('invited'),
    passwordHash: text('password_hash'),
    /** Bumped when the password changes: sessions carrying an older version end. */
    sessionVersion: integer('session_version').notNull().default(1),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('users_email_lower_idx').on(sql`lower(${t.email})`)],
);
export type User = typeof users.$inferSelect;
export type Role = (typeof roleEnum.enumValues)[number];
export const roles = roleEnum.enumValues;

export const oneTimeTokens = pgTable(
  'one_time_tokens',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: tokenKindEnum('kind').notNull(),
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text('token_hash').notNull().unique(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('one_time_tokens_user_idx').on(t.userId)],
);
export type OneTimeToken = typeof oneTimeTokens.$inferSelect;

export const signInAttempts = pgTable(
  'sign_in_attempts',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    email: text('email').notNull(),
    succeeded: boolean('succeeded').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sign_in_attempts_email_at_idx').on(t.email, t.at)],
);

export const auditEvents = pgTable(
  'audit_events',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    actorId: integer('actor_id').references(() => users.id, { onDelete: 'set null' }),
    /** e.g. "user.invited", "user.role_changed" */
    action: text('action').notNull(),
    targetType: text('target_type').notNull(),
    targetId: text('target_id'),
    detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({}),
  },
  (t) => [index('audit_events_at_idx').on(t.at)],
);
export type AuditEvent = typeof auditEvents.$inferSelect;

export const chambers = pgTable('chambers', {
  id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
  name: text('name').notNull().unique(),
  process: text('process').notNull(),
  description: text('description').notNull().default(''),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
export type Chamber = typeof chambers.$inferSelect;

/** Messages caught by the local SMTP sink (development and tests). */
export const caughtMail = pgTable('caught_mail', {
  id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  envelopeFrom: text('envelope_from').notNull(),
  envelopeTo: text('envelope_to').array().notNull(),
  subject: text('subject').notNull(),
  textBody: text('text_body').notNull(),
  raw: text('raw').notNull(),
});
export type CaughtMail = typeof caughtMail.$inferSelect;

/** Small key/value facts about this database, e.g. which seed steps have run. */
export const appMeta = pgTable('app_meta', {
  key: text('key').primaryKey(),
  value: text('value').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
