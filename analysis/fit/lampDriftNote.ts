import { type HeldIndexShift } from './thinLayer';

/** One layer's figures as reported, and what one σ of the held lamp drift moved them by (its share of their σ). */
export interface LampDriftShare {
  layer: number;
  thicknessSigmaNm: number;
  indexSigma: number;
  indexHeld: boolean;
  shift: HeldIndexShift;
}

/** A figure whose σ² the held drift makes up more than this fraction of is named in the note ("most": chosen here, not a published figure). */
export const LAMP_SHARE_NAMED = 0.5;
/** Layers named at most; the rest counted. */
const NAMED_AT_MOST = 6;

/**
 * The run's note where the lamp's drift within a chip was held (no reference column, not fitted)
 * and the assumed stability (AnalyzeOptions.lampStabilityPerHour, fit/gainDriftPrior.ts) makes up
 * most of a layer's σ: those σ are then the assumption's, not the readings', and a shop whose lamp
 * is known to be steadier gets tighter figures by saying so. The share of a figure is
 * (shift/σ)², the drift's variance over the figure's whole variance as reported (the shift added in
 * quadrature is one σ's change, first-order propagation); capped at 1 where a later reading
 * narrowed the figure (its share is then taken in proportion, fit/gainDriftSigma.ts). Null where
 * no figure passes LAMP_SHARE_NAMED.
 */
export function lampDriftNote(shares: readonly LampDriftShare[], heldPerHour: number, sigmaPerHour: number): string | null {
  const named: string[] = [];
  for (const s of shares) {
    const d = share(s.shift.thicknessNm, s.thicknessSigmaNm);
    const n = s.indexHeld ? 0 : share(s.shift.index, s.indexSigma);
    const parts = [d > LAMP_SHARE_NAMED ? `thickness ${pct(d)}` : '', n > LAMP_SHARE_NAMED ? `index ${pct(n)}` : ''].filter(Boolean);
    if (parts.length) named.push(`layer ${s.layer} (${parts.join(', ')})`);
  }
  if (named.length === 0) return null;
  const list = named.length > NAMED_AT_MOST ? [...named.slice(0, NAMED_AT_MOST), `${named.length - NAMED_AT_MOST} more layer${named.length - NAMED_AT_MOST === 1 ? '' : 's'}`] : named;
  return `lamp drift assumed: with no reference column the lamp's drift within a chip is not read from its layers; held at ${perHour(heldPerHour)} `
    + `with an assumed stability of ±${perHour(sigmaPerHour)}, it makes up most of the uncertainty (σ²) of ${list.join(', ')}; `
    + 'a lamp known to be steadier gives tighter figures ("Lamp stability, %/h" under "Analyse again with other settings")';
}

function share(shift: number, sigma: number): number {
  return sigma > 0 && Number.isFinite(shift) ? Math.min(1, (shift / sigma) ** 2) : 0;
}

// (a share at the cap is where a later reading narrowed the figure more than the shift: "≥ 99 %")
const pct = (x: number) => (x >= 0.99 ? '≥ 99 %' : `${Math.round(x * 100)} %`);
const perHour = (x: number) => `${(x * 100).toFixed(2)} %/h`;
