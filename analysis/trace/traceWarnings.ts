import { largest, smallest } from './extremes';
import { median } from './robustStats';
import type { TraceData, TraceWarning } from './types';

const MAX_GAP_WARNINGS = 20;
const MAX_FEW_WARNINGS = 20;
const SATURATION_RUN = 5;

/** Warnings about a parsed trace: thin layers, gaps in time, a clipped signal. */
export function traceWarnings(
  trace: Pick<TraceData, 'timeS' | 'signal' | 'layer' | 'rowCount' | 'headerLine'>,
  options: { gapFactor: number; minLayerSamples: number },
): TraceWarning[] {
  const out: TraceWarning[] = [];
  const { timeS, signal, layer, rowCount: n, headerLine } = trace;
  const lineOf = (i: number) => headerLine + 1 + i;

  if (layer) {
    const counts = new Map<number, number>();
    // by runs of one layer (a trace holds a few long ones), not a map update per sample
    for (let i = 0; i < n; ) {
      const l = layer[i];
      const j = runEnd(layer, n, i);
      if (l > 0) counts.set(l, (counts.get(l) ?? 0) + j - i);
      i = j;
    }
    const few = [...counts].sort((a, b) => a[0] - b[0]).filter(([, c]) => c < options.minLayerSamples);
    for (const [l, c] of few.slice(0, MAX_FEW_WARNINGS)) {
      out.push({
        code: 'few_samples',
        layer: l,
        message: `layer ${l} has only ${c} samples (at least ${options.minLayerSamples} are needed for a reliable fit)`,
      });
    }
    if (few.length > MAX_FEW_WARNINGS) {
      out.push({ code: 'few_samples_more', message: `${few.length - MAX_FEW_WARNINGS} more layers with fewer than ${options.minLayerSamples} samples not listed (${few.length} in all)` });
    }
  }

  if (n >= 3) {
    const steps = new Float64Array(n - 1);
    timeSteps(timeS, n, steps);
    const step = median(steps);
    const limit = options.gapFactor * step;
    let gaps = 0;
    for (let i = nextAbove(steps, limit, 0); i >= 0; i = nextAbove(steps, limit, i + 1)) {
      gaps++;
      if (gaps <= MAX_GAP_WARNINGS) {
        out.push({
          code: 'time_gap',
          line: lineOf(i + 1),
          message: `line ${lineOf(i + 1)}: a gap of ${fmt(steps[i])} s in time_s after ${fmt(timeS[i])} s (the median step is ${fmt(step)} s)`,
        });
      }
    }
    if (gaps > MAX_GAP_WARNINGS) {
      out.push({ code: 'time_gaps_more', message: `${gaps - MAX_GAP_WARNINGS} more gaps in time_s not listed (${gaps} in all)` });
    }
  }

  if (n > 0) {
    const max = largest(signal, n), min = smallest(signal, n);
    if (max > min) {
      saturation(signal, n, max, 'maximum', out, lineOf);
      saturation(signal, n, min, 'minimum', out, lineOf);
    }
  }
  return out;
}

function saturation(
  signal: Float64Array,
  n: number,
  level: number,
  side: 'maximum' | 'minimum',
  out: TraceWarning[],
  lineOf: (i: number) => number,
): void {
  let runs = 0;
  let samples = 0;
  let first = -1;
  for (let i = nextAt(signal, n, level, 0); i >= 0; ) {
    const j = runEnd(signal, n, i);
    if (j - i >= SATURATION_RUN) {
      runs++;
      samples += j - i;
      if (first < 0) first = i;
    }
    i = nextAt(signal, n, level, j);
  }
  if (runs === 0) return;
  out.push({
    code: side === 'maximum' ? 'saturated_max' : 'saturated_min',
    line: lineOf(first),
    message:
      `signal sits at its ${side} ${level} in ${runs} run${runs > 1 ? 's' : ''} of ${SATURATION_RUN} or more identical samples ` +
      `(${samples} samples, the first at line ${lineOf(first)}): the detector or its ADC may be clipping`,
  });
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

// The long loops over the samples sit in small functions with nothing after the loop but the
// return: the engine compiles such a loop on the stack while it runs (traceWarnings runs once), and
// code after it, never run by then, had no type feedback and threw that compiled code away.

/** The end of the run of values equal to a[i] that starts at i. */
function runEnd(a: ArrayLike<number>, n: number, i: number): number {
  const v = a[i];
  let j = i + 1;
  while (j < n && a[j] === v) j++;
  return j;
}

/** steps[i − 1] = timeS[i] − timeS[i − 1] for i in [1, n). */
function timeSteps(timeS: ArrayLike<number>, n: number, steps: Float64Array): void {
  for (let i = 1; i < n; i++) steps[i - 1] = timeS[i] - timeS[i - 1];
}

/** The first i ≥ from whose a[i] is not ≤ limit (a NaN included), or −1. */
function nextAbove(a: Float64Array, limit: number, from: number): number {
  for (let i = from; i < a.length; i++) if (!(a[i] <= limit)) return i;
  return -1;
}

/** The first i in [from, n) with a[i] === level, or −1. */
function nextAt(a: Float64Array, n: number, level: number, from: number): number {
  for (let i = from; i < n; i++) if (a[i] === level) return i;
  return -1;
}

