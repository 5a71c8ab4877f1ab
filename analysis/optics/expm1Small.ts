// e^x − 1 for the weak absorber's attenuation in the monitor curve's inner loop
// (optics/growingLayer.ts): there |x| = k·κ·d stays below 10⁻³ for any film a monitor follows with
// κ < 10⁻³, where the engine's Math.expm1 (a call into its C library, about 9 ns here) is most of
// what the absorbing branch adds to a point. Below 10⁻³ the Taylor series e^x − 1 = Σ xⁿ/n! to
// n = 6 leaves a remainder near x⁷/7!, a fraction x⁶/5040 < 2·10⁻²² of the result, far under one
// unit in its last place (Abramowitz & Stegun 4.2.1); elsewhere Math.expm1.

const SMALL = 1e-3;

/** e^x − 1, accurate to within an ulp or two of Math.expm1 (checked in tests over both branches). */
export function expm1Small(x: number): number {
  if (Math.abs(x) < SMALL) return x * (1 + x * (1 / 2 + x * (1 / 6 + x * (1 / 24 + x * (1 / 120 + x * (1 / 720))))));
  return Math.expm1(x);
}
