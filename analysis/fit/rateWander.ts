import { oneShapeFrom } from './oneShape';

/**
 * A rate that wanders within a layer: r(τ) = r + a·τ + w(τ), w an Ornstein–Uhlenbeck process of
 * σ `sigmaNmPerS` and correlation time `correlationS`, represented by its values c_k at K + 1
 * equally spaced knots over the layer's logged duration, linear between them and held at c_K
 * beyond (growth after the cut). The knots are parametrized non-centred: c_0 = σ·v_0,
 * c_k = ρ·c_{k−1} + σ·√(1 − ρ²)·v_k with ρ = e^(−h/τc) (the exact AR(1) discretisation of
 * Ornstein–Uhlenbeck at spacing h; e.g. D. T. Gillespie, Phys. Rev. E 54, 2084 (1996), from
 * memory), so the prior on v is the unit normal and enters a fit as the pseudo-observations
 * 0 = noise·v_j (a ridge). The thickness gains Σ_j v_j·Ψ_j(τ), Ψ_j = ∫₀^τ ψ_j, ψ_j the rate basis.
 */
export interface RateWander {
  /** Knot times from the layer's start, s (equally spaced, the first at 0, the last at the logged end). */
  knotsS: Float64Array;
  sigmaNmPerS: number;
  correlationS: number;
  /**
   * σ of one fit point's noise as white-equivalent (long-run σ of one sample over √(samples per
   * point)), weighing the prior against the data; set per fit data (bins differ between fits).
   */
  pointSigma: number;
  /** The knot parameters v held at these values (no wander parameters in the fit). */
  fixed?: Float64Array;
}

/**
 * A wander with every field present (fixed undefined when absent) and in one order, each field of
 * the most general kind (oneShapeFrom): one object shape for the hot code that reads it
 * (wanderBasis, integrateKnots), which a wander's σ of 1 in one place and 0.3 in another would
 * otherwise deoptimise.
 */
export function rateWander(w: RateWander): RateWander {
  return { knotsS: w.knotsS, sigmaNmPerS: w.sigmaNmPerS, correlationS: w.correlationS, pointSigma: w.pointSigma, fixed: w.fixed };
}
oneShapeFrom(rateWander, ['knotsS', 'sigmaNmPerS', 'correlationS', 'pointSigma', 'fixed']);

/** Number of wander parameters (knots) in a fit: none when absent or held. */
export const wanderCount = (w: RateWander | undefined): number => (w && !w.fixed ? w.knotsS.length : 0);

/** Equally spaced knots over [0, durationS], about one per `spacingS` (at least 2). */
export function wanderKnots(durationS: number, spacingS: number): Float64Array {
  const k = Math.max(1, Math.round(durationS / Math.max(spacingS, 1e-9)));
  return Float64Array.from({ length: k + 1 }, (_, i) => (durationS * i) / k);
}

/** ∫₀^τ hat_k, hat_k the piecewise-linear basis at knot k (the last held at 1 beyond the last knot). */
function hatIntegral(t: Float64Array, k: number, tau: number): number {
  const K = t.length - 1;
  let s = 0;
  if (k > 0) {
    // rising half on [t_{k−1}, t_k]
    const a = t[k - 1], h = t[k] - a, x = Math.min(Math.max(tau - a, 0), h);
    s += (x * x) / (2 * h);
  }
  if (k < K) {
    // falling half on [t_k, t_{k+1}]
    const a = t[k], h = t[k + 1] - a, x = Math.min(Math.max(tau - a, 0), h);
    s += x - (x * x) / (2 * h);
  } else if (tau > t[K]) s += tau - t[K];
  return s;
}

/** hat_k(τ). */
function hat(t: Float64Array, k: number, tau: number): number {
  const K = t.length - 1;
  if (k < K && tau >= t[k] && tau <= t[k + 1]) return (t[k + 1] - tau) / (t[k + 1] - t[k]);
  if (k > 0 && tau >= t[k - 1] && tau <= t[k]) return (tau - t[k - 1]) / (t[k] - t[k - 1]);
  return k === K && tau > t[K] ? 1 : 0;
}

/**
 * Ψ_j(τ) (or ψ_j(τ) with `rate`) for every j into out (length K + 1): the knot values are
 * c = σ·L·v with L lower triangular, L_kj = s_j·ρ^(k−j), s_0 = 1, s_j = √(1 − ρ²); so
 * Ψ_j = σ·s_j·Σ_{k≥j} ρ^(k−j)·Φ_k, summed backwards.
 */
export function wanderBasis(w: RateWander, tau: number, out: Float64Array, rate = false): Float64Array {
  const t = w.knotsS, K = t.length - 1;
  const rho = K > 0 ? Math.exp(-(t[1] - t[0]) / w.correlationS) : 0;
  const s = Math.sqrt(Math.max(0, 1 - rho * rho));
  let j = K;
  // Knots wholly after τ (t_{j−1} ≥ τ): Φ_j(τ) is 0 and so is the sum so far; the same figures
  // without the calls (the Jacobian of the wander's choice asks for every sample of a layer).
  if (!rate && Number.isFinite(rho)) for (; j >= 1 && t[j - 1] >= tau; j--) out[j] = w.sigmaNmPerS * s * 0;
  let acc = 0;
  const whole = rate ? null : wholeHatIntegrals(t);
  for (; j >= 0; j--) {
    const phi = rate ? hat(t, j, tau) : j < K && tau >= t[j + 1] ? whole![j] : hatIntegral(t, j, tau);
    acc = phi + rho * acc;
    out[j] = w.sigmaNmPerS * (j === 0 ? 1 : s) * acc;
  }
  return out;
}

/**
 * hatIntegral(t, k, τ) of each knot k < K whose hat τ has passed whole (τ ≥ t[k+1]), where it no
 * longer depends on τ: each half's x is its width h then (τ − a ≥ h after rounding, which is
 * monotone), so the figure at τ = t[k+1] is the figure at any later τ, to the last bit. Kept for
 * the last knots asked (a Jacobian asks for every sample of a layer on one wander's knots).
 */
function wholeHatIntegrals(t: Float64Array): Float64Array {
  if (t !== wholeFor) {
    const K = t.length - 1;
    wholeValues = new Float64Array(Math.max(K, 0));
    for (let k = 0; k < K; k++) wholeValues[k] = hatIntegral(t, k, t[k + 1]);
    wholeFor = t;
  }
  return wholeValues;
}
let wholeFor: Float64Array | null = null;
let wholeValues = new Float64Array(0);

/** The wander's knot rates c_k, nm/s, from its parameters v. */
export function wanderKnotRates(w: RateWander, v: ArrayLike<number>): Float64Array {
  const t = w.knotsS, K = t.length - 1;
  const rho = K > 0 ? Math.exp(-(t[1] - t[0]) / w.correlationS) : 0;
  const s = Math.sqrt(Math.max(0, 1 - rho * rho));
  const c = new Float64Array(K + 1);
  for (let k = 0; k <= K; k++) c[k] = (k === 0 ? 0 : rho * c[k - 1]) + w.sigmaNmPerS * (k === 0 ? 1 : s) * v[k];
  return c;
}

/** The wander's thickness Σ v_j·Ψ_j(τ) = ∫₀^τ w, nm (0 without wander). */
export function wanderThickness(w: RateWander | undefined, v: ArrayLike<number> | undefined, tau: number): number {
  if (!w || !v) return 0;
  return integrateKnots(w.knotsS, wanderKnotRates(w, v), tau);
}

/** The law's thickness at every τ of tauS into out (knot rates computed once). */
export function lawThicknessSeries(law: ThicknessLaw, w: RateWander | undefined, tauS: ArrayLike<number>, out: Float64Array): Float64Array {
  const c = w && law.wander ? wanderKnotRates(w, law.wander) : null;
  if (c) return wanderSeries(law.rateNmPerS, law.rateDriftNmPerS2, w!.knotsS, c, knotPrefix(w!.knotsS, c), tauS, out);
  for (let i = 0; i < tauS.length; i++) {
    const tau = tauS[i];
    out[i] = law.rateNmPerS * tau + 0.5 * law.rateDriftNmPerS2 * tau * tau + 0;
  }
  return out;
}

/**
 * integrateKnots's sums over whole segments: P[k] = the sum of segments 0 … k − 1, added in the
 * same order. A segment the loop passes whole has x = h exactly (τ > t[k+1] gives τ − t[k] ≥
 * t[k+1] − t[k] after rounding, which is monotone), so P[k] plus the partial segment is
 * integrateKnots's figure to the last bit, at one segment a τ instead of all before it.
 */
function knotPrefix(t: Float64Array, c: Float64Array): Float64Array {
  const K = t.length - 1;
  const P = new Float64Array(K + 1);
  let d = 0;
  for (let k = 0; k < K; k++) {
    const h = t[k + 1] - t[k], x = h;
    d += c[k] * x + ((c[k + 1] - c[k]) * x * x) / (2 * h);
    P[k + 1] = d;
  }
  return P;
}

/** lawThicknessSeries with a wander: integrateKnots through knotPrefix (the same figures). */
function wanderSeries(
  rate: number, drift: number, t: Float64Array, c: Float64Array, P: Float64Array, tauS: ArrayLike<number>, out: Float64Array,
): Float64Array {
  const K = t.length - 1;
  // the segment of the last τ: samples come in time order, so the search goes on from there
  // (from the start again for an earlier τ); the same segment as a search from the start
  let k = -1, last = -Infinity;
  for (let i = 0; i < tauS.length; i++) {
    const tau = tauS[i];
    // the last segment integrateKnots's loop enters: the largest k < K with τ > t[k] (none: −1)
    if (!(tau >= last)) k = -1;
    last = tau;
    while (k + 1 < K && tau > t[k + 1]) k++;
    let d = 0;
    if (k >= 0) {
      const h = t[k + 1] - t[k], x = Math.min(tau - t[k], h);
      d = (k === 0 ? 0 : P[k]) + (c[k] * x + ((c[k + 1] - c[k]) * x * x) / (2 * h));
    }
    out[i] = rate * tau + 0.5 * drift * tau * tau + (tau > t[K] ? d + c[K] * (tau - t[K]) : d);
  }
  return out;
}

/** ∫₀^τ of the piecewise-linear rate with values c at knots t (held at c_K beyond). */
function integrateKnots(t: Float64Array, c: Float64Array, tau: number): number {
  const K = t.length - 1;
  let d = 0;
  for (let k = 0; k < K && tau > t[k]; k++) {
    const h = t[k + 1] - t[k], x = Math.min(tau - t[k], h);
    d += c[k] * x + ((c[k + 1] - c[k]) * x * x) / (2 * h);
  }
  return tau > t[K] ? d + c[K] * (tau - t[K]) : d;
}

/** The wander's rate w(τ), nm/s. */
export function wanderRate(w: RateWander | undefined, v: ArrayLike<number> | undefined, tau: number): number {
  if (!w || !v) return 0;
  const t = w.knotsS, K = t.length - 1, c = wanderKnotRates(w, v);
  if (tau >= t[K]) return c[K];
  if (tau <= 0) return c[0];
  const k = Math.min(K - 1, Math.floor((tau / t[K]) * K));
  const x = (tau - t[k]) / (t[k + 1] - t[k]);
  return c[k] + (c[k + 1] - c[k]) * x;
}

/** What the thickness law needs: the trend and, optionally, the wander. */
export interface ThicknessLaw {
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  wander?: Float64Array;
}

/** d(τ) = r·τ + a·τ²/2 + wander. */
export const lawThickness = (law: ThicknessLaw, w: RateWander | undefined, tau: number): number =>
  law.rateNmPerS * tau + 0.5 * law.rateDriftNmPerS2 * tau * tau + wanderThickness(w, law.wander, tau);

/** ḋ(τ) = r + a·τ + w(τ). */
export const lawRate = (law: ThicknessLaw, w: RateWander | undefined, tau: number): number =>
  law.rateNmPerS + law.rateDriftNmPerS2 * tau + wanderRate(w, law.wander, tau);

/**
 * τ ≥ 0 at which the law reaches thicknessNm (extrapolated past the data at the final rate);
 * NaN when it never does. Bisection on the monotone part, then one secant refinement.
 */
export function lawTimeToThickness(law: ThicknessLaw, w: RateWander | undefined, thicknessNm: number, horizonS: number): number {
  const f = (tau: number) => lawThickness(law, w, tau) - thicknessNm;
  if (f(0) > 0) return NaN;
  let hi = Math.max(horizonS, 1e-9), lo = 0;
  for (let i = 0; i < 8 && f(hi) < 0; i++) hi *= 2;
  if (f(hi) < 0) return NaN;
  for (let i = 0; i < 60 && hi - lo > 1e-9 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * The quadratic law r·τ + a·τ²/2 with the same thickness and rate as the full law at T: what
 * code that works near a layer's end in (r, a) alone (fit/layerEnd.ts) needs.
 */
export function endEquivalentLaw(law: ThicknessLaw, w: RateWander | undefined, T: number): { rateNmPerS: number; rateDriftNmPerS2: number } {
  if (!w || !law.wander || !(T > 0)) return { rateNmPerS: law.rateNmPerS, rateDriftNmPerS2: law.rateDriftNmPerS2 };
  const D = lawThickness(law, w, T), R = lawRate(law, w, T);
  const a = (2 * (R * T - D)) / (T * T);
  return { rateNmPerS: R - a * T, rateDriftNmPerS2: a };
}
