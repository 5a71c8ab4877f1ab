// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/layerBias.ts 'scenario name' [seeds] [mode]):
// each design layer's mean error over the seeds (thickness, or optical thickness below 0.5 QWOT;
// index; cut), its RMS and mean signed z, to tell a bias that repeats from scatter. Analysis
// options from FRINGELOG_ACCURACY_OPTIONS, chamber changes from FRINGELOG_CHAMBER_OPTIONS
// (as seedSweep.ts); FRINGELOG_PER_SEED=1 also prints each seed's row.
import { layerErrors, type LayerError } from './accuracyTable';
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));
const maxAbs = (v: number[]) => v.reduce((a, b) => Math.max(a, Math.abs(b)), 0);

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'real chamber, BBAR, lamp reference');
  const all: LayerError[] = [];
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const e = layerErrors(seed, results[mode], run.truth.layers);
    all.push(...e);
    if (process.env.FRINGELOG_PER_SEED) {
      console.log(`  s${seed} ${e.map((x) => `L${x.layer} ${(x.qwot < 0.5 ? x.opticalPct! : x.thicknessPct!).toFixed(2)}%/${x.index!.toFixed(4)}/z${(x.zThickness ?? 0).toFixed(1)}`).join('  ')}`);
    }
  }
  const layers = [...new Set(all.map((e) => e.layer))].sort((a, b) => a - b);
  console.log(`${scenario.name} — ${mode} — seeds ${seeds[0]}…${seeds[seeds.length - 1]} (${seeds.length})`);
  for (const l of layers) {
    const g = all.filter((e) => e.layer === l && e.thicknessPct !== null);
    const thin = g[0].qwot < 0.5;
    const d = g.map((e) => (thin ? e.opticalPct! : e.thicknessPct!));
    const n = g.map((e) => e.index!);
    const cut = g.map((e) => e.cutQwotPct!);
    const zd = g.map((e) => Math.sign(e.thicknessPct!) * (e.zThickness ?? 0));
    console.log(`  L${l} (${g[0].qwot.toFixed(2)} QWOT) ${thin ? 'nd' : ' d'} mean ${mean(d).toFixed(3)} RMS ${rms(d).toFixed(3)} max ${maxAbs(d).toFixed(3)} %`
      + `  n mean ${mean(n).toFixed(4)} RMS ${rms(n).toFixed(4)} max ${maxAbs(n).toFixed(4)}  cut mean ${mean(cut).toFixed(3)} max ${maxAbs(cut).toFixed(3)}`
      + `  z_d mean ${mean(zd).toFixed(2)} RMS ${rms(zd).toFixed(2)}`);
  }
}

void main();
