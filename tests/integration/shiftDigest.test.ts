import { randomBytes } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import PgBoss from 'pg-boss';
import fs from 'node:fs';
import path from 'node:path';
import { parseDesign } from '@/analysis/design';
import { shopHistory, synthesizeRun, traceCsv } from '@/analysis/synth';
import { readTraceText } from '@/analysis/trace';
import { analyseStoredRun } from '@/db/jobs/analyseStoredRun';
import { findChamberByName } from '@/db/queries/chambers';
import { latestDesignRevision } from '@/db/queries/designs';
import { createRunWithTrace } from '@/db/queries/runs';
import { sampleTracesDir } from '@/db/seed/sampleRuns';
import { closeDb, db } from '@/db/client';
import { env } from '@/db/env';
import { registerShiftDigests, shiftDigestQueue } from '@/db/jobs/shiftDigestSchedule';
import type { ShiftWindow } from '@/db/jobs/shifts';
import { saveAlertPreferences as storeAlertPreferences } from '@/db/queries/alerts';
import { listCaughtMail } from '@/db/queries/mail';
import { findUserIdByEmail } from '@/db/queries/users';
import { sendShiftDigest } from '@/app/_lib/shiftDigest';
import { saveAlertPreferences } from '@/app/(app)/account/actions';
import { demo, form, lastMailId, signInDemo, waitForMail } from './helpers';

const bosses: PgBoss[] = [];
afterAll(async () => {
  for (const b of bosses) await b.stop({ graceful: false, wait: true }).catch(() => undefined);
  await closeDb();
});

// The first night of the seeded shop history: Monday 7 September 2026, 22:00 to 06:00 UTC.
const night: ShiftWindow = { shift: 'night', from: new Date('2026-09-07T22:00:00Z'), to: new Date('2026-09-08T06:00:00Z') };
// A night after everything seeded, for a run of this test's own (so no other test's charts see it).
const laterNight: ShiftWindow = { shift: 'night', from: new Date('2027-01-04T22:00:00Z'), to: new Date('2027-01-05T06:00:00Z') };

/** A Bay 1 run of the four-layer AR with layer 3 cut 5 % late (about +9 % QWOT, beyond the ±2 % limit), started after midnight. */
async function lateCutRun(): Promise<{ runId: number; runCode: string }> {
  const file = 'bbar4-visible.json';
  const design = parseDesign(JSON.parse(fs.readFileSync(path.join(sampleTracesDir, file), 'utf8')) as unknown, file);
  const revision = (await latestDesignRevision(design.name))!;
  const chamber = (await findChamberByName('Bay 1 e-beam'))!;
  const planned = shopHistory().find((p) => p.chamber === 'Bay 1 e-beam' && p.designFile === file)!;
  const csv = traceCsv(synthesizeRun(design, { ...planned.options, seed: 99011, overshoot: { 3: 0.05 } }));
  const runCode = 'B1-DIGEST-1';
  const trace = await readTraceText(csv, { fileName: 'b1-digest-1.csv', layerCount: design.layers.length });
  const { run } = await createRunWithTrace({
    designRevisionId: revision.id, chamberId: chamber.id, runCode, shift: 'night', operatorName: 'Priya Oyelaran',
    startedAt: new Date('2027-01-05T01:30:00Z'), uploadedBy: null,
    trace: { fileName: 'b1-digest-1.csv', bytes: Buffer.from(csv), rowCount: trace.rowCount, columns: trace.columns, meta: trace.meta },
  });
  expect((await analyseStoredRun(run.id, 'refit')).state).toBe('done');
  return { runId: run.id, runCode };
}

describe('shift digest', () => {
  it('mails the opted-in engineer the night’s runs with the late-cut run flagged; not the supervisor who did not opt in, nor the operator', async () => {
    await signInDemo('operator');
    expect((await saveAlertPreferences(null, form({ shiftDigest: 'on' }))).ok).toBe(false);
    // Even a stored wish does not make an operator a recipient: the role decides first.
    const operatorId = (await findUserIdByEmail(demo('operator').email))!;
    await storeAlertPreferences(operatorId, { outOfTolerance: false, controlRules: false, shiftDigest: true });
    await signInDemo('supervisor');
    expect((await saveAlertPreferences(null, form({ outOfTolerance: 'on' }))).ok).toBe(true);
    await signInDemo('engineer');
    expect((await saveAlertPreferences(null, form({ shiftDigest: 'on' }))).ok).toBe(true);

    const flaggedRun = await lateCutRun();
    const before = await lastMailId();
    expect(await sendShiftDigest(laterNight)).toEqual([demo('engineer').email]);
    const mail = await waitForMail(demo('engineer').email, /night shift digest, 2027-01-04/, before);
    expect(mail.subject).toBe('Fringelog: night shift digest, 2027-01-04, 1 run, 1 flagged');
    const block = mail.textBody.split('\n\n').find((b) => b.includes(`Run ${flaggedRun.runCode}: `))!;
    expect(block).toMatch(/^\[flagged\] Run B1-DIGEST-1: Larkspur LK-BB4 .* rev\. \d+, Bay 1 e-beam, shift night, operator Priya Oyelaran, started 2027-01-05 01:30 UTC/);
    expect(block).toContain('disposition: none yet');
    const worst = /worst cut error: layer 3, (\d+\.\d\d) % QWOT against ±2 \(joint re-fit\)/.exec(block);
    expect(Number(worst?.[1])).toBeGreaterThan(5);
    // Far beyond Bay 1's history of the design: rule 1 (a point beyond 3σ) fires on its chart.
    expect(block).toContain('control-chart rule 1 on layer 3 cut');
    expect(block).toMatch(/out of tolerance: layers? ([\d]+, )*3\b/);
    expect(block).toContain(`${process.env.APP_URL}/runs/${flaggedRun.runId}?mode=refit`);
    expect(mail.textBody).toContain("Fringelog's figures are advisory; what to do with a run follows your shop's procedures.");

    // The seeded history's first night: the runs the plan started then (read from the plan, not the database), none flagged.
    const planned = shopHistory().filter((p) => p.startedAt >= night.from && p.startedAt < night.to);
    expect(planned.length).toBeGreaterThan(0);
    expect(await sendShiftDigest(night)).toEqual([demo('engineer').email]);
    const first = await waitForMail(demo('engineer').email, /night shift digest, 2026-09-07/, before);
    expect(first.subject).toBe(`Fringelog: night shift digest, 2026-09-07, ${planned.length} run${planned.length === 1 ? '' : 's'}, 0 flagged`);
    for (const p of planned) expect(first.textBody).toContain(`Run ${p.runCode}: `);
    expect(first.textBody).toMatch(/worst cut error: layer 3, \d\.\d\d % QWOT against ±2/);

    const others = (await listCaughtMail(200)).filter((m) => m.id > before && !m.envelopeTo.includes(demo('engineer').email));
    expect(others).toEqual([]);
  });

  it('sends nothing for a shift without runs', async () => {
    const before = await lastMailId();
    expect(await sendShiftDigest({ shift: 'early', from: new Date('2020-01-01T06:00:00Z'), to: new Date('2020-01-01T14:00:00Z') })).toEqual([]);
    expect((await listCaughtMail(50)).filter((m) => m.id > before && /shift digest/.test(m.subject))).toEqual([]);
  });

  it('a worker registers a schedule at each shift end with pg-boss, idempotently, and works the queue', async () => {
    const prefix = `digest-test-${randomBytes(4).toString('hex')}`;
    const windows: ShiftWindow[] = [];
    const boss = new PgBoss({ connectionString: env().DATABASE_URL, max: 2 });
    bosses.push(boss);
    await boss.start();
    await registerShiftDigests(boss, async (w) => void windows.push(w), prefix);
    // A second worker registering the same schedules leaves one row each.
    await registerShiftDigests(boss, async () => undefined, prefix);
    const rows = await db().execute<{ name: string; cron: string; timezone: string; data: { shift: string } }>(
      sql`select name, cron, timezone, data from pgboss.schedule where name like ${`${prefix}-%`} order by name`,
    );
    expect(rows.rows).toEqual([
      { name: `${prefix}-day`, cron: '0 22 * * *', timezone: 'UTC', data: { shift: 'day' } },
      { name: `${prefix}-early`, cron: '0 14 * * *', timezone: 'UTC', data: { shift: 'early' } },
      { name: `${prefix}-night`, cron: '0 6 * * *', timezone: 'UTC', data: { shift: 'night' } },
    ]);
    // What the scheduler sends at a shift end, sent by hand: the worker digests the night that ended last.
    const sentAt = Date.now();
    await boss.send(shiftDigestQueue('night', prefix), { shift: 'night' });
    const deadline = Date.now() + 30_000;
    while (windows.length === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    expect(windows).toHaveLength(1);
    const w = windows[0];
    expect(w.shift).toBe('night');
    expect(w.to.getUTCHours()).toBe(6);
    expect(w.to.getTime() - w.from.getTime()).toBe(8 * 3600e3);
    expect(w.to.getTime()).toBeLessThanOrEqual(sentAt + 1000);
    expect(w.to.getTime()).toBeGreaterThan(sentAt - 24 * 3600e3);
  });
});
