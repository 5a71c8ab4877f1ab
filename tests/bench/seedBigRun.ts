// Stores the bench's 10⁶-sample, 40-layer synthetic run in the app's database and analyses it
// (refit), once: run code BENCH-1M in the first chamber. Prints "RUN <id>". Run by runPage.ts
// with tsx --conditions=react-server and the app's DATABASE_URL.
import { parseDesign } from '../../analysis/design';
import { traceCsvChunks } from '../../analysis/synth';
import { readTrace } from '../../analysis/trace';
import { closeDb } from '../../db/client';
import { analyseStoredRun } from '../../db/jobs/analyseStoredRun';
import { listChambers } from '../../db/queries/chambers';
import { createDesignRevision, latestDesignRevision } from '../../db/queries/designs';
import { createRunWithTrace, listRuns } from '../../db/queries/runs';
import { benchSynth, design40Document } from './analysis';

const CODE = 'BENCH-1M';
const existing = (await listRuns(5000)).find((r) => r.runCode === CODE && r.analysisState === 'done');
if (existing) {
  console.log(`RUN ${existing.id}`);
} else {
  const document = design40Document();
  const design = parseDesign(document);
  const revision = (await latestDesignRevision(document.name)) ?? (await createDesignRevision({ document, name: document.name, referenceWavelengthNm: design.referenceWavelengthNm, layerCount: design.layers.length, sourceFileName: 'bench.design.json', createdBy: null }));
  const synth = benchSynth(design);
  const bytes = Buffer.concat(Array.from(traceCsvChunks(synth, { rowsPerChunk: 50_000 }), (c) => Buffer.from(c)));
  const trace = await readTrace([bytes], { fileName: 'bench-1m.csv' });
  const [chamber] = await listChambers();
  const t0 = performance.now();
  const { run } = await createRunWithTrace({
    designRevisionId: revision.id, chamberId: chamber.id, runCode: CODE, shift: 'bench', operatorName: 'bench', startedAt: new Date(),
    uploadedBy: null, trace: { fileName: 'bench-1m.csv', bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
  const outcome = await analyseStoredRun(run.id, 'refit');
  console.error(`stored and analysed ${trace.rowCount.toLocaleString('en')} samples (${(bytes.length / 2 ** 20).toFixed(0)} MB) in ${((performance.now() - t0) / 1000).toFixed(1)} s: ${outcome.state}`);
  console.log(`RUN ${run.id}`);
}
await closeDb();
