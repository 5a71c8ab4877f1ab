import 'server-only';
import { createHash, type Hash } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import type { Db } from '../client';
import { auditEvents, runs, traceFileChunkRows, traceFiles, users, type Run } from '../schema';
import { CHUNK_BYTES } from './runs';

/** The run code is already used in that chamber (runs_chamber_code_idx). */
export class RunCodeTakenError extends Error {
  constructor(readonly runCode: string) {
    super(`run code "${runCode}" is already used in this chamber`);
  }
}

/**
 * Writes an uploaded trace into trace_file_chunks as its bytes arrive, in slices of CHUNK_BYTES,
 * inside the upload's transaction; the file row exists from the first byte (run_id still null)
 * and is tied to its run by `attach`. At most one slice is held in memory.
 */
export class TraceWriter {
  private fileId = 0;
  private seq = 0;
  private pending: Buffer[] = [];
  private pendingBytes = 0;
  private hash: Hash = createHash('sha256');
  byteSize = 0;

  constructor(private readonly tx: Db) {}

  async begin(fileName: string): Promise<void> {
    const [file] = await this.tx
      .insert(traceFiles)
      .values({ fileName, byteSize: 0, sha256: '', rowCount: 0, columns: [] })
      .returning({ id: traceFiles.id });
    this.fileId = file.id;
  }

  async write(chunk: Buffer): Promise<void> {
    this.hash.update(chunk);
    this.byteSize += chunk.byteLength;
    this.pending.push(chunk);
    this.pendingBytes += chunk.byteLength;
    if (this.pendingBytes >= CHUNK_BYTES) await this.flush();
  }

  async flush(): Promise<void> {
    if (this.pendingBytes === 0) return;
    const bytes = this.pending.length === 1 ? this.pending[0] : Buffer.concat(this.pending, this.pendingBytes);
    this.pending = [];
    this.pendingBytes = 0;
    await this.tx.insert(traceFileChunkRows).values({ traceFileId: this.fileId, seq: this.seq++, bytes });
  }

  /** Stores the run and ties the file to it, with the audit entry. Throws RunCodeTakenError on a repeated code. */
  async attach(input: {
    designRevisionId: number;
    chamberId: number;
    runCode: string;
    shift: string | null;
    operatorName: string | null;
    startedAt: Date | null;
    uploadedBy: number | null;
    tokenId: number | null;
    fileName: string;
    rowCount: number;
    columns: string[];
    meta: Record<string, string>;
  }): Promise<{ run: Run; sha256: string }> {
    await this.flush();
    const sha256 = this.hash.digest('hex');
    const [taken] = await this.tx
      .select({ id: runs.id })
      .from(runs)
      .where(sql`${runs.chamberId} = ${input.chamberId} and ${runs.runCode} = ${input.runCode}`);
    if (taken) throw new RunCodeTakenError(input.runCode);
    const operatorName = input.operatorName?.trim() || null;
    const [operator] = operatorName
      ? await this.tx.select({ id: users.id }).from(users).where(sql`lower(${users.name}) = lower(${operatorName})`).limit(1)
      : [];
    let run: Run;
    try {
      [run] = await this.tx
        .insert(runs)
        .values({
          designRevisionId: input.designRevisionId,
          chamberId: input.chamberId,
          runCode: input.runCode,
          shift: input.shift,
          operatorId: operator?.id ?? null,
          operatorName,
          startedAt: input.startedAt,
          uploadedBy: input.uploadedBy,
        })
        .returning();
    } catch (err) {
      // Two uploads of one code at once: the unique index decides.
      if ((err as { code?: string }).code === '23505' || (err as { cause?: { code?: string } }).cause?.code === '23505') throw new RunCodeTakenError(input.runCode);
      throw err;
    }
    await this.tx
      .update(traceFiles)
      .set({ runId: run.id, byteSize: this.byteSize, sha256, rowCount: input.rowCount, columns: input.columns, meta: input.meta })
      .where(eq(traceFiles.id, this.fileId));
    await this.tx.insert(auditEvents).values({
      actorId: input.uploadedBy,
      action: 'run.uploaded',
      targetType: 'run',
      targetId: String(run.id),
      detail: { runCode: run.runCode, file: input.fileName, bytes: this.byteSize, ...(input.tokenId ? { chamberToken: input.tokenId } : {}) },
    });
    return { run, sha256 };
  }
}
