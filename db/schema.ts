import { sql } from 'drizzle-orm';
import { boolean, customType, doublePrecision, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';

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
    /** The client address the guess came from (app/_lib/clientAddress.ts), for the per-client limit. */
    client: text('client').notNull().default('unknown'),
    /** Recorded as a failure before the password is checked; set true when it was right. */
    succeeded: boolean('succeeded').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sign_in_attempts_email_at_idx').on(t.email, t.at), index('sign_in_attempts_client_at_idx').on(t.client, t.at)],
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

/** Raw bytes (PostgreSQL bytea) as a Node Buffer. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({
  dataType() {
    return 'bytea';
  },
});

export const designs = pgTable(
  'designs',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    name: text('name').notNull().unique(),
    createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('designs_created_by_idx').on(t.createdBy)],
);
export type DesignRow = typeof designs.$inferSelect;

/** A design as it was at one time; never updated: a change is a new revision. */
export const designRevisions = pgTable(
  'design_revisions',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    designId: integer('design_id')
      .notNull()
      .references(() => designs.id, { onDelete: 'restrict' }),
    revision: integer('revision').notNull(),
    /** The design file ("fringelog.design/1") as uploaded. */
    document: jsonb('document').$type<unknown>().notNull(),
    sourceFileName: text('source_file_name'),
    /** From the parsed document, for lists. */
    name: text('name').notNull(),
    referenceWavelengthNm: doublePrecision('reference_wavelength_nm').notNull(),
    layerCount: integer('layer_count').notNull(),
    createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('design_revisions_design_revision_idx').on(t.designId, t.revision), index('design_revisions_created_by_idx').on(t.createdBy)],
);
export type DesignRevision = typeof designRevisions.$inferSelect;

export const runStatusEnum = pgEnum('run_status', ['uploaded', 'analysed', 'failed']);
export const dispositionEnum = pgEnum('run_disposition', ['accepted', 'on_hold', 'rejected']);

export const runs = pgTable(
  'runs',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    designRevisionId: integer('design_revision_id')
      .notNull()
      .references(() => designRevisions.id, { onDelete: 'restrict' }),
    chamberId: integer('chamber_id')
      .notNull()
      .references(() => chambers.id, { onDelete: 'restrict' }),
    /** The shop's run number as the trace names it, e.g. "B1-0412". */
    runCode: text('run_code').notNull(),
    shift: text('shift'),
    /** The operator as a Fringelog user, when the name in the file matches one. */
    operatorId: integer('operator_id').references(() => users.id, { onDelete: 'set null' }),
    /** The operator as the trace file names them. */
    operatorName: text('operator_name'),
    startedAt: timestamp('started_at', { withTimezone: true }),
    status: runStatusEnum('status').notNull().default('uploaded'),
    disposition: dispositionEnum('disposition'),
    dispositionReason: text('disposition_reason'),
    dispositionBy: integer('disposition_by').references(() => users.id, { onDelete: 'set null' }),
    dispositionAt: timestamp('disposition_at', { withTimezone: true }),
    uploadedBy: integer('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('runs_chamber_code_idx').on(t.chamberId, t.runCode),
    index('runs_design_revision_idx').on(t.designRevisionId),
    index('runs_operator_idx').on(t.operatorId),
    index('runs_uploaded_by_idx').on(t.uploadedBy),
    index('runs_disposition_by_idx').on(t.dispositionBy),
    index('runs_started_at_idx').on(t.startedAt),
  ],
);
export type Run = typeof runs.$inferSelect;

/** The trace file of a run, byte for byte as uploaded. */
export const traceFiles = pgTable(
  'trace_files',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    /** Null only inside the upload's transaction, while the bytes stream in before the run row exists. */
    runId: integer('run_id')
      .unique()
      .references(() => runs.id, { onDelete: 'cascade' }),
    fileName: text('file_name').notNull(),
    byteSize: integer('byte_size').notNull(),
    /** Hex SHA-256 of the bytes. */
    sha256: text('sha256').notNull(),
    rowCount: integer('row_count').notNull(),
    /** Header names as read (lower-cased). */
    columns: text('columns').array().notNull(),
    /** The `# key: value` lines. */
    meta: jsonb('meta').$type<Record<string, string>>().notNull().default({}),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('trace_files_sha256_idx').on(t.sha256)],
);
export type TraceFile = typeof traceFiles.$inferSelect;

/** The bytes of a trace file in order, in slices of about 1 MiB, so no upload or read holds the whole file. */
export const traceFileChunkRows = pgTable(
  'trace_file_chunks',
  {
    traceFileId: integer('trace_file_id')
      .notNull()
      .references(() => traceFiles.id, { onDelete: 'cascade' }),
    seq: integer('seq').notNull(),
    bytes: bytea('bytes').notNull(),
  },
  (t) => [primaryKey({ columns: [t.traceFileId, t.seq] })],
);

/** A chamber's controller PC authenticates with one of these; only the SHA-256 of the token is stored. */
export const chamberTokens = pgTable(
  'chamber_tokens',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    chamberId: integer('chamber_id')
      .notNull()
      .references(() => chambers.id, { onDelete: 'cascade' }),
    label: text('label').notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    /** The token's last four characters, to tell tokens apart in the list. */
    hint: text('hint').notNull(),
    createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /** Written at most once a minute. */
    lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    revokedBy: integer('revoked_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [index('chamber_tokens_chamber_idx').on(t.chamberId), index('chamber_tokens_created_by_idx').on(t.createdBy), index('chamber_tokens_revoked_by_idx').on(t.revokedBy)],
);
export type ChamberToken = typeof chamberTokens.$inferSelect;

export const analysisModeEnum = pgEnum('analysis_mode', ['sequential', 'refit']);
export const analysisStateEnum = pgEnum('analysis_state', ['queued', 'running', 'done', 'failed']);

/** Run-level results of one analysis (analysis/fit AnalysisResult without its layers), arrays as plain numbers. */
export type AnalysisSummary = Record<string, unknown>;

export const analyses = pgTable(
  'analyses',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    runId: integer('run_id')
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    mode: analysisModeEnum('mode').notNull(),
    settings: jsonb('settings').$type<Record<string, unknown>>().notNull().default({}),
    state: analysisStateEnum('state').notNull().default('queued'),
    error: text('error'),
    requestedBy: integer('requested_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    warnings: jsonb('warnings').$type<string[]>().notNull().default([]),
    summary: jsonb('summary').$type<AnalysisSummary>(),
    /** Bumped each time a worker takes the analysis; only the holder of the current attempt may store its result. */
    attempt: integer('attempt').notNull().default(0),
    /** Renewed every few seconds by the worker running it: a running analysis whose beat stops has lost its worker (db/jobs/workerLease.ts). */
    heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }),
    /** Layers whose |cut error| grades outside their tolerance (analysis/design/tolerance.ts); set when done. */
    cutsOutsideTolerance: integer('cuts_outside_tolerance'),
  },
  (t) => [index('analyses_run_idx').on(t.runId, t.mode), index('analyses_requested_by_idx').on(t.requestedBy)],
);
export type Analysis = typeof analyses.$inferSelect;

export const layerResults = pgTable(
  'layer_results',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    analysisId: integer('analysis_id')
      .notNull()
      .references(() => analyses.id, { onDelete: 'cascade' }),
    layer: integer('layer').notNull(),
    material: text('material').notNull(),
    thicknessNm: doublePrecision('thickness_nm').notNull(),
    thicknessSigmaNm: doublePrecision('thickness_sigma_nm').notNull(),
    index: doublePrecision('index').notNull(),
    indexSigma: doublePrecision('index_sigma').notNull(),
    rateNmPerS: doublePrecision('rate_nm_per_s').notNull(),
    cutErrorQwotPct: doublePrecision('cut_error_qwot_pct').notNull(),
    residualRms: doublePrecision('residual_rms').notNull(),
    /** Every other key of the layer's result (analysis/fit LayerResult). */
    detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({}),
  },
  (t) => [uniqueIndex('layer_results_analysis_layer_idx').on(t.analysisId, t.layer)],
);
export type LayerResultRow = typeof layerResults.$inferSelect;

/** Which alert e-mails a user asked for (engineers and supervisors; off until they opt in). */
export const alertPreferences = pgTable('alert_preferences', {
  userId: integer('user_id')
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  /** A finished analysis has a layer beyond its tolerance. */
  outOfTolerance: boolean('out_of_tolerance').notNull().default(false),
  /** A finished analysis completes a Western Electric rule on its chamber's control chart. */
  controlRules: boolean('control_rules').notNull().default(false),
  /** A digest of each shift's runs and flags when the shift ends (db/jobs/shifts.ts). */
  shiftDigest: boolean('shift_digest').notNull().default(false),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
export type AlertPreferences = typeof alertPreferences.$inferSelect;
/**
 * A run's trace as plotted: every sample's time and reading as little-endian float64 in bytea
 * (one row a run, not one a sample), and every 1024th sample's time, so a zoomed window is found
 * and read (substring) without the whole column.
 */
export const runSeries = pgTable('run_series', {
  runId: integer('run_id')
    .primaryKey()
    .references(() => runs.id, { onDelete: 'cascade' }),
  sampleCount: integer('sample_count').notNull(),
  timeS: bytea('time_s').notNull(),
  signal: bytea('signal').notNull(),
  /** Time of samples 0, 1024, 2048, … (float64 LE). */
  timeIndex: bytea('time_index').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
export type RunSeriesRow = typeof runSeries.$inferSelect;

/** One analysis's fitted model at every trace sample (float64 LE, NaN outside fitted layers), and the whole-run overview as plotted. */
export const analysisSeries = pgTable('analysis_series', {
  analysisId: integer('analysis_id')
    .primaryKey()
    .references(() => analyses.id, { onDelete: 'cascade' }),
  model: bytea('model').notNull(),
  /** The decimated whole run: { timeS, signal, model } (model null where none). */
  overview: jsonb('overview').$type<{ timeS: number[]; signal: number[]; model: (number | null)[] }>().notNull(),
});

/** A note pinned to a moment of a run (time_s) or to one of its layers, or both. */
export const runAnnotations = pgTable(
  'run_annotations',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    runId: integer('run_id')
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    timeS: doublePrecision('time_s'),
    layer: integer('layer'),
    body: text('body').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('run_annotations_run_idx').on(t.runId), index('run_annotations_author_idx').on(t.authorId)],
);
export type RunAnnotation = typeof runAnnotations.$inferSelect;

/** The discussion of a run, oldest first. */
export const runComments = pgTable(
  'run_comments',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    runId: integer('run_id')
      .notNull()
      .references(() => runs.id, { onDelete: 'cascade' }),
    authorId: integer('author_id').references(() => users.id, { onDelete: 'set null' }),
    body: text('body').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('run_comments_run_idx').on(t.runId), index('run_comments_author_idx').on(t.authorId)],
);
export type RunComment = typeof runComments.$inferSelect;
/** The shop's own materials (designs name them; a saved design revision carries a copy of the model). */
export const materials = pgTable(
  'materials',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    name: text('name').notNull().unique(),
    /** A material model of shared/FORMATS.md (analysis/materials materialModelSchema). */
    model: jsonb('model').$type<unknown>().notNull(),
    description: text('description').notNull().default(''),
    /** Where the numbers come from (a fit of the shop's runs, a supplier sheet, a paper). */
    source: text('source').notNull().default(''),
    createdBy: integer('created_by').references(() => users.id, { onDelete: 'set null' }),
    updatedBy: integer('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('materials_created_by_idx').on(t.createdBy), index('materials_updated_by_idx').on(t.updatedBy)],
);
export type MaterialRow = typeof materials.$inferSelect;
