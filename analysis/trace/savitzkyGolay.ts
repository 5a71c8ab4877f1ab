import { solveDense } from './polyFit';

export interface SavitzkyGolayOptions {
  /** Odd number of samples in the moving window. @default 11 */
  window?: number;
  /** Degree of the local polynomial, below window. @default 3 */
  order?: number;
  /** 0 smooths; 1 gives the first derivative. @default 0 */
  derivative?: 0 | 1;
  /** Sample spacing, dividing the derivative (so it is per unit of x, not per sample). @default 1 */
  dx?: number;
}

/**
 * Least-squares polynomial projection matrix for a window of 2h+1 samples: row j holds the
 * weights that give coefficient c_j of Σ c_j u^j with u = (i − h) / h
 * (Savitzky & Golay 1964, Anal. Chem. 36, 1627). Row-major (order+1) × window.
 */
function projection(window: number, order: number): Float64Array {
  const key = `${window},${order}`;
  let P = projections.get(key);
  if (!P) {
    // a handful of shapes are used, each many times (every edge point of every smoothed series)
    if (projections.size >= 64) projections.clear();
    projections.set(key, (P = computeProjection(window, order)));
  }
  return P;
}
const projections = new Map<string, Float64Array>();

function computeProjection(window: number, order: number): Float64Array {
  const h = (window - 1) / 2;
  const m = order + 1;
  const A = new Float64Array(m * m);
  for (let i = 0; i < window; i++) {
    const u = h === 0 ? 0 : (i - h) / h;
    for (let r = 0; r < m; r++) for (let c = 0; c < m; c++) A[r * m + c] += u ** (r + c);
  }
  const P = new Float64Array(m * window);
  for (let i = 0; i < window; i++) {
    const u = h === 0 ? 0 : (i - h) / h;
    const b = new Float64Array(m);
    for (let r = 0; r < m; r++) b[r] = u ** r;
    const col = solveDense(A.slice(), b, m)!;
    for (let r = 0; r < m; r++) P[r * window + i] = col[r];
  }
  return P;
}

/**
 * Weights w[i] such that Σ w[i] y[i] over the window is the fitted polynomial's value
 * (derivative 0) or slope per sample (derivative 1) at offset `at` from the window centre
 * (at = 0: the classic centred coefficients; ±h: the window's ends).
 */
export function savitzkyGolayCoefficients(window: number, order: number, derivative: 0 | 1 = 0, at = 0): Float64Array {
  checkShape(window, order);
  const h = (window - 1) / 2;
  const m = order + 1;
  const P = projection(window, order);
  const u = h === 0 ? 0 : at / h;
  const w = new Float64Array(window);
  for (let j = derivative; j < m; j++) {
    const f = derivative === 0 ? u ** j : (j * u ** (j - 1)) / h;
    if (f === 0) continue;
    for (let i = 0; i < window; i++) w[i] += f * P[j * window + i];
  }
  return w;
}

/**
 * Savitzky–Golay smoothing or first derivative. Interior points use the centred weights; the
 * first and last h = (window − 1)/2 points evaluate the polynomial fitted to the first and last
 * full window. A series shorter than the window uses the largest odd window that fits (and an
 * order below it). Throws on a non-finite sample.
 */
export function savitzkyGolay(y: ArrayLike<number>, options: SavitzkyGolayOptions = {}): Float64Array {
  const n = y.length;
  let window = options.window ?? 11;
  let order = options.order ?? 3;
  const derivative = options.derivative ?? 0;
  const dx = options.dx ?? 1;
  checkShape(window, order);
  if (derivative !== 0 && derivative !== 1) throw new RangeError(`savitzkyGolay: derivative must be 0 or 1, got ${derivative}`);
  if (!(dx > 0) || !Number.isFinite(dx)) throw new RangeError(`savitzkyGolay: dx must be a positive finite number, got ${dx}`);
  assertFinite(y);
  const out = new Float64Array(n);
  if (n === 0) return out;
  if (n < window) {
    window = n % 2 === 1 ? n : n - 1;
    order = Math.min(order, window - 1);
  }
  if (window === 1) {
    if (derivative === 0) out.set(Array.from(y));
    return out;
  }
  const h = (window - 1) / 2;
  convolveInterior(y, savitzkyGolayCoefficients(window, order, derivative, 0), dx, out);
  for (let e = 0; e < h; e++) {
    const head = savitzkyGolayCoefficients(window, order, derivative, e - h);
    const tail = savitzkyGolayCoefficients(window, order, derivative, h - e);
    let a = 0;
    let b = 0;
    for (let k = 0; k < window; k++) {
      a += head[k] * y[k];
      b += tail[k] * y[n - window + k];
    }
    out[e] = a / dx;
    out[n - 1 - e] = b / dx;
  }
  return out;
}

// The loops over the samples sit in small functions of their own, so the engine optimises
// each apart from the rest of savitzkyGolay.

function assertFinite(y: ArrayLike<number>): void {
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new RangeError(`savitzkyGolay: y[${i}] is not a finite number (${y[i]})`);
  }
}

/** out[i] = Σ w[k]·y[i − h + k] / dx for the points with a whole window. */
function convolveInterior(y: ArrayLike<number>, w: Float64Array, dx: number, out: Float64Array): void {
  const n = y.length, window = w.length, h = (window - 1) / 2;
  for (let i = h; i < n - h; i++) {
    let s = 0;
    for (let k = 0; k < window; k++) s += w[k] * y[i - h + k];
    out[i] = s / dx;
  }
}

function checkShape(window: number, order: number): void {
  if (!Number.isInteger(window) || window < 1 || window % 2 === 0) {
    throw new RangeError(`savitzkyGolay: window must be an odd positive integer, got ${window}`);
  }
  if (!Number.isInteger(order) || order < 0 || order >= window) {
    throw new RangeError(`savitzkyGolay: order must be an integer from 0 to window − 1 (${window - 1}), got ${order}`);
  }
}
