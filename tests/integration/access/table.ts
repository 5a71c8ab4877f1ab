// The access table: every page, route handler and server action × every principal, with the
// expected answer. One row per entry; access.test.ts checks each cell and that every route of
// app/ has a row. Adding a route = adding one line here (see DEVELOPERS.md).
import { roles, type Role } from '@/db/schema';
import { listRuns } from '@/db/queries/runs';
import { GET as health } from '@/app/api/health/route';
import HomePage from '@/app/(app)/(home)/page';
import AccountPage from '@/app/(app)/account/page';
import UsersPage from '@/app/(app)/admin/users/page';
import MailPage from '@/app/(app)/admin/mail/page';
import AuditPage from '@/app/(app)/audit/page';
import RunsPage from '@/app/(app)/runs/(list)/page';
import RunLayout from '@/app/(app)/runs/[runId]/layout';
import RunPage from '@/app/(app)/runs/[runId]/page';
import RunReportPage from '@/app/(app)/runs/[runId]/report/page';
import SignInPage from '@/app/(auth)/sign-in/page';
import ResetPasswordPage from '@/app/(auth)/reset-password/page';
import SetPasswordPage from '@/app/(auth)/set-password/page';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { requestPasswordReset } from '@/app/(auth)/reset-password/actions';
import { setPasswordWithToken } from '@/app/(auth)/set-password/actions';
import { signOut } from '@/app/(app)/actions';
import { changePassword, saveAlertPreferences } from '@/app/(app)/account/actions';
import ComparePage from '@/app/(app)/compare/page';
import { GET as compareCsv } from '@/app/api/compare/csv/route';
import { changeRole, inviteUser, resendInvite, setActive } from '@/app/(app)/admin/users/actions';
import { addAnnotation, addComment, changeOwnNote, decideRun } from '@/app/(app)/runs/[runId]/actions';
import { GET as runSeries } from '@/app/api/runs/[id]/series/route';
import { listDesigns } from '@/db/queries/designs';
import { createShopMaterial, findShopMaterial } from '@/db/queries/materials';
import { GET as listDesignsRoute, POST as importDesignRoute } from '@/app/api/designs/route';
import { GET as readDesignRoute } from '@/app/api/designs/[designId]/route';
import { POST as newRevisionRoute } from '@/app/api/designs/[designId]/revisions/route';
import { GET as exportDesignRoute } from '@/app/api/designs/[designId]/export/route';
import { GET as listMaterialsRoute, POST as createMaterialRoute } from '@/app/api/materials/route';
import { GET as readMaterialRoute, PUT as changeMaterialRoute } from '@/app/api/materials/[name]/route';
import DesignsPage from '@/app/(app)/designs/page';
import DesignPage from '@/app/(app)/designs/[designId]/page';
import EditDesignPage from '@/app/(app)/designs/[designId]/edit/page';
import CompareRevisionsPage from '@/app/(app)/designs/[designId]/compare/page';
import MaterialsPage from '@/app/(app)/materials/page';
import MaterialPage from '@/app/(app)/materials/[name]/page';
import NewMaterialPage from '@/app/(app)/materials/new/page';
import EditMaterialPage from '@/app/(app)/materials/[name]/edit/page';
import { importDesign, saveDesign } from '@/app/(app)/designs/actions';
import { adoptIndex, createMaterial, updateMaterial } from '@/app/(app)/materials/actions';
import { GET as listRunsRoute, POST as uploadRunRoute } from '@/app/api/runs/route';
import { GET as readRunRoute } from '@/app/api/runs/[id]/route';
import { GET as rawTraceRoute } from '@/app/api/runs/[id]/trace/route';
import { GET as resultsCsvRoute } from '@/app/api/runs/[id]/results.csv/route';
import { POST as reanalyseRoute } from '@/app/api/runs/[id]/analyses/route';
import { GET as readAnalysisRoute } from '@/app/api/analyses/[id]/route';
import UploadPage from '@/app/(app)/runs/upload/page';
import ChamberTokensPage from '@/app/(app)/admin/chamber-tokens/page';
import { createChamberTokenAction, revokeChamberTokenAction } from '@/app/(app)/admin/chamber-tokens/actions';
import { latestAnalyses } from '@/db/queries/analyses';
import { getRequest, params, uploadRequest } from '../apiHelpers';
import { form, uniqueEmail } from '../helpers';

/** Who asks. Chamber tokens join here (and get a column in every row) once they exist. */
export const principals = ['anonymous', ...roles] as const;
export type Principal = (typeof principals)[number];

/**
 * What a cell expects: `yes` (page rendered, action or handler did its work or refused the input),
 * `sign-in` (redirect to /sign-in, `unauthorized:session`, 401), `forbidden` (403 page,
 * `forbidden:role`, 403), `home` (redirect to /), or a route handler's own word (`up`, `details`).
 */
export type Expect = 'yes' | 'sign-in' | 'forbidden' | 'home' | 'up' | 'details';
export type Cells = Record<Principal, Expect>;

export type Row = { key: string; call: (who: Principal) => Promise<unknown>; expect: Cells };

const cells = (f: (p: Principal) => Expect): Cells => Object.fromEntries(principals.map((p) => [p, f(p)])) as Cells;
/** Signed-in users with one of these roles; anonymous visitors go to sign-in, other roles get 403. */
const only = (...allowed: Role[]): Cells => cells((p) => (p === 'anonymous' ? 'sign-in' : allowed.includes(p) ? 'yes' : 'forbidden'));
const signedIn = only(...roles);
const everyone = cells(() => 'yes');

const page = (path: string, call: Row['call'], expect: Cells): Row => ({ key: `page ${path}`, call, expect });
const route = (methodAndPath: string, call: Row['call'], expect: Cells): Row => ({ key: methodAndPath, call, expect });
const action = (fileAndName: string, call: Row['call'], expect: Cells): Row => ({ key: `action ${fileAndName}`, call, expect });

const noSearch = { searchParams: Promise.resolve({}) };
async function aRun() {
  const [run] = await listRuns(1);
  if (!run) throw new Error('the test database has no run (seed:sample-runs)');
  return { params: Promise.resolve({ runId: String(run.id) }), searchParams: Promise.resolve({}) };
}
const NO_USER = 2147483647;
async function aRunId(): Promise<string> {
  const [run] = await listRuns(1);
  if (!run) throw new Error('the test database has no run (seed:sample-runs)');
  return String(run.id);
}
/** Note actions on a run that does not exist: past the access check they answer not_found (a `yes`). */
const NO_RUN = 2147483647;

async function aDesign() {
  const [d] = await listDesigns();
  if (!d) throw new Error('the test database has no design (seed:sample-runs)');
  return { params: Promise.resolve({ designId: String(d.id) }), searchParams: Promise.resolve({}) };
}
/** A shop material for the rows that need one (built-ins have no edit page). */
const SHOP_MATERIAL = 'LK-access-table-film';
async function aShopMaterial() {
  if (!(await findShopMaterial(SHOP_MATERIAL))) {
    await createShopMaterial({ name: SHOP_MATERIAL, model: { model: 'constant', n: 1.46, k: 0 }, description: 'for the access table', source: 'invented for a test' }, null as unknown as number);
  }
  return { params: Promise.resolve({ name: SHOP_MATERIAL }) };
}
const jsonRequest = (url: string, method: string, body: unknown) =>
  new Request(`http://localhost${url}`, { method, body: JSON.stringify(body), headers: { 'content-type': 'application/json' } });
/** A well-formed design file whose layer names no material: past the access check it is refused at its key. */
const faultyDesign = { format: 'fringelog.design/1', name: 'access table', referenceWavelengthNm: 550, substrate: 'crown-glass-1.52', layers: [{ material: 'no-such-film', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } }] };
const designFileForm = () => {
  const f = new FormData();
  f.set('file', new File([JSON.stringify(faultyDesign)], 'access.json', { type: 'application/json' }));
  return f;
};
const editors = only('engineer', 'admin');

async function anAnalysisId(): Promise<string> {
  const byMode = await latestAnalyses(Number(await aRunId()));
  const a = byMode.refit ?? byMode.sequential;
  if (!a) throw new Error('the first run has no analysis');
  return String(a.analysis.id);
}
/** An upload every caller may send: past the access check it is refused (unknown design), storing nothing. */
const refusedUpload = () => uploadRequest({ design: 'no such design', chamber: 'Bay 1 e-beam', runCode: 'ACCESS-0' }, { name: 'access.csv', bytes: 'time_s,signal\n0,0.9\n' });
const reanalysis = () => new Request('http://localhost/api/runs/x/analyses', { method: 'POST', body: JSON.stringify({ mode: 'refit' }), headers: { 'content-type': 'application/json' } });

export const accessTable: Row[] = [
  page('/', () => HomePage(), signedIn),
  page('/account', () => AccountPage(), signedIn),
  page('/admin/users', () => UsersPage(), only('admin')),
  page('/admin/mail', () => MailPage(), only('admin')),
  page('/audit', () => AuditPage(), only('supervisor', 'admin')),
  page('/runs', () => RunsPage({ searchParams: Promise.resolve({}) }), signedIn),
  page('/runs/[runId]', async () => { const p = await aRun(); await RunLayout({ children: null, params: p.params }); return RunPage(p); }, signedIn),
  page('/runs/[runId]/report', async () => { const p = await aRun(); await RunLayout({ children: null, params: p.params }); return RunReportPage(p); }, signedIn),
  page('/sign-in', () => SignInPage(noSearch), cells((p) => (p === 'anonymous' ? 'yes' : 'home'))),
  page('/reset-password', () => Promise.resolve(ResetPasswordPage()), everyone),
  page('/set-password', () => SetPasswordPage({ searchParams: Promise.resolve({ token: 'no-such-token-000000000' }) }), everyone),
  page('/compare', () => ComparePage(noSearch), signedIn),
  route('GET /api/compare/csv', () => compareCsv(new Request('http://localhost/api/compare/csv?table=layers')), signedIn),
  route('GET /api/runs/[id]/series', async () => runSeries(new Request('http://localhost/api/runs/x/series'), { params: Promise.resolve({ id: await aRunId() }) }), signedIn),
  page('/designs', () => DesignsPage(), signedIn),
  page('/designs/[designId]', async () => DesignPage(await aDesign()), signedIn),
  page('/designs/[designId]/compare', async () => CompareRevisionsPage({ ...(await aDesign()), searchParams: Promise.resolve({ a: '1', b: '1' }) }), signedIn),
  page('/designs/[designId]/edit', async () => EditDesignPage(await aDesign()), editors),
  page('/materials', () => MaterialsPage(), signedIn),
  page('/materials/[name]', () => MaterialPage({ params: Promise.resolve({ name: 'SiO2' }) }), signedIn),
  page('/materials/new', () => NewMaterialPage(), editors),
  page('/materials/[name]/edit', async () => EditMaterialPage(await aShopMaterial()), editors),
  route('GET /api/designs', () => listDesignsRoute(), signedIn),
  route('POST /api/designs', () => importDesignRoute(jsonRequest('/api/designs', 'POST', faultyDesign)), editors),
  route('GET /api/designs/[designId]', async () => readDesignRoute(new Request('http://localhost/api/designs/x'), { params: (await aDesign()).params }), signedIn),
  route('POST /api/designs/[designId]/revisions', async () => newRevisionRoute(jsonRequest('/api/designs/x/revisions', 'POST', faultyDesign), { params: (await aDesign()).params }), editors),
  route('GET /api/designs/[designId]/export', async () => exportDesignRoute(new Request('http://localhost/api/designs/x/export?revision=1'), { params: (await aDesign()).params }), signedIn),
  route('GET /api/materials', () => listMaterialsRoute(), signedIn),
  route('POST /api/materials', () => createMaterialRoute(jsonRequest('/api/materials', 'POST', { name: 'SiO2', model: { model: 'constant', n: 1.46 } })), editors),
  route('GET /api/materials/[name]', () => readMaterialRoute(new Request('http://localhost/api/materials/SiO2'), { params: Promise.resolve({ name: 'SiO2' }) }), signedIn),
  route('PUT /api/materials/[name]', () => changeMaterialRoute(jsonRequest('/api/materials/x', 'PUT', { name: 'LK-no-such-film', model: { model: 'constant', n: 1.46 } }), { params: Promise.resolve({ name: 'LK-no-such-film' }) }), editors),
  page('/runs/upload', () => UploadPage(), signedIn),
  page('/admin/chamber-tokens', () => ChamberTokensPage(), only('admin')),
  route('GET /api/runs', () => listRunsRoute(getRequest('/api/runs')), signedIn),
  route('POST /api/runs', () => uploadRunRoute(refusedUpload()), signedIn),
  route('GET /api/runs/[id]', async () => readRunRoute(getRequest('/api/runs/x'), params(await aRunId())), signedIn),
  route('GET /api/runs/[id]/trace', async () => rawTraceRoute(getRequest('/api/runs/x/trace'), params(await aRunId())), signedIn),
  route('GET /api/runs/[id]/results.csv', async () => resultsCsvRoute(getRequest('/api/runs/x/results.csv'), params(await aRunId())), signedIn),
  route('POST /api/runs/[id]/analyses', () => reanalyseRoute(reanalysis(), params(NO_RUN)), editors),
  route('GET /api/analyses/[id]', async () => readAnalysisRoute(getRequest('/api/analyses/x'), params(await anAnalysisId())), signedIn),
  route('GET /api/health', () => health(), cells((p) => (p === 'admin' ? 'details' : 'up'))),
  action('(auth)/sign-in#signIn', () => signIn(null, form({ email: uniqueEmail('table'), password: 'wrong-password-1' })), everyone),
  action('(auth)/reset-password#requestPasswordReset', () => requestPasswordReset(null, form({ email: uniqueEmail('table') })), everyone),
  action('(auth)/set-password#setPasswordWithToken', () => setPasswordWithToken(null, form({ token: 'no-such-token-000000000', password: 'table-pass-123', confirm: 'table-pass-123' })), everyone),
  action('(app)#signOut', () => signOut(), everyone),
  action('(app)/account#changePassword', () => changePassword(null, form({ current: 'not-the-password-1', password: 'table-pass-123', confirm: 'table-pass-123' })), signedIn),
  action('(app)/account#saveAlertPreferences', () => saveAlertPreferences(null, form({ outOfTolerance: 'on' })), only('engineer', 'supervisor')),
  action('(app)/runs/[runId]#addAnnotation', () => addAnnotation(null, form({ runId: NO_RUN, body: 'table row', timeS: 1 })), only('operator', 'engineer', 'supervisor')),
  action('(app)/runs/[runId]#addComment', () => addComment(null, form({ runId: NO_RUN, body: 'table row' })), only('operator', 'engineer', 'supervisor')),
  action('(app)/runs/[runId]#changeOwnNote', () => changeOwnNote(null, form({ runId: NO_RUN, noteId: NO_RUN, kind: 'comment', body: 'x' })), only('operator', 'engineer', 'supervisor')),
  action('(app)/runs/[runId]#decideRun', () => decideRun(null, form({ runId: NO_RUN, disposition: 'on_hold', reason: 'table row' })), only('engineer', 'supervisor')),
  action('(app)/designs#saveDesign', () => saveDesign(null, form({ designId: NO_RUN, document: JSON.stringify(faultyDesign) })), editors),
  action('(app)/designs#importDesign', () => importDesign(null, designFileForm()), editors),
  action('(app)/materials#createMaterial', () => createMaterial(null, form({ input: JSON.stringify({ name: 'SiO2', model: { model: 'constant', n: 1.46 } }) })), editors),
  action('(app)/materials#updateMaterial', () => updateMaterial(null, form({ name: 'LK-no-such-film', input: JSON.stringify({ name: 'LK-no-such-film', model: { model: 'constant', n: 1.46 } }) })), editors),
  action('(app)/materials#adoptIndex', () => adoptIndex(null, form({ name: 'LK-no-such-film', wavelengthNm: 550 })), editors),
  action('(app)/admin/chamber-tokens#createChamberTokenAction', () => createChamberTokenAction(null, form({ chamberId: NO_RUN, label: 'access table row' })), only('admin')),
  action('(app)/admin/chamber-tokens#revokeChamberTokenAction', () => revokeChamberTokenAction(null, form({ tokenId: NO_RUN })), only('admin')),
  action('(app)/admin/users#inviteUser', () => inviteUser(null, form({ email: uniqueEmail('table'), name: 'Table Row', role: 'operator' })), only('admin')),
  action('(app)/admin/users#resendInvite', () => resendInvite(null, form({ userId: NO_USER })), only('admin')),
  action('(app)/admin/users#changeRole', () => changeRole(null, form({ userId: NO_USER, role: 'operator' })), only('admin')),
  action('(app)/admin/users#setActive', () => setActive(null, form({ userId: NO_USER, active: 'false' })), only('admin')),
];
