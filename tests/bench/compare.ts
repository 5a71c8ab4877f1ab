// Compare-page figures for `npm run bench`: a year of runs (three chambers, three shifts, two
// designs, both analysis modes: thousands of analyses) inserted by SQL into a scratch database
// `fringelog_bench` (recreated each time; the cluster is the one `npm start` uses), then each
// compare query and the whole page's load timed (median of five after one warm-up); the scratch
// database is dropped afterwards.
import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
// @ts-expect-error plain JavaScript module of the bootstrap
import { databaseUrl, ensureDatabases, ensurePostgresInstalled, root, sessionSecret, startPostgres } from '../../db/local/bootstrap.mjs';

const BENCH_DB = 'fringelog_bench';
const WEEKS = 52;

async function median(fn: () => Promise<unknown>, times = 5): Promise<number> {
  await fn();
  const ms: number[] = [];
  for (let i = 0; i < times; i++) {
    const t0 = performance.now();
    await fn();
    ms.push(performance.now() - t0);
  }
  return ms.sort((a, b) => a - b)[Math.floor(times / 2)];
}

export async function run(): Promise<void> {
  const pg = await startPostgres(ensurePostgresInstalled());
  const password = ensureDatabases(pg, [BENCH_DB], { recreate: [BENCH_DB] });
  process.env.DATABASE_URL = databaseUrl(password, BENCH_DB);
  process.env.SESSION_SECRET ??= sessionSecret();
  process.env.SMTP_URL ??= 'smtp://127.0.0.1:1';
  const { db, closeDb } = await import('../../db/client');
  const { loadComparison } = await import('../../app/(app)/compare/loadComparison');
  const q = await import('../../db/queries/compare');
  try {
    await migrate(db(), { migrationsFolder: path.join(root, 'drizzle') });
    const t0 = performance.now();
    const designs: { file: string; id: number; layers: number }[] = [];
    for (const file of ['bbar4-visible.json', 'hr17-mirror-600.json']) {
      const doc = JSON.parse(fs.readFileSync(path.join(root, 'sample-traces', file), 'utf8')) as { name: string; layers: unknown[] };
      const [d] = (await db().execute<{ id: number }>(sql`insert into designs (name) values (${doc.name}) returning id`)).rows;
      await db().execute(sql`insert into design_revisions (design_id, revision, document, name, reference_wavelength_nm, layer_count)
        values (${d.id}, 1, ${JSON.stringify(doc)}::jsonb, ${doc.name}, 550, ${doc.layers.length})`);
      designs.push({ file, id: d.id, layers: doc.layers.length });
    }
    await db().execute(sql`insert into chambers (name, process) values ('Bench 1', 'e-beam'), ('Bench 2', 'IAD'), ('Bench 3', 'sputter')`);
    // Every working day of the year, each chamber runs both designs on one of three shifts.
    await db().execute(sql`select setseed(0.42)`);
    await db().execute(sql`
      insert into runs (design_revision_id, chamber_id, run_code, shift, started_at, status)
      select dr.id, c.id, 'R' || dr.id || '-' || d, (array['early','day','night'])[1 + (d + c.id) % 3],
        timestamptz '2025-01-06 06:00+00' + (d / 5 * 7 + d % 5) * interval '1 day' + ((d + c.id) % 3) * interval '8 hours', 'analysed'
      from design_revisions dr cross join chambers c cross join generate_series(0, ${WEEKS * 5 - 1}) d`);
    await db().execute(sql`insert into analyses (run_id, mode, state, finished_at) select r.id, m::analysis_mode, 'done', now() from runs r cross join unnest(array['sequential','refit']) m`);
    await db().execute(sql`
      insert into layer_results (analysis_id, layer, material, thickness_nm, thickness_sigma_nm, index, index_sigma, rate_nm_per_s, cut_error_qwot_pct, residual_rms, detail)
      select a.id, l, case when l % 2 = 1 then 'H' else 'L' end, 100 * (1 + 0.01 * (random() - 0.5)), 0.2,
        case when l % 2 = 1 then 2.1 else 1.46 end + 0.01 * (random() - 0.5), 0.001, 0.4, 2 * (random() - 0.5), 0.001,
        jsonb_build_object('designThicknessNm', 100, 'nominalIndex', case when l % 2 = 1 then 2.1 else 1.46 end, 'indexHeld', false,
          'opticalToCrystalRatio', case when r.chamber_id % 3 = 1 then 1.05 + 0.01 * random() end)
      from analyses a join runs r on r.id = a.run_id join design_revisions dr on dr.id = r.design_revision_id cross join generate_series(1, dr.layer_count) l`);
    await db().execute(sql`analyze`);
    const counts = (await db().execute<{ runs: number; analyses: number; layers: number }>(sql`
      select (select count(*) from runs)::int as runs, (select count(*) from analyses)::int as analyses, (select count(*) from layer_results)::int as layers`)).rows[0];
    console.log(`compare: a year of runs inserted in ${((performance.now() - t0) / 1000).toFixed(1)} s: ${counts.runs} runs, ${counts.analyses} analyses, ${counts.layers} layer results`);
    for (const d of designs) {
      const filter = { designId: d.id, revision: null, from: new Date('2025-01-01'), to: new Date('2026-01-01'), chamberIds: [], shifts: [], mode: 'refit' as const };
      const figures: [string, number][] = [
        ['per layer', await median(() => q.compareLayerSummary(filter))],
        ['by shift', await median(() => q.compareGroupStats(filter, 'shift', 'cut'))],
        ['by chamber', await median(() => q.compareGroupStats(filter, 'chamber', 'cut'))],
        ['control series', await median(() => q.compareSeries(filter, 3, 'cut'))],
        ['index history', await median(() => q.compareIndexHistory(filter))],
        ['tooling history', await median(() => q.compareToolingHistory(filter))],
        ['whole page (loadComparison)', await median(() => loadComparison({ design: d.id, from: '2025-01-01', to: '2025-12-31', chamber: [], shift: [], mode: 'refit', metric: 'cut' }))],
      ];
      console.log(`compare ${d.file} (${d.layers} layers, ${WEEKS * 5 * 3} runs in the year), median of 5:`);
      for (const [what, ms] of figures) console.log(`  ${what.padEnd(30)} ${ms.toFixed(0).padStart(5)} ms`);
    }
  } finally {
    await closeDb();
    pg.psql(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
    pg.stop();
  }
}
