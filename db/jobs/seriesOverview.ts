import { decimateIndices } from '../../analysis/trace';
import type { SeriesOverview } from '../queries/series';

/** Points of a whole-run overview: enough for a wide screen, few enough to draw at once. */
export const OVERVIEW_POINTS = 6000;

/**
 * The samples worth plotting of [from, to): per bucket the lowest and highest reading and the
 * largest misfit (reading − model), with the model beside them (null where there is none).
 */
export function plotPoints(timeS: ArrayLike<number>, signal: ArrayLike<number>, model: ArrayLike<number> | null, maxPoints: number): SeriesOverview {
  const n = signal.length;
  let misfit: Float64Array | undefined;
  if (model) {
    misfit = new Float64Array(n);
    for (let i = 0; i < n; i++) misfit[i] = Number.isNaN(model[i]) ? 0 : signal[i] - model[i];
  }
  const picked = decimateIndices(signal, 0, n, maxPoints, misfit);
  const out: SeriesOverview = { timeS: [], signal: [], model: [] };
  for (const i of picked) {
    out.timeS.push(timeS[i]);
    out.signal.push(signal[i]);
    const m = model ? model[i] : NaN;
    out.model.push(Number.isNaN(m) ? null : m);
  }
  return out;
}
