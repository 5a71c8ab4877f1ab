// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/calibrationSweep.ts 'scenario name' [seeds, e.g. 51-66] [mode]):
// per seed, each chip's offset and gain as the analysis took them against the simulator's truth,
// and every layer's index error ± σ, thickness error and gain; then per layer over the seeds the
// index error's mean, RMS, largest and RMS z. Which layers carry an index error, and whether the
// calibration does. Options as seedSweep.ts (FRINGELOG_ACCURACY_OPTIONS, FRINGELOG_CHAMBER_OPTIONS).
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

const signed = (v: number, d: number) => `${v >= 0 ? '+' : ''}${v.toFixed(d)}`;

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'R monitoring with an offset');
  const perLayer = new Map<number, { err: number; z: number }[]>();
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const r = results[mode];
    if (!r) {
      console.log(`seed ${seed}: no ${mode} result`);
      continue;
    }
    for (const t of run.truth.chips) {
      const c = r.chips.find((x) => x.chip === t.chip);
      if (!c) continue;
      const weight = c.offsetWeight === undefined ? '' : ` weight ${c.offsetWeight.toFixed(2)}`;
      console.log(`seed ${seed} chip ${t.chip}: offset ${c.offset.toFixed(5)} ± ${c.offsetSigma.toFixed(5)} (${c.offsetSource}${weight}), true ${t.offset.toFixed(5)}; `
        + `gain ${signed((c.gain / t.gain - 1) * 100, 3)} % from the truth${c.layerGainSigma === undefined ? '' : ` (σ ${((c.layerGainSigma / c.gain) * 100).toFixed(3)} %)`}`);
    }
    const cells = run.truth.layers.map((t) => {
      const l = r.layers.find((x) => x.layer === t.layer);
      if (!l) return `L${t.layer} —`;
      const chipGain = run.truth.chips.find((c) => c.chip === t.chip)!.gain;
      const err = l.index - t.index;
      if (!l.indexHeld && l.indexSigma > 0) perLayer.set(t.layer, [...(perLayer.get(t.layer) ?? []), { err, z: err / l.indexSigma }]);
      return `L${t.layer} n${signed(err, 4)}±${l.indexSigma.toFixed(4)}${l.indexHeld ? ' held' : ''} d${signed((l.thicknessNm / t.thicknessNm - 1) * 100, 2)}% g${signed((l.gain / chipGain - 1) * 100, 2)}%`;
    });
    console.log(`  ${cells.join('  ')}`);
  }
  const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));
  console.log(`${scenario.name} — ${mode} — index error per layer over ${seeds.length} seeds:`);
  for (const [layer, v] of [...perLayer].sort((a, b) => a[0] - b[0])) {
    const e = v.map((x) => x.err);
    console.log(`  layer ${layer}: mean ${signed(e.reduce((a, b) => a + b, 0) / e.length, 4)} RMS ${rms(e).toFixed(4)} max ${Math.max(...e.map(Math.abs)).toFixed(4)} RMS z ${rms(v.map((x) => x.z)).toFixed(2)}`);
  }
}

void main();
