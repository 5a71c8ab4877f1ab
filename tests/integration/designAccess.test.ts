import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { createDesignRevision, listDesigns } from '@/db/queries/designs';
import { roles, type Role } from '@/db/schema';
import { capabilities } from '@/app/_lib/capabilities';
import { GET as listDesignsRoute, POST as importRoute } from '@/app/api/designs/route';
import { GET as readDesignRoute } from '@/app/api/designs/[designId]/route';
import { POST as newRevisionRoute } from '@/app/api/designs/[designId]/revisions/route';
import { GET as exportRoute } from '@/app/api/designs/[designId]/export/route';
import { GET as listMaterialsRoute, POST as createMaterialRoute } from '@/app/api/materials/route';
import { GET as readMaterialRoute, PUT as changeMaterialRoute } from '@/app/api/materials/[name]/route';
import DesignsPage from '@/app/(app)/designs/page';
import DesignPage from '@/app/(app)/designs/[designId]/page';
import EditDesignPage from '@/app/(app)/designs/[designId]/edit/page';
import ComparePage from '@/app/(app)/designs/[designId]/compare/page';
import MaterialsPage from '@/app/(app)/materials/page';
import MaterialPage from '@/app/(app)/materials/[name]/page';
import NewMaterialPage from '@/app/(app)/materials/new/page';
import EditMaterialPage from '@/app/(app)/materials/[name]/edit/page';
import { saveDesign, importDesign } from '@/app/(app)/designs/actions';
import { createMaterial, updateMaterial, adoptIndex } from '@/app/(app)/materials/actions';
import { anonymous, form, interruptOf, signInDemo } from './helpers';

afterAll(async () => {
  await closeDb();
});

const monitor = { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' };
let counter = 0;
const unique = (prefix: string) => `${prefix} ${Date.now().toString(36)}-${++counter}`;
const designFile = (name: string) => ({ format: 'fringelog.design/1', name, referenceWavelengthNm: 550, substrate: 'crown-glass-1.52', layers: [{ material: 'MgF2-film', qwot: 1, monitor }] });
const json = (url: string, method: string, body: unknown) => new Request(`http://localhost${url}`, { method, body: JSON.stringify(body), headers: { 'content-type': 'application/json' } });
const ctx = <T extends Record<string, string>>(p: T) => ({ params: Promise.resolve(p) });
const material = (name: string) => ({ name, description: 'test film', source: 'invented for a test', model: { model: 'constant', n: 1.46, k: 0 } });

async function sampleDesignId(): Promise<string> {
  const d = (await listDesigns()).find((x) => x.name.includes('LK-AR1'));
  if (!d) throw new Error('no demo design LK-AR1');
  return String(d.id);
}

/** A design of this test's own, so new revisions leave the demo designs alone. */
let ownDesignId = '';
beforeAll(async () => {
  const name = unique('access test design');
  const rev = await createDesignRevision({ document: designFile(name), name, referenceWavelengthNm: 550, layerCount: 1, createdBy: null });
  ownDesignId = String(rev.designId);
});

const as = async (role: Role | 'anonymous') => (role === 'anonymous' ? anonymous() : signInDemo(role));
const everyone = ['anonymous', ...roles] as const;
const editor = (r: (typeof everyone)[number]) => r !== 'anonymous' && capabilities[r].editDesigns;

describe('designs and materials: who may do what', () => {
  it('engineers and admins edit; operators and supervisors read', () => {
    expect(roles.filter((r) => capabilities[r].viewDesigns)).toEqual(roles);
    expect(roles.filter((r) => capabilities[r].editDesigns)).toEqual(['engineer', 'admin']);
  });

  for (const role of everyone) {
    it(`route handlers answer the ${role} as expected`, async () => {
      const id = await sampleDesignId();
      await as(role);
      const read = role === 'anonymous' ? 401 : 200;
      const write = role === 'anonymous' ? 401 : editor(role) ? 201 : 403;
      expect((await listDesignsRoute()).status).toBe(read);
      expect((await readDesignRoute(new Request(`http://localhost/api/designs/${id}`), ctx({ designId: id }))).status).toBe(read);
      expect((await exportRoute(new Request(`http://localhost/api/designs/${id}/export?revision=1`), ctx({ designId: id }))).status).toBe(read);
      expect((await listMaterialsRoute()).status).toBe(read);
      expect((await readMaterialRoute(new Request('http://localhost/api/materials/SiO2'), ctx({ name: 'SiO2' }))).status).toBe(read);

      const imported = await importRoute(json('/api/designs', 'POST', designFile(unique(`access ${role}`))));
      expect(imported.status).toBe(write);
      const revision = await newRevisionRoute(json(`/api/designs/${ownDesignId}/revisions`, 'POST', designFile('ignored: the design keeps its name')), ctx({ designId: ownDesignId }));
      expect(revision.status).toBe(write);
      const name = unique(`LK-access-${role}`).replace(/\s/g, '-');
      expect((await createMaterialRoute(json('/api/materials', 'POST', material(name)))).status).toBe(write);
      const changed = await changeMaterialRoute(json(`/api/materials/${name}`, 'PUT', { ...material(name), description: 'changed' }), ctx({ name }));
      // a material the caller could not create is not there to change
      expect(changed.status).toBe(role === 'anonymous' ? 401 : editor(role) ? 200 : 403);
      if (write !== 201) {
        const body = (await imported.json()) as { error: { code: string; message: string } };
        expect(body.error.code).toBe(role === 'anonymous' ? 'unauthorized:session' : 'forbidden:role');
        expect(typeof body.error.message).toBe('string');
      }
    });

    it(`pages and actions answer the ${role} as expected`, async () => {
      const id = await sampleDesignId();
      await as(role);
      const read = role === 'anonymous' ? { kind: 'redirect', location: '/sign-in' } : 'returned';
      const edit = role === 'anonymous' ? read : editor(role) ? 'returned' : { kind: 'http', status: 403 };
      const sp = (o: Record<string, string> = {}) => Promise.resolve(o);
      expect(await interruptOf(() => DesignsPage())).toEqual(read);
      expect(await interruptOf(() => DesignPage({ params: ctx({ designId: id }).params, searchParams: sp() }))).toEqual(read);
      expect(await interruptOf(() => ComparePage({ params: ctx({ designId: id }).params, searchParams: sp({ a: '1', b: '1' }) }))).toEqual(read);
      expect(await interruptOf(() => MaterialsPage())).toEqual(read);
      expect(await interruptOf(() => MaterialPage({ params: ctx({ name: 'SiO2' }).params }))).toEqual(read);
      expect(await interruptOf(() => EditDesignPage({ params: ctx({ designId: id }).params, searchParams: sp() }))).toEqual(edit);
      expect(await interruptOf(() => NewMaterialPage())).toEqual(edit);
      // a built-in material has no edit page: 404 for those who may edit
      expect(await interruptOf(() => EditMaterialPage({ params: ctx({ name: 'SiO2' }).params }))).toEqual(editor(role) ? { kind: 'http', status: 404 } : edit);

      if (!editor(role)) {
        const code = role === 'anonymous' ? 'unauthorized:session' : 'forbidden:role';
        const doc = JSON.stringify(designFile('x'));
        expect(await saveDesign(null, form({ designId: ownDesignId, document: doc }))).toMatchObject({ ok: false, code });
        const file = new FormData();
        file.set('file', new File([doc], 'x.json', { type: 'application/json' }));
        expect(await importDesign(null, file)).toMatchObject({ ok: false, code });
        expect(await createMaterial(null, form({ input: JSON.stringify(material('LK-nope')) }))).toMatchObject({ ok: false, code });
        expect(await updateMaterial(null, form({ name: 'LK-nope', input: JSON.stringify(material('LK-nope')) }))).toMatchObject({ ok: false, code });
        expect(await adoptIndex(null, form({ name: 'LK-nope', wavelengthNm: 550 }))).toMatchObject({ ok: false, code });
      }
    });
  }
});
