import { referenceRatio, referenceWindowS, type TraceData } from '../trace';
import { type AnalyzeOptions } from './types';

/**
 * The gain drift's prior σ left once the signal is divided by the reference, fraction per hour:
 * what the ratio does not remove is the two detectors' own gains drifting apart, taken here as a
 * tenth of the lamp's default allowance (a choice, not a published figure).
 */
export const REFERENCE_STABILITY_PER_HOUR = 0.001;

/**
 * A trace with a lamp reference column (option lampReference, on by default): the signal divided
 * by the reference smoothed (over the window trace/referenceRatio.ts referenceWindowS picks) and
 * normalised to its run median (trace/referenceRatio.ts), and the
 * lamp drift's prior tightened to what the ratio leaves (REFERENCE_STABILITY_PER_HOUR, unless
 * lampStabilityPerHour is given), with a note. The start-up on level cuts (option
 * levelStartTransient) is then on unless set: it was left off because a false start delay read
 * as a lamp drift of 0.45 %/h a second, which that prior no longer lets it (real-chamber BBAR,
 * refit: the ramp as the shutter opens had left layer 2 of 0.41 QWOT +0.0085 in index, layer 4
 * +0.0049; with it +0.0033 and +0.0022, as with the simulator's ramp off). So is, in sequential
 * mode, each level cut's own fit on that delay's clock (option sequentialLevelClock): the drift
 * held at 0.1 %/h no longer takes δ's error into the layers. Without one, or with the option off, the trace and
 * options as they were. `lamp`: the divisor at each sample, for modelled readings (AnalysisResult.model)
 * to be put back in the trace's units.
 */
export function withLampReference(trace: TraceData, options: AnalyzeOptions): { trace: TraceData; options: AnalyzeOptions; note: string | null; lamp?: Float64Array } {
  if (!trace.reference || options.lampReference === false) return { trace, options, note: null };
  // The window: long against the reference's white noise, short against what the lamp does (trace/referenceRatio.ts).
  const { windowS } = referenceWindowS(trace.timeS, trace.reference);
  const { signal, lamp } = referenceRatio(trace.timeS, trace.signal, trace.reference, windowS);
  const stability = options.lampStabilityPerHour ?? REFERENCE_STABILITY_PER_HOUR;
  return {
    trace: { ...trace, signal },
    lamp,
    options: {
      ...options, lampStabilityPerHour: stability, levelStartTransient: options.levelStartTransient ?? true,
      sequentialLevelClock: options.sequentialLevelClock ?? true,
    },
    note: `signal divided by the lamp reference column (its ${windowS} s running mean over its run median, the window chosen by Mallows' C_L); lamp drift prior ${+(stability * 100).toFixed(3)} %/h`,
  };
}
