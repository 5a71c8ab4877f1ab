// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/seedSweep.ts 'scenario name' [seeds, e.g. 15-30] [mode]):
// one scenario's errors and 3σ coverage over more seeds than the accuracy harness runs, in one
// mode, with the analysis options of FRINGELOG_ACCURACY_OPTIONS; the chips' first, last and other
// layers apart (mean, RMS, mean signed z), the mean error by place on the chip (on the mirrors the
// places alternate H and L, so a bias by material shows there too); and the layers beyond 3σ.
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
  const first: LayerError[] = [];
  // each layer's place on its chip (1 = the chip's first), for a bias that follows the place
  const place = new Map<LayerError, number>();
  for (const seed of seeds) {
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const e = layerErrors(seed, results[mode], run.truth.layers);
    errors.push(...e);
    // each chip's last layer: nothing above it tells its growth after the cut (fit/layerEnds.ts)
    const lastLayers = new Set([...new Set(run.truth.layers.map((t) => t.chip))].map((c) => run.truth.layers.filter((t) => t.chip === c).at(-1)!.layer));
    last.push(...e.filter((x) => lastLayers.has(x.layer)));
    // each chip's first layer: it starts on the bare chip, whose idle stretch sets its gain and offset
    const firstLayers = new Set([...new Set(run.truth.layers.map((t) => t.chip))].map((c) => run.truth.layers.find((t) => t.chip === c)!.layer));
    first.push(...e.filter((x) => firstLayers.has(x.layer)));
    for (const x of e) {
      const t = run.truth.layers.find((l) => l.layer === x.layer)!;
      place.set(x, x.layer - run.truth.layers.find((l) => l.chip === t.chip)!.layer + 1);
    }
  }
  const s = summarize(errors);
  const pct = (v: number | null) => (v === null ? '—' : `${(v * 100).toFixed(1)}`);
  const zs = errors.flatMap((e) => (e.zThickness === null ? [] : [e.zThickness]));
  const zn = errors.flatMap((e) => (e.zIndex === null || e.zIndex === undefined ? [] : [e.zIndex]));
  console.log(`${scenario.name} — ${mode} — seeds ${seeds[0]}…${seeds[seeds.length - 1]} (${seeds.length}): max|d| ${s.maxThicknessPct.toFixed(3)} % RMS ${s.rmsThicknessPct.toFixed(3)} `
    + `max|n| ${s.maxIndex.toFixed(4)} RMS ${s.rmsIndex.toFixed(4)} max|cut| ${s.maxCutQwotPct.toFixed(3)} RMS ${s.rmsCutQwotPct.toFixed(3)} `
    + `coverage d/n/cut ${pct(s.coverage.thickness)}/${pct(s.coverage.index)}/${pct(s.coverage.cut)} % RMS z_d ${rms(zs).toFixed(2)} z_n ${rms(zn).toFixed(2)} missing ${s.missing}`);
  const group = (label: string, g: LayerError[]) => {
    const d = g.flatMap((e) => (e.thicknessPct === null ? [] : [e.thicknessPct]));
    const z = g.flatMap((e) => (e.thicknessPct === null || e.zThickness === null ? [] : [Math.sign(e.thicknessPct) * e.zThickness]));
    const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
    console.log(`  chips' ${label} layers (${d.length}): mean ${mean(d).toFixed(3)} % RMS ${rms(d).toFixed(3)} % `
      + `max|d| ${Math.max(0, ...d.map(Math.abs)).toFixed(3)} % mean z ${mean(z).toFixed(2)} within 3σ ${g.filter((e) => e.zThickness !== null && e.zThickness <= 3).length}/${g.length}`);
  };
  group('first', first);
  group('last', last);
  const others = errors.filter((e) => !first.includes(e) && !last.includes(e));
  group('other', others);
  const places = [...new Set(place.values())].sort((a, b) => a - b);
  console.log(`  by place on the chip, mean d err % / mean signed z_d: ${places.map((p) => {
    const g = errors.filter((e) => place.get(e) === p && e.thicknessPct !== null);
    const m = g.reduce((a, e) => a + e.thicknessPct!, 0) / Math.max(1, g.length);
    const z = g.reduce((a, e) => a + Math.sign(e.thicknessPct!) * (e.zThickness ?? 0), 0) / Math.max(1, g.length);
    return `${p}: ${m.toFixed(3)}/${z.toFixed(2)}`;
  }).join('  ')}`);
  const out = errors.filter((e) => (e.zThickness ?? 0) > 3 || (e.zCut ?? 0) > 3 || (e.zIndex ?? 0) > 3);
  console.log(`  beyond 3σ: ${out.map((e) => `s${e.seed} L${e.layer} d${e.thicknessPct!.toFixed(2)}% z${e.zThickness!.toFixed(1)}/${(e.zIndex ?? 0).toFixed(1)}/${(e.zCut ?? 0).toFixed(1)}`).join('  ') || 'none'}`);
}

void main();
