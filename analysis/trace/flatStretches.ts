import { median } from './robustStats';
import { savitzkyGolay } from './savitzkyGolay';

/** A stretch of the trace where the signal stays flat: a pause between layers, or a turning point's top. */
export interface FlatStretch {
  /** First sample index. */
  startIndex: number;
  /** One past the last sample index. */
  endIndex: number;
  /** Median signal over the stretch's first (edgeS) seconds: the level the stretch starts at. */
  startLevel: number;
  /** Median signal over its last seconds (a chip change ends on the bare new chip). */
  endLevel: number;
}

export interface FlatStretchOptions {
  /** Bin width for the slope estimate, s. @default 0.5 */
  binS?: number;
  /** Slope windows tried, shortest first, s: the shortest whose noise stays well under the layers' slopes is used. @default [1.5, 3, 6, 12, 24] */
  windowsS?: readonly number[];
  /** Flat runs shorter than this are dropped, s. @default 1 */
  minS?: number;
  /** Flat runs separated by less than this are one stretch (a chip change: old level, dark, bare chip), s. @default 4 */
  mergeS?: number;
  /** Length over which the start and end levels are taken, s. @default 2 */
  edgeS?: number;
  /** A sample is flat against the steepest slope within ± this many seconds (layers differ in swing), s. @default 60 */
  localS?: number;
}

/**
 * Finds the flat stretches of a trace (low slope over a window), as candidates for the pauses
 * between layers. The slope comes from a Savitzky–Golay first derivative of bin means; its noise
 * from the spread of the difference to a three-times-longer window's slope (which holds the
 * trend), so correlated noise is measured as it is, not from white-noise assumptions. A sample
 * is flat where |slope| < max(3σ, 5 % of the steepest slope within ±localS, level steps capped
 * at twice the 90th percentile). At each sample the shortest window whose 3σ stays under a quarter
 * of that local slope is used: short pauses need short windows, layers with small swings long ones. Which stretches are pauses, which turning points, is left
 * to the caller (it needs the design).
 */
export function flatStretches(timeS: ArrayLike<number>, signal: ArrayLike<number>, options: FlatStretchOptions = {}): FlatStretch[] {
  const n = signal.length;
  if (n < 10) return [];
  const dt = (timeS[n - 1] - timeS[0]) / (n - 1);
  if (!(dt > 0)) return [];
  const per = Math.max(1, Math.round((options.binS ?? 0.5) / dt));
  const nb = Math.floor(n / per);
  if (nb < 7) return [];
  const binS = per * dt;
  const y = new Float64Array(nb);
  for (let b = 0; b < nb; b++) {
    let s = 0;
    for (let i = b * per; i < (b + 1) * per; i++) s += signal[i];
    y[b] = s / per;
  }
  const oddBins = (s: number) => {
    const w = Math.max(3, Math.round(s / binS));
    return Math.min(w % 2 ? w : w + 1, nb % 2 ? nb : nb - 1);
  };
  const flat = new Uint8Array(nb);
  const decided = new Uint8Array(nb);
  const windows = options.windowsS ?? [1.5, 3, 6, 12, 24];
  windows.forEach((windowS, k) => {
    const w = oddBins(windowS);
    const short = savitzkyGolay(y, { window: w, order: 1, derivative: 1 });
    const long = savitzkyGolay(y, { window: oddBins(3 * windowS), order: 2, derivative: 1 });
    const diff = new Float64Array(nb);
    for (let b = 0; b < nb; b++) diff[b] = short[b] - long[b];
    const m = median(diff);
    for (let b = 0; b < nb; b++) diff[b] = Math.abs(diff[b] - m);
    const sigma = 1.4826 * median(diff);
    // level steps (chip changes, dark) are not layers: their slope is capped at twice the 90th percentile
    const sortedAbs = Float64Array.from(long, Math.abs).sort();
    const cap = 2 * sortedAbs[Math.floor(0.9 * (nb - 1))];
    const local = slidingMax(long.map((v) => Math.min(Math.abs(v), cap)), Math.round((options.localS ?? 60) / binS));
    for (let b = 0; b < nb; b++) {
      if (decided[b]) continue;
      // this window resolves the local slopes well enough, or it is the longest there is
      if (3 * sigma > 0.25 * local[b] && k < windows.length - 1) continue;
      decided[b] = 1;
      flat[b] = Math.abs(short[b]) < Math.max(3 * sigma, 0.05 * local[b]) ? 1 : 0;
    }
  });
  const stepTol = 0.01 * Math.max(...y.map(Math.abs));
  // runs of flat bins, merged across short gaps, short ones dropped
  const runs: [number, number][] = [];
  for (let b = 0; b < nb; ) {
    if (!flat[b]) {
      b++;
      continue;
    }
    let e = b;
    while (e < nb && flat[e]) e++;
    const last = runs[runs.length - 1];
    // across a short gap at the same level (a spike, noise), not across a step (chip change, dark)
    if (last && (b - last[1]) * binS < (options.mergeS ?? 4) && Math.abs(y[b] - y[last[1] - 1]) < stepTol) last[1] = e;
    else runs.push([b, e]);
    b = e;
  }
  const edge = options.edgeS ?? 2;
  const out: FlatStretch[] = [];
  for (const [a, b] of runs) {
    if ((b - a) * binS < (options.minS ?? 1)) continue;
    const startIndex = a * per;
    const endIndex = b === nb ? n : b * per;
    const k = Math.max(1, Math.min(Math.round(edge / dt), Math.floor((endIndex - startIndex) / 2)));
    out.push({
      startIndex, endIndex,
      startLevel: medianOf(signal, startIndex, startIndex + k),
      endLevel: medianOf(signal, endIndex - k, endIndex),
    });
  }
  return out;
}

function medianOf(y: ArrayLike<number>, from: number, to: number): number {
  const part = new Float64Array(to - from);
  for (let i = from; i < to; i++) part[i - from] = y[i];
  return median(part);
}

/** max |x| over [i − h, i + h] for every i (monotone deque, O(n)). */
function slidingMax(x: ArrayLike<number>, h: number): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  const q = new Int32Array(n);
  let head = 0, tail = 0, next = 0;
  for (let i = 0; i < n; i++) {
    for (; next < n && next <= i + h; next++) {
      while (tail > head && Math.abs(x[q[tail - 1]]) <= Math.abs(x[next])) tail--;
      q[tail++] = next;
    }
    while (q[head] < i - h) head++;
    out[i] = Math.abs(x[q[head]]);
  }
  return out;
}
