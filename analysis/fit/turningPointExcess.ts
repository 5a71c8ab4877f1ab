import { type LayerAt } from '../optics';
import { turningPointNearNm } from './cutTiming';
import { type LayerEstimate } from './fitLayers';
import { type FitLayerData } from './layerModel';
import { lawRate, lawThickness } from './rateWander';

/**
 * The most a turning-point cut is taken to run past the turning point before the controller
 * closes the shutter, % of the layer's thickness, by default (option turningPointOvershootPct;
 * common practice: a controller that cuts on the turning point it sees stops within about 1 % of
 * the layer past it).
 */
export const TURNING_POINT_OVERSHOOT_PCT = 1;

/**
 * The longest time the shutter takes to close, s (the chambers take 0.1–1 s). The rate
 * falls to 0 as it closes, taken as linearly (common practice for a blade crossing the plume): the
 * film grows by at most the final rate times half this time.
 */
export const SHUTTER_CLOSE_S = 1;

/** The film a turning-point cut may have grown past its turning point, nm: its prior's first two moments. */
export interface TurningPointExcess {
  /** Largest overshoot considered (overshootPct of the layer). */
  overshootMaxNm: number;
  /** Largest growth while the shutter closes (the final rate for half of SHUTTER_CLOSE_S). */
  growthMaxNm: number;
  /** E[x] of the excess x. */
  meanNm: number;
  /** E[x²]. */
  meanSquareNm2: number;
}

/**
 * What the data leave open of a turning-point cut whose end was placed on its fitted turning
 * point (no layer column, fit/turningPointEnd): the film grown past the turning point before the
 * growth stopped, the controller's overshoot (up to overshootPct of the layer) and the growth
 * while the shutter closes (the final rate for half of SHUTTER_CLOSE_S). Neither is in such a
 * trace: the readings past the turning point and the pause's level move only to second order in
 * the excess (on the chamber simulator's 9-layer run the pause level leaves the excess's
 * posterior flat up to 5 % of each layer; allowed up to 30 %, its root-mean-square is 6–11 %),
 * and the next layer's placed start takes up its first-order effect. Its prior: two independent
 * uniforms, the overshoot on [0, a] and the growth on [0, b], so E[x] = (a + b)/2 and
 * E[x²] = a²/3 + ab/2 + b²/3 (a uniform on [0, a] has mean a/2 and mean square a²/3).
 */
export function turningPointExcess(layer: FitLayerData, estimate: LayerEstimate, overshootPct = TURNING_POINT_OVERSHOOT_PCT): TurningPointExcess {
  const endNm = Math.max(lawThickness(estimate, layer.wander, layer.durationS), 0);
  const rate = Math.max(lawRate(estimate, layer.wander, layer.durationS), 0);
  const a = (Math.max(overshootPct, 0) / 100) * endNm, b = (rate * SHUTTER_CLOSE_S) / 2;
  return { overshootMaxNm: a, growthMaxNm: b, meanNm: (a + b) / 2, meanSquareNm2: (a * a) / 3 + (a * b) / 2 + (b * b) / 3 };
}

/** Thickness step of the layer below for the turning point's central difference, nm. */
const STEP_NM = 0.5;

/**
 * How far a layer's turning point nearest `endNm` moves back per nm more of the layer directly
 * below (−∂d_TP/∂d_below, central difference on the model): the self-compensation of
 * turning-point monitoring, where a layer cut past its turning point leaves the next one's
 * turning point earlier (deep in a quarter-wave stack of H and L about 1 for L on H and
 * (n_L/n_H)² for H on L; analysis/fit/__tests__/turningPointExcess.test.ts derives it). Null where either side has no
 * turning point within 10 % of endNm.
 */
export function turningPointCompensation(layer: FitLayerData, index: number, below: readonly LayerAt[], endNm: number): number | null {
  if (below.length === 0) return null;
  const at = (shiftNm: number) =>
    turningPointNearNm(layer.optics, below.map((l, i) => (i === below.length - 1 ? { ...l, thicknessNm: l.thicknessNm + shiftNm } : l)), index, layer.extinction, endNm);
  const up = at(STEP_NM), down = at(-STEP_NM);
  return up === null || down === null ? null : -(up - down) / (2 * STEP_NM);
}

/**
 * The mean square error the excesses leave in a turning-point layer's thickness placed on its
 * turning point: the truth lies its own excess v past it, and its turning point c·u earlier for
 * an excess u of the layer below (turningPointCompensation), so the error is c·u − v, and with u
 * and v independent E[(c·u − v)²] = c²·E[u²] − 2c·E[u]·E[v] + E[v²].
 */
export function excessErrorMeanSquare(own: TurningPointExcess, below: TurningPointExcess | null, compensation: number | null): number {
  if (!below || compensation === null) return own.meanSquareNm2;
  const c = compensation;
  return Math.max(c * c * below.meanSquareNm2 - 2 * c * below.meanNm * own.meanNm + own.meanSquareNm2, 0);
}

/**
 * What a turning-point layer placed on its turning point lacks on average, nm: the truth lies
 * v − c·u past it (excessErrorMeanSquare), so E[v] − c·E[u]; added, the estimate stands at the
 * posterior mean under the excesses' priors (the trace tells nothing of them).
 */
export function excessMeanShiftNm(own: TurningPointExcess, below: TurningPointExcess | null, compensation: number | null): number {
  return own.meanNm - (below && compensation !== null ? compensation * below.meanNm : 0);
}

/**
 * The variance the excesses leave about that mean: c²·Var(u) + Var(v) for independent u and v
 * (Var = E[x²] − E[x]²), the σ of an estimate moved by excessMeanShiftNm.
 */
export function excessErrorVariance(own: TurningPointExcess, below: TurningPointExcess | null, compensation: number | null): number {
  const variance = (x: TurningPointExcess) => Math.max(x.meanSquareNm2 - x.meanNm * x.meanNm, 0);
  const c = below && compensation !== null ? compensation : 0;
  return c * c * (below ? variance(below) : 0) + variance(own);
}
