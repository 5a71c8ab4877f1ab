import { type LayerAt } from '../optics';
import { loggedIntervalS, spectrumLines, type SpectrumLine, type TraceData } from '../trace';
import { medianInPlace } from '../trace/robustStats';
import { type LayerState } from './analyzeRun';
import { layerResidualsEvery } from './layerResult';

/** Most residual samples the run's spectrum is taken on (every k-th sample of each layer beyond this). */
const MAX_POINTS = 16384;
/**
 * The least line reported, a fraction of full scale: chosen here, beneath every line a 0.2 % lamp
 * ripple leaves in the simulator's scenarios (0.06–0.2 % of full scale) and above the one false
 * line seen over seeds 1–10 of every scenario in both modes (0.01 %, 5× its continuum).
 */
const MIN_LINE_FRACTION = 3e-4;
/** Lines are sought from this many cycles over the run up (fewer do not make a periodic disturbance). */
const MIN_CYCLES_IN_RUN = 20;
/** …and from this many cycles within a median layer up: slower misfit follows the layers, not a clock. */
const MIN_CYCLES_IN_LAYER = 3;

/** The run's residual series and what the search needs, as plain data (structured-cloneable). */
export interface RunLinesRequest {
  timeS: Float64Array;
  residual: Float64Array;
  /** The reported model M at those samples (model units). */
  model: Float64Array;
  minFrequencyHz: number;
  rawRateHz: number;
}

/**
 * Periodic disturbances through the whole run: narrow lines in the spectrum of every layer's
 * residuals under its reported model, taken together in time (trace/fringeSpectrum.ts
 * spectrumLines). One layer's spectrum holds a few cycles of a slow line under its fringe and
 * the detector's red noise; the run's residuals hold many, with the fringe taken out by the fit
 * (a 0.2 % lamp ripple aliased into a 20 s beat stands 6–100 times above its continuum there
 * and passes unseen in every layer's own spectrum). Lines slower than MIN_CYCLES_IN_RUN cycles
 * over the run or MIN_CYCLES_IN_LAYER over a median layer are not sought: there misfit follows
 * the layers. The request is the series (null where too short); runLinesFromRequest searches it,
 * here or on another thread (AnalyzeOptions.runLinesOf).
 */
export function runLinesRequest(states: readonly LayerState[], belows: readonly (readonly LayerAt[])[], trace: TraceData): RunLinesRequest | null {
  const total = states.reduce((a, s) => a + s.samples.tauS.length, 0);
  if (states.length === 0 || total < 256) return null;
  const step = Math.max(1, Math.ceil(total / MAX_POINTS));
  const parts = states.map((s, j) => layerResidualsEvery(s, belows[j], trace, step)).filter((p) => p.timeS.length > 0);
  // in time order, each part's samples increasing; samples that would go back in time (none in a valid run) left out
  parts.sort((a, b) => a.timeS[0] - b.timeS[0]);
  const timeS = new Float64Array(parts.reduce((a, p) => a + p.timeS.length, 0)), residual = new Float64Array(timeS.length), model = new Float64Array(timeS.length);
  let count = 0;
  for (const p of parts) {
    for (let i = 0; i < p.timeS.length; i++) {
      if ((count > 0 && !(p.timeS[i] > timeS[count - 1])) || !Number.isFinite(p.residual[i])) continue;
      timeS[count] = p.timeS[i];
      model[count] = p.model[i];
      residual[count++] = p.residual[i];
    }
  }
  if (count < 256) return null;
  const spanS = timeS[count - 1] - timeS[0];
  const medianLayerS = medianInPlace(Float64Array.from(states, (s) => s.samples.tauS[s.samples.tauS.length - 1] ?? 0));
  return {
    timeS: timeS.slice(0, count), residual: residual.slice(0, count), model: model.slice(0, count),
    minFrequencyHz: Math.max(MIN_CYCLES_IN_RUN / spanS, medianLayerS > 0 ? MIN_CYCLES_IN_LAYER / medianLayerS : 0),
    rawRateHz: 1 / loggedIntervalS(trace.timeS),
  };
}

/** The lines in a run's residuals, strongest first; amplitudes in model units, fractions of full scale. */
export function runLinesFromRequest(r: RunLinesRequest): SpectrumLine[] {
  return spectrumLines(r.timeS, r.residual, { minFrequencyHz: r.minFrequencyHz, rawRateHz: r.rawRateHz, minAmplitude: MIN_LINE_FRACTION });
}

/** The warning for a run-wide line. */
export function runDisturbanceWarning(d: SpectrumLine): string {
  return `periodic disturbance through the run at ${d.frequencyHz.toPrecision(3)} Hz (period ${(1 / d.frequencyHz).toPrecision(3)} s), `
    + `${(d.amplitude * 100).toFixed(2)} % of full scale in the fits' residuals (${d.snr.toFixed(0)}× the noise near it): ${d.note}`;
}

/** A ripple on the lamp read from the run's residuals: reading = offset + gain·M·(1 + a·sin ωt + b·cos ωt). */
export interface LampRipple {
  frequencyHz: number;
  a: number;
  b: number;
  /** √(a² + b²), a fraction of the lamp. */
  amplitude: number;
  /** Its standard error, from the residuals about the fit. */
  amplitudeSigma: number;
}

/**
 * The lamp ripple behind a line of the run's residuals, where the line is one: with the lamp
 * ripple ε(t) the residual in model units is M·ε(t), so a and b are the least-squares
 * coefficients of the residuals on M·sin ωt and M·cos ωt (ordinary least squares; the standard
 * errors from the residual variance about the fit). The frequency is refined over ±1.5 bins of
 * the run (1/span) to the one that explains most (31 steps): a line's frequency from the spectrum
 * is good to a fraction of a bin, and over a long run a phase that slips that much halves the fit.
 */
export function lampRippleOf(r: RunLinesRequest, line: SpectrumLine): LampRipple | null {
  const n = r.timeS.length;
  if (n < 16) return null;
  const span = r.timeS[n - 1] - r.timeS[0];
  let best: LampRipple & { explained: number } | null = null;
  for (let k = -15; k <= 15; k++) {
    const f = line.frequencyHz + (k / 10) * (1 / span);
    const w = 2 * Math.PI * f;
    let ss = 0, sc = 0, cc = 0, ys = 0, yc = 0, yy = 0;
    for (let i = 0; i < n; i++) {
      const xs = r.model[i] * Math.sin(w * r.timeS[i]), xc = r.model[i] * Math.cos(w * r.timeS[i]), y = r.residual[i];
      ss += xs * xs; sc += xs * xc; cc += xc * xc; ys += y * xs; yc += y * xc; yy += y * y;
    }
    const det = ss * cc - sc * sc;
    if (!(det > 0)) continue;
    const a = (ys * cc - yc * sc) / det, b = (yc * ss - ys * sc) / det;
    const explained = a * ys + b * yc;
    if (best && explained <= best.explained) continue;
    const s2 = Math.max(0, yy - explained) / Math.max(1, n - 2);
    const amplitude = Math.hypot(a, b);
    // var(a) = s²·cc/det, var(b) = s²·ss/det; the amplitude's along (a, b)
    const amplitudeSigma = amplitude > 0 ? Math.sqrt((s2 * (a * a * cc + b * b * ss - 2 * a * b * sc)) / det) / amplitude : Infinity;
    best = { frequencyHz: f, a, b, amplitude, amplitudeSigma, explained };
  }
  if (!best) return null;
  const { explained: _explained, ...ripple } = best;
  return ripple;
}

