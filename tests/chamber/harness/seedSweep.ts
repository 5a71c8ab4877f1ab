// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/seedSweep.ts 'scenario name' [seeds, e.g. 15-30] [mode]):
// one scenario's errors and 3σ coverage over more seeds than the accuracy harness runs, in one
// mode, with the analysis options of FRINGELOG_ACCURACY_OPTIONS; and the layers beyond 3σ.
// FRINGELOG_CHAMBER_OPTIONS (JSON) changes the scenario's chamber, e.g. '{"darkOffset":0.0006}':
// an effect the scenario leaves off, turned on to see whether a σ it holds is then used.
import { layerErrors, summarize, type LayerError } from './accuracyTable';
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'correlated noise and rate wander, mirror');
  const errors: LayerError[] = [];
  const last: LayerError[] = [];
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const e = layerErrors(seed, results[mode], run.truth.layers);
    errors.push(...e);
    // each chip's last layer: nothing above it tells its growth after the cut (fit/layerEnds.ts)
    const lastLayers = new Set([...new Set(run.truth.layers.map((t) => t.chip))].map((c) => run.truth.layers.filter((t) => t.chip === c).at(-1)!.layer));
    last.push(...e.filter((x) => lastLayers.has(x.layer)));
  }
  const s = summarize(errors);
  const pct = (v: number | null) => (v === null ? '—' : `${(v * 100).toFixed(1)}`);
  const zs = errors.flatMap((e) => (e.zThickness === null ? [] : [e.zThickness]));
  const zn = errors.flatMap((e) => (e.zIndex === null || e.zIndex === undefined ? [] : [e.zIndex]));
  console.log(`${scenario.name} — ${mode} — seeds ${seeds[0]}…${seeds[seeds.length - 1]} (${seeds.length}): max|d| ${s.maxThicknessPct.toFixed(3)} % RMS ${s.rmsThicknessPct.toFixed(3)} `
    + `max|n| ${s.maxIndex.toFixed(4)} RMS ${s.rmsIndex.toFixed(4)} max|cut| ${s.maxCutQwotPct.toFixed(3)} RMS ${s.rmsCutQwotPct.toFixed(3)} `
    + `coverage d/n/cut ${pct(s.coverage.thickness)}/${pct(s.coverage.index)}/${pct(s.coverage.cut)} % RMS z_d ${rms(zs).toFixed(2)} z_n ${rms(zn).toFixed(2)} missing ${s.missing}`);
  const lastD = last.flatMap((e) => (e.thicknessPct === null ? [] : [e.thicknessPct]));
  console.log(`  chips' last layers (${lastD.length}): mean ${(lastD.reduce((a, b) => a + b, 0) / Math.max(1, lastD.length)).toFixed(3)} % RMS ${rms(lastD).toFixed(3)} % `
    + `max|d| ${Math.max(0, ...lastD.map(Math.abs)).toFixed(3)} % within 3σ ${last.filter((e) => e.zThickness !== null && e.zThickness <= 3).length}/${last.length}`);
  const out = errors.filter((e) => (e.zThickness ?? 0) > 3 || (e.zCut ?? 0) > 3 || (e.zIndex ?? 0) > 3);
  console.log(`  beyond 3σ: ${out.map((e) => `s${e.seed} L${e.layer} d${e.thicknessPct!.toFixed(2)}% z${e.zThickness!.toFixed(1)}/${(e.zIndex ?? 0).toFixed(1)}/${(e.zCut ?? 0).toFixed(1)}`).join('  ') || 'none'}`);
}

void main();
