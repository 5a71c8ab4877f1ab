// Tail probabilities of Student's t and Fisher's F through the regularized incomplete beta
// function I_x(a, b): M. Abramowitz, I. A. Stegun, Handbook of Mathematical Functions (1964),
// 26.5.8 (continued fraction), 26.7.1 (t) and 26.6.2 (F); evaluated by the modified Lentz method
// as in W. H. Press et al., Numerical Recipes, 3rd ed. (2007), §6.4.

/** ln Γ(x) for x > 0, Lanczos approximation (g = 7, nine coefficients; Numerical Recipes §6.1 form). */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma: x must be > 0 (got ${x})`);
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let s = c[0];
  for (let i = 1; i < 9; i++) s += c[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(s);
}

/** Continued fraction of I_x(a, b) (A&S 26.5.8), modified Lentz. */
function betaFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 500; m++) {
    const m2 = 2 * m;
    let num = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + num * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + num / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    num = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + num * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + num / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < 1e-15) return h;
  }
  throw new RangeError(`incomplete beta: no convergence for x = ${x}, a = ${a}, b = ${b}`);
}

/** The regularized incomplete beta function I_x(a, b), 0 ≤ x ≤ 1, a, b > 0. */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0)) throw new RangeError(`regularizedBeta: a and b must be > 0 (got ${a}, ${b})`);
  if (!(x >= 0 && x <= 1)) throw new RangeError(`regularizedBeta: x must be in [0, 1] (got ${x})`);
  if (x === 0 || x === 1) return x;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  // The fraction converges fast for x < (a + 1)/(a + b + 2); otherwise use I_x(a, b) = 1 − I_{1−x}(b, a).
  return x < (a + 1) / (a + b + 2) ? (front * betaFraction(x, a, b)) / a : 1 - (front * betaFraction(1 - x, b, a)) / b;
}

/** P(|T| ≥ |t|) for Student's t with ν degrees of freedom (A&S 26.7.1): I_{ν/(ν+t²)}(ν/2, 1/2). ν may be fractional (Welch). */
export function studentTTwoSidedP(t: number, dof: number): number {
  if (!(dof > 0)) throw new RangeError(`studentTTwoSidedP: degrees of freedom must be > 0 (got ${dof})`);
  if (!Number.isFinite(t)) return Number.isNaN(t) ? NaN : 0;
  return regularizedBeta(dof / (dof + t * t), dof / 2, 0.5);
}

/** P(F ≥ f) for Fisher's F with (d1, d2) degrees of freedom (A&S 26.6.2): I_{d2/(d2+d1·f)}(d2/2, d1/2). */
export function fUpperP(f: number, d1: number, d2: number): number {
  if (!(d1 > 0) || !(d2 > 0)) throw new RangeError(`fUpperP: degrees of freedom must be > 0 (got ${d1}, ${d2})`);
  if (Number.isNaN(f)) return NaN;
  if (f <= 0) return 1;
  if (!Number.isFinite(f)) return 0;
  return regularizedBeta(d2 / (d2 + d1 * f), d2 / 2, d1 / 2);
}

/**
 * The regularized lower incomplete gamma function P(a, x), a > 0, x ≥ 0: its series for
 * x < a + 1 (A&S 6.5.29), else 1 − Q(a, x) by Legendre's continued fraction (A&S 6.5.31),
 * modified Lentz, as in Numerical Recipes, 3rd ed., §6.2.
 */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0)) throw new RangeError(`regularizedGammaP: a must be > 0 (got ${a})`);
  if (!(x >= 0)) throw new RangeError(`regularizedGammaP: x must be ≥ 0 (got ${x})`);
  if (x === 0) return 0;
  const front = Math.exp(-x + a * Math.log(x) - logGamma(a));
  if (x < a + 1) {
    let term = 1 / a, total = term;
    for (let n = 1; n <= 1000; n++) {
      term *= x / (a + n);
      total += term;
      if (Math.abs(term) < Math.abs(total) * 1e-16) return front * total;
    }
    throw new RangeError(`regularizedGammaP: no convergence for a = ${a}, x = ${x}`);
  }
  const tiny = 1e-300;
  let b = x + 1 - a, c = 1 / tiny, d = 1 / b, h = d;
  for (let i = 1; i <= 1000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < 1e-15) return 1 - front * h;
  }
  throw new RangeError(`regularizedGammaP: no convergence for a = ${a}, x = ${x}`);
}

/** The χ²(ν) quantile at lower-tail probability p: P(ν/2, x/2) = p solved by bisection. */
export function chiSquareQuantile(p: number, dof: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`chiSquareQuantile: p must be in (0, 1) (got ${p})`);
  if (!(dof > 0)) throw new RangeError(`chiSquareQuantile: dof must be > 0 (got ${dof})`);
  let lo = 0, hi = Math.max(1, dof);
  while (regularizedGammaP(dof / 2, hi / 2) < p) hi *= 2;
  for (let i = 0; i < 100 && hi - lo > 1e-12 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (regularizedGammaP(dof / 2, mid / 2) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
