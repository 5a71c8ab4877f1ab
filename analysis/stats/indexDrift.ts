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
 * This run's estimate of a material's index deviation at a time, from its fitted layers so far:
 * the linear trend in time from three or more layers, their mean from one or two, null from none.
 */
export function driftEstimateAt(points: readonly IndexPoint[], material: string, timeS: number): { deviation: number; from: number } | null {
  const list = points.filter((p) => p.material === material && !p.indexHeld && Number.isFinite(p.indexDeviation));
  if (list.length === 0) return null;
  if (list.length < 3) return { deviation: list.reduce((a, p) => a + p.indexDeviation, 0) / list.length, from: list.length };
  const t = linearTrend(list.map((p) => p.timeS / 3600), list.map((p) => p.indexDeviation));
  return { deviation: t.intercept + (t.slope * timeS) / 3600, from: list.length };
}
