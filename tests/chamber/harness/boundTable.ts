// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/boundTable.ts ['scenario name'] [seeds, e.g. 15-30] [mode]):
// per layer, the analysis's reported σ_d and its errors over the seeds against the Cramér–Rao
// bounds A (the layer's own samples, true stack below) and B (the whole chip's record, growths
// after the cuts known), harness/boundRows.ts; and what each bound allows for the scenario's
// largest error over its own seeds.
import { scenarios, type Mode } from '../scenarios';
import { boundRows } from './boundRows';
import { maxAbsNormal } from './cramerRao';
import { seedList } from './seedList';

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));
const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
const col = (v: number, d: number, w: number) => v.toFixed(d).padStart(w);

async function main(): Promise<void> {
  const name = process.argv[2] ?? 'correlated noise and spikes, mirror';
  const scenario = scenarios().find((s) => s.name === name);
  if (!scenario) throw new Error(`no scenario named '${name}'`);
  const seeds = seedList(process.argv[3], scenario.seeds);
  const mode = (process.argv[4] ?? 'sequential') as Mode;
  const rows = await boundRows(scenario, seeds, mode);
  console.log(`== ${name} — ${mode} — seeds ${seeds.join(',')}`);
  const w = rows.every((r) => r.boundW !== null);
  console.log(`layer   σ_A d %   σ_B d %${w ? '   σ_W d %  σ_BW d %' : ''}  σ_rep d %  σ_rep/σ_A  RMS err %  mean err %  RMS/σ_A  RMS/σ_B  RMS z | σ_A cut  σ_rep cut  RMS cut${w ? '  RMS/σ_W RMS/σ_BW' : ''}`);
  for (const r of rows) {
    const err = rms(r.errors);
    console.log(`${String(r.layer).padStart(5)} ${col(r.boundA, 3, 9)} ${col(r.boundB, 3, 9)}${w ? col(r.boundW!, 3, 10) + col(r.boundBW!, 3, 9) : ''} ${col(r.reported, 3, 10)} ${col(r.reported / r.boundA, 2, 10)} ${col(err, 3, 10)} `
      + `${col(mean(r.errors), 3, 11)} ${col(err / r.boundA, 2, 8)} ${col(err / r.boundB, 2, 8)} ${col(rms(r.z), 2, 6)} | ${col(r.cutBoundA, 3, 7)} ${col(r.cutReported, 3, 10)} ${col(rms(r.cutErrors), 3, 8)}${w ? col(err / r.boundW!, 2, 9) + col(err / r.boundBW!, 2, 9) : ''}`);
  }
  const ratios = rows.map((r) => r.reported / r.boundA).sort((a, b) => a - b);
  console.log(`all layers: σ_rep/σ_A median ${ratios[Math.floor(ratios.length / 2)].toFixed(2)}, `
    + `RMS err/σ_A ${rms(rows.flatMap((r) => r.errors.map((e) => e / r.boundA))).toFixed(2)}, RMS err/σ_B ${rms(rows.flatMap((r) => r.errors.map((e) => e / r.boundB))).toFixed(2)}, `
    + `RMS z ${rms(rows.flatMap((r) => r.z)).toFixed(2)} over ${rows.reduce((a, r) => a + r.errors.length, 0)} layer-runs`);
  const target = scenario.targets.thicknessPct;
  const bounds: [string, number[]][] = [['A', rows.map((r) => r.boundA)], ['B', rows.map((r) => r.boundB)]];
  if (w) bounds.push(['W', rows.map((r) => r.boundW!)], ['BW', rows.map((r) => r.boundBW!)]);
  if (w) console.log(`RMS err/σ_W ${rms(rows.flatMap((r) => r.errors.map((e) => e / r.boundW!))).toFixed(2)}, σ_rep/σ_W median ${rows.map((r) => r.reported / r.boundW!).sort((a, b) => a - b)[Math.floor(rows.length / 2)].toFixed(2)}, `
    + `RMS err/σ_BW ${rms(rows.flatMap((r) => r.errors.map((e) => e / r.boundBW!))).toFixed(2)}, σ_rep/σ_BW median ${rows.map((r) => r.reported / r.boundBW!).sort((a, b) => a - b)[Math.floor(rows.length / 2)].toFixed(2)}`);
  for (const [label, per] of bounds) {
    const sigmas = scenario.seeds.flatMap(() => per);
    const m = maxAbsNormal(sigmas);
    console.log(`at bound ${label}, over ${sigmas.length} layers (${scenario.seeds.length} seeds): E[max|d err|] ${m.mean.toFixed(3)} %, median ${m.quantile(0.5).toFixed(3)} %, `
      + `95th percentile ${m.quantile(0.95).toFixed(3)} %; P(all within ${target} %) ${(m.within(target) * 100).toFixed(0)} %`);
  }
}

void main();
