// sin x and cos x in one call, for the monitor curve's inner loop (optics/growingLayer.ts), which
// needs both of every phase thickness: Math.sin and Math.cos each reduce the argument and run
// their own kernel (30 ns the pair here, most of a point's cost); here one reduction serves both
// and the kernels are fdlibm's (Sun Microsystems 1993, k_sin.c and k_cos.c: minimax polynomials
// on [−π/4, π/4]; coefficients from memory, checked against Math.sin and Math.cos in
// tests: within 2 units in the last place over 10⁶ arguments).

/** sinCos's results (numbers in an object made once: a pair returned would be an object a call). */
export const sinCosOut = { sin: 0, cos: 0 };

const INV_PIO2 = 6.36619772367581382433e-1; // 2/π
// π/2 in two parts (Cody–Waite reduction, as fdlibm's e_rem_pio2.c): the first has 33 significant
// bits, so k·PIO2_1 is exact for |k| < 2²⁰; the second carries the next 53.
const PIO2_1 = 1.57079632673412561417e0;
const PIO2_1T = 6.07710050650619224932e-11;
/** Beyond this the two-part reduction loses accuracy; the engine's functions take over (a phase thickness here stays below a few thousand). */
const REDUCED_UP_TO = 1e5;

const S1 = -1.66666666666666324348e-1, S2 = 8.33333333332248946124e-3, S3 = -1.98412698298579493134e-4;
const S4 = 2.75573137070700676789e-6, S5 = -2.50507602534068634195e-8, S6 = 1.58969099521155010221e-10;
const C1 = 4.16666666666666019037e-2, C2 = -1.38888888888741095749e-3, C3 = 2.48015872894767294178e-5;
const C4 = -2.75573143513906633035e-7, C5 = 2.08757232129817482790e-9, C6 = -1.13596475577881948265e-11;

/** sin x and cos x into sinCosOut (NaN for a non-finite x, as Math.sin and Math.cos). */
export function sinCos(x: number): void {
  if (!(Math.abs(x) < REDUCED_UP_TO)) {
    sinCosOut.sin = Math.sin(x);
    sinCosOut.cos = Math.cos(x);
    return;
  }
  const k = Math.round(x * INV_PIO2);
  const r = x - k * PIO2_1 - k * PIO2_1T;
  const z = r * r;
  const s = r + r * z * (S1 + z * (S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)))));
  const c = 1 - 0.5 * z + z * z * (C1 + z * (C2 + z * (C3 + z * (C4 + z * (C5 + z * C6)))));
  const q = k & 3;
  if (q === 0) {
    sinCosOut.sin = s;
    sinCosOut.cos = c;
  } else if (q === 1) {
    sinCosOut.sin = c;
    sinCosOut.cos = -s;
  } else if (q === 2) {
    sinCosOut.sin = -s;
    sinCosOut.cos = -c;
  } else {
    sinCosOut.sin = -c;
    sinCosOut.cos = s;
  }
}
