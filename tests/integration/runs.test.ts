import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { parseDesign } from '@/analysis/design';
import { analyzeRun, type LayerResult } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { closeDb, db } from '@/db/client';
import { analyseStoredRun } from '@/db/jobs/analyseStoredRun';
import { createAnalysis, findAnalysis, latestAnalyses, markAnalysisRunning, storeAnalysisResult } from '@/db/queries/analyses';
import { findChamberByName } from '@/db/queries/chambers';
import { createDesignRevision, latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace, findRun, listRuns, traceFileChunks } from '@/db/queries/runs';
import { layerResults, runs, traceFiles } from '@/db/schema';
import { sampleRunDesigns, sampleTracesDir } from '@/db/seed/sampleRuns';

afterAll(async () => {
  await closeDb();
});

const sample = (file: string) => fs.readFileSync(path.join(sampleTracesDir, file));
let unique = 0;
const uniqueName = (prefix: string) => `${prefix} ${Date.now().toString(36)}-${++unique}`;

async function storeDesign(file: string, name = uniqueName('test design')) {
  const document = JSON.parse(sample(file).toString('utf8')) as Record<string, unknown>;
  const design = parseDesign(document, file);
  return createDesignRevision({ document: { ...document, name }, name, referenceWavelengthNm: design.referenceWavelengthNm, layerCount: design.layers.length, sourceFileName: file, createdBy: null });
}

async function storeRun(designRevisionId: number, fileName: string, bytes: Buffer, runCode = uniqueName('T')) {
  const trace = await readTrace([bytes], { fileName });
  const chamber = await findChamberByName('Bay 1 e-beam');
  return createRunWithTrace({
    designRevisionId,
    chamberId: chamber!.id,
    runCode,
    shift: trace.meta.shift ?? null,
    operatorName: trace.meta.operator ?? null,
    startedAt: new Date('2026-11-03T00:00:00Z'),
    uploadedBy: null,
    trace: { fileName, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
}

async function collect(chunks: AsyncIterable<Uint8Array>): Promise<{ bytes: Buffer; count: number }> {
  const parts: Buffer[] = [];
  for await (const c of chunks) parts.push(Buffer.from(c));
  return { bytes: Buffer.concat(parts), count: parts.length };
}

describe('the demo runs of the seed', () => {
  it('lists every sample trace as a run in the chamber its metadata names, analysed, with a worst cut error', async () => {
    const list = await listRuns();
    // The seed's shop history (seed:shop-history) adds runs of its own beside the seven sample traces.
    const sampleCodes = ['B1-0412', 'B1-0413', 'B2-0587', 'B2-0588', 'B3-1120', 'B3-1121', 'B3-1122'];
    const demo = list.filter((r) => sampleCodes.includes(r.runCode));
    expect(demo.map((r) => r.runCode).sort()).toEqual(sampleCodes);
    for (const r of demo) {
      expect(r.chamberName.startsWith(`Bay ${r.runCode[1]} `), r.runCode).toBe(true);
      expect(r.analysisState, r.runCode).toBe('done');
      expect(r.worstCutMode, r.runCode).toBe('refit');
      expect(r.worstCutErrorQwotPct, r.runCode).toBeTypeOf('number');
    }
    const overshoot = demo.find((r) => r.runCode === 'B1-0413')!;
    expect(overshoot.operatorName).toBe('Ines Varga');
    expect(overshoot.shift).toBe('early');
    expect(overshoot.startedAt?.toISOString()).toBe('2026-11-03T00:00:00.000Z');
    // The overshoot run was cut 6.3 % QWOT late; under the correlated noise every Larkspur run carries
    // the single MgF2 layer reads it as +3.0 ± 2.5 % (sample-traces/README.md): past the 2 % that
    // draws a warning, and above the clean run's +1.4 ± 2.6 %.
    const clean = demo.find((r) => r.runCode === 'B1-0412')!;
    expect(overshoot.worstCutErrorQwotPct!).toBeGreaterThan(2);
    expect(overshoot.worstCutErrorQwotPct!).toBeGreaterThan(clean.worstCutErrorQwotPct! + 1);
  });

  it('keeps both modes of a demo run, with one layer result per design layer', async () => {
    const b3 = (await listRuns()).find((r) => r.runCode === 'B3-1120')!;
    const byMode = await latestAnalyses(b3.id);
    for (const mode of ['sequential', 'refit'] as const) {
      const a = byMode[mode]!;
      expect(a.analysis.state).toBe('done');
      expect(a.layers.map((l) => l.layer)).toEqual(Array.from({ length: 17 }, (_, i) => i + 1));
      expect(a.layers[10].detail.chip).toBe(2);
      expect(Array.isArray((a.analysis.summary as { spectrum: { wavelengthNm: unknown } }).spectrum.wavelengthNm)).toBe(true);
    }
    const header = await findRun(b3.id);
    expect(header?.design.layerCount).toBe(17);
    expect(header?.trace?.sha256).toBe(createHash('sha256').update(sample('bay3-hr17-run1120.csv')).digest('hex'));
  });

  it('names the lamp ripple of run B3-1122 and divides it out: every layer within 3σ of the truth the trace was made with', async () => {
    // sample-traces/generate.ts: a 0.25 % ripple at 100.04 Hz read 5 times a second, a 0.04 Hz beat
    const truth = JSON.parse(sample('bay3-hr17-run1122-ripple.truth.json').toString('utf8')) as { layers: { thicknessNm: number; index: number }[] };
    const run = (await listRuns()).find((r) => r.runCode === 'B3-1122')!;
    const byMode = await latestAnalyses(run.id);
    for (const mode of ['sequential', 'refit'] as const) {
      const a = byMode[mode]!;
      expect(a.analysis.state, mode).toBe('done');
      const divided = a.analysis.warnings.find((w) => w.startsWith('lamp ripple divided out'));
      expect(divided, mode).toMatch(/^lamp ripple divided out: 0\.2[4-6]\d ± 0\.0\d\d % at 0\.0400\d Hz/);
      expect(a.analysis.warnings.some((w) => w.startsWith('periodic disturbance through the run at 0.0400 Hz')), mode).toBe(true);
      expect(a.layers).toHaveLength(17);
      for (const l of a.layers) {
        const t = truth.layers[l.layer - 1];
        expect(Math.abs(l.thicknessNm - t.thicknessNm), `${mode} layer ${l.layer} thickness`).toBeLessThan(3 * l.thicknessSigmaNm);
        expect(Math.abs(l.index - t.index), `${mode} layer ${l.layer} index`).toBeLessThan(3 * l.indexSigma);
      }
    }
  });
});

describe('designs', () => {
  it('numbers the revisions of a design from 1, each one kept', async () => {
    const name = uniqueName('AR revision test');
    const first = await storeDesign('ar1-mgf2-crown.json', name);
    const second = await storeDesign('ar1-mgf2-crown.json', name);
    expect([first.revision, second.revision]).toEqual([1, 2]);
    expect(first.designId).toBe(second.designId);
    expect((await latestDesignRevision(name))?.id).toBe(second.id);
    expect(first.layerCount).toBe(1);
    expect(first.referenceWavelengthNm).toBe(550);
  });
});

describe('runs and their raw trace', () => {
  it('stores the file byte for byte and reads it back in chunks of any size', async () => {
    const rev = await storeDesign('ar1-mgf2-crown.json');
    const bytes = sample('bay1-ar1-run0412.csv');
    const stored = await storeRun(rev.id, 'bay1-ar1-run0412.csv', bytes);
    expect(stored.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    const back = await collect(traceFileChunks(stored.run.id, 1000));
    expect(back.bytes.equals(bytes)).toBe(true);
    expect(back.count).toBe(Math.ceil(bytes.byteLength / 1000));
    const [file] = await db().select({ rowCount: traceFiles.rowCount, columns: traceFiles.columns }).from(traceFiles).where(eq(traceFiles.runId, stored.run.id));
    expect(file).toEqual({ rowCount: 1498, columns: ['time_s', 'signal', 'layer', 'chip'] });
  });

  it('writes nothing when the run cannot be stored (same run code twice in a chamber)', async () => {
    const rev = await storeDesign('ar1-mgf2-crown.json');
    const bytes = sample('bay1-ar1-run0412.csv');
    const code = uniqueName('DUP');
    await storeRun(rev.id, 'first.csv', bytes, code);
    const count = async () => (await db().select({ n: sql<number>`count(*)::int` }).from(traceFiles)).at(0)!.n;
    const before = await count();
    await expect(storeRun(rev.id, 'second.csv', bytes, code)).rejects.toThrow();
    expect(await count()).toBe(before);
    expect(await db().select({ id: runs.id }).from(runs).where(eq(runs.runCode, code))).toHaveLength(1);
  });
});

describe('the analysis of a stored run', () => {
  it('gives the same layers as analysing the file directly, read back from the database in small chunks', async () => {
    const rev = await storeDesign('ar1-mgf2-crown.json');
    const bytes = sample('bay1-ar1-run0413-overshoot.csv');
    const { run } = await storeRun(rev.id, 'bay1-ar1-run0413-overshoot.csv', bytes);
    const outcome = await analyseStoredRun(run.id, 'sequential', { chunkBytes: 777 });
    expect(outcome).toMatchObject({ state: 'done', layers: 1 });
    const stored = (await findAnalysis(outcome.analysisId))!;
    const design = parseDesign(JSON.parse(sample('ar1-mgf2-crown.json').toString('utf8')), 'ar1-mgf2-crown.json');
    const direct = await analyzeRun(design, await readTrace([bytes], { layerCount: 1 }), { mode: 'sequential' });
    expect(stored.layers).toHaveLength(1);
    const [l] = stored.layers;
    const d = direct.layers[0];
    expect([l.thicknessNm, l.thicknessSigmaNm, l.index, l.indexSigma, l.rateNmPerS, l.cutErrorQwotPct, l.residualRms]).toEqual([
      d.thicknessNm, d.thicknessSigmaNm, d.index, d.indexSigma, d.rateNmPerS, d.cutErrorQwotPct, d.residualRms,
    ]);
    expect(l.detail.idealCutTimeS).toBe(d.idealCutTimeS);
    expect(l.detail.lastTurningPoint).toEqual(d.lastTurningPoint);
    expect(stored.analysis.warnings).toEqual(direct.warnings);
    // the outcome counts the run's notes (what the analysis did) apart from its warnings
    const notes = direct.warnings.filter((w) => w.startsWith('start transient:') || w.startsWith('lamp ripple divided out:')).length;
    expect(notes).toBeGreaterThan(0);
    expect(outcome).toMatchObject({ warnings: direct.warnings.length - notes, notes });
    expect(stored.analysis.settings).toEqual({ mode: 'sequential' });
    expect(stored.analysis.startedAt).toBeInstanceOf(Date);
    expect(stored.analysis.finishedAt).toBeInstanceOf(Date);
    expect((await findRun(run.id))?.run.status).toBe('analysed');
  });

  it('fails with the file, line and column of a bad trace, and writes no layer results', async () => {
    const rev = await storeDesign('ar1-mgf2-crown.json');
    // A layer number the one-layer design does not have, in the middle of the file.
    const text = sample('bay1-ar1-run0412.csv').toString('utf8').split('\n');
    const header = text.findIndex((l) => l.startsWith('time_s'));
    const bad = header + 600;
    text[bad] = text[bad].replace(/,1,1$/, ',2,1');
    expect(text[bad]).toMatch(/,2,1$/);
    const { run } = await storeRun(rev.id, 'wrong-design.csv', Buffer.from(text.join('\n')));
    const outcome = await analyseStoredRun(run.id, 'refit');
    expect(outcome.state).toBe('failed');
    const message = outcome.state === 'failed' ? outcome.error : '';
    expect(message).toBe(`wrong-design.csv line ${bad + 1}, column "layer": layer 2 is beyond the design's 1 layers`);
    const stored = (await findAnalysis(outcome.analysisId))!;
    expect(stored.analysis.state).toBe('failed');
    expect(stored.analysis.error).toBe(message);
    expect(stored.layers).toEqual([]);
    expect(await db().select().from(layerResults).where(eq(layerResults.analysisId, outcome.analysisId))).toEqual([]);
    expect((await findRun(run.id))?.run.status).toBe('failed');
  });

  it('stores a result only for an analysis that is running, and then all of it', async () => {
    const rev = await storeDesign('ar1-mgf2-crown.json');
    const { run } = await storeRun(rev.id, 'r.csv', sample('bay1-ar1-run0412.csv'));
    const queued = await createAnalysis({ runId: run.id, mode: 'refit', requestedBy: null });
    const done = await analyseStoredRun(run.id, 'refit');
    const layers = (await findAnalysis(done.analysisId))!.layers.map(({ id: _id, analysisId: _a, detail, ...l }) => ({ ...l, ...detail }) as unknown as LayerResult);
    expect(await storeAnalysisResult(queued.id, { layers, warnings: [], summary: {} })).toBe(false);
    expect((await findAnalysis(queued.id))!.layers).toEqual([]);
    expect(await markAnalysisRunning(queued.id)).toBe(true);
    expect(await markAnalysisRunning(queued.id)).toBe(false);
    // A layer twice breaks the unique (analysis, layer) index: the whole store rolls back.
    await expect(storeAnalysisResult(queued.id, { layers: [...layers, ...layers], warnings: [], summary: {} })).rejects.toThrow();
    const after = (await findAnalysis(queued.id))!;
    expect(after.analysis.state).toBe('running');
    expect(after.layers).toEqual([]);
  });
});

describe('the sample table of the seed', () => {
  it('names a design for every trace in sample-traces/, and each design file exists', () => {
    const traces = fs.readdirSync(sampleTracesDir).filter((f) => f.endsWith('.csv')).sort();
    expect(Object.keys(sampleRunDesigns).sort()).toEqual(traces);
    for (const d of Object.values(sampleRunDesigns)) expect(fs.existsSync(path.join(sampleTracesDir, d)), d).toBe(true);
  });
});
