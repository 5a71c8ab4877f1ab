import fs from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseDesign } from '@/analysis/design';
import { linearTrend } from '@/analysis/stats';
import { historyStories, HISTORY_START, shopHistory, synthesizeRun, traceCsv } from '@/analysis/synth';
import { readTraceText } from '@/analysis/trace';
import { closeDb } from '@/db/client';
import { analyseStoredRun } from '@/db/jobs/analyseStoredRun';
import { findChamberByName } from '@/db/queries/chambers';
import { latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { listComparableDesigns } from '@/db/queries/compare';
import { sampleTracesDir } from '@/db/seed/sampleRuns';
import { roles } from '@/db/schema';
import { sendAnalysisAlerts } from '@/app/_lib/alerts';
import { saveAlertPreferences } from '@/app/(app)/account/actions';
import ComparePage from '@/app/(app)/compare/page';
import { loadComparison } from '@/app/(app)/compare/loadComparison';
import { GET as compareCsv } from '@/app/api/compare/csv/route';
import { listCaughtMail } from '@/db/queries/mail';
import { anonymous, demo, form, interruptOf, signInDemo, textOf, waitForMail } from './helpers';

afterAll(async () => {
  await closeDb();
});

const bbar4 = 'bbar4-visible.json';
const designDoc = () => JSON.parse(fs.readFileSync(path.join(sampleTracesDir, bbar4), 'utf8')) as unknown;

async function bbar4Id(): Promise<number> {
  const name = parseDesign(designDoc(), bbar4).name;
  const d = (await listComparableDesigns()).find((x) => x.name === name);
  if (!d) throw new Error('the demo history has no four-layer AR runs');
  return d.id;
}

const historyOnly = { from: '2026-09-07', to: '2026-10-30', chamber: [], shift: [] };

describe('compare over the seeded shop history (known truth: analysis/synth shopHistory)', () => {
  it('finds the shift that cuts layer 3 late, and only that layer stands out by far', async () => {
    const c = await loadComparison({ ...historyOnly, design: await bbar4Id(), metric: 'cut' });
    const row = c.byShift.rows.find((r) => r.layer === historyStories.lateShift.layer)!;
    const night = row.cells[historyStories.lateShift.shift]!;
    for (const other of ['early', 'day']) expect(night.mean! - row.cells[other]!.mean!).toBeGreaterThan(1.5);
    expect(row.difference.test).toBe('welch-anova');
    expect(row.difference.test && row.difference.pValue).toBeLessThan(1e-6);
    // Layers 1 and 2 were cut alike on every shift: no difference anywhere near that strong.
    for (const layer of [1, 2]) {
      const d = c.byShift.rows.find((r) => r.layer === layer)!.difference;
      expect(d.test && d.pValue).toBeGreaterThan(0.001);
    }
  });

  it("recovers Bay 3's high-index drift per week and Bay 1's tooling step at the maintenance date", async () => {
    const c = await loadComparison({ ...historyOnly, design: await bbar4Id(), metric: 'index', layer: 3 });
    const bay3 = c.control!.points.filter((p) => p.chamber === historyStories.drift.chamber);
    const weeks = bay3.map((p) => (p.startedAt.getTime() - HISTORY_START.getTime()) / (7 * 86400e3));
    const trend = linearTrend(weeks, bay3.map((p) => p.value));
    expect(trend.slope).toBeCloseTo(historyStories.drift.perWeek, 3); // −0.0035 per week built in, ±0.0005
    expect(c.control!.ok && c.control!.signals.some((s) => bay3.some((p) => p.runId === c.control!.points[s.index].runId))).toBe(true);

    const step = historyStories.toolingStep;
    const h = c.tooling.filter((p) => p.chamber === step.chamber && p.material === step.material);
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    const before = mean(h.filter((p) => p.startedAt < step.maintenance).map((p) => p.value));
    const after = mean(h.filter((p) => p.startedAt >= step.maintenance).map((p) => p.value));
    expect(Math.abs(before - step.before)).toBeLessThan(0.01);
    expect(Math.abs(after - step.after)).toBeLessThan(0.01);
  });

  it('the history holds about a hundred runs across three chambers and three shifts', () => {
    const plan = shopHistory();
    expect(plan.length).toBeGreaterThan(80);
    expect(new Set(plan.map((p) => `${p.chamber}/${p.shift}`)).size).toBe(9);
  });
});

describe('the compare page and its CSV', () => {
  it('are open to every role and closed to the signed-out', async () => {
    anonymous();
    expect(await interruptOf(() => ComparePage({ searchParams: Promise.resolve({}) }))).toEqual({ kind: 'redirect', location: '/sign-in' });
    expect((await compareCsv(new Request('http://localhost/api/compare/csv?table=layers'))).status).toBe(401);
    for (const role of roles) {
      await signInDemo(role);
      expect(textOf(await ComparePage({ searchParams: Promise.resolve({ metric: 'cut' }) }))).toContain('Compare runs');
      const res = await compareCsv(new Request(`http://localhost/api/compare/csv?table=layers&design=${await bbar4Id()}`));
      expect(res.status).toBe(200);
      expect((await res.text()).split('\r\n')[0]).toBe('layer,material,runs,thickness_n,thickness_mean,thickness_sd,thickness_out_of_tolerance,thickness_limit,index_n,index_mean,index_sd,index_out_of_tolerance,index_limit,cut_n,cut_mean,cut_sd,cut_out_of_tolerance,cut_limit');
    }
  });

  it('answers a bad selection with a message naming the field', async () => {
    await signInDemo('supervisor');
    const res = await compareCsv(new Request('http://localhost/api/compare/csv?table=layers&to=2026-02-30'));
    expect(res.status).toBe(400);
    expect(await res.json()).toEqual({ error: { code: 'bad_request:input', message: 'to: is not a real date' } });
  });
});

describe('tolerance alerts', () => {
  it('e-mail the engineer who opted in about a late-cut run, with a link to it; not the supervisor who did not, never the operator', async () => {
    await signInDemo('operator');
    const refused = await saveAlertPreferences(null, form({ outOfTolerance: 'on' }));
    expect(refused.ok).toBe(false);
    await signInDemo('supervisor');
    expect((await saveAlertPreferences(null, form({}))).ok).toBe(true);
    await signInDemo('engineer');
    expect((await saveAlertPreferences(null, form({ outOfTolerance: 'on', controlRules: 'on' }))).ok).toBe(true);

    const design = parseDesign(designDoc(), bbar4);
    const revision = (await latestDesignRevision(design.name))!;
    const chamber = (await findChamberByName('Bay 2 IAD'))!;
    const planned = shopHistory().find((p) => p.chamber === 'Bay 2 IAD' && p.shift === 'day')!;
    // Layer 3 cut 5 % late: about +9 % QWOT, beyond the ±2 % limit and far beyond Bay 2's history.
    const csv = traceCsv(synthesizeRun(design, { ...planned.options, seed: 99001, overshoot: { 3: 0.05 } }));
    const trace = await readTraceText(csv, { fileName: 'b2-alert-1.csv', layerCount: design.layers.length });
    const { run } = await createRunWithTrace({
      designRevisionId: revision.id, chamberId: chamber.id, runCode: 'B2-ALERT-1', shift: 'day', operatorName: 'Tomasz Quill',
      startedAt: new Date('2026-11-20T14:00:00Z'), uploadedBy: null,
      trace: { fileName: 'b2-alert-1.csv', bytes: Buffer.from(csv), rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
    });
    const before = Math.max(0, ...(await listCaughtMail(200)).map((m) => m.id));
    let mailed: string[] = [];
    const outcome = await analyseStoredRun(run.id, 'refit', { onStored: async (id) => (mailed = await sendAnalysisAlerts(id)) });
    expect(outcome.state).toBe('done');
    expect(mailed).toEqual([demo('engineer').email]);
    const mail = await waitForMail(demo('engineer').email, /B2-ALERT-1/, before);
    expect(mail.subject).toBe('Fringelog: run B2-ALERT-1 out of tolerance and control-chart rule');
    expect(mail.textBody).toMatch(/layer 3 \(H\): cut error, % QWOT \d+\.\d\d, limit ±2/);
    expect(mail.textBody).toContain('rule 1 (one point beyond 3σ)');
    expect(mail.textBody).toContain(`${process.env.APP_URL}/runs/${run.id}?mode=refit`);
    expect((await listCaughtMail(200)).filter((m) => m.id > before && m.envelopeTo.includes(demo('supervisor').email))).toEqual([]);
  });
});
