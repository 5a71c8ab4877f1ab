// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/startDelaySweep.ts 'scenario name' [seeds]; PER_LAYER=1 for each layer's own minimum):
// the run's start delay (fit/startDelay.ts) as the profiling pass reads it, per seed, with each
// layer's own minimum on the grid, the layers standing on a growth below apart from the chips' first.
import { parseDesign } from '@/analysis/design';
import { findStartDelay, type AnalyzeOptions } from '@/analysis/fit';
import { profileFromRequest } from '@/analysis/fit/startDelayRequest';
import { pooledStartDelay, START_DELAY_GRID_S, withShutterProfiled, type StartDelayProfile } from '@/analysis/fit/startDelay';
import { readTrace } from '@/analysis/trace';
import { chamberCsvChunks, simulateChamberRun } from '..';
import { scenarioFromArgs } from './seedList';

function argmin(c: ArrayLike<number>): number {
  let k = 0;
  for (let i = 1; i < c.length; i++) if (c[i] < c[k]) k = i;
  const j = Math.min(Math.max(k, 1), c.length - 2), h = START_DELAY_GRID_S[1] - START_DELAY_GRID_S[0];
  const [a, b, d] = [c[j - 1], c[j], c[j + 1]];
  return a - 2 * b + d > 0 ? Math.min(Math.max(START_DELAY_GRID_S[j] + (h * (a - d)) / (2 * (a - 2 * b + d)), 0), 3) : START_DELAY_GRID_S[k];
}

async function main(): Promise<void> {
  const { scenario, seeds } = scenarioFromArgs(process.argv, 'real chamber, mirror');
  const extra = process.env.FRINGELOG_ACCURACY_OPTIONS ? (JSON.parse(process.env.FRINGELOG_ACCURACY_OPTIONS) as AnalyzeOptions) : {};
  const all: number[] = [];
  for (const seed of seeds) {
    const run = simulateChamberRun(scenario.design, { ...scenario.options, seed });
    const design = parseDesign(scenario.design, `${scenario.name}.json`);
    const trace = await readTrace(chamberCsvChunks(run), { fileName: 'x.csv', layerCount: design.layers.length });
    const profiles: { layer: number; p: StartDelayProfile | null }[] = [];
    const pooled = await findStartDelay(design, trace, {
      ...extra, mode: 'refit',
      startDelayProfileOf: async (r) => {
        const ps = profileFromRequest(r);
        ps.forEach((p, i) => r.layers[i].profiled && profiles.push({ layer: profiles.length, p }));
        return ps;
      },
    });
    const ok = profiles.filter((x) => x.p) as { layer: number; p: StartDelayProfile }[];
    const withG = ok.filter((x) => x.p.growth), without = ok.filter((x) => !x.p.growth);
    const pw = pooledStartDelay(withG.map((x) => x.p)), po = pooledStartDelay(without.map((x) => x.p));
    const trueClose = run.truth.layers.map((l) => l.shutterCloseS / 2);
    const meanClose = trueClose.reduce((a, b) => a + b, 0) / trueClose.length;
    all.push(pooled?.delayS ?? NaN);
    console.log(`seed ${seed}: δ̂ ${pooled?.delayS.toFixed(3)} ± ${pooled?.sigmaS.toFixed(3)} shutter ${pooled?.shutterS?.toFixed(3)} (true mean ${meanClose.toFixed(3)}) kept ${pooled?.kept} gain ${pooled?.gainChi2.toFixed(1)} margin ${pooled?.marginChi2.toFixed(1)} disp ${pooled?.dispersion?.toFixed(2)}`
      + ` | with growth below (${withG.length}) ${pw?.delayS.toFixed(3)} ± ${pw?.sigmaS.toFixed(3)} | without (${without.length}) ${po?.delayS.toFixed(3)} ± ${po?.sigmaS.toFixed(3)}`);
    if (process.env.TWO_SIDED && pooled) {
      // probe: each layer's own minimum with the parabola through 0, h, 2h continued below δ = 0
      const { curves } = withShutterProfiled(ok.map((x) => x.p));
      const h = START_DELAY_GRID_S[1];
      const total = START_DELAY_GRID_S.map((_, k) => curves.reduce((a, c) => a + c[k], 0));
      let k = 0;
      for (let i = 1; i < total.length; i++) if (total[i] < total[k]) k = i;
      let q1 = 0, q2 = 0, neg = 0;
      for (const c of curves) {
        const a = (c[2] - 2 * c[1] + c[0]) / (2 * h * h), b = (c[1] - c[0]) / h - a * h;
        const own = Math.min(...c);
        const ext = a > 0 && -b / (2 * a) < 0 ? c[0] - (b * b) / (4 * a) : own;
        if (ext < own) neg++;
        q1 += c[k] - own;
        q2 += c[k] - Math.min(own, ext);
      }
      const L = curves.length;
      console.log(`   two-sided: k ${k} layers below 0 ${neg}/${L} birge ${Math.max(1, q1 / (L - 1)).toFixed(2)} -> ${Math.max(1, q2 / (L - 1)).toFixed(2)} gain/birge ${(pooled.gainChi2 / Math.max(1, q2 / (L - 1))).toFixed(1)} margin ${pooled.marginChi2.toFixed(1)}`);
    }
    if (process.env.PER_LAYER) console.log('   ' + ok.map((x) => `${x.p.growth ? 'g' : 'f'}${argmin(x.p.chi2).toFixed(2)}`).join(' '));
  }
  const m = all.reduce((a, b) => a + b, 0) / all.length;
  console.log(`mean δ̂ ${m.toFixed(3)} over ${all.length} seeds`);
}

void main();
