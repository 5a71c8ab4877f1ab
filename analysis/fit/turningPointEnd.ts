import { type LayerAt } from '../optics';
import { modelTurningPoints } from './cutTiming';
import { type LayerEstimate } from './fitLayers';
import { layerAtWavelength, type FitLayerData } from './layerModel';
import { lawThickness, lawTimeToThickness } from './rateWander';

/**
 * The end of a turning-point-cut layer whose boundaries were placed without a layer column
 * (fit/placeBoundaries), from its fit: the time base τ at which the fitted layer reaches its
 * modelled turning point nearest the placed end (its index, on the fitted stack below). The
 * placement puts the end where the design's curve at one steady rate turns; a rate that wanders
 * within the layer moves that by seconds from where the data turn (measured on the chamber
 * simulator's 12-layer run: −2.8 to +2.7 s), while the fit's own turning point rests on its
 * index and the stack below alone. The overshoot past the turning point is not read: it moves the
 * readings only to second order, and the next layer's start moves with it to first order (the
 * placed start absorbs it). null where the fitted curve has no turning point within
 * `withinFraction` of the layer's thickness at the placed end.
 */
export function turningPointEndS(layer: FitLayerData, estimate: LayerEstimate, below: readonly LayerAt[], withinFraction = 0.1): number | null {
  const placedNm = lawThickness(estimate, layer.wander, layer.durationS);
  if (!(placedNm > 0)) return null;
  const tps = modelTurningPoints(layer.optics, below, estimate.index, layer.extinction, placedNm * (1 + 2 * withinFraction));
  let nearest: number | null = null;
  for (const tp of tps) {
    if (Math.abs(tp.thicknessNm - placedNm) <= withinFraction * placedNm && (nearest === null || Math.abs(tp.thicknessNm - placedNm) < Math.abs(nearest - placedNm))) nearest = tp.thicknessNm;
  }
  if (nearest === null) return null;
  const tau = lawTimeToThickness(estimate, layer.wander, nearest, layer.durationS);
  return Number.isFinite(tau) && tau > 0 ? tau : null;
}

/**
 * After a chip's joint fit: every turning-point cut's end (`turningPoint[j]`) placed again on the
 * jointly fitted layer (turningPointEndS), bottom up, each on the stack below as now ended.
 * Writes the layers' durationS; true when any moved (the chip is then fitted again).
 */
export function turningPointEndsOnChip(data: FitLayerData[], estimates: readonly LayerEstimate[], turningPoint: readonly boolean[]): boolean {
  let moved = false;
  for (let j = 0; j < data.length; j++) {
    if (!turningPoint[j]) continue;
    const below = data.slice(0, j).map((d, i) => layerAtWavelength(d, estimates[i], data[j].optics.wavelengthNm));
    const endS = turningPointEndS(data[j], estimates[j], below);
    if (endS !== null && Math.abs(endS - data[j].durationS) > 1e-3) {
      data[j].durationS = endS;
      moved = true;
    }
  }
  return moved;
}
