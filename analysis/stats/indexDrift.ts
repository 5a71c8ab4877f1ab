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
 * the linear trend in time from three or more layers, their mean from one or two, null from none.
 * σ is that of a new layer's index there: the trend's prediction σ, s²·(1 + 1/n + (t − t̄)²/Sxx)
 * (N. R. Draper, H. Smith, Applied Regression Analysis, ch. 1, the prediction of a new
 * observation), at least the layers' own σ and INDEX_SCATTER_FLOOR.
 */
export function driftEstimateAt(points: readonly IndexPoint[], material: string, timeS: number): { deviation: number; sigma: number; from: number } | null {
  const list = points.filter((p) => p.material === material && !p.indexHeld && Number.isFinite(p.indexDeviation));
  if (list.length === 0) return null;
  const n = list.length;
  const ownVar = list.reduce((a, p) => a + (Number.isFinite(p.indexSigma) ? p.indexSigma ** 2 : 0), 0) / n;
  const floor = Math.max(ownVar, INDEX_SCATTER_FLOOR ** 2);
  if (n < 3) {
    const mean = list.reduce((a, p) => a + p.indexDeviation, 0) / n;
    const spread = list.reduce((a, p) => a + (p.indexDeviation - mean) ** 2, 0);
    return { deviation: mean, sigma: Math.sqrt(Math.max(floor, spread) * (1 + 1 / n)), from: n };
  }
  const x = list.map((p) => p.timeS / 3600);
  const t = linearTrend(x, list.map((p) => p.indexDeviation));
  const x0 = timeS / 3600;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const sxx = x.reduce((a, b) => a + (b - mx) ** 2, 0);
  const s2 = Math.max((t.residualRms ** 2 * n) / (n - 2), floor);
  const lever = sxx > 0 ? (x0 - mx) ** 2 / sxx : 0;
  return { deviation: t.intercept + t.slope * x0, sigma: Math.sqrt(s2 * (1 + 1 / n + lever)), from: n };
}
