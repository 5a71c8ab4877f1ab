import { type LayerAt } from '../optics';
import { modelTurningPoints, turningPointNearNm } from './cutTiming';
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
 * jointly fitted layer (turningPointEndS), bottom up, each on the stack below as now ended, and
 * its thickness (and n·d) read there from its fitted rate law. Writes the layers' durationS and
 * `estimates[j]`; true when any end moved.
 *
 * The chip is not fitted again on the moved ends: a fit on them bends each rate law so that the
 * thickness at the end stands off the turning point (the next layer's start pulls it), and that
 * offset carries nothing of the excess past the turning point that the trace does not show (12-layer
 * run without layer column, seeds 35, 36, 101–106, 96 layers: offset RMS 0.18 nm, correlation
 * with the true excess 0.01); the excess's prior mean (fit/turningPointExcess.ts) then stood on
 * noise. Refitted so, refit read 1.06 % at most (RMS 0.45 %) against 0.98 % (0.37 %) placed.
 */
export function turningPointEndsOnChip(data: FitLayerData[], estimates: LayerEstimate[], turningPoint: readonly boolean[]): boolean {
  let moved = false;
  for (let j = 0; j < data.length; j++) {
    if (!turningPoint[j]) continue;
    const below = data.slice(0, j).map((d, i) => layerAtWavelength(d, estimates[i], data[j].optics.wavelengthNm));
    const endS = turningPointEndS(data[j], estimates[j], below);
    if (endS !== null && Math.abs(endS - data[j].durationS) > 1e-3) {
      data[j].durationS = endS;
      const d = lawThickness(estimates[j], data[j].wander, endS);
      estimates[j] = { ...estimates[j], thicknessNm: d, opticalThicknessNm: estimates[j].index * d };
      moved = true;
    }
  }
  return moved;
}

/** σ of a layer below as the turning point's propagation takes it: thickness, nm, and real index. */
export interface BelowSigma {
  thicknessNm: number;
  index: number;
}

/**
 * σ of a thickness placed on the fitted layer's turning point (turningPointEndS), and of its n·d.
 * There d is the turning point's d_TP(n, stack below): the rate law only found which turning point,
 * so the law's own σ at the end (the extrapolated r·τ + a·τ²/2 at a fixed τ) is not this
 * estimate's. On the chamber simulator's single quarter-wave MgF2 layer that law σ read 1.6–2.3 %
 * where the errors over 20 runs had an RMS of 0.44 % (RMS z 0.21). First-order propagation (JCGM
 * 100:2008, the GUM, §5.1.2, from memory) through symmetric differences of ±1σ in the layer's
 * index and in each layer below's thickness and index, the inputs taken as independent (their
 * covariances are not carried between layers here). Null where a perturbed curve has no turning
 * point near the end; the excess past the turning point is added apart (fit/turningPointExcess.ts).
 */
export function turningPointEndSigma(
  layer: FitLayerData, index: number, indexSigma: number, below: readonly LayerAt[], belowSigma: readonly BelowSigma[], endNm: number,
): { thicknessNm: number; opticalThicknessNm: number } | null {
  let varD = 0, varNd = 0;
  const add = (atPlus: number | null, atMinus: number | null, dn: number) => {
    if (atPlus === null || atMinus === null) return false;
    const dd = (atPlus - atMinus) / 2;
    varD += dd * dd;
    // n·d moves with d, and with n itself where n is the input moved (dn ≠ 0)
    const dnd = index * dd + dn * endNm;
    varNd += dnd * dnd;
    return true;
  };
  if (indexSigma > 0 && !add(turningPointNearNm(layer.optics, below, index + indexSigma, layer.extinction, endNm), turningPointNearNm(layer.optics, below, index - indexSigma, layer.extinction, endNm), indexSigma)) return null;
  for (let i = 0; i < below.length; i++) {
    const s = belowSigma[i];
    const moved = (f: (l: LayerAt) => LayerAt) => below.map((l, k) => (k === i ? f(l) : l));
    if (s.thicknessNm > 0) {
      const ok = add(
        turningPointNearNm(layer.optics, moved((l) => ({ ...l, thicknessNm: l.thicknessNm + s.thicknessNm })), index, layer.extinction, endNm),
        turningPointNearNm(layer.optics, moved((l) => ({ ...l, thicknessNm: Math.max(l.thicknessNm - s.thicknessNm, 0) })), index, layer.extinction, endNm), 0);
      if (!ok) return null;
    }
    if (s.index > 0) {
      const ok = add(
        turningPointNearNm(layer.optics, moved((l) => ({ ...l, n: { re: l.n.re + s.index, im: l.n.im } })), index, layer.extinction, endNm),
        turningPointNearNm(layer.optics, moved((l) => ({ ...l, n: { re: l.n.re - s.index, im: l.n.im } })), index, layer.extinction, endNm), 0);
      if (!ok) return null;
    }
  }
  return { thicknessNm: Math.sqrt(varD), opticalThicknessNm: Math.sqrt(varNd) };
}
