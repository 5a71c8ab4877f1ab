// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/layerEndSweep.ts 'scenario name' [seeds] [mode] [layer]):
// one layer's end over seeds against the simulator's truth: its final thickness's error, its
// error at the last logged sample (the fit's own, apart from the growth after the cut it added or
// not), its index error and rate, and every layer's true growth after its cut, to tell a bias of
// the fit from one of the growth (e.g. the growth of the layer below left out of the stack).
// Options as seedSweep.ts (FRINGELOG_ACCURACY_OPTIONS, FRINGELOG_CHAMBER_OPTIONS).
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'real chamber, BBAR, lamp reference');
  const layer = Number(process.argv[5] ?? 4);
  const rows: { grown: number; err: number; atLogged: number; dn: number }[] = [];
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const t = run.truth.layers.find((l) => l.layer === layer)!;
    const r = results[mode]!.layers.find((l) => l.layer === layer)!;
    const row = { grown: t.afterCutNm, err: (r.thicknessNm / t.thicknessNm - 1) * 100, atLogged: r.thicknessNm - (t.thicknessNm - t.afterCutNm), dn: r.index - t.index };
    rows.push(row);
    console.log(`seed ${seed}: true growths ${run.truth.layers.map((l) => l.afterCutNm.toFixed(3)).join(' ')} nm; layer ${layer} d ${r.thicknessNm.toFixed(3)} ± ${r.thicknessSigmaNm.toFixed(3)} nm `
      + `(true ${t.thicknessNm.toFixed(3)}), error ${row.err.toFixed(3)} %, fitted − true at the last logged sample ${row.atLogged.toFixed(3)} nm, n error ${row.dn.toFixed(4)}, `
      + `rate ${r.rateNmPerS.toFixed(4)} (true mean ${t.rateNmPerS.toFixed(4)}) nm/s`);
  }
  const mean = (k: keyof (typeof rows)[number]) => rows.reduce((a, r) => a + r[k], 0) / rows.length;
  console.log(`mean: true growth ${mean('grown').toFixed(3)} nm, error ${mean('err').toFixed(3)} %, at the last logged sample ${mean('atLogged').toFixed(3)} nm, n ${mean('dn').toFixed(4)}`);
}

void main();
