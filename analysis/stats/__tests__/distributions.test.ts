import { describe, expect, it } from 'vitest';
import { fUpperP, logGamma, regularizedBeta, studentTTwoSidedP } from '..';

/** P(|T| ≥ t) by Simpson's rule on x = √ν·tan θ: ∫cos^(ν−1)θ dθ from atan(t/√ν) to π/2 over the same from 0 (ν ≥ 1). Independent of the incomplete beta. */
function tTailBySimpson(t: number, dof: number): number {
  const integral = (a: number, b: number) => {
    const n = 20000;
    const h = (b - a) / n;
    let s = 0;
    for (let i = 0; i <= n; i++) s += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * Math.cos(a + i * h) ** (dof - 1);
    return (s * h) / 3;
  };
  const top = Math.atan(Math.abs(t) / Math.sqrt(dof));
  return integral(top, Math.PI / 2) / integral(0, Math.PI / 2);
}

describe('distributions', () => {
  it('logGamma matches factorials and Γ(1/2) = √π', () => {
    expect(logGamma(1)).toBeCloseTo(0, 12);
    expect(logGamma(6)).toBeCloseTo(Math.log(120), 11);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 11);
    expect(() => logGamma(0)).toThrow('logGamma: x must be > 0 (got 0)');
  });

  it('closed forms: I_x(a, 1) = xᵃ, Cauchy (ν = 1), ν = 2, and F with ν₁ = 2', () => {
    expect(regularizedBeta(0.3, 2.5, 1)).toBeCloseTo(0.3 ** 2.5, 12);
    expect(studentTTwoSidedP(1.7, 1)).toBeCloseTo(1 - (2 / Math.PI) * Math.atan(1.7), 12);
    expect(studentTTwoSidedP(2.2, 2)).toBeCloseTo(1 - 2.2 / Math.sqrt(2 + 2.2 ** 2), 12);
    expect(fUpperP(3.3, 2, 9)).toBeCloseTo((1 + (2 * 3.3) / 9) ** -4.5, 12);
  });

  it('the t tail agrees with an independent numerical integration of the density', () => {
    for (const [t, dof] of [[0.5, 3], [2.1, 7], [3.4, 15], [1.3, 40]]) {
      expect(studentTTwoSidedP(t, dof)).toBeCloseTo(tTailBySimpson(t, dof), 8);
    }
  });

  it('gives the tail areas of the published critical-value tables', () => {
    // Critical values as printed in the NIST/SEMATECH e-Handbook of Statistical Methods,
    // §1.3.6.7.2 (Student's t, upper tail) and §1.3.6.7.3 (F, upper 5 % and 1 %), to three
    // decimals (transcribed from memory); tolerance covers that rounding.
    const t: [number, number, number][] = [
      [2.228, 10, 0.05], // t(0.975; 10), two-sided 5 %
      [4.032, 5, 0.01], // t(0.995; 5)
      [1.725, 20, 0.1], // t(0.95; 20)
      [2.042, 30, 0.05], // t(0.975; 30)
    ];
    for (const [value, dof, p] of t) expect(Math.abs(studentTTwoSidedP(value, dof) - p)).toBeLessThan(p * 0.01);
    const f: [number, number, number, number][] = [
      [3.708, 3, 10, 0.05],
      [3.493, 2, 20, 0.05],
      [2.711, 5, 20, 0.05],
      [5.412, 4, 12, 0.01],
    ];
    for (const [value, d1, d2, p] of f) expect(Math.abs(fUpperP(value, d1, d2) - p)).toBeLessThan(p * 0.01);
  });

  it('edges and bad input', () => {
    expect(studentTTwoSidedP(0, 5)).toBeCloseTo(1, 12);
    expect(studentTTwoSidedP(Infinity, 5)).toBe(0);
    expect(fUpperP(0, 2, 3)).toBe(1);
    expect(() => studentTTwoSidedP(1, 0)).toThrow('studentTTwoSidedP: degrees of freedom must be > 0 (got 0)');
    expect(() => regularizedBeta(1.2, 1, 1)).toThrow('regularizedBeta: x must be in [0, 1] (got 1.2)');
  });
});
