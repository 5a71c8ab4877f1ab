import { linearTrend, type LinearTrend } from './linearTrend';

export interface IndexPoint {
  layer: number;
  material: string;
  /** Layer start time, s. */
  timeS: number;
  /** Fitted index − the material's nominal index, at the monitor wavelength. */
  indexDeviation: number;
  indexSigma: number;
  /** Held layers carry no information about the index and are left out. */
  indexHeld: boolean;
}

export interface MaterialDrift {
  material: string;
  layers: number[];
  timeS: number[];
  deviation: number[];
  /** Each deviation's σ (the layer's own index σ). */
  sigma: number[];
  meanDeviation: number;
  /** Deviation against the order of the material's fitted layers (1, 2, 3, …): slope per layer. */
  byOrder: LinearTrend;
  /** Deviation against time: slope per hour. */
  byTime: LinearTrend;
}

/** Index deviation per material across a run, with linear trends against layer order and time. */
export function indexDrift(points: readonly IndexPoint[]): MaterialDrift[] {
  const byMaterial = new Map<string, IndexPoint[]>();
  for (const p of points) {
    if (p.indexHeld || !Number.isFinite(p.indexDeviation)) continue;
    const list = byMaterial.get(p.material) ?? [];
    list.push(p);
    byMaterial.set(p.material, list);
  }
  return [...byMaterial.entries()].map(([material, list]) => {
    const deviation = list.map((p) => p.indexDeviation);
    const timeS = list.map((p) => p.timeS);
    return {
      material,
      layers: list.map((p) => p.layer),
      timeS,
      deviation,
      sigma: list.map((p) => p.indexSigma),
      meanDeviation: deviation.reduce((a, b) => a + b, 0) / deviation.length,
      byOrder: linearTrend(list.map((_, i) => i + 1), deviation),
      byTime: linearTrend(timeS.map((t) => t / 3600), deviation),
    };
  });
}

/**
 * Layer-to-layer scatter of a film's index about its trend, the floor of a held index's σ when
 * too few layers show the scatter themselves (common practice for evaporated oxide films).
 */
export const INDEX_SCATTER_FLOOR = 0.005;
/** σ of a film's index about its material's nominal when no layer of the run tells (common practice: about 1 % for oxide films). */
export const NOMINAL_INDEX_SIGMA = 0.02;

/**
 * This run's estimate of a material's index deviation at a time, from its fitted layers so far:
 * the linear trend in time from three or more layers, their mean from one or two, null from none;
 * each layer weighted by 1/(σᵢ² + s₀²), its own σ and the layer-to-layer scatter s₀ =
 * INDEX_SCATTER_FLOOR, so a layer whose index the data barely tell (a thin one, or one on a
 * poorly known stack) does not pull the estimate (weighted least squares: N. R. Draper, H. Smith,
 * Applied Regression Analysis, ch. 9, from memory). σ is that of a new layer's index there:
 * f·(1/Σw + (t − t̄)²/Sxx + s₀²), the weighted prediction of a new observation (ch. 1 for equal
 * weights), with t̄ and Sxx weighted and f = max(1, χ²/ν) when the layers scatter more than
 * their σ say.
 */
export function driftEstimateAt(points: readonly IndexPoint[], material: string, timeS: number): { deviation: number; sigma: number; from: number } | null {
  const list = points.filter((p) => p.material === material && !p.indexHeld && Number.isFinite(p.indexDeviation));
  if (list.length === 0) return null;
  const n = list.length;
  const s0 = INDEX_SCATTER_FLOOR ** 2;
  const w = list.map((p) => 1 / ((Number.isFinite(p.indexSigma) ? p.indexSigma ** 2 : 0) + s0));
  const x = list.map((p) => p.timeS / 3600);
  const y = list.map((p) => p.indexDeviation);
  const sw = w.reduce((a, b) => a + b, 0);
  const mx = w.reduce((a, wi, i) => a + wi * x[i], 0) / sw;
  const my = w.reduce((a, wi, i) => a + wi * y[i], 0) / sw;
  const sxx = w.reduce((a, wi, i) => a + wi * (x[i] - mx) ** 2, 0);
  // A line from three or more layers spread in time; else their mean.
  const line = n >= 3 && sxx > 0;
  const slope = line ? w.reduce((a, wi, i) => a + wi * (x[i] - mx) * (y[i] - my), 0) / sxx : 0;
  const x0 = timeS / 3600;
  let chi2 = 0;
  for (let i = 0; i < n; i++) chi2 += w[i] * (y[i] - my - slope * (x[i] - mx)) ** 2;
  const dof = n - (line ? 2 : 1);
  const f = dof > 0 ? Math.max(1, chi2 / dof) : 1;
  const lever = line ? (x0 - mx) ** 2 / sxx : 0;
  return { deviation: my + slope * (x0 - mx), sigma: Math.sqrt(f * (1 / sw + lever + s0)), from: n };
}
