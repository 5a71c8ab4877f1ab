import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import { parseDesign } from '../../analysis/design';
import { shopHistory, synthesizeRun, traceCsv, type HistoryRun } from '../../analysis/synth';
import { readTraceText } from '../../analysis/trace';
import type { Executor } from '../client';
import { analyseStoredRun } from '../jobs/analyseStoredRun';
import type { AnalysisMode } from '../queries/analyses';
import { findChamberByName } from '../queries/chambers';
import { createDesignRevision, latestDesignRevision } from '../queries/designs';
import { createRunWithTrace } from '../queries/runs';
import { findUserIdByEmail } from '../queries/users';
import { demoUsers } from './demoData';
import { sampleTracesDir } from './sampleRuns';

export type HistoryLoadReport = { runs: number; failed: { runCode: string; error: string }[]; analyseMs: number };

/**
 * Loads the demo shop's eight-week history (analysis/synth shopHistory): each planned run is
 * synthesised with its known truth, stored as a trace file against the newest revision of its
 * design, and analysed in `mode` (the joint re-fit: layer-by-layer fits let the thin layers'
 * errors pile up on the four-layer AR and would hide the late cuts the history is built around).
 */
export async function loadShopHistory(ex: Executor, plan: HistoryRun[] = shopHistory(), mode: AnalysisMode = 'refit'): Promise<HistoryLoadReport> {
  const operatorId = (await findUserIdByEmail(demoUsers.find((u) => u.role === 'operator')!.email, ex)) ?? null;
  const engineerId = (await findUserIdByEmail(demoUsers.find((u) => u.role === 'engineer')!.email, ex)) ?? null;
  const designs = new Map<string, { design: ReturnType<typeof parseDesign>; revisionId: number }>();
  const chambers = new Map<string, number>();
  const report: HistoryLoadReport = { runs: 0, failed: [], analyseMs: 0 };
  for (const planned of plan) {
    let d = designs.get(planned.designFile);
    if (!d) {
      const document: unknown = JSON.parse(fs.readFileSync(path.join(sampleTracesDir, planned.designFile), 'utf8'));
      const design = parseDesign(document, planned.designFile);
      const revision =
        (await latestDesignRevision(design.name, ex)) ??
        (await createDesignRevision(
          { document, name: design.name, referenceWavelengthNm: design.referenceWavelengthNm, layerCount: design.layers.length, sourceFileName: planned.designFile, createdBy: engineerId },
          ex,
        ));
      d = { design, revisionId: revision.id };
      designs.set(planned.designFile, d);
    }
    let chamberId = chambers.get(planned.chamber);
    if (chamberId === undefined) {
      const chamber = await findChamberByName(planned.chamber, ex);
      if (!chamber) throw new Error(`shop history ${planned.runCode}: chamber "${planned.chamber}" is not one of the demo chambers`);
      chamberId = chamber.id;
      chambers.set(planned.chamber, chamberId);
    }
    const csv = traceCsv(synthesizeRun(d.design, planned.options));
    const fileName = `${planned.runCode.toLowerCase()}.csv`;
    const trace = await readTraceText(csv, { fileName, layerCount: d.design.layers.length });
    const { run } = await createRunWithTrace(
      {
        designRevisionId: d.revisionId,
        chamberId,
        runCode: planned.runCode,
        shift: planned.shift,
        operatorName: planned.operator,
        startedAt: planned.startedAt,
        uploadedBy: operatorId,
        trace: { fileName, bytes: Buffer.from(csv), rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
      },
      ex,
    );
    report.runs++;
    const t0 = performance.now();
    const outcome = await analyseStoredRun(run.id, mode, { requestedBy: operatorId }, ex);
    report.analyseMs += performance.now() - t0;
    if (outcome.state === 'failed') report.failed.push({ runCode: planned.runCode, error: outcome.error });
  }
  return report;
}
