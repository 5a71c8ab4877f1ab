// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/startTransientSweep.ts 'scenario name' [seeds, e.g. 15-30]):
// what the start transient (option startTransient, fit/startTransient.ts) does to one scenario,
// seed by seed and in both modes: the run's start delay as the profiling pass reads it (δ̂ ± σ,
// kept or not), and the errors (max, RMS, 3σ coverage of d) with the option on and off; then the
// same summed over the seeds where the delay is kept and over those where it is not. The
// analysis options of FRINGELOG_ACCURACY_OPTIONS apply to both (startTransient set on each).
import { parseDesign } from '@/analysis/design';
import { analyzeRun, findStartDelay, type AnalyzeOptions } from '@/analysis/fit';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { type Mode } from '../scenarios';
import { layerErrors, summarize, type LayerError } from './accuracyTable';
import { scenarioFromArgs } from './seedList';

const MODES: Mode[] = ['sequential', 'refit'];

function line(e: LayerError[]): string {
  const s = summarize(e);
  const cov = s.coverage.thickness === null ? '—' : (s.coverage.thickness * 100).toFixed(0);
  return `${s.maxThicknessPct.toFixed(2)}/${s.rmsThicknessPct.toFixed(3)}/${cov}`;
}

async function main(): Promise<void> {
  const { scenario, seeds } = scenarioFromArgs(process.argv, 'correlated noise and rate wander, mirror');
  const extra = process.env.FRINGELOG_ACCURACY_OPTIONS ? (JSON.parse(process.env.FRINGELOG_ACCURACY_OPTIONS) as AnalyzeOptions) : {};
  const design = parseDesign(scenario.design, `${scenario.name}.json`);
  // errors by [kept?][mode][on?]
  const pools = new Map<string, LayerError[]>();
  const byPlace: { key: string; on: number; off: number }[] = [];
  const add = (k: string, e: LayerError[]) => pools.set(k, [...(pools.get(k) ?? []), ...e]);
  console.log(`${scenario.name}: per seed, max|d| % / RMS % / d within 3σ %, startTransient on → off`);
  for (const seed of seeds) {
    const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
    const trace = await readTrace(chamberCsvChunks(run), { fileName: `${scenario.name} seed ${seed}.csv`, layerCount: design.layers.length });
    const p = await findStartDelay(design, trace, { ...extra, startTransient: true });
    const kept = p?.kept ? 'kept' : 'not kept';
    const parts: string[] = [];
    for (const mode of MODES) {
      const on = layerErrors(seed, await analyzeRun(design, trace, { ...extra, mode, startTransient: true }), run.truth.layers);
      const off = layerErrors(seed, await analyzeRun(design, trace, { ...extra, mode, startTransient: false }), run.truth.layers);
      add(`${kept} ${mode} on`, on);
      add(`${kept} ${mode} off`, off);
      add(`all ${mode} on`, on);
      add(`all ${mode} off`, off);
      // each layer's change on → off, by its place on its chip (first, last, other)
      for (const t of run.truth.layers) {
        const onChip = run.truth.layers.filter((u) => u.chip === t.chip);
        const where = t.layer === onChip[0].layer ? 'first' : t.layer === onChip.at(-1)!.layer ? 'last' : 'other';
        const a = on.find((x) => x.layer === t.layer)!, b = off.find((x) => x.layer === t.layer)!;
        if (a.thicknessPct !== null && b.thicknessPct !== null) byPlace.push({ key: `${kept} ${mode} ${where}`, on: a.thicknessPct, off: b.thicknessPct });
      }
      parts.push(`${mode} ${line(on)} → ${line(off)}`);
    }
    console.log(`seed ${seed}: δ̂ ${p?.delayS.toFixed(2)} ± ${p?.sigmaS.toFixed(2)} s gain ${p?.gainChi2.toFixed(1)} disp ${p?.dispersion.toFixed(2)} margin ${p?.marginChi2.toFixed(1)} ${kept.padEnd(8)} | ${parts.join(' | ')}`);
  }
  for (const k of ['kept', 'not kept', 'all']) {
    const parts = MODES.map((m) => pools.has(`${k} ${m} on`) ? `${m} ${line(pools.get(`${k} ${m} on`)!)} → ${line(pools.get(`${k} ${m} off`)!)}` : `${m} —`);
    console.log(`${k.padEnd(8)} (${(pools.get(`${k} refit on`)?.length ?? 0) / design.layers.length} seeds): ${parts.join(' | ')}`);
  }
  const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
  const rms = (v: number[]) => Math.sqrt(mean(v.map((x) => x * x)));
  console.log('by place on the chip, mean / RMS d err %, on → off:');
  for (const k of [...new Set(byPlace.map((x) => x.key))].sort()) {
    const g = byPlace.filter((x) => x.key === k);
    console.log(`  ${k.padEnd(22)} (${g.length}): ${mean(g.map((x) => x.on)).toFixed(3)} / ${rms(g.map((x) => x.on)).toFixed(3)} → ${mean(g.map((x) => x.off)).toFixed(3)} / ${rms(g.map((x) => x.off)).toFixed(3)}`);
  }
}

void main();
