// A diagnosis, not a test (run by hand: npx tsx tests/chamber/harness/effectsOff.ts ['scenario name'] [seeds]):
// a scenario with the simulator's effects switched off one at a time, the errors per layer in
// each mode, to tell which chamber effect carries which error. Options for the analysis from
// FRINGELOG_ACCURACY_OPTIONS as in the accuracy harness.
import { type ChamberOptions } from '../options';
import { scenarios, type Mode } from '../scenarios';
import { layerErrors, type LayerError } from './accuracyTable';
import { runScenario } from './runScenario';

const VARIANTS: Record<string, (o: ChamberOptions) => ChamberOptions> = {
  'as the scenario': (o) => o,
  'no lamp drift': (o) => ({ ...o, lampDriftPerHour: 0 }),
  'no ramp at opening': (o) => ({ ...o, rampS: 0 }),
  'no rate wander': (o) => ({ ...o, rateWander: undefined }),
  'no index drift': (o) => ({ ...o, indexDriftPerHour: {} }),
  'no index in layer': (o) => ({ ...o, indexWithinLayer: {} }),
  'no index scatter': (o) => ({ ...o, indexScatter: 0 }),
  'no correlated noise': (o) => ({ ...o, correlatedNoise: undefined }),
  'no spikes': (o) => ({ ...o, spikes: undefined }),
  'no growth after cut': (o) => ({ ...o, shutterCloseS: [0, 0] }),
  'no stray light': (o) => ({ ...o, strayFraction: 0 }),
  'no time jitter': (o) => ({ ...o, jitterFraction: 0 }),
  'no cut latency': (o) => ({ ...o, levelLatencyS: [0, 0] }),
  'no lamp drift, no ramp': (o) => ({ ...o, lampDriftPerHour: 0, rampS: 0 }),
};

const f = (v: number | null, digits: number) => (v === null ? '—' : `${v >= 0 ? ' ' : ''}${v.toFixed(digits)}`);
const maxAbs = (v: number[]) => v.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));

async function main(): Promise<void> {
  const name = process.argv[2] ?? 'real chamber, BBAR';
  const scenario = scenarios().find((s) => s.name === name);
  if (!scenario) throw new Error(`no scenario named '${name}'`);
  const seeds = process.argv[3] ? process.argv[3].split(',').map(Number) : scenario.seeds;
  const modes: Mode[] = ['sequential', 'refit'];
  for (const [label, change] of Object.entries(VARIANTS)) {
    const errors: Record<Mode, LayerError[]> = { sequential: [], refit: [] };
    for (const seed of seeds) {
      const { run, results } = await runScenario({ ...scenario, options: change(scenario.options) }, seed, modes);
      for (const m of modes) errors[m].push(...layerErrors(seed, results[m], run.truth.layers));
    }
    for (const m of modes) {
      const thick = errors[m].filter((e) => e.qwot >= 0.5 && e.thicknessPct !== null);
      const thin = errors[m].filter((e) => e.qwot < 0.5 && e.opticalPct !== null);
      const layers = [...new Set(errors[m].map((e) => e.layer))].map((l) => `L${l} ${errors[m].filter((e) => e.layer === l)
        .map((e) => (e.qwot < 0.5 ? `nd${f(e.opticalPct, 2)}` : `d${f(e.thicknessPct, 2)} n${f(e.index, 4)}`)).join('/')}`).join('  ');
      console.log(`${label.padEnd(24)} ${m.padEnd(10)} max|d| ${maxAbs(thick.map((e) => e.thicknessPct!)).toFixed(2)} % (RMS ${rms(thick.map((e) => e.thicknessPct!)).toFixed(2)})`
        + `  max|n| ${maxAbs(thick.map((e) => e.index!)).toFixed(4)} (RMS ${rms(thick.map((e) => e.index!)).toFixed(4)})  thin max|nd| ${maxAbs(thin.map((e) => e.opticalPct!)).toFixed(2)} %`
        + `  max|cut| ${maxAbs(errors[m].filter((e) => e.cutQwotPct !== null).map((e) => e.cutQwotPct!)).toFixed(2)} %QW | ${layers}`);
    }
  }
}

void main();
