import 'server-only';
import type { AnalysisMode } from '@/analysis/fit';
import { sendAnalysisJob } from '@/db/jobs/queue';
import { createAnalysis } from '@/db/queries/analyses';
import { findChamberByName } from '@/db/queries/chambers';
import { findDesignRevisionByNumber, latestDesignRevision } from '@/db/queries/designs';
import { withTransaction } from '@/db/queries/transaction';
import { RunCodeTakenError, TraceWriter } from '@/db/queries/uploads';
import type { Caller } from '../caller';
import { fieldOrMeta, parseStartedAt, uploadFieldsSchema } from './fields';
import { receiveUpload, UploadRefused } from './receiveUpload';

export const UPLOAD_MODES: readonly AnalysisMode[] = ['sequential', 'refit'];

export type Stored = { run: { id: number; url: string; runCode: string }; analyses: { id: number; mode: AnalysisMode; state: 'queued' }[] };

function unprocessable(field: string, message: string): UploadRefused {
  return new UploadRefused('unprocessable:field', message, { field });
}

/**
 * POST /api/runs after authorization: in one transaction, streams the trace into storage while it
 * is checked, settles the run's fields (sent, else from the trace's metadata), stores the run and
 * queues its analyses (the jobs are written by the same transaction). Any refusal rolls all of it
 * back. Throws UploadRefused, RunCodeTakenError, or ChamberMismatch.
 */
export async function storeUpload(request: Request, caller: Caller, maxBytes: number): Promise<Stored> {
  return withTransaction(async (tx, raw) => {
    const writer = new TraceWriter(tx);
    const got = await receiveUpload(request, { maxBytes, sink: writer });
    const parsed = uploadFieldsSchema.safeParse(got.fields);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const field = String(issue.path[0] ?? 'form');
      throw unprocessable(field, `field "${field}": ${issue.message}`);
    }
    const fields = parsed.data;
    const meta = got.scan.meta;

    const designName = fieldOrMeta(fields, meta, 'design');
    if (!designName) throw unprocessable('design', 'no design: send the field "design" or put a "# design: …" line in the trace');
    const revision = fields.designRevision
      ? await findDesignRevisionByNumber(designName.value, fields.designRevision, tx)
      : await latestDesignRevision(designName.value, tx);
    if (!revision) {
      throw unprocessable('design', fields.designRevision ? `design "${designName.value}" has no revision ${fields.designRevision}` : `no design named "${designName.value}"`);
    }

    const chamberName = fieldOrMeta(fields, meta, 'chamber');
    let chamberId: number;
    if (caller.kind === 'chamber') {
      if (chamberName && chamberName.value !== caller.token.chamberName) throw new ChamberMismatch(chamberName.value, chamberName.from);
      chamberId = caller.token.chamberId;
    } else {
      if (!chamberName) throw unprocessable('chamber', 'no chamber: send the field "chamber" or put a "# chamber: …" line in the trace');
      const chamber = await findChamberByName(chamberName.value, tx);
      if (!chamber) throw unprocessable('chamber', `no chamber named "${chamberName.value}"`);
      chamberId = chamber.id;
    }

    const runCode = fieldOrMeta(fields, meta, 'runCode');
    if (!runCode) throw unprocessable('runCode', 'no run code: send the field "runCode" or put a "# run: …" line in the trace');
    const started = fieldOrMeta(fields, meta, 'startedAt');
    const startedAt = started ? parseStartedAt(started.value) : null;
    if (started && !startedAt) throw unprocessable('startedAt', `"${started.value}" (${started.from === 'field' ? 'field startedAt' : 'the trace\'s "# date:" line'}) is not an ISO 8601 date`);
    if (got.scan.maxLayer > revision.layerCount) {
      throw new UploadRefused('unprocessable:trace', `${got.fileName}: the layer column reaches layer ${got.scan.maxLayer}, beyond the ${revision.layerCount} layers of ${revision.name} revision ${revision.revision}`, { columnName: 'layer' });
    }

    const { run } = await writer.attach({
      designRevisionId: revision.id,
      chamberId,
      runCode: runCode.value,
      shift: fieldOrMeta(fields, meta, 'shift')?.value ?? null,
      operatorName: fieldOrMeta(fields, meta, 'operator')?.value ?? null,
      startedAt,
      uploadedBy: caller.kind === 'user' ? caller.user.id : null,
      tokenId: caller.kind === 'chamber' ? caller.token.tokenId : null,
      fileName: got.fileName,
      rowCount: got.scan.rowCount,
      columns: got.scan.columns,
      meta,
    });
    const analyses: Stored['analyses'] = [];
    for (const mode of UPLOAD_MODES) {
      const a = await createAnalysis({ runId: run.id, mode, settings: { mode }, requestedBy: caller.kind === 'user' ? caller.user.id : null }, tx);
      await sendAnalysisJob(a.id, raw);
      analyses.push({ id: a.id, mode, state: 'queued' });
    }
    return { run: { id: run.id, url: `/runs/${run.id}`, runCode: run.runCode }, analyses };
  });
}

/** A chamber token's upload names another chamber. */
export class ChamberMismatch extends Error {
  constructor(
    readonly named: string,
    readonly from: 'field' | 'trace',
  ) {
    super(`this chamber token is for another chamber than "${named}" (${from === 'field' ? 'field chamber' : 'the trace\'s "# chamber:" line'})`);
  }
}

export { RunCodeTakenError, UploadRefused };
