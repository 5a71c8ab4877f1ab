import { solveDense } from './polyFit';
import { noiseSigma } from './robustStats';
import { savitzkyGolay, savitzkyGolayCoefficients } from './savitzkyGolay';
import type { Segment, Segmentation } from './types';

export interface AutoSegmentOptions {
  /** Odd window, in samples, of the Savitzky–Golay slope estimate. @default 101 */
  windowSamples?: number;
  /** A stretch turns active when |slope| exceeds this many σ of the slope noise. @default 8 */
  highSigma?: number;
  /** …and idle again when |slope| falls below this many σ. @default 4 */
  lowSigma?: number;
  /** Idle stretches shorter than this (e.g. the flat top of a fringe) stay inside the layer. @default 2 × windowSamples */
  minIdleSamples?: number;
  /** Active stretches shorter than this (steps, spikes) are not layers. @default 2 × windowSamples */
  minLayerSamples?: number;
}

/**
 * Finds deposition stretches in a trace without a layer column: where the signal changes
 * (a layer grows) rather than stays flat (shutter closed). The slope comes from a
 * Savitzky–Golay derivative; a two-threshold (hysteresis) test in units of its noise marks
 * active samples; short idle and short active stretches are absorbed; each boundary is then
 * placed by a least-squares hinge (flat, then linear) fit. Layers are numbered in order.
 */
export function autoSegment(timeS: ArrayLike<number>, signal: ArrayLike<number>, options: AutoSegmentOptions = {}): Segmentation {
  const n = signal.length;
  if (timeS.length !== n) throw new RangeError(`autoSegment: timeS has ${timeS.length} samples but signal has ${n}`);
  const warnings = [{ code: 'segments_inferred', message: '' }];
  let w = options.windowSamples ?? 101;
  if (!Number.isInteger(w) || w < 5 || w % 2 === 0) throw new RangeError(`autoSegment: windowSamples must be an odd integer ≥ 5, got ${w}`);
  const minIdle = options.minIdleSamples ?? 2 * w;
  const minLayer = options.minLayerSamples ?? 2 * w;
  let runs: [number, number, boolean][] = n > 0 ? [[0, n, false]] : [];
  if (n >= 5) {
    w = Math.min(w, n % 2 === 1 ? n : n - 1);
    const slope = savitzkyGolay(signal, { window: w, order: 2, derivative: 1 });
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < n; i++) {
      lo = Math.min(lo, signal[i]);
      hi = Math.max(hi, signal[i]);
    }
    const slopeSigma = Math.max(noiseSigma(signal) * Math.hypot(...savitzkyGolayCoefficients(w, 2, 1)), 1e-12 * (hi - lo));
    const high = (options.highSigma ?? 8) * slopeSigma;
    const low = (options.lowSigma ?? 4) * slopeSigma;
    const active = new Uint8Array(n);
    let on = false;
    for (let i = 0; i < n; i++) {
      const s = Math.abs(slope[i]);
      on = on ? s >= low : s > high;
      active[i] = on ? 1 : 0;
    }
    runs = absorb(absorb(toRuns(active), true, minIdle), false, minLayer);
    for (let r = 0; r < runs.length; r++) {
      if (!runs[r][2]) continue;
      const prevEnd = r > 0 ? runs[r - 1][0] : 0;
      const nextStart = r + 1 < runs.length ? runs[r + 1][1] : n;
      const [a, b] = runs[r];
      // the slope window smears each edge by up to half a window into the idle side; beyond
      // about one window into the layer a fringe departs from a parabola, so look no further
      const h = (w - 1) / 2;
      const start = hinge(timeS, signal, Math.max(prevEnd, a - 2 * w), Math.min(b, a + h + w), a - w, a + h, true);
      const end = hinge(timeS, signal, Math.max(start + 1, b - h - w), Math.min(nextStart, b + 2 * w), b - h, b + w, false);
      runs[r][0] = start;
      runs[r][1] = Math.max(end, start + 1);
      if (r > 0) runs[r - 1][1] = runs[r][0];
      if (r + 1 < runs.length) runs[r + 1][0] = runs[r][1];
    }
  }
  const layers: Segment[] = [];
  const idle: Segment[] = [];
  for (const [a, b, isActive] of runs) {
    if (b <= a) continue;
    const seg: Segment = { layer: isActive ? layers.length + 1 : 0, chip: 1, startIndex: a, endIndex: b, startTimeS: timeS[a], endTimeS: timeS[b - 1], sampleCount: b - a, run: 1 };
    (isActive ? layers : idle).push(seg);
  }
  warnings[0].message =
    `the trace has no layer column: ${layers.length} deposition segment${layers.length === 1 ? ' was' : 's were'} ` +
    'inferred from the signal (changing vs. flat); check them against the design';
  return { layers, idle, warnings, inferred: true };
}

function toRuns(mask: Uint8Array): [number, number, boolean][] {
  const runs: [number, number, boolean][] = [];
  let start = 0;
  for (let i = 1; i <= mask.length; i++) {
    if (i === mask.length || mask[i] !== mask[start]) {
      runs.push([start, i, mask[start] === 1]);
      start = i;
    }
  }
  return runs;
}

/** Flips idle runs (idleRuns) or active runs shorter than min, idle ones only between layers, then merges neighbours. */
function absorb(runs: [number, number, boolean][], idleRuns: boolean, min: number): [number, number, boolean][] {
  const flipped = runs.map(([a, b, act], i): [number, number, boolean] => {
    const target = idleRuns ? !act : act;
    const interior = !idleRuns || (i > 0 && i < runs.length - 1);
    return target && interior && b - a < min ? [a, b, !act] : [a, b, act];
  });
  const merged: [number, number, boolean][] = [];
  for (const r of flipped) {
    const last = merged[merged.length - 1];
    if (last && last[2] === r[2]) last[1] = r[1];
    else merged.push([...r]);
  }
  return merged;
}

/**
 * Index c in [cFrom, cTo] minimising the squared error of y ≈ α + β·g + γ·g², g = max(0, t − t_c)
 * (a rising edge, `start`) or g = max(0, t_c − t) (a falling edge), over the samples [from, to):
 * flat on one side, a linear or parabolic departure on the other (a layer that starts at a
 * turning point departs parabolically).
 */
function hinge(t: ArrayLike<number>, y: ArrayLike<number>, from: number, to: number, cFrom: number, cTo: number, start: boolean): number {
  const lo = Math.max(from, Math.round(cFrom), 0);
  const hi = Math.min(to - 1, Math.round(cTo));
  const fallback = Math.round(Math.min(Math.max((cFrom + cTo) / 2, from), to - 1));
  if (to - from < 6 || hi <= lo) return start ? fallback : fallback + 1;
  const scale = t[to - 1] - t[from] || 1;
  let best = fallback;
  let bestErr = Infinity;
  const A = new Float64Array(9);
  const b = new Float64Array(3);
  for (let c = lo; c <= hi; c++) {
    A.fill(0);
    b.fill(0);
    let syy = 0;
    const tc = t[c];
    for (let i = from; i < to; i++) {
      const g = Math.max(0, start ? t[i] - tc : tc - t[i]) / scale;
      const g2 = g * g;
      const v = y[i];
      A[0] += 1;
      A[1] += g;
      A[2] += g2;
      A[5] += g2 * g;
      A[8] += g2 * g2;
      b[0] += v;
      b[1] += g * v;
      b[2] += g2 * v;
      syy += v * v;
    }
    A[3] = A[1];
    A[4] = A[2];
    A[6] = A[2];
    A[7] = A[5];
    const x = solveDense(A.slice(), b.slice(), 3);
    if (!x) continue;
    // residual of a least-squares solution: Σy² − xᵀ(Jᵀy)
    const err = syy - (x[0] * b[0] + x[1] * b[1] + x[2] * b[2]);
    if (err < bestErr) {
      bestErr = err;
      best = c;
    }
  }
  return start ? best : best + 1;
}
