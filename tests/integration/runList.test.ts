import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { GET as listRuns } from '@/app/api/runs/route';
import { errorOf, getRequest } from './apiHelpers';
import { signInDemo } from './helpers';

afterAll(async () => {
  await closeDb();
});

type Page = { runs: { runCode: string; chamber: string; flagged: boolean; analysisState: string; cutsOutsideTolerance: number; warningCount: number; startedAt: string }[]; total: number };
// The seven sample runs (the shop history's codes look alike, so they are named).
const sampleCodes = ['B1-0412', 'B1-0413', 'B2-0587', 'B2-0588', 'B3-1120', 'B3-1121', 'B3-1122'];
const demo = { test: (code: string) => sampleCodes.includes(code) };

async function list(query: string): Promise<Page> {
  const res = await listRuns(getRequest(`/api/runs?${query}`));
  expect(res.status).toBe(200);
  return (await res.json()) as Page;
}

describe('GET /api/runs: filters, sort and pages', () => {
  it('filters by chamber, design and start date; the total counts every match', async () => {
    await signInDemo('supervisor');
    const bay3 = await list('chamber=Bay 3 sputter&pageSize=200');
    expect(bay3.runs.filter((r) => demo.test(r.runCode)).map((r) => r.runCode).sort()).toEqual(['B3-1120', 'B3-1121', 'B3-1122']);
    expect(new Set(bay3.runs.map((r) => r.chamber))).toEqual(new Set(['Bay 3 sputter']));
    expect(bay3.total).toBe(bay3.runs.length);
    const dated = await list('from=2026-11-09&to=2026-11-10');
    expect(dated.runs.map((r) => r.runCode).sort()).toEqual(['B3-1120', 'B3-1121']);
    const ar1 = await list(`design=${encodeURIComponent('Larkspur LK-AR1 single-layer MgF2 antireflection on crown glass')}&pageSize=200`);
    expect(ar1.runs.every((r) => r.chamber === 'Bay 1 e-beam')).toBe(true);
  });

  it('flags the run cut outside tolerance (the overshoot run) and not the clean one; the flag filter agrees', async () => {
    await signInDemo('operator');
    const all = await list('pageSize=200');
    const overshoot = all.runs.find((r) => r.runCode === 'B1-0413');
    // sample-traces/README.md: B1-0413 was cut late, well past the shop default of 2 % QWOT
    expect(overshoot).toMatchObject({ flagged: true, analysisState: 'done' });
    expect(overshoot!.cutsOutsideTolerance).toBeGreaterThan(0);
    expect(all.runs.find((r) => r.runCode === 'B2-0587')).toMatchObject({ flagged: false, cutsOutsideTolerance: 0, warningCount: 0 });
    // the clean run: its analyses' only message is the start-up delay's note (what the analysis did),
    // which neither counts as a warning nor flags it (db/queries/runNotes.ts)
    expect(all.runs.find((r) => r.runCode === 'B1-0412')).toMatchObject({ flagged: false, cutsOutsideTolerance: 0, warningCount: 0 });
    const flagged = await list('flagged=true&pageSize=200');
    expect(flagged.runs.every((r) => r.flagged)).toBe(true);
    expect(flagged.runs.map((r) => r.runCode)).toContain('B1-0413');
    const calm = await list('flagged=false&pageSize=200');
    expect(calm.runs.every((r) => !r.flagged)).toBe(true);
    expect(flagged.total + calm.total).toBe(all.total);
    const done = await list('state=done&pageSize=200');
    expect(done.runs.every((r) => r.analysisState === 'done')).toBe(true);
  });

  it('sorts and pages on the server', async () => {
    await signInDemo('engineer');
    const sorted = await list('sort=runCode&pageSize=200');
    const codes = sorted.runs.map((r) => r.runCode);
    expect(codes).toEqual([...codes].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
    const first = await list('sort=runCode&pageSize=2&page=1');
    const second = await list('sort=runCode&pageSize=2&page=2');
    expect(first.runs.map((r) => r.runCode)).toEqual(codes.slice(0, 2));
    expect(second.runs.map((r) => r.runCode)).toEqual(codes.slice(2, 4));
    expect(second.total).toBe(sorted.total);
    const past = await list(`sort=runCode&pageSize=2&page=${sorted.total + 5}`);
    expect(past).toMatchObject({ runs: [], total: sorted.total });
  });

  it('a bad query parameter is a 400 naming it', async () => {
    await signInDemo('operator');
    expect(await errorOf(await listRuns(getRequest('/api/runs?pageSize=5000')), 400)).toMatchObject({ field: 'pageSize' });
    expect(await errorOf(await listRuns(getRequest('/api/runs?from=03/11/2026')), 400)).toMatchObject({ field: 'from' });
    expect(await errorOf(await listRuns(getRequest('/api/runs?state=finished')), 400)).toMatchObject({ field: 'state' });
  });
});
