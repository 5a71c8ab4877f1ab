import { largest, smallest } from './extremes';
import { fitPolynomial } from './polyFit';
import { noiseSigma } from './robustStats';
import { savitzkyGolay, savitzkyGolayCoefficients } from './savitzkyGolay';

export interface TurningPoint {
  /** Sample index of the extreme sample. */
  index: number;
  /** Sub-sample time of the extremum (vertex of a local least-squares parabola). */
  timeS: number;
  /** Signal at the vertex. */
  value: number;
  kind: 'max' | 'min';
  /**
   * False only for the last extremum when includeEnd is set and the series ends before the
   * signal has moved back by the hysteresis (e.g. a layer cut on its turning point).
   */
  confirmed: boolean;
}

export interface TurningPointOptions {
  /**
   * The signal must move back by at least this much (signal units) from an extremum before
   * it counts. @default hysteresisSigma × the robust noise σ of the (smoothed) signal
   */
  hysteresis?: number;
  /**
   * Multiple of the noise σ used for the default hysteresis; 12 because Gaussian noise alone
   * spans about ±5σ over 10⁵–10⁶ samples, and must never pass as a fringe. @default 12
   */
  hysteresisSigma?: number;
  /** Odd Savitzky–Golay window (quadratic) applied before the search; 0 or 1 for none. @default 0 */
  smoothWindow?: number;
  /** The refinement parabola spans the samples within this drop of the extremum. @default hysteresis */
  refineDrop?: number;
  /** Largest half-width, in samples, of the refinement fit. @default 2000 */
  maxRefineHalfWidth?: number;
  /**
   * Also report the extremum the series was heading for at its end, unconfirmed: the vertex of a
   * parabola fitted to the samples within 3 × refineDrop of the end's extreme, at most that fit's
   * span beyond the last sample (a layer cut just after, or just before, its turning point).
   * @default false
   */
  includeEnd?: boolean;
}

/**
 * Turning points (extrema) of a monitor signal by a hysteresis zig-zag: a maximum is confirmed
 * only once the signal has fallen by `hysteresis` below it (and had risen by as much to reach
 * it), so noise cannot create extrema; each is refined by a least-squares parabola in time over
 * a window symmetric about it.
 */
export function findTurningPoints(timeS: ArrayLike<number>, y: ArrayLike<number>, options: TurningPointOptions = {}): TurningPoint[] {
  const n = y.length;
  if (timeS.length !== n) throw new RangeError(`findTurningPoints: timeS has ${timeS.length} samples but y has ${n}`);
  assertFinite(timeS, y);
  if (n < 3) return [];
  const win = options.smoothWindow ?? 0;
  const smooth = win > 1;
  const ys = smooth ? savitzkyGolay(y, { window: win, order: 2 }) : Float64Array.from(y);
  let h = options.hysteresis;
  if (h === undefined) {
    const gain = smooth ? Math.hypot(...savitzkyGolayCoefficients(Math.min(win, n % 2 ? n : n - 1), 2)) : 1;
    const { lo, hi } = extent(ys);
    h = Math.max((options.hysteresisSigma ?? 12) * noiseSigma(y) * gain, 1e-9 * (hi - lo), Number.MIN_VALUE);
  } else if (!(h > 0)) {
    throw new RangeError(`findTurningPoints: hysteresis must be positive, got ${h}`);
  }
  const { found, pending } = zigzag(ys, h);
  const drop = options.refineDrop ?? h;
  const maxHalf = options.maxRefineHalfWidth ?? 2000;
  const out = found.map(({ index, kind }) => refine(timeS, y, ys, index, kind, drop, maxHalf));
  if (options.includeEnd && pending) {
    const last = refineAtEnd(timeS, y, ys, pending.index, pending.kind, drop, maxHalf);
    if (last) out.push(last);
  }
  return out;
}

// The loops over the samples sit in small functions of their own, so the engine optimises
// each apart (findTurningPoints runs once per layer).

function assertFinite(timeS: ArrayLike<number>, y: ArrayLike<number>): void {
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i]) || !Number.isFinite(timeS[i])) {
      throw new RangeError(`findTurningPoints: sample ${i} is not finite (time ${timeS[i]}, value ${y[i]})`);
    }
  }
}

/**
 * The lowest and highest of ys, each from a loop of its own with nothing after it but the
 * return: an object built after the loop, with no type feedback when the engine compiled the
 * loop on the stack, left that compiled code on call after call (one per layer).
 */
function extent(ys: Float64Array): { lo: number; hi: number } {
  return { lo: smallest(ys), hi: largest(ys) };
}


type Pivot = { index: number; kind: 'max' | 'min' };

function zigzag(ys: Float64Array, h: number): { found: Pivot[]; pending: Pivot | null } {
  const out: Pivot[] = [];
  const n = ys.length;
  let mode = 0; // 0: direction unknown, 1: rising (tracking a max), -1: falling (tracking a min)
  let hi = 0;
  let lo = 0;
  for (let i = 1; i < n; i++) {
    const v = ys[i];
    if (mode === 0) {
      if (v > ys[hi]) hi = i;
      if (v < ys[lo]) lo = i;
      if (ys[hi] - v >= h) {
        // the first extremum is genuine only if the signal had also risen by h to reach it
        if (minOf(ys, 0, hi) <= ys[hi] - h) out.push({ index: hi, kind: 'max' });
        mode = -1;
        lo = i;
      } else if (v - ys[lo] >= h) {
        if (maxOf(ys, 0, lo) >= ys[lo] + h) out.push({ index: lo, kind: 'min' });
        mode = 1;
        hi = i;
      }
    } else if (mode === 1) {
      if (v > ys[hi]) hi = i;
      else if (ys[hi] - v >= h) {
        out.push({ index: hi, kind: 'max' });
        mode = -1;
        lo = i;
      }
    } else if (v < ys[lo]) lo = i;
    else if (v - ys[lo] >= h) {
      out.push({ index: lo, kind: 'min' });
      mode = 1;
      hi = i;
    }
  }
  const pending: Pivot | null = mode === 1 ? { index: hi, kind: 'max' } : mode === -1 ? { index: lo, kind: 'min' } : null;
  return { found: out, pending };
}

function minOf(a: Float64Array, from: number, to: number): number {
  let m = Infinity;
  for (let i = from; i <= to; i++) if (a[i] < m) m = a[i];
  return m;
}

function maxOf(a: Float64Array, from: number, to: number): number {
  let m = -Infinity;
  for (let i = from; i <= to; i++) if (a[i] > m) m = a[i];
  return m;
}

function refine(
  timeS: ArrayLike<number>,
  y: ArrayLike<number>,
  ys: Float64Array,
  k: number,
  kind: 'max' | 'min',
  drop: number,
  maxHalf: number,
): TurningPoint {
  const n = ys.length;
  const sign = kind === 'max' ? 1 : -1;
  const level = sign * ys[k] - drop;
  // the region above the level, not stopped by a single noisy sample (looks 3 samples ahead)
  const above = (i: number) => i >= 0 && i < n && sign * ys[i] >= level;
  let left = k;
  while (left > 0 && k - left < maxHalf && (above(left - 1) || above(left - 2) || above(left - 3))) left--;
  let right = k;
  while (right < n - 1 && right - k < maxHalf && (above(right + 1) || above(right + 2) || above(right + 3))) right++;
  // its midpoint is a better first centre than the noisy extreme sample
  let centre = Math.round((left + right) / 2);
  const half = Math.max(Math.round((right - left) / 2), 1);
  let best: TurningPoint = { index: k, timeS: timeS[k], value: y[k], kind, confirmed: true };
  for (let pass = 0; pass < 4; pass++) {
    const a = Math.max(0, centre - half);
    const b = Math.min(n, centre + half + 1);
    if (b - a < 3) break;
    const t0 = timeS[centre];
    const scale = Math.max(timeS[b - 1] - t0, t0 - timeS[a]) || 1;
    const c = fitPolynomial(timeS, y, a, b, 2, t0, scale);
    if (!c || !(sign * c[2] < 0)) break;
    const u = -c[1] / (2 * c[2]);
    const t = t0 + u * scale;
    if (!(t >= timeS[a] && t <= timeS[b - 1])) break;
    best = { index: k, timeS: t, value: c[0] + c[1] * u + c[2] * u * u, kind, confirmed: true };
    const next = nearestIndex(timeS, t, a, b);
    if (next === centre) break;
    centre = next;
  }
  return best;
}

/** One-sided refinement of the extremum the series ends on or heads for; null if the end does not bend. */
function refineAtEnd(
  timeS: ArrayLike<number>,
  y: ArrayLike<number>,
  ys: Float64Array,
  k: number,
  kind: 'max' | 'min',
  drop: number,
  maxHalf: number,
): TurningPoint | null {
  const n = ys.length;
  const sign = kind === 'max' ? 1 : -1;
  // one-sided, so a wider fit than refine() uses: samples within 3 × drop of the extreme
  const level = sign * ys[k] - 3 * drop;
  const a = fitStart(ys, k, sign, level, maxHalf);
  if (n - a < 5) return null;
  const t0 = timeS[n - 1];
  const span = t0 - timeS[a];
  const c = fitPolynomial(timeS, y, a, n, 2, t0, span || 1);
  if (!c || !(sign * c[2] < 0)) return null;
  const u = -c[1] / (2 * c[2]);
  if (!(u >= -1 && u <= 1)) return null;
  // a poor parabola over a long flat stretch can put its vertex far from the extreme sample
  if (Math.abs(t0 + u * span - timeS[k]) > 0.5 * span) return null;
  return { index: k, timeS: t0 + u * span, value: c[0] + c[1] * u + c[2] * u * u, kind, confirmed: false };
}

/**
 * refineAtEnd's first sample: back from k while the samples (or the one before) stay within the
 * level, at most 2·maxHalf. A function of its own with nothing after the loop: code after it, with
 * no type feedback when the engine compiled the loop on the stack, left that code call after call.
 */
function fitStart(ys: Float64Array, k: number, sign: number, level: number, maxHalf: number): number {
  let a = k;
  while (a > 0 && k - a < 2 * maxHalf && (sign * ys[a - 1] >= level || (a > 1 && sign * ys[a - 2] >= level))) a--;
  return a;
}

function nearestIndex(timeS: ArrayLike<number>, t: number, a: number, b: number): number {
  let best = a;
  for (let i = a + 1; i < b; i++) if (Math.abs(timeS[i] - t) < Math.abs(timeS[best] - t)) best = i;
  return best;
}
