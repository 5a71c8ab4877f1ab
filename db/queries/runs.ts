import 'server-only';
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { analyses, auditEvents, chambers, designRevisions, runs, traceFileChunkRows, traceFiles, users, type Run } from '../schema';

export type NewRun = {
  designRevisionId: number;
  chamberId: number;
  runCode: string;
  shift?: string | null;
  /** The operator as the trace names them; linked to a user of that name when there is one. */
  operatorName?: string | null;
  startedAt?: Date | null;
  uploadedBy: number | null;
  trace: {
    fileName: string;
    bytes: Buffer;
    rowCount: number;
    columns: string[];
    meta: Record<string, string>;
  };
};

export type StoredRun = { run: Run; traceFileId: number; sha256: string };

/** Size of the slices a trace file is stored in (trace_file_chunks). */
export const CHUNK_BYTES = 1 << 20;

/** Stores a run, its raw trace file (byte for byte, with its SHA-256) and the audit entry in one transaction. */
export async function createRunWithTrace(input: NewRun, ex: Executor = db()): Promise<StoredRun> {
  const sha256 = createHash('sha256').update(input.trace.bytes).digest('hex');
  return ex.transaction(async (tx) => {
    const operatorName = input.operatorName?.trim() || null;
    const [operator] = operatorName
      ? await tx.select({ id: users.id }).from(users).where(sql`lower(${users.name}) = lower(${operatorName})`).limit(1)
      : [];
    const [run] = await tx
      .insert(runs)
      .values({
        designRevisionId: input.designRevisionId,
        chamberId: input.chamberId,
        runCode: input.runCode,
        shift: input.shift ?? null,
        operatorId: operator?.id ?? null,
        operatorName,
        startedAt: input.startedAt ?? null,
        uploadedBy: input.uploadedBy,
      })
      .returning();
    const [file] = await tx
      .insert(traceFiles)
      .values({
        runId: run.id,
        fileName: input.trace.fileName,
        byteSize: input.trace.bytes.byteLength,
        sha256,
        rowCount: input.trace.rowCount,
        columns: input.trace.columns,
        meta: input.trace.meta,
      })
      .returning({ id: traceFiles.id });
    const bytes = input.trace.bytes;
    for (let seq = 0, at = 0; at < bytes.byteLength; seq++, at += CHUNK_BYTES) {
      await tx.insert(traceFileChunkRows).values({ traceFileId: file.id, seq, bytes: bytes.subarray(at, at + CHUNK_BYTES) });
    }
    await tx.insert(auditEvents).values({
      actorId: input.uploadedBy,
      action: 'run.uploaded',
      targetType: 'run',
      targetId: String(run.id),
      detail: { runCode: run.runCode, file: input.trace.fileName, bytes: input.trace.bytes.byteLength },
    });
    return { run, traceFileId: file.id, sha256 };
  });
}

/**
 * The raw trace file of a run, read back from PostgreSQL one stored slice (trace_file_chunks) at
 * a time, so a large file is never one buffer. Slices are re-cut to chunkBytes when given.
 */
export async function* traceFileChunks(runId: number, chunkBytes?: number, ex: Executor = db()): AsyncGenerator<Uint8Array> {
  const [file] = await ex.select({ id: traceFiles.id }).from(traceFiles).where(eq(traceFiles.runId, runId));
  if (!file) throw new Error(`run ${runId} has no trace file`);
  const seqs = await ex.select({ seq: traceFileChunkRows.seq }).from(traceFileChunkRows).where(eq(traceFileChunkRows.traceFileId, file.id)).orderBy(asc(traceFileChunkRows.seq));
  for (const { seq } of seqs) {
    const [row] = await ex
      .select({ bytes: traceFileChunkRows.bytes })
      .from(traceFileChunkRows)
      .where(and(eq(traceFileChunkRows.traceFileId, file.id), eq(traceFileChunkRows.seq, seq)));
    if (!row) throw new Error(`run ${runId}: trace file vanished while being read`);
    const part = row.bytes;
    if (!chunkBytes) {
      yield new Uint8Array(part.buffer, part.byteOffset, part.byteLength);
      continue;
    }
    for (let at = 0; at < part.byteLength; at += chunkBytes) yield new Uint8Array(part.buffer, part.byteOffset + at, Math.min(chunkBytes, part.byteLength - at));
  }
}

/** What the analysis of a stored run needs: the run, its design revision and its trace file's facts. */
export async function findRunForAnalysis(runId: number, ex: Executor = db()) {
  const [row] = await ex
    .select({
      run: runs,
      revision: designRevisions,
      trace: { fileName: traceFiles.fileName, byteSize: traceFiles.byteSize, rowCount: traceFiles.rowCount },
    })
    .from(runs)
    .innerJoin(designRevisions, eq(designRevisions.id, runs.designRevisionId))
    .innerJoin(traceFiles, eq(traceFiles.runId, runs.id))
    .where(eq(runs.id, runId));
  return row;
}

export type RunListRow = {
  id: number;
  runCode: string;
  designName: string;
  designRevision: number;
  chamberName: string;
  operatorName: string | null;
  shift: string | null;
  startedAt: Date | null;
  status: Run['status'];
  /** State of the newest analysis, any mode. */
  analysisState: 'queued' | 'running' | 'done' | 'failed' | null;
  /** Largest |cut error| (% QWOT) of the newest finished analysis, and its mode. */
  worstCutErrorQwotPct: number | null;
  worstCutMode: 'sequential' | 'refit' | null;
};

const latestDone = sql`(select a.id from ${analyses} a where a.run_id = ${runs.id} and a.state = 'done' order by a.id desc limit 1)`;

/** Every run, newest first, with its design, chamber, latest analysis state and worst |cut error|. */
export async function listRuns(limit = 500): Promise<RunListRow[]> {
  const rows = await db()
    .select({
      id: runs.id,
      runCode: runs.runCode,
      designName: designRevisions.name,
      designRevision: designRevisions.revision,
      chamberName: chambers.name,
      operatorName: sql<string | null>`coalesce(${users.name}, ${runs.operatorName})`,
      shift: runs.shift,
      startedAt: runs.startedAt,
      status: runs.status,
      analysisState: sql<RunListRow['analysisState']>`(select a.state from ${analyses} a where a.run_id = ${runs.id} order by a.id desc limit 1)`,
      worstCutErrorQwotPct: sql<number | null>`(select max(abs(lr.cut_error_qwot_pct)) from layer_results lr where lr.analysis_id = ${latestDone})`,
      worstCutMode: sql<RunListRow['worstCutMode']>`(select a.mode from ${analyses} a where a.id = ${latestDone})`,
    })
    .from(runs)
    .innerJoin(designRevisions, eq(designRevisions.id, runs.designRevisionId))
    .innerJoin(chambers, eq(chambers.id, runs.chamberId))
    .leftJoin(users, eq(users.id, runs.operatorId))
    .orderBy(sql`${runs.startedAt} desc nulls last`, desc(runs.id))
    .limit(limit);
  return rows.map((r) => ({ ...r, worstCutErrorQwotPct: r.worstCutErrorQwotPct === null ? null : Number(r.worstCutErrorQwotPct) }));
}

export async function runExists(runId: number): Promise<boolean> {
  const [row] = await db().select({ id: runs.id }).from(runs).where(eq(runs.id, runId));
  return row !== undefined;
}

/** A run's header facts: design, chamber, operator and trace file (without its bytes). */
export async function findRun(runId: number) {
  const [row] = await db()
    .select({
      run: runs,
      design: { designId: designRevisions.designId, name: designRevisions.name, revision: designRevisions.revision, referenceWavelengthNm: designRevisions.referenceWavelengthNm, layerCount: designRevisions.layerCount },
      chamber: { name: chambers.name, process: chambers.process },
      operatorUserName: users.name,
      trace: { fileName: traceFiles.fileName, byteSize: traceFiles.byteSize, rowCount: traceFiles.rowCount, sha256: traceFiles.sha256, columns: traceFiles.columns },
    })
    .from(runs)
    .innerJoin(designRevisions, eq(designRevisions.id, runs.designRevisionId))
    .innerJoin(chambers, eq(chambers.id, runs.chamberId))
    .leftJoin(users, eq(users.id, runs.operatorId))
    .leftJoin(traceFiles, eq(traceFiles.runId, runs.id))
    .where(eq(runs.id, runId));
  return row;
}
export type RunHeader = NonNullable<Awaited<ReturnType<typeof findRun>>>;
