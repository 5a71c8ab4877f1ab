import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { readTrace } from '@/analysis/trace';
import { closeDb } from '@/db/client';
import { findChamberByName } from '@/db/queries/chambers';
import { createDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { findUserIdByEmail } from '@/db/queries/users';
import { sampleTracesDir } from '@/db/seed/sampleRuns';
import AuditPage from '@/app/(app)/audit/page';
import { demo, signInDemo, textOf } from './helpers';

afterAll(async () => {
  await closeDb();
});

describe('the audit log names stored designs and runs', () => {
  it('reads as sentences with the design name, the run code and the file', async () => {
    const engineerId = await findUserIdByEmail(demo('engineer').email);
    const operatorId = await findUserIdByEmail(demo('operator').email);
    const chamber = await findChamberByName('Bay 1 e-beam');
    if (!engineerId || !operatorId || !chamber) throw new Error('demo data missing');
    const tag = Date.now().toString(36);
    const document = JSON.parse(fs.readFileSync(path.join(sampleTracesDir, 'ar1-mgf2-crown.json'), 'utf8')) as Record<string, unknown>;
    const name = `audit check ${tag}`;
    const design = parseDesign(document, 'ar1-mgf2-crown.json');
    const revision = await createDesignRevision({
      document: { ...document, name }, name, referenceWavelengthNm: design.referenceWavelengthNm,
      layerCount: design.layers.length, sourceFileName: 'ar1-mgf2-crown.json', createdBy: engineerId,
    });
    const bytes = fs.readFileSync(path.join(sampleTracesDir, 'bay1-ar1-run0412.csv'));
    const trace = await readTrace([bytes], { fileName: 'bay1-ar1-run0412.csv' });
    const runCode = `A-${tag}`;
    await createRunWithTrace({
      designRevisionId: revision.id, chamberId: chamber.id, runCode, shift: 'early', operatorName: 'Ines Varga',
      startedAt: new Date('2026-11-03T00:00:00Z'), uploadedBy: operatorId,
      trace: { fileName: 'bay1-ar1-run0412.csv', bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
    });

    await signInDemo('admin');
    const page = textOf(await AuditPage());
    expect(page).toContain(`${demo('engineer').name} stored a revision of design ${name}`);
    expect(page).toContain('revision 1');
    expect(page).toContain(`${demo('operator').name} stored the trace of run ${runCode}`);
    expect(page).toContain(`bay1-ar1-run0412.csv, ${(bytes.byteLength / 1024).toFixed(1)} kB`);
  });
});
