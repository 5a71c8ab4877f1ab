import { growingLayerSignal, type GrowingLayer } from '../optics/growingLayer';

export interface ModelTurningPoint {
  thicknessNm: number;
  signal: number;
  kind: 'max' | 'min';
}

export interface ModelTurningPointOptions {
  /** Sampling step of the scan before refinement, nm. @default a quarter-wave of the growing layer / 400 */
  stepNm?: number;
  /** Refinement stops when the bracket is narrower than this, nm. @default 1e-9 */
  toleranceNm?: number;
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/**
 * Extrema of the modelled monitor signal strictly inside (fromNm, toNm) of growing thickness.
 * The curve is scanned on a fine grid and each sign change of the slope refined by golden-section
 * search; this makes no assumption about the stack below (quarter-wave stacks turn at multiples
 * of λ/4n, general stacks and absorbing layers do not).
 */
export function modelTurningPoints(spec: GrowingLayer, fromNm: number, toNm: number, options: ModelTurningPointOptions = {}): ModelTurningPoint[] {
  if (!(toNm > fromNm)) return [];
  const quarterWaveNm = spec.wavelengthNm / (4 * spec.growing.re);
  const stepNm = options.stepNm ?? quarterWaveNm / 400;
  const toleranceNm = options.toleranceNm ?? 1e-9;
  const count = Math.max(3, Math.ceil((toNm - fromNm) / stepNm) + 1);
  const grid = new Float64Array(count);
  for (let i = 0; i < count; i++) grid[i] = fromNm + ((toNm - fromNm) * i) / (count - 1);
  const y = growingLayerSignal(spec, grid);

  let lo = Infinity;
  let hi = -Infinity;
  for (const v of y) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  // A curve flat to rounding (a layer matched to what lies below) has no turning points.
  if (hi - lo <= 1e-12 * Math.max(1, hi)) return [];

  const one = new Float64Array(1);
  const at = new Float64Array(1);
  const f = (d: number): number => {
    at[0] = d;
    return growingLayerSignal(spec, at, one)[0];
  };
  const found: ModelTurningPoint[] = [];
  let lastSign = 0;
  let lastIndex = 0;
  for (let i = 1; i < count; i++) {
    const diff = y[i] - y[i - 1];
    const sign = diff > 0 ? 1 : diff < 0 ? -1 : 0;
    if (sign === 0) continue;
    if (lastSign !== 0 && sign !== lastSign) {
      const kind = lastSign > 0 ? 'max' : 'min';
      const g = kind === 'max' ? (d: number) => -f(d) : f;
      const d = parabolicPolish(g, goldenMinimum(g, grid[Math.max(0, lastIndex - 1)], grid[i], toleranceNm), 1e-5 * quarterWaveNm);
      if (d > fromNm && d < toNm) found.push({ thicknessNm: d, signal: f(d), kind });
    }
    lastSign = sign;
    lastIndex = i;
  }
  return found;
}

/**
 * Golden-section alone stalls where the curve is flat to rounding (~√ε of the bracket); two
 * vertex steps of a parabola through x ± h locate the extremum to ~1e-9 nm instead.
 */
function parabolicPolish(g: (x: number) => number, x: number, h: number): number {
  for (let it = 0; it < 2; it++) {
    const gm = g(x - h), g0 = g(x), gp = g(x + h);
    const curvature = gp - 2 * g0 + gm;
    if (!(curvature > 0)) return x;
    const step = (h * (gm - gp)) / (2 * curvature);
    if (!(Math.abs(step) < h)) return x;
    x += step;
  }
  return x;
}

function goldenMinimum(g: (x: number) => number, a: number, b: number, tol: number): number {
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let gc = g(c);
  let gd = g(d);
  for (let it = 0; it < 200 && b - a > tol; it++) {
    if (gc < gd) {
      b = d;
      d = c;
      gd = gc;
      c = b - GOLDEN * (b - a);
      gc = g(c);
    } else {
      a = c;
      c = d;
      gc = gd;
      d = a + GOLDEN * (b - a);
      gd = g(d);
    }
  }
  return (a + b) / 2;
}
