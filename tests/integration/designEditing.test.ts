import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { indexAt, materialModelSchema } from '@/analysis/materials';
import { readTrace } from '@/analysis/trace';
import { analyseStoredRun } from '@/db/jobs/analyseStoredRun';
import { findChamberByName } from '@/db/queries/chambers';
import { createRunWithTrace } from '@/db/queries/runs';
import { sampleTracesDir } from '@/db/seed/sampleRuns';
import { parseDesign } from '@/analysis/design';
import { closeDb } from '@/db/client';
import { findDesignWithRevisions, findRevisionOf, listDesigns } from '@/db/queries/designs';
import { listRuns, findRun } from '@/db/queries/runs';
import { fittedIndexOf, findShopMaterial } from '@/db/queries/materials';
import { listAudit } from '@/db/queries/audit';
import { POST as importRoute } from '@/app/api/designs/route';
import { GET as exportRoute } from '@/app/api/designs/[designId]/export/route';
import { POST as createMaterialRoute } from '@/app/api/materials/route';
import { PUT as changeMaterialRoute } from '@/app/api/materials/[name]/route';
import { saveDesign } from '@/app/(app)/designs/actions';
import { adoptIndex } from '@/app/(app)/materials/actions';
import { form, interruptOf, signInDemo } from './helpers';

afterAll(async () => {
  await closeDb();
});

const monitor = { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' };
let counter = 0;
const unique = (prefix: string) => `${prefix}-${Date.now().toString(36)}-${++counter}`;
const json = (url: string, method: string, body: unknown) => new Request(`http://localhost${url}`, { method, body: JSON.stringify(body) });
const ctx = <T extends Record<string, string>>(p: T) => ({ params: Promise.resolve(p) });
const file = (name: string, layers: unknown[], materials: Record<string, unknown> = {}) => ({
  format: 'fringelog.design/1',
  name,
  referenceWavelengthNm: 550,
  substrate: 'crown-glass-1.52',
  materials,
  layers,
});

async function importAs(doc: unknown) {
  const res = await importRoute(json('/api/designs', 'POST', doc));
  return { status: res.status, body: (await res.json()) as { error?: { code: string; message: string; key?: string }; design?: { id: number }; revision?: number } };
}

describe('importing a design with a fault', () => {
  const cases: [string, unknown[], Record<string, unknown>, string, RegExp][] = [
    ['negative thickness', [{ material: 'SiO2', thicknessNm: -5, monitor }], {}, 'layers[0].thicknessNm', /must be a finite number > 0/],
    ['unknown material', [{ material: 'unobtainium', qwot: 1, monitor }], {}, 'layers[0].material', /"unobtainium" is neither in "materials" nor built in/],
    [
      'monitor wavelength outside the range',
      [{ material: 'T', qwot: 1, monitor: { ...monitor, wavelengthNm: 900 } }],
      { T: { model: 'table', points: [[400, 1.5, 0], [700, 1.48, 0]] } },
      'layers[0].monitor.wavelengthNm',
      /outside the material's valid range 400–700 nm/,
    ],
  ];
  for (const [what, layers, materials, key, message] of cases) {
    it(`names the key (${what}) and stores nothing`, async () => {
      await signInDemo('engineer');
      const before = (await listDesigns()).length;
      const audit = (await listAudit(1))[0]?.id;
      const name = unique('faulty');
      const { status, body } = await importAs(file(name, layers, materials));
      expect(status).toBe(422);
      expect(body.error).toMatchObject({ code: 'bad_request:design', key });
      expect(body.error?.message).toMatch(message);
      expect((await listDesigns()).length).toBe(before);
      expect((await listAudit(1))[0]?.id).toBe(audit);
    });
  }

  it('answers a body that is not JSON with 400', async () => {
    await signInDemo('engineer');
    const res = await importRoute(new Request('http://localhost/api/designs', { method: 'POST', body: '{"format": ' }));
    expect(res.status).toBe(400);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('bad_request:json');
  });
});

describe('editing a design', () => {
  it('stores a new revision, and a run made with the old one keeps it', async () => {
    const run = (await listRuns()).find((r) => r.runCode === 'B1-0412');
    if (!run) throw new Error('no demo run B1-0412');
    const header = await findRun(run.id);
    const designId = header!.design.designId;
    const before = await findDesignWithRevisions(designId);
    const old = await findRevisionOf(designId, header!.design.revision);
    await signInDemo('engineer');
    const doc = structuredClone(old!.document) as { layers: { qwot?: number; thicknessNm?: number }[] };
    delete doc.layers[0].qwot;
    doc.layers[0].thicknessNm = 101.5;
    const outcome = await interruptOf(() => saveDesign(null, form({ designId, document: JSON.stringify(doc) })));
    const newest = before!.revisions[0].revision + 1;
    expect(outcome).toEqual({ kind: 'redirect', location: `/designs/${designId}?revision=${newest}` });
    const stored = await findRevisionOf(designId, newest);
    expect(parseDesign(stored!.document).layers[0].thicknessNm).toBe(101.5);
    // the run still points at the revision it was made with, unchanged
    const again = await findRun(run.id);
    expect(again!.design.revision).toBe(header!.design.revision);
    expect((await findRevisionOf(designId, header!.design.revision))!.document).toEqual(old!.document);
  });

  it('refuses a negative thickness at the field and stores nothing', async () => {
    const design = (await listDesigns()).find((d) => d.name.includes('LK-BB4'))!;
    const rev = await findRevisionOf(design.id, design.revision);
    const doc = structuredClone(rev!.document) as { layers: { thicknessNm?: number }[] };
    doc.layers[2].thicknessNm = -3;
    await signInDemo('admin');
    const result = await saveDesign(null, form({ designId: design.id, document: JSON.stringify(doc) }));
    expect(result).toMatchObject({ ok: false, code: 'bad_request:design', fieldErrors: { 'layers[2].thicknessNm': ['must be a finite number > 0'] } });
    expect((await findDesignWithRevisions(design.id))!.revisions[0].revision).toBe(design.revision);
  });
});

describe('shop materials in designs', () => {
  it('are written into the revision, so a later change of the material leaves it as it was', async () => {
    await signInDemo('engineer');
    const name = unique('LK-SiO2-IAD');
    const created = await createMaterialRoute(json('/api/materials', 'POST', { name, source: 'invented for a test', model: { model: 'cauchy', A: 1.455, B: 0.0035, C: 0, k: 0 } }));
    expect(created.status).toBe(201);
    const { status, body } = await importAs(file(unique('uses shop material'), [{ material: name, qwot: 1, monitor }]));
    expect(status).toBe(201);
    const exported = await exportRoute(new Request(`http://localhost/api/designs/${body.design!.id}/export`), ctx({ designId: String(body.design!.id) }));
    const doc = (await exported.json()) as { materials: Record<string, unknown>; materialOrigins: Record<string, string> };
    expect(doc.materials[name]).toEqual({ model: 'cauchy', A: 1.455, B: 0.0035, C: 0, k: 0 });
    expect(doc.materialOrigins[name]).toBe(name);
    expect(exported.headers.get('content-disposition')).toMatch(/^attachment; filename=".*-rev1\.json"$/);

    const changed = await changeMaterialRoute(json(`/api/materials/${name}`, 'PUT', { model: { model: 'constant', n: 1.6, k: 0 } }), ctx({ name }));
    expect(changed.status).toBe(200);
    const stored = await findRevisionOf(body.design!.id, 1);
    expect((stored!.document as typeof doc).materials[name]).toEqual({ model: 'cauchy', A: 1.455, B: 0.0035, C: 0, k: 0 });
    // and the exported file parses on its own, without the database
    expect(parseDesign(doc).layers[0].thicknessNm).toBeCloseTo(550 / (4 * (1.455 + 0.0035 / 0.55 ** 2)), 9);
  });

  it('refuses a bad model at its field, a taken name, and a built-in name', async () => {
    await signInDemo('engineer');
    const bad = await createMaterialRoute(json('/api/materials', 'POST', { name: unique('LK-bad'), model: { model: 'sellmeier', B: [1, 2], C: [0.1] } }));
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { key: string } }).error.key).toBe('model.C');
    const builtIn = await createMaterialRoute(json('/api/materials', 'POST', { name: 'SiO2', model: { model: 'constant', n: 1.46 } }));
    expect(((await builtIn.json()) as { error: { key: string; message: string } }).error).toMatchObject({ key: 'name', message: expect.stringMatching(/built-in/) });
    const name = unique('LK-twice');
    expect((await createMaterialRoute(json('/api/materials', 'POST', { name, model: { model: 'constant', n: 1.46 } }))).status).toBe(201);
    expect((await createMaterialRoute(json('/api/materials', 'POST', { name, model: { model: 'constant', n: 1.47 } }))).status).toBe(409);
    expect((await findShopMaterial(name))!.model).toEqual({ model: 'constant', n: 1.46 });
  });
});

describe("a material's index fitted from the runs", () => {
  it('comes from the stored analyses through the design aliases (SiO2 is "L" in the demo designs)', async () => {
    const fitted = await fittedIndexOf('SiO2');
    expect(fitted.length).toBeGreaterThan(0);
    for (const f of fitted) {
      expect(f.runs).toBeGreaterThan(0);
      // a deposited silica film: n between 1.40 and 1.50 in the visible (common practice)
      expect(f.mean).toBeGreaterThan(1.4);
      expect(f.mean).toBeLessThan(1.5);
    }
    expect(await fittedIndexOf('no-such-material')).toEqual([]);
  });

  it("is adopted as the nominal: a run of a design naming a shop material, analysed, moves the model to what the run measured", async () => {
    await signInDemo('engineer');
    const name = unique('LK-MgF2');
    // the nominal is 0.01 high on purpose; the sample run was made with n(550) = 1.38026 (sample-traces/bay1-ar1-run0412.truth.json)
    const model = { model: 'cauchy', A: 1.382, B: 0.0025, C: 0, k: 0, validFromNm: 200, validToNm: 2000 };
    expect((await createMaterialRoute(json('/api/materials', 'POST', { name, source: 'test', model }))).status).toBe(201);
    const ar1 = JSON.parse(fs.readFileSync(path.join(sampleTracesDir, 'ar1-mgf2-crown.json'), 'utf8')) as Record<string, unknown>;
    const { body } = await importAs({ ...ar1, name: unique('AR1 with a shop MgF2'), materials: { L: name } });
    const revision = await findRevisionOf(body.design!.id, 1);
    const traceFile = 'bay1-ar1-run0412.csv';
    const bytes = fs.readFileSync(path.join(sampleTracesDir, traceFile));
    const trace = await readTrace([bytes], { fileName: traceFile });
    const chamber = await findChamberByName('Bay 1 e-beam');
    const run = await createRunWithTrace({
      designRevisionId: revision!.id,
      chamberId: chamber!.id,
      runCode: unique('T'),
      shift: null,
      operatorName: null,
      startedAt: null,
      uploadedBy: null,
      trace: { fileName: traceFile, bytes, rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
    });
    expect((await analyseStoredRun(run.run.id, 'refit')).state).toBe('done');

    const [fitted] = await fittedIndexOf(name);
    expect(fitted).toMatchObject({ wavelengthNm: 550, runs: 1, layers: 1 });
    expect(Math.abs(fitted.mean - 1.38026)).toBeLessThan(0.005);
    expect(await adoptIndex(null, form({ name, wavelengthNm: 550 }))).toEqual({ ok: true, data: undefined });
    const adopted = materialModelSchema.parse((await findShopMaterial(name))!.model);
    expect(indexAt(adopted, 550).re).toBeCloseTo(Number(fitted.mean.toFixed(4)), 10);
    expect((adopted as { B: number }).B).toBe(0.0025);
    const entry = (await listAudit(5)).find((e) => e.action === 'material.index_adopted' && e.detail.name === name);
    expect(entry?.detail).toMatchObject({ wavelengthNm: 550, index: Number(fitted.mean.toFixed(4)), runs: 1 });
  });

  it('cannot be adopted where no run measured the material', async () => {
    await signInDemo('engineer');
    const name = unique('LK-unused');
    await createMaterialRoute(json('/api/materials', 'POST', { name, model: { model: 'constant', n: 1.46 } }));
    expect(await adoptIndex(null, form({ name, wavelengthNm: 550 }))).toMatchObject({ ok: false, fieldErrors: { wavelengthNm: [`No run measured ${name} at 550 nm.`] } });
  });
});
