import { fromNK, growingLayerSignal, type LayerAt } from '../optics';
import { type MonitorOptics } from './layerModel';

export interface ModelTurningPoint {
  thicknessNm: number;
  /** Modelled signal (fraction). */
  signal: number;
  kind: 'max' | 'min';
}

/**
 * Extrema of the modelled monitor signal of a layer growing from 0 to maxThicknessNm, located
 * on a fine grid and refined by a parabola through the three points around each.
 */
export function modelTurningPoints(
  optics: MonitorOptics, below: readonly LayerAt[], index: number, extinction: number, maxThicknessNm: number,
): ModelTurningPoint[] {
  const steps = Math.max(64, Math.ceil(maxThicknessNm / 0.25));
  const h = maxThicknessNm / steps;
  const d = new Float64Array(steps + 1);
  for (let i = 0; i <= steps; i++) d[i] = i * h;
  const spec = { ...optics, below, growing: fromNK(index, extinction), pol: 's' as const };
  const m = growingLayerSignal(spec, d);
  const out: ModelTurningPoint[] = [];
  for (let i = 1; i < steps; i++) {
    const a = m[i - 1], b = m[i], c = m[i + 1];
    const isMax = b > a && b >= c, isMin = b < a && b <= c;
    if (!isMax && !isMin) continue;
    const den = a - 2 * b + c;
    const shift = den !== 0 ? (0.5 * (a - c)) / den : 0;
    const thicknessNm = d[i] + shift * h;
    out.push({ thicknessNm, signal: growingLayerSignal(spec, [thicknessNm])[0], kind: isMax ? 'max' : 'min' });
  }
  return out;
}

/** The modelled turning point of a layer (index, extinction, on `below`) nearest endNm, within 10 % of it; null without one. */
export function turningPointNearNm(optics: MonitorOptics, below: readonly LayerAt[], index: number, extinction: number, endNm: number): number | null {
  let best: number | null = null;
  for (const tp of modelTurningPoints(optics, below, index, extinction, endNm * 1.2)) {
    if (Math.abs(tp.thicknessNm - endNm) <= 0.1 * endNm && (best === null || Math.abs(tp.thicknessNm - endNm) < Math.abs(best - endNm))) best = tp.thicknessNm;
  }
  return best;
}

/** τ ≥ 0 at which r·τ + a·τ²/2 reaches d (extrapolated); NaN when it never does. */
export function timeToThickness(thicknessNm: number, rateNmPerS: number, rateDriftNmPerS2: number): number {
  const r = rateNmPerS, a = rateDriftNmPerS2;
  if (Math.abs(a) < 1e-15 * Math.max(Math.abs(r), 1e-300)) return r > 0 ? thicknessNm / r : NaN;
  const disc = r * r + 2 * a * thicknessNm;
  if (disc < 0) return NaN;
  // Numerically stable root of a/2·τ² + r·τ − d = 0
  const tau = (2 * thicknessNm) / (r + Math.sqrt(disc));
  return tau >= 0 ? tau : NaN;
}
