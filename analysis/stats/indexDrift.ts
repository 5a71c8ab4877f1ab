import { linearTrend, type LinearTrend } from './linearTrend';
import { randomEffectsTrend } from './randomEffectsTrend';
import { weightedLine } from './weightedLine';

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

/**
 * How a material's drift lines were drawn: 'random-effects', five or more layers
 * (RANDOM_EFFECTS_MIN_POINTS), each weighted by 1/(σᵢ² + τ̂²), τ̂² the layers' spread about the
 * line read from the data (stats/randomEffectsTrend.ts: the same line as the pooled-index note's);
 * 'weighted', fewer layers, each by 1/σᵢ², a slope's σ widened by √(χ²/(k − 2)) where the layers
 * scatter more than their σ say; 'unweighted', a layer without a σ > 0 (ordinary least squares).
 */
export type DriftMethod = 'random-effects' | 'weighted' | 'unweighted';

export interface MaterialDrift {
  material: string;
  layers: number[];
  timeS: number[];
  deviation: number[];
  /** Each deviation's σ (the layer's own index σ). */
  sigma: number[];
  /** The line's value at the layers' mean time (one layer: its value); 'unweighted', their mean. */
  meanDeviation: number;
  /** Deviation against the order of the material's fitted layers (1, 2, 3, …): slope per layer. */
  byOrder: LinearTrend;
  /** Deviation against time: slope per hour. */
  byTime: LinearTrend;
  method: DriftMethod;
  /** The layers' spread about the line, τ̂² ('random-effects'); 0 ('weighted'); NaN ('unweighted'). */
  tau2: number;
}

/**
 * Index deviation per material across a run, with its trend against layer order and time: one
 * weighted line (see DriftMethod), so a reading the data barely tell (a deep layer of a high
 * reflector, σ 0.005–0.02) does not tip it as an unweighted line let it. The order line takes the
 * time line's weights.
 */
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
    const sigma = list.map((p) => p.indexSigma);
    const hours = timeS.map((t) => t / 3600);
    const order = list.map((_, i) => i + 1);
    const common = { material, layers: list.map((p) => p.layer), timeS, deviation, sigma };
    if (sigma.some((s) => !(s > 0) || !Number.isFinite(s))) {
      return {
        ...common, method: 'unweighted' as const, tau2: NaN,
        meanDeviation: deviation.reduce((a, b) => a + b, 0) / deviation.length,
        byOrder: linearTrend(order, deviation),
        byTime: linearTrend(hours, deviation),
      };
    }
    const re = randomEffectsTrend(list.map((p) => ({ timeS: p.timeS, value: p.indexDeviation, sigma: p.indexSigma })));
    if (re) {
      const w = sigma.map((s) => 1 / (s * s + re.tau2));
      const tMean = re.meanTimeS / 3600;
      const byTime: LinearTrend = {
        slope: re.slopePerHour,
        slopeSigma: re.slopeSigmaPerHour,
        intercept: re.atMean - re.slopePerHour * tMean,
        interceptSigma: Math.sqrt(Math.max(0, re.atMeanSigma ** 2 - 2 * tMean * re.atMeanSlopeCovariance + tMean ** 2 * re.slopeSigmaPerHour ** 2)),
        count: list.length,
        residualRms: residualRms(hours, deviation, re.atMean - re.slopePerHour * tMean, re.slopePerHour),
      };
      return { ...common, method: 'random-effects' as const, tau2: re.tau2, meanDeviation: re.atMean, byOrder: weightedTrend(order, deviation, w, false), byTime };
    }
    const w = sigma.map((s) => 1 / (s * s));
    const byTime = weightedTrend(hours, deviation, w, true);
    const mean = w.reduce((a, wi, i) => a + wi * deviation[i], 0) / w.reduce((a, b) => a + b, 0);
    const tMean = hours.reduce((a, b) => a + b, 0) / hours.length;
    return {
      ...common, method: 'weighted' as const, tau2: 0,
      meanDeviation: Number.isFinite(byTime.slope) ? byTime.intercept + byTime.slope * tMean : mean,
      byOrder: weightedTrend(order, deviation, w, true),
      byTime,
    };
  });
}

/**
 * The weighted line through (x, y) in LinearTrend's terms: σ from (X'WX)⁻¹, times √max(1, χ²/(k − 2))
 * with `scatterScale` (the fixed-effect line's layers scattering more than their σ say; the
 * Birge ratio, common practice); a slope needs three points to carry a σ, as the unweighted one.
 */
function weightedTrend(x: readonly number[], y: readonly number[], w: readonly number[], scatterScale: boolean): LinearTrend {
  const k = x.length;
  const xMean = x.reduce((a, b) => a + b, 0) / k;
  const line = k >= 2 ? weightedLine(x.map((v) => v - xMean), y, w) : null;
  if (!line) {
    const mean = w.reduce((a, wi, i) => a + wi * y[i], 0) / w.reduce((a, b) => a + b, 0);
    return { slope: NaN, slopeSigma: NaN, intercept: mean, interceptSigma: NaN, count: k, residualRms: NaN };
  }
  const f = k > 2 ? (scatterScale ? Math.max(1, line.q / (k - 2)) : 1) : NaN;
  const intercept = line.a - line.b * xMean;
  return {
    slope: line.b,
    slopeSigma: Math.sqrt(f * line.inv11),
    intercept,
    interceptSigma: Math.sqrt(f * Math.max(0, line.inv00 - 2 * xMean * line.inv01 + xMean * xMean * line.inv11)),
    count: k,
    residualRms: residualRms(x, y, intercept, line.b),
  };
}

const residualRms = (x: readonly number[], y: readonly number[], a: number, b: number) =>
  Math.sqrt(y.reduce((s, yi, i) => s + (yi - a - b * x[i]) ** 2, 0) / y.length);

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
