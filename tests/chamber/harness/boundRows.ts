// Per layer over seeds: the analysis's reported σ_d and its errors beside two Cramér–Rao bounds,
// A from the layer's own samples given the true stack below (layerBound.ts) and B from the whole
// chip's record with the growths after the cuts known (chipBound.ts); where the rate wanders, W
// with the wander as a random nuisance (wanderBound.ts), and BW, B so (chipBound.ts). Thickness in % of the truth.
import { type Mode, type Scenario } from '../scenarios';
import { chipBound } from './chipBound';
import { layerBound } from './layerBound';
import { runScenario } from './runScenario';
import { wanderBoundNm } from './wanderBound';

export interface BoundRow {
  layer: number;
  /** Means over the seeds of σ_A, σ_B and the reported σ_d, %. */
  boundA: number;
  boundB: number;
  /** Where the rate wanders: the hybrid bound with the wander as a random nuisance (wanderBound.ts), else null. */
  boundW: number | null;
  /** Where the rate wanders: B with each layer's wander as a random nuisance (chipBound's wanderBlockS, 5 s blocks), else null. */
  boundBW: number | null;
  reported: number;
  /** Errors d̂ − d per seed, %. */
  errors: number[];
  /** Errors over the reported σ, per seed. */
  z: number[];
  /** σ_A of the cut error, % QWOT, and the analysis's σ and errors of it. */
  cutBoundA: number;
  cutReported: number;
  cutErrors: number[];
}

const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);

export async function boundRows(scenario: Scenario, seeds: number[], mode: Mode): Promise<BoundRow[]> {
  type Draw = { a: number; b: number; w: number | null; bw: number | null; rep: number; err: number; z: number; cutA: number; cutRep: number; cutErr: number };
  const draws = new Map<number, Draw[]>();
  for (const seed of seeds) {
    const options = { ...scenario.options, seed };
    const { run, results } = await runScenario(scenario, seed, [mode]);
    const chipNumbers = [...new Set(run.truth.layers.map((l) => l.chip))];
    const chips = chipNumbers.flatMap((c) => chipBound(scenario.design, options, run, c));
    const chipsW = scenario.options.rateWander ? chipNumbers.flatMap((c) => chipBound(scenario.design, options, run, c, { wanderBlockS: 5 })) : null;
    for (const t of run.truth.layers) {
      const l = results[mode]?.layers.find((x) => x.layer === t.layer);
      if (!l) continue;
      // the gain prior of the sequential per-layer gain (gainPriorFraction 0.005); it hardly matters
      const a = layerBound(scenario.design, options, run, t, { gain: 0.005 });
      const list = draws.get(t.layer) ?? [];
      list.push({
        a: (a.thicknessSigmaNm / t.thicknessNm) * 100, b: (chips.find((c) => c.layer === t.layer)!.thicknessSigmaNm / t.thicknessNm) * 100,
        bw: chipsW ? (chipsW.find((c) => c.layer === t.layer)!.thicknessSigmaNm / t.thicknessNm) * 100 : null,
        w: scenario.options.rateWander ? (wanderBoundNm(scenario.design, options, run, t) / t.thicknessNm) * 100 : null,
        rep: (l.thicknessSigmaNm / t.thicknessNm) * 100, err: (l.thicknessNm / t.thicknessNm - 1) * 100, z: (l.thicknessNm - t.thicknessNm) / l.thicknessSigmaNm,
        cutA: a.cutSigmaQwotPct, cutRep: l.cutErrorSigmaQwotPct, cutErr: l.cutErrorQwotPct - t.cutErrorQwotPct,
      });
      draws.set(t.layer, list);
    }
  }
  return [...draws.entries()].sort((x, y) => x[0] - y[0]).map(([layer, d]) => ({
    layer, boundA: mean(d.map((x) => x.a)), boundB: mean(d.map((x) => x.b)),
    boundW: d[0].w === null ? null : mean(d.map((x) => x.w!)), boundBW: d[0].bw === null ? null : mean(d.map((x) => x.bw!)), reported: mean(d.map((x) => x.rep)),
    errors: d.map((x) => x.err), z: d.map((x) => x.z), cutBoundA: mean(d.map((x) => x.cutA)), cutReported: mean(d.map((x) => x.cutRep)), cutErrors: d.map((x) => x.cutErr),
  }));
}
