// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/thinIndexBound.ts ['scenario name'] [seeds] [mode]; env
//   BOUND_NO_DRIFT=1: every layer's rate drift known, as the simulator has none; BOUND_LAMP_SIGMA=0.01:
//   the lamp's drift within the chip a parameter under a Gaussian prior of that σ per hour, as an
//   analysis without a reference column has it, chipBound.ts lampDriftSigmaPerHour; BOUND_RAMP_FREE=1:
//   the rate's start-up at shutter opening in the law with its time constant free, chipBound.ts ramp):
// the Cramér–Rao bound of each layer from its whole chip's record (chipBound.ts, growths known)
// as the thin layers' (< 0.5 QWOT) index is told: free, under a Gaussian prior of 0.0064 / 0.003
// about the truth, known, and with one index per material; beside the analysis's RMS error.
// What a held thin-layer index can give the layers above it, and where a target lies beyond the
// data: the probability that the harness's seeds fall within the scenario's targets at each bound.
import { scenarios, type Mode } from '../scenarios';
import { chipBound, type ChipBoundOptions } from './chipBound';
import { maxAbsNormal } from './cramerRao';
import { layerErrors } from './accuracyTable';
import { runScenario } from './runScenario';
import { seedList } from './seedList';

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / Math.max(1, v.length));

async function main(): Promise<void> {
  const name = process.argv[2] ?? 'thin level-cut layers (R)';
  const scenario = scenarios().find((s) => s.name === name);
  if (!scenario) throw new Error(`no scenario named '${name}'`);
  const seeds = seedList(process.argv[3], scenario.seeds);
  const mode = (process.argv[4] ?? 'refit') as Mode;
  const drift: ChipBoundOptions = {
    ...(process.env.BOUND_NO_DRIFT ? { rateDrift: false } : {}),
    ...(process.env.BOUND_LAMP_SIGMA ? { lampDriftSigmaPerHour: Number(process.env.BOUND_LAMP_SIGMA) } : {}),
    ...(process.env.BOUND_RAMP_FREE ? { ramp: 'free' as const } : {}),
  };
  const cases: [string, ChipBoundOptions][] = [
    ['free', { ...drift }], ['prior .0064', { ...drift, thinIndex: 0.0064 }], ['prior .003', { ...drift, thinIndex: 0.003 }],
    ['known', { ...drift, thinIndex: 0 }], ['shared', { ...drift, sharedIndex: true }],
  ];
  type Row = { qwot: number; d: number[][]; n: number[][]; cut: number[][]; nd: number[][]; errD: number[]; errN: number[]; errCut: number[] };
  const rows = new Map<number, Row>();
  for (const seed of seeds) {
    const options = { ...scenario.options, seed };
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const errors = layerErrors(seed, results[mode], run.truth.layers);
    const chips = [...new Set(run.truth.layers.map((l) => l.chip))];
    const bounds = cases.map(([, o]) => chips.flatMap((c) => chipBound(scenario.design, options, run, c, o)));
    for (const t of run.truth.layers) {
      const r = rows.get(t.layer) ?? { qwot: t.qwotAtMonitor, d: cases.map(() => []), n: cases.map(() => []), cut: cases.map(() => []), nd: cases.map(() => []), errD: [], errN: [], errCut: [] };
      bounds.forEach((b, c) => {
        const x = b.find((y) => y.layer === t.layer)!;
        r.d[c].push((x.thicknessSigmaNm / t.thicknessNm) * 100);
        r.n[c].push(x.indexSigma);
        r.cut[c].push(x.cutSigmaQwotPct);
        r.nd[c].push((x.opticalSigmaNm / (t.index * t.thicknessNm)) * 100);
      });
      const e = errors.find((y) => y.layer === t.layer)!;
      if (e.thicknessPct !== null) { r.errD.push(e.thicknessPct); r.errN.push(e.index!); r.errCut.push(e.cutQwotPct!); }
      rows.set(t.layer, r);
    }
  }
  const lamp = (drift.lampDriftSigmaPerHour !== undefined ? `lamp drift under a ${(drift.lampDriftSigmaPerHour * 100).toFixed(2)} %/h prior` : 'lamp drift known')
    + (drift.ramp === 'free' ? ', the start-up\'s time constant free' : '');
  console.log(`== ${name} — ${mode} — seeds ${seeds.join(',')}: RMS over seeds of σ_CRB (whole chip, growths known, ${lamp}), thin layers' index ${cases.map((c) => c[0]).join(' / ')}`);
  for (const [layer, r] of [...rows].sort((a, b) => a[0] - b[0])) {
    const f = (v: number[][], d: number) => v.map((x) => rms(x).toFixed(d)).join(' ');
    console.log(`layer ${layer}  σ_d % ${f(r.d, 2)} | RMS err ${rms(r.errD).toFixed(2)}   σ_n ${f(r.n, 4)} | ${rms(r.errN).toFixed(4)}   σ_cut %QW ${f(r.cut, 2)} | ${rms(r.errCut).toFixed(2)}`);
  }
  // What each case allows the harness's own seeds: the probability that every layer lies within
  // the scenario's targets, each layer's error N(0, σ²) at its RMS σ over the seeds (maxAbsNormal)
  const harnessSeeds = scenario.seeds.length, t = scenario.targets;
  const all = [...rows.values()];
  const thick = all.filter((r) => r.qwot >= 0.5), thin = all.filter((r) => r.qwot < 0.5);
  const within = (g: Row[], pick: (r: Row) => number[], target: number) => maxAbsNormal(g.flatMap((r) => Array<number>(harnessSeeds).fill(rms(pick(r))))).within(target);
  cases.forEach(([label], c) => {
    console.log(`${label.padEnd(12)} P(all within target over ${harnessSeeds} seeds): thickness ${(100 * within(thick, (r) => r.d[c], t.thicknessPct)).toFixed(0)} %, `
      + `index ${(100 * within(thick, (r) => r.n[c], t.index)).toFixed(0)} %, cut ${(100 * within(thick, (r) => r.cut[c], t.cutQwotPct)).toFixed(0)} %, thin n·d ${(100 * within(thin, (r) => r.nd[c], t.thinOpticalPct)).toFixed(0)} %`);
  });
}

main().catch((e) => { console.error(e); process.exit(1); });
