import type { TraceData } from '../trace';
import type { AnalyzeOptions } from './types';

/**
 * A detector chain that reads low toward the top of its range, as the shop measured it (option
 * detectorLinearity): a reading v of a linear response u is v = u·(1 − k·u), k = lowPct/100 over
 * the linear reading it was measured at (e.g. with calibrated neutral-density filters, common
 * practice). Quadratic compression is the first term of any smooth one; a shop whose check shows
 * another shape should keep its readings where the detector is linear instead.
 */
export interface DetectorLinearity {
  /** How far low the detector reads at `atReading`, % of the reading. */
  lowPct: number;
  /** The linear reading (trace units: the signal column's) at which it reads lowPct low. */
  atReading: number;
}

/** The detector's k (per unit of reading): v = u·(1 − k·u). */
export function compressionPerReading(l: DetectorLinearity): number {
  return l.lowPct / 100 / l.atReading;
}

/** The linear response u behind a reading v = u·(1 − k·u): the root that goes to v as k → 0 (written so it stays exact there). */
export function linearReading(v: number, k: number): number {
  const disc = 1 - 4 * k * v;
  return (2 * v) / (1 + Math.sqrt(disc));
}

/** The reading v = u·(1 − k·u) of a linear response u (the model put back in the trace's units). */
export function compressedReading(u: number, k: number): number {
  return u * (1 - k * u);
}

/**
 * The trace with its signal linearised (option detectorLinearity), a note for the run's warnings,
 * and k for putting the model back. Throws, naming the line, where a reading is beyond the largest
 * that detector can give (1/(4k)): the coefficient does not fit the data.
 */
export function withLinearisedSignal(trace: TraceData, options: AnalyzeOptions): { trace: TraceData; note: string | null; k: number } {
  const l = options.detectorLinearity;
  if (!l || !(l.lowPct > 0)) return { trace, note: null, k: 0 };
  if (!(l.atReading > 0) || !(l.lowPct < 100)) throw new Error(`detectorLinearity: lowPct ${l.lowPct} at a reading of ${l.atReading}: the reading must be above 0 and lowPct below 100`);
  const k = compressionPerReading(l);
  const signal = new Float64Array(trace.signal.length);
  for (let i = 0; i < signal.length; i++) {
    const v = trace.signal[i];
    if (4 * k * v >= 1) {
      throw new Error(
        `detectorLinearity: the reading ${v} on line ${trace.headerLine + 1 + i} is above the most a detector ${l.lowPct} % low at ${l.atReading} can give `
          + `(${+(1 / (4 * k)).toPrecision(4)}): check the coefficient and its reading`,
      );
    }
    signal[i] = linearReading(v, k);
  }
  const note = `signal linearised for a detector reading ${+l.lowPct.toFixed(4)} % low at ${+l.atReading.toPrecision(4)} (quadratic, option detectorLinearity, as entered: its own uncertainty is not in σ)`;
  return { trace: { ...trace, signal }, note, k };
}
