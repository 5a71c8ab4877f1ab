import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import { parseDesign } from '../../analysis/design';
import { readTrace } from '../../analysis/trace';
import type { Executor } from '../client';
import { analyseStoredRun, type AnalyseOutcome } from '../jobs/analyseStoredRun';
import { findChamberByName } from '../queries/chambers';
import { createDesignRevision } from '../queries/designs';
import { createRunWithTrace } from '../queries/runs';
import { findUserIdByEmail } from '../queries/users';
import type { AnalysisMode } from '../queries/analyses';
import { demoUsers } from './demoData';

export const sampleTracesDir = path.resolve(import.meta.dirname, '..', '..', 'sample-traces');

/** Which design each demo trace was run against (the trace files do not name their design). */
export const sampleRunDesigns: Record<string, string> = {
  'bay1-ar1-run0412.csv': 'ar1-mgf2-crown.json',
  'bay1-ar1-run0413-overshoot.csv': 'ar1-mgf2-crown.json',
  'bay2-bb4-run0587.csv': 'bbar4-visible.json',
  'bay2-bb4-run0588-nolayer.csv': 'bbar4-visible.json',
  'bay3-hr17-run1120.csv': 'hr17-mirror-600.json',
  'bay3-hr17-run1121-spike.csv': 'hr17-mirror-600.json',
  'bay3-hr17-run1122-ripple.csv': 'hr17-mirror-600.json',
};

/** The process engineer owns the demo designs; the chamber operator uploaded the demo runs. */
const designOwner = demoUsers.find((u) => u.role === 'engineer')!.email;
const uploader = demoUsers.find((u) => u.role === 'operator')!.email;

function required(meta: Record<string, string>, key: string, file: string): string {
  const v = meta[key]?.trim();
  if (!v) throw new Error(`${file}: metadata line "# ${key}: …" missing`);
  return v;
}

export type SampleLoadReport = { designs: number; runs: number; analyses: (AnalyseOutcome & { file: string; mode: AnalysisMode; ms: number })[] };

/**
 * Loads the designs and traces of sample-traces/ (see its README): one revision per design, one
 * run per trace in the chamber its `# chamber:` line names, then each run analysed in every
 * given mode. Throws, naming the file, on a missing design, chamber or metadata line.
 */
export async function loadSampleRuns(ex: Executor, modes: readonly AnalysisMode[] = ['sequential', 'refit'], dir = sampleTracesDir): Promise<SampleLoadReport> {
  const engineerId = (await findUserIdByEmail(designOwner, ex)) ?? null;
  const operatorId = (await findUserIdByEmail(uploader, ex)) ?? null;
  const revisions = new Map<string, { id: number; layerCount: number }>();
  for (const file of new Set(Object.values(sampleRunDesigns))) {
    const document: unknown = JSON.parse(fs.readFileSync(path.join(dir, file), 'utf8'));
    const design = parseDesign(document, file);
    const rev = await createDesignRevision(
      { document, name: design.name, referenceWavelengthNm: design.referenceWavelengthNm, layerCount: design.layers.length, sourceFileName: file, createdBy: engineerId },
      ex,
    );
    revisions.set(file, { id: rev.id, layerCount: design.layers.length });
  }
  const report: SampleLoadReport = { designs: revisions.size, runs: 0, analyses: [] };
  for (const [file, designFile] of Object.entries(sampleRunDesigns)) {
    const bytes = fs.readFileSync(path.join(dir, file));
    const revision = revisions.get(designFile)!;
    const trace = await readTrace([bytes], { fileName: file, layerCount: revision.layerCount });
    const chamberName = required(trace.meta, 'chamber', file);
    const chamber = await findChamberByName(chamberName, ex);
    if (!chamber) throw new Error(`${file}: chamber "${chamberName}" is not one of the demo chambers`);
    const date = trace.meta.date?.trim();
    const { run } = await createRunWithTrace(
      {
        designRevisionId: revision.id,
        chamberId: chamber.id,
        runCode: required(trace.meta, 'run', file),
        shift: trace.meta.shift?.trim() || null,
        operatorName: trace.meta.operator?.trim() || null,
        startedAt: date ? new Date(`${date}T00:00:00Z`) : null,
        uploadedBy: operatorId,
        trace: { fileName: file, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
      },
      ex,
    );
    report.runs++;
    for (const mode of modes) {
      const t0 = performance.now();
      const outcome = await analyseStoredRun(run.id, mode, { requestedBy: operatorId }, ex);
      report.analyses.push({ ...outcome, file, mode, ms: Math.round(performance.now() - t0) });
    }
  }
  return report;
}
