import { type PooledStartDelay } from './startDelay';
import { type AnalysisResult } from './types';

/**
 * The start delay's own σ into each layer's figures: the run analysed again with the delay one σ
 * longer (`moved`), and every layer's change of thickness, index, rate and cut error added in
 * quadrature to its σ (first-order propagation, as fit/offsetSigma.ts does for the offset). The
 * passes held the delay as exact.
 */
export function carryStartDelaySigma(result: AnalysisResult, moved: AnalysisResult): void {
  const byLayer = new Map(moved.layers.map((l) => [l.layer, l]));
  const add = (sigma: number, delta: number) => (Number.isFinite(delta) ? Math.hypot(sigma, delta) : sigma);
  for (const l of result.layers) {
    const m = byLayer.get(l.layer);
    if (!m) continue;
    l.thicknessSigmaNm = add(l.thicknessSigmaNm, m.thicknessNm - l.thicknessNm);
    if (!l.indexHeld) l.indexSigma = add(l.indexSigma, m.index - l.index);
    l.rateSigmaNmPerS = add(l.rateSigmaNmPerS, m.rateNmPerS - l.rateNmPerS);
    l.cutErrorSigmaQwotPct = add(l.cutErrorSigmaQwotPct, m.cutErrorQwotPct - l.cutErrorQwotPct);
  }
}

/** The run's note on the start transient (a warning line: shared/FORMATS.md fixes no other field). */
export function startDelayNote(p: PooledStartDelay): string {
  const found = `start transient: the rate reaches its full value as if the shutter opened ${p.delayS.toFixed(2)} ± ${p.sigmaS.toFixed(2)} s late ` +
    `(pooled over ${p.layers} layers${p.shutterS !== null ? `, with growth after turning-point cuts of ${p.shutterS.toFixed(2)} s at the full rate` : ''}, χ² lower by ${p.gainChi2.toFixed(1)})`;
  return p.kept ? `${found}; every layer fitted with it` : `${found}: not kept (not above the margin of ${p.marginChi2.toFixed(1)}); layers fitted without it`;
}
