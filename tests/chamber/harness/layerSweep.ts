// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/layerSweep.ts 'scenario name' [seeds, e.g. 71-86] [mode]):
// one scenario's errors by design layer over many seeds (mean, RMS and max of thickness, optical
// thickness, index and cut error, RMS z), to find which layer and which quantity set a row's
// maximum, and to tell a bias that repeats (the mean) from scatter.
// FRINGELOG_ACCURACY_OPTIONS / FRINGELOG_CHAMBER_OPTIONS act as in seedSweep.ts;
// FRINGELOG_PER_SEED=1 also prints each seed's row.
import { layerErrors, type LayerError } from './accuracyTable';
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));
const maxAbs = (v: number[]) => v.reduce((m, x) => (Math.abs(x) > Math.abs(m) ? x : m), 0);

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'thin level-cut layers (R)');
  const errors: LayerError[] = [];
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const e = layerErrors(seed, results[mode], run.truth.layers);
    errors.push(...e);
    if (process.env.FRINGELOG_PER_SEED) {
      console.log(`  s${seed} ${e.map((x) => `L${x.layer} ${(x.qwot < 0.5 ? x.opticalPct! : x.thicknessPct!).toFixed(2)}%/${x.index!.toFixed(4)}/z${(x.zThickness ?? 0).toFixed(1)}`).join('  ')}`);
    }
  }
  console.log(`${scenario.name} — ${mode} — seeds ${seeds[0]}…${seeds[seeds.length - 1]}`);
  console.log('layer  QWOT  d mean/RMS/max %        nd mean/RMS/max %       n mean/RMS/max                    cut RMS/max %QW   RMS z d/n/cut  worst seed (d)');
  const layers = [...new Set(errors.map((e) => e.layer))].sort((a, b) => a - b);
  const vals = (g: LayerError[], f: (e: LayerError) => number | null | undefined) => g.flatMap((e) => { const v = f(e); return v === null || v === undefined ? [] : [v]; });
  for (const l of layers) {
    const g = errors.filter((e) => e.layer === l);
    const d = vals(g, (e) => e.thicknessPct), nd = vals(g, (e) => e.opticalPct), n = vals(g, (e) => e.index), c = vals(g, (e) => e.cutQwotPct);
    const worst = g.reduce((w, e) => (Math.abs(e.thicknessPct ?? 0) > Math.abs(w.thicknessPct ?? 0) ? e : w), g[0]);
    console.log(`${String(l).padStart(5)} ${g[0].qwot.toFixed(2).padStart(5)}  ${mean(d).toFixed(2).padStart(6)}/${rms(d).toFixed(2).padStart(5)}/${maxAbs(d).toFixed(2).padStart(6)}  `
      + `${mean(nd).toFixed(2).padStart(6)}/${rms(nd).toFixed(2).padStart(5)}/${maxAbs(nd).toFixed(2).padStart(6)}  ${mean(n).toFixed(4).padStart(7)}/${rms(n).toFixed(4)}/${maxAbs(n).toFixed(4).padStart(7)}  `
      + `${rms(c).toFixed(2).padStart(5)}/${maxAbs(c).toFixed(2).padStart(6)}   ${rms(vals(g, (e) => e.zThickness)).toFixed(1)}/${rms(vals(g, (e) => e.zIndex)).toFixed(1)}/${rms(vals(g, (e) => e.zCut)).toFixed(1)}   s${worst.seed}`);
  }
}

main().catch((e) => { console.error(e); process.exit(1); });
