// A diagnosis, not a test (run by hand:
//   npx tsx tests/chamber/harness/startDelaySweep.ts 'scenario name' [seeds]; PER_LAYER=1 for each layer's own minimum):
// the run's start delay (fit/startDelay.ts) as the profiling pass reads it, per seed, with each
// layer's own minimum on the grid, the layers standing on a growth below apart from the chips' first.
// DIP_AT=0.5 (a fraction of each layer's logged time) adds a control: the same onset placed there
// instead of at the start (the clock τ before it, τ0 + E(τ − τ0) after), pooled as the start's,
// both without the growth below: a start-up shows at the start only, a rate wander anywhere.
import { parseDesign } from '@/analysis/design';
import { findStartDelay, type AnalyzeOptions } from '@/analysis/fit';
import { indexAtMemo } from '@/analysis/materials';
import { fitLayerData } from '@/analysis/fit/layerModel';
import { indexRange } from '@/analysis/fit/layerSampleWork';
import { binMeans } from '@/analysis/fit/subsample';
import { chainedStartDelayProfiles } from '@/analysis/fit/startDelayChain';
import { exposureTime } from '@/analysis/fit/startTransient';
import { profileFromRequest, type StartDelayProfileRequest } from '@/analysis/fit/startDelayRequest';
import { PROFILE_POINTS } from '@/analysis/fit/startDelay';
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

/** A request's profiles with the onset at fraction `at` of each layer's logged time (0: its start), no growth below. */
function profilesWithOnsetAt(r: StartDelayProfileRequest, at: number): (StartDelayProfile | null)[] {
  return chainedStartDelayProfiles(r.layers.map((l) => {
    const nominalAt = indexAtMemo(l.material);
    const own = indexRange(l.y.length);
    const t0 = at * l.layer.durationS;
    const clock = (t: number, d: number) => (t < t0 ? t : t0 + exposureTime(t - t0, d));
    return {
      start: l.start, loggedS: l.layer.durationS, below: l.below, offsetSignal: l.offsetSignal, profiled: l.profiled,
      ...(l.gainPrior ? { gainPrior: l.gainPrior } : {}),
      dataAt: (delayS: number) => {
        const d = l.onClock ? delayS : 0;
        const b = binMeans(l.tauS, own, l.y, PROFILE_POINTS, Float64Array.from(l.tauS, (t) => clock(t, d)));
        return fitLayerData({ ...l.layer, nominalAt, tauS: b.tauS, y: b.y, durationS: clock(l.layer.durationS, d) });
      },
    };
  }));
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
    const dipAt = process.env.DIP_AT ? Number(process.env.DIP_AT) : null;
    const atStart: StartDelayProfile[] = [], atDip: StartDelayProfile[] = [];
    const pooled = await findStartDelay(design, trace, {
      ...extra, mode: 'refit',
      startDelayProfileOf: async (r) => {
        const ps = profileFromRequest(r);
        ps.forEach((p, i) => r.layers[i].profiled && profiles.push({ layer: profiles.length, p }));
        if (dipAt !== null) {
          for (const [at, into] of [[0, atStart], [dipAt, atDip]] as const) {
            profilesWithOnsetAt(r, at).forEach((p, i) => r.layers[i].profiled && p && into.push(p));
          }
        }
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
    if (dipAt !== null) {
      const f = (p: ReturnType<typeof pooledStartDelay>) => `${p?.delayS.toFixed(2)} ± ${p?.sigmaS.toFixed(2)} gain ${p?.gainChi2.toFixed(1)} disp ${p?.dispersion.toFixed(2)} gain/disp ${((p?.gainChi2 ?? 0) / (p?.dispersion ?? 1)).toFixed(1)} kept ${p?.kept}`;
      console.log(`   no growth below: onset at start ${f(pooledStartDelay(atStart))} | at ${dipAt} of the layer ${f(pooledStartDelay(atDip))}`);
    }
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
