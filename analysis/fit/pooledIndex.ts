import { randomEffectsTrend } from '../stats';
import { commonShiftTrend } from './commonShiftTrend';
import { type LayerEstimate } from './fitLayers';

/** One layer as the pooling sees it. */
export interface PooledIndexLayer {
  material: string;
  /** Layer start time, s. */
  timeS: number;
  nominalIndex: number;
  estimate: LayerEstimate;
  /** Only layers whose index the fit was free to read, cut on a turning point, of ≥ 0.5 QWOT. */
  eligible: boolean;
}

/**
 * Each material's indices read together: the run's layers of a film scatter about a slow trend
 * (the index drift across the run) by a spread τ, and each layer's own reading adds its σ. A
 * layer deep in a high reflector reads its index from a turning-point level of a few % of full
 * scale (σ 0.003–0.006 on the chamber simulator's 40-layer run, against 0.001 on a chip's first
 * layers), so its material's other layers tell it as much as its own data: the index is predicted
 * from the trend and its reading together (the random-effects model's BLUP). The detector's
 * offset moves every layer's reading at once, each by its own signed share (indexOffsetShift, one
 * draw per run: the offset is the detector's), so the readings' errors are taken as their own σ²
 * less that share, plus the shared rank-one term, and the prediction's σ as the Prasad–Rao MSE
 * with that covariance (fit/commonShiftTrend.ts); `atUpperBound` (sequential, where each layer's
 * σ also holds the stack below's carried σ, shared with the layers below it on the chip and not
 * split off) takes the spread at its upper bound instead (white-noise mirror, seeds 11–26, RMS
 * z_n 0.36 against 0.45, but 40 layers 0.94 and 100 % within 3σ against 1.29 and 97.8 %): pooling averages the layers' own errors away,
 * not the offset's, and the offset's pattern across the layers (its sign and size differ with
 * each layer's place in the stack) is read along with the trend. Where that fails, the BLUP with
 * σ at the spread's upper bound (stats/randomEffectsTrend.ts). The trend and spread in the run's
 * note are the latter's. A turning-point cut's end pins its optical
 * thickness n·d (a non-absorbing layer's extrema fall at whole quarter-waves of its own optical
 * thickness whatever lies below: H. A. Macleod, "Thin-Film Optical Filters", ch. on monitoring,
 * from memory), so n·d stays, d and the rates move by n̂/n*, and σ_d keeps its relative size.
 * Returns the new estimates, one per layer (the same object where it did not move).
 */
export function poolIndices(layers: readonly PooledIndexLayer[], notes?: string[], atUpperBound = false): LayerEstimate[] {
  const out = layers.map((l) => l.estimate);
  const materials = new Set(layers.filter((l) => l.eligible).map((l) => l.material));
  for (const material of materials) {
    const idx = layers.flatMap((l, j) => (l.eligible && l.material === material && l.estimate.indexSigma > 0 ? [j] : []));
    const trend = randomEffectsTrend(idx.map((j) => ({ timeS: layers[j].timeS, value: layers[j].estimate.index - layers[j].nominalIndex, sigma: layers[j].estimate.indexSigma })));
    if (!trend) continue;
    const shared = commonShiftTrend(idx.map((j) => {
      const e = layers[j].estimate;
      const shift = e.indexOffsetShift ?? 0;
      // the own part kept ≥ 10 % of σ (a reading's σ is never all the offset's)
      return { timeS: layers[j].timeS, value: e.index - layers[j].nominalIndex, sigma: Math.sqrt(Math.max(e.indexSigma ** 2 - shift * shift, 0.01 * e.indexSigma ** 2)), shifts: shift ? [{ source: RUN_OFFSET, delta: shift }] : [] };
    }), atUpperBound ? 'upperBound' : 'prasadRao');
    const predicted = shared?.predicted ?? trend.predicted;
    // The run says so: the per-layer indices it reports are no longer each layer's own reading alone.
    notes?.push(pooledIndexNote(material, idx.length, trend.atMean, trend.slopePerHour, trend.slopeSigmaPerHour, Math.sqrt(trend.tau2Upper)));
    idx.forEach((j, i) => {
      const e = layers[j].estimate;
      const index = layers[j].nominalIndex + predicted[i].value;
      const k = e.index / index;
      out[j] = {
        ...e, index, indexSigma: predicted[i].sigma,
        thicknessNm: e.thicknessNm * k, thicknessSigmaNm: e.thicknessSigmaNm * k,
        rateNmPerS: e.rateNmPerS * k, rateSigma: e.rateSigma * k, rateDriftNmPerS2: e.rateDriftNmPerS2 * k, rateDriftSigma: e.rateDriftSigma * k,
        ...(e.wander ? { wander: e.wander.map((v) => v * k) } : {}),
      };
    });
  }
  return out;
}

/** The one source of the readings' offset shifts (the detector's). */
const RUN_OFFSET = {};

/** The run's note for one material's pooled indices (its trend the run's index drift's, stats/indexDrift.ts, where the same layers are fitted). */
export function pooledIndexNote(material: string, count: number, atMean: number, slopePerHour: number, slopeSigmaPerHour: number, spreadUpper: number): string {
  const signed = (v: number) => `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(4)}`;
  return `${material}: the indices of its ${count} turning-point layers read together (option pooledIndex): ${signed(atMean)} from nominal at mid-run, `
    + `drifting ${signed(slopePerHour)} ± ${slopeSigmaPerHour.toFixed(4)} per hour, layer-to-layer spread at most ${spreadUpper.toFixed(4)} (95 %); each layer's index is its own reading `
    + `drawn toward that trend as far as its own σ allows (n·d as fitted)`;
}
