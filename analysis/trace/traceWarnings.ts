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
      let j = i + 1;
      while (j < n && layer[j] === l) j++;
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
    for (let i = 1; i < n; i++) steps[i - 1] = timeS[i] - timeS[i - 1];
    const step = median(steps);
    const limit = options.gapFactor * step;
    let gaps = 0;
    for (let i = 0; i < steps.length; i++) {
      if (steps[i] <= limit) continue;
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
    let max = -Infinity;
    let min = Infinity;
    for (let i = 0; i < n; i++) {
      if (signal[i] > max) max = signal[i];
      if (signal[i] < min) min = signal[i];
    }
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
  for (let i = 0; i < n; ) {
    if (signal[i] !== level) {
      i++;
      continue;
    }
    let j = i;
    while (j < n && signal[j] === level) j++;
    if (j - i >= SATURATION_RUN) {
      runs++;
      samples += j - i;
      if (first < 0) first = i;
    }
    i = j;
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
