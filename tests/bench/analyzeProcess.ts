// Issue 7's speed case for `npm run bench`: a 40-layer, 5-chip, 8·10⁵-sample trace from the
// chamber simulator (tests/chamber, every chamber effect on), the whole `analyze` CLI process in
// refit mode (spawned: start-up, parse, fit, JSON out), median of a few runs, and whether every
// layer is within its tolerance against the truth. Prints figures; asserts nothing.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parseDesign } from '../../analysis/design';
import { gradeAgainst } from '../../analysis/design/tolerance';
import { chamberCsv, simulateChamberRun } from '../chamber';
import { mirrorDesign, REAL_CHAMBER } from '../chamber/scenarios';

const root = path.resolve(import.meta.dirname, '../..');
const RUNS = 3;

export async function run(): Promise<void> {
  const json = mirrorDesign(40, 8);
  const options = { ...REAL_CHAMBER, rateNmPerS: { H: 0.25, L: 0.5 }, seed: 40 };
  // size the interval so the run has about 8·10⁵ samples
  const probe = simulateChamberRun(json, { ...options, sampleIntervalS: 0.1 });
  const t0 = performance.now();
  const sim = simulateChamberRun(json, { ...options, sampleIntervalS: (0.1 * probe.timeS.length) / 800_000 });
  const simMs = performance.now() - t0;
  const dir = mkdtempSync(path.join(tmpdir(), 'fringelog-bench-'));
  const designFile = path.join(dir, 'design.json'), traceFile = path.join(dir, 'trace.csv');
  writeFileSync(designFile, JSON.stringify(json));
  const csv = chamberCsv(sim);
  writeFileSync(traceFile, csv);
  console.log(`analyze process: 40 layers, 5 chips, ${sim.timeS.length.toLocaleString('en')} samples (${(csv.length / 2 ** 20).toFixed(0)} MB CSV; simulated in ${simMs.toFixed(0)} ms), refit`);

  const times: number[] = [];
  let out = '';
  for (let i = 0; i < RUNS; i++) {
    const s = performance.now();
    const r = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [path.join(root, 'analysis/cli/analyze.ts'), '--design', designFile, '--trace', traceFile, '--mode', 'refit'], {
      cwd: root, encoding: 'utf8', maxBuffer: 256 * 2 ** 20,
    });
    times.push(performance.now() - s);
    if (r.status !== 0) {
      console.log(`  analyze failed (exit ${r.status}): ${r.stderr.trim().slice(0, 300)}`);
      rmSync(dir, { recursive: true, force: true });
      return;
    }
    out = r.stdout;
  }
  times.sort((a, b) => a - b);
  console.log(`  whole process, median of ${RUNS}: ${(times[RUNS >> 1] / 1000).toFixed(2)} s (min ${(times[0] / 1000).toFixed(2)} s; issue 7 target ≤ 1.5 s)`);

  // Each layer's estimation errors (thickness %, index, cut error % QWOT) graded against its tolerance.
  const design = parseDesign(json);
  const result = JSON.parse(out) as { layers: { layer: number; thicknessNm: number; index: number; cutErrorQwotPct: number }[] };
  const grades = { within: 0, near: 0, outside: 0 };
  let worst = 0;
  for (const l of result.layers) {
    const t = sim.truth.layers[l.layer - 1];
    const tol = design.layers[l.layer - 1].tolerance;
    const errPct = (l.thicknessNm / t.thicknessNm - 1) * 100;
    worst = Math.max(worst, Math.abs(errPct));
    const g = [gradeAgainst(errPct, tol.thicknessPct), gradeAgainst(l.index - t.index, tol.indexAbs), gradeAgainst(l.cutErrorQwotPct - t.cutErrorQwotPct, tol.cutErrorQwotPct)];
    grades[g.includes('outside') ? 'outside' : g.includes('near') ? 'near' : 'within']++;
  }
  const missing = design.layers.length - result.layers.length;
  console.log(`  layers against the truth, graded on their tolerance: ${grades.within} within, ${grades.near} near, ${grades.outside} outside, ${missing} without a result (worst thickness error ${worst.toFixed(2)} %)`);
  rmSync(dir, { recursive: true, force: true });
}

if (process.argv[1]?.endsWith('analyzeProcess.ts')) await run();
