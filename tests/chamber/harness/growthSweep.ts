// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/growthSweep.ts 'scenario name' [seeds] [mode]):
// the growth after each cut as the analysis read it (fit/layerEnds.ts) against the simulator's,
// by the layer's place on its chip: mean read − true, nm, and the run's shutter time predicted.
import { LayerEnds } from '@/analysis/fit/layerEnds';
import { runScenario } from './runScenario';
import { scenarioFromArgs } from './seedList';

interface Dump { layer: number; growth: number; sigma: number; next: number | null; shutter: { timeS: number; sigmaS: number } | null }
let dumps: Dump[] = [];
const proto = LayerEnds.prototype as unknown as Record<string, (...a: unknown[]) => unknown>;
const finish = proto.finish;
proto.finish = function (this: { records: { s: { design: { layer: number } }; growth: { deltaNm: number; sigmaNm: number }; nextAsGrowth: { meanNm: number } | null }[]; shutter: { predict: () => { timeS: number; sigmaS: number } | null } }, ...a: unknown[]) {
  const out = finish.apply(this, a);
  const shutter = this.shutter.predict();
  if (process.env.GROWTH_TIMES) console.log([...(this.shutter as unknown as { times: Map<number, { timeS: number; sigmaS: number }> }).times].map(([l, t]) => `${l}:${t.timeS.toFixed(2)}±${t.sigmaS.toFixed(2)}`).join(' '));
  dumps = this.records.map((r) => ({ layer: r.s.design.layer, growth: r.growth.deltaNm, sigma: r.growth.sigmaNm, next: r.nextAsGrowth?.meanNm ?? null, shutter }));
  return out;
};

async function main(): Promise<void> {
  const { scenario, seeds, mode } = scenarioFromArgs(process.argv, 'correlated noise and spikes, mirror');
  const byPlace = new Map<number, { err: number[]; z: number[] }>();
  for (const seed of seeds) {
    dumps = [];
    const { run } = await runScenario(scenario, seed, [mode]);
    const truth = run.truth.layers;
    const sh = dumps[0]?.shutter;
    const parts: string[] = [];
    for (const d of dumps) {
      const t = truth.find((l) => l.layer === d.layer)!;
      const place = d.layer - truth.find((l) => l.chip === t.chip)!.layer + 1;
      const last = truth.filter((l) => l.chip === t.chip).at(-1)!.layer === d.layer;
      const key = last ? 99 : place;
      const g = byPlace.get(key) ?? { err: [], z: [] };
      g.err.push(d.growth - t.afterCutNm);
      g.z.push((d.growth - t.afterCutNm) / Math.max(d.sigma, 1e-9));
      byPlace.set(key, g);
      parts.push(`${d.layer}:${(d.growth - t.afterCutNm).toFixed(3)}`);
    }
    console.log(`seed ${seed} shutter ${sh ? `${sh.timeS.toFixed(3)}±${sh.sigmaS.toFixed(3)} s` : '—'}  read−true nm ${parts.join(' ')}`);
  }
  const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
  console.log(`by place (99 = chip's last), mean read−true nm / mean z: ${[...byPlace].sort((a, b) => a[0] - b[0]).map(([p, g]) => `${p}: ${mean(g.err).toFixed(3)}/${mean(g.z).toFixed(2)}`).join('  ')}`);
}

void main();
