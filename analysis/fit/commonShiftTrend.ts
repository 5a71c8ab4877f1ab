import { qProfileUpperBound } from '../stats';
import { invertSymmetric } from './invertSymmetric';

/** One reading for commonShiftTrend: its own independent σ, and its signed change at one σ of each common shift. */
export interface CommonShiftPoint {
  timeS: number;
  value: number;
  /** The reading's independent 1σ (its σ² less the common shifts' δ²). */
  sigma: number;
  shifts: readonly { source: object; delta: number }[];
}

/**
 * A linear trend in time under a random-effects model whose readings share errors: each true value
 * is a + b·t + uᵢ, uᵢ ~ N(0, τ²), read with an error of covariance R = diag(σᵢ²) + Σ_g δ_g δ_gᵀ, one
 * rank-one term per common shift g (one draw of a chip's offset moves every reading of the chip by
 * its δ). τ² by the moment estimator on R's generalised residuals, τ̂² = max(0, (Q − (k − 2))/tr P),
 * P = R⁻¹ − R⁻¹X(XᵀR⁻¹X)⁻¹XᵀR⁻¹, Q = yᵀPy (E Q = k − 2 + τ² tr P); its variance 2·tr(PVPV)/(tr P)²
 * (Q a quadratic form in normal variables). Each value is predicted by the BLUP
 * θ̂ = Xβ̂ + τ̂²V⁻¹(y − Xβ̂), V = R + τ̂²I, β̂ by GLS, linear in the readings, θ̂ = Cy; its error
 * variance with τ² known, τ²(C − I)(C − I)ᵀ + CRCᵀ (diagonal), is the Prasad–Rao g₁ + g₂, and
 * 2g₃ = 2·(∂Cᵢ/∂τ²)V(∂Cᵢ/∂τ²)ᵀ·Var τ̂² is added for τ² estimated (N. G. N. Prasad, J. N. K. Rao,
 * JASA 85, 163–171 (1990), from memory; the derivative taken numerically). 'upperBound': the
 * spread instead at its 95 % upper bound τᵤ² from the profile Q(τ²) = yᵀP(τ²)y = χ²₀.₀₅(k − 2)
 * (Viechtbauer's Q-profile, from memory; floored as stats/randomEffectsTrend.ts does), the error
 * variance τᵤ²(C − I)(C − I)ᵀ + CRCᵀ with C at τ̂² (conservative). Prasad–Rao's also takes the
 * upper bound where τ̂² is truncated at 0: its expansion about τ̂² does not hold at the boundary
 * (a known weakness of the moment estimator there, from memory), and there every reading was
 * drawn onto the trend with the trend's σ alone, however little the readings could tell of a
 * spread: a 40-layer mirror logged once a second (tests/chamber/__tests__/slowLogger.test.ts),
 * H layers read to σ 0.005–0.026 each, got σ 0.0006–0.0009 for errors of 0.0027–0.0034, refit
 * index within 3σ 94 → 99 % (seeds 41–42); on the harness at 10 Hz only σ moved (RMS z_n of the
 * spikes mirror's refit 0.52 → 0.46).
 * null with fewer than 5 points, a σ not > 0, all at one time, or a singular R.
 */
export function commonShiftTrend(points: readonly CommonShiftPoint[], mse: 'prasadRao' | 'upperBound' = 'prasadRao'): { tau2: number; predicted: { value: number; sigma: number }[] } | null {
  const k = points.length;
  if (k < 5 || points.some((p) => !(p.sigma > 0) || !Number.isFinite(p.value) || !Number.isFinite(p.timeS))) return null;
  const mean = points.reduce((a, p) => a + p.timeS, 0) / k;
  const x = points.map((p) => (p.timeS - mean) / 3600);
  if (x.every((v) => Math.abs(v - x[0]) < 1e-12)) return null;
  const y = points.map((p) => p.value);
  const R = new Float64Array(k * k);
  points.forEach((p, i) => { R[i * k + i] = p.sigma ** 2; });
  const sources = new Set(points.flatMap((p) => p.shifts.map((s) => s.source)));
  for (const g of sources) {
    const d = points.map((p) => p.shifts.filter((s) => s.source === g).reduce((a, s) => a + s.delta, 0));
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) R[i * k + j] += d[i] * d[j];
  }
  const withTau = (tau2: number) => {
    const V = R.slice();
    for (let i = 0; i < k; i++) V[i * k + i] += tau2;
    const Vi = invertSymmetric(V, k);
    if (!Vi) return null;
    // XᵀV⁻¹X (2×2) and its inverse
    let s00 = 0, s01 = 0, s11 = 0;
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
      const v = Vi[i * k + j];
      s00 += v; s01 += v * x[j]; s11 += x[i] * v * x[j];
    }
    const det = s00 * s11 - s01 * s01;
    if (!(det > 0)) return null;
    const [a00, a01, a11] = [s11 / det, -s01 / det, s00 / det];
    // H = X A⁻¹ XᵀV⁻¹ (the GLS fit's hat), P = V⁻¹ − V⁻¹H, C = H + τ²V⁻¹(I − H)
    const XtVi = [0, 1].map((r) => Array.from({ length: k }, (_, j) => { let s = 0; for (let i = 0; i < k; i++) s += (r === 0 ? 1 : x[i]) * Vi[i * k + j]; return s; }));
    const H = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) H[i * k + j] = (a00 + a01 * x[i]) * XtVi[0][j] + (a01 + a11 * x[i]) * XtVi[1][j];
    const P = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
      let s = 0;
      for (let m = 0; m < k; m++) s += Vi[i * k + m] * H[m * k + j];
      P[i * k + j] = Vi[i * k + j] - s;
    }
    const C = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
      let s = 0;
      for (let m = 0; m < k; m++) s += Vi[i * k + m] * ((m === j ? 1 : 0) - H[m * k + j]);
      C[i * k + j] = H[i * k + j] + tau2 * s;
    }
    return { V, P, C };
  };
  const at0 = withTau(0);
  if (!at0) return null;
  let q = 0, trP = 0;
  for (let i = 0; i < k; i++) {
    trP += at0.P[i * k + i];
    for (let j = 0; j < k; j++) q += y[i] * at0.P[i * k + j] * y[j];
  }
  const tau2 = trP > 0 ? Math.max(0, (q - (k - 2)) / trP) : 0;
  const fit = withTau(tau2);
  if (!fit) return null;
  const { V, C } = fit;
  // Var τ̂² = 2 tr(P V P V)/(tr P)², P at τ² = 0 (the estimator's), V at τ̂²
  const PV = matMul(at0.P, V, k);
  let tr = 0;
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) tr += PV[i * k + j] * PV[j * k + i];
  const varTau2 = trP > 0 ? (2 * tr) / (trP * trP) : 0;
  const profile = (t: number) => {
    const f = withTau(t);
    if (!f) return 0;
    let qq = 0;
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) qq += y[i] * f.P[i * k + j] * y[j];
    return qq;
  };
  // the spread the error variance takes: τ̂² (Prasad–Rao, with g₃ for its estimation) or its upper bound
  const upper = mse === 'upperBound' || tau2 === 0 ? qProfileUpperBound(profile, k - 2, tau2, trP, Math.max(tau2, 1e-12)) : null;
  const h = Math.max(tau2, points.reduce((a, p) => a + p.sigma ** 2, 0) / k) * 1e-3;
  const moved = upper === null ? withTau(tau2 + h) : null;
  const predicted = points.map((_, i) => {
    let value = 0, v = 0;
    for (let j = 0; j < k; j++) value += C[i * k + j] * y[j];
    // τ²(C − I)(C − I)ᵀ + C R Cᵀ at row i
    for (let j = 0; j < k; j++) v += (upper ?? tau2) * (C[i * k + j] - (i === j ? 1 : 0)) ** 2;
    v += quad(C, i, R, k);
    if (moved) {
      const dC = new Float64Array(k * k);
      for (let j = 0; j < k; j++) dC[i * k + j] = (moved.C[i * k + j] - C[i * k + j]) / h;
      v += 2 * quad(dC, i, V, k) * varTau2;
    }
    return { value, sigma: Math.sqrt(v) };
  });
  return { tau2, predicted };
}

/** cᵢ M cᵢᵀ for row i of c (k×k row-major). */
function quad(c: Float64Array, i: number, m: Float64Array, k: number): number {
  let s = 0;
  for (let a = 0; a < k; a++) {
    const ca = c[i * k + a];
    if (ca === 0) continue;
    for (let b = 0; b < k; b++) s += ca * m[a * k + b] * c[i * k + b];
  }
  return s;
}

function matMul(a: Float64Array, b: Float64Array, k: number): Float64Array {
  const out = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let m = 0; m < k; m++) {
    const v = a[i * k + m];
    if (v === 0) continue;
    for (let j = 0; j < k; j++) out[i * k + j] += v * b[m * k + j];
  }
  return out;
}
