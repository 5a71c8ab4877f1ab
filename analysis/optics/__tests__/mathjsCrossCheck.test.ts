import fc from 'fast-check';
import { abs, add, arg, complex, cos, divide, type Complex as MComplex, type Matrix, matrix, multiply, sin, sqrt, subtract } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { fromNK, growingLayerSignal, stackResponse, type StackAt } from '..';

// An independent evaluation of the same physics with mathjs complex numbers and matrices:
// Snell invariant, tilted admittances η_s = N cosθ, η_p = N/cosθ (N cosθ in the fourth quadrant),
// characteristic matrices multiplied by mathjs, then r, T, A from [B, C] (Macleod, Thin-Film
// Optical Filters, eqs. 2.106–2.124). R is also recomputed by the recursive Airy sum of Fresnel
// coefficients (Born & Wolf, Principles of Optics §1.6), a different algorithm.
type Layer = { n: number; k: number; d: number };
const c = (re: number, im = 0) => complex(re, im);

function nCosOf(N: MComplex, n0SinSq: number): MComplex {
  let q = sqrt(subtract(multiply(N, N), c(n0SinSq)) as MComplex) as MComplex;
  if (q.im > 0) q = multiply(q, -1) as MComplex;
  return q;
}
const etaOf = (N: MComplex, q: MComplex, pol: 's' | 'p') => (pol === 's' ? q : (divide(multiply(N, N), q) as MComplex));

function reference(ns: number, layers: Layer[], wl: number, angleDeg: number, pol: 's' | 'p') {
  const n0SinSq = Math.sin((angleDeg * Math.PI) / 180) ** 2;
  const eta0 = etaOf(c(1), nCosOf(c(1), n0SinSq), pol);
  const etaS = etaOf(c(ns), nCosOf(c(ns), n0SinSq), pol);
  let m: Matrix = matrix([[c(1), c(0)], [c(0), c(1)]]);
  for (const l of [...layers].reverse()) {
    const N = c(l.n, -l.k);
    const q = nCosOf(N, n0SinSq);
    const eta = etaOf(N, q, pol);
    const delta = multiply(q, (2 * Math.PI * l.d) / wl) as MComplex;
    const i = c(0, 1);
    const lm = matrix([
      [cos(delta), divide(multiply(i, sin(delta)), eta) as MComplex],
      [multiply(multiply(i, eta), sin(delta)) as MComplex, cos(delta)],
    ]);
    m = multiply(m, lm) as Matrix;
  }
  const bc = multiply(m, matrix([[c(1)], [etaS]])) as Matrix;
  const B = bc.get([0, 0]) as MComplex;
  const C = bc.get([1, 0]) as MComplex;
  const den = add(multiply(eta0, B), C) as MComplex;
  const r = divide(subtract(multiply(eta0, B), C), den) as MComplex;
  const R = (abs(r) as unknown as number) ** 2;
  const T = (4 * eta0.re * etaS.re) / (abs(den) as unknown as number) ** 2;
  return { R, T, phase: arg(r) };
}

function airyR(ns: number, layers: Layer[], wl: number, angleDeg: number, pol: 's' | 'p'): number {
  const n0SinSq = Math.sin((angleDeg * Math.PI) / 180) ** 2;
  const media = [c(1), ...[...layers].reverse().map((l) => c(l.n, -l.k)), c(ns)];
  const etas = media.map((N) => etaOf(N, nCosOf(N, n0SinSq), pol));
  // from the substrate up: r_j = (ρ_j + r_{j+1} e^{−2iδ}) / (1 + ρ_j r_{j+1} e^{−2iδ})
  const rho = (a: MComplex, b: MComplex) => divide(subtract(a, b), add(a, b)) as MComplex;
  let r = rho(etas[etas.length - 2], etas[etas.length - 1]);
  for (let j = etas.length - 2; j >= 1; j--) {
    const l = [...layers].reverse()[j - 1];
    const q = nCosOf(media[j], n0SinSq);
    const delta = multiply(q, (2 * Math.PI * l.d) / wl) as MComplex;
    const e = complex({ r: Math.exp(2 * delta.im), phi: -2 * delta.re });
    const re = multiply(r, e) as MComplex;
    const p = rho(etas[j - 1], etas[j]);
    r = divide(add(p, re), add(c(1), multiply(p, re))) as MComplex;
  }
  return (abs(r) as unknown as number) ** 2;
}

const layerArb = fc.record({
  n: fc.double({ min: 1.2, max: 3.2, noNaN: true }),
  k: fc.double({ min: 0, max: 0.6, noNaN: true }),
  d: fc.double({ min: 1, max: 300, noNaN: true }),
});
const caseArb = fc.record({
  ns: fc.double({ min: 1.4, max: 1.9, noNaN: true }),
  layers: fc.array(layerArb, { minLength: 1, maxLength: 8 }),
  wl: fc.double({ min: 350, max: 1100, noNaN: true }),
  angleDeg: fc.double({ min: 5, max: 75, noNaN: true }),
  pol: fc.constantFrom('s' as const, 'p' as const),
});
const toStack = (ns: number, layers: Layer[]): StackAt => ({
  ambient: fromNK(1),
  substrate: fromNK(ns),
  layers: layers.map((l) => ({ n: fromNK(l.n, l.k), thicknessNm: l.d })),
});

describe('cross-check against mathjs complex matrices (random absorbing stacks, oblique incidence)', () => {
  it('R, T and phase agree with the mathjs characteristic-matrix evaluation and R with the Airy recursion', () => {
    fc.assert(
      fc.property(caseArb, ({ ns, layers, wl, angleDeg, pol }) => {
        const ours = stackResponse(toStack(ns, layers), wl, { angleDeg, pol });
        const ref = reference(ns, layers, wl, angleDeg, pol);
        expect(ours.R).toBeCloseTo(ref.R, 10);
        expect(ours.T).toBeCloseTo(ref.T, 10);
        expect(Math.cos(ours.phaseRad - ref.phase)).toBeCloseTo(1, 8);
        expect(ours.R).toBeCloseTo(airyR(ns, layers, wl, angleDeg, pol), 10);
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('a weakly absorbing layer at oblique incidence keeps its absorption (regression: complex sqrt cancellation)', () => {
    const layers = [{ n: 1.2, k: 8.78050224227339e-12, d: 133.91681362968833 }, { n: 1.2, k: 0, d: 1 }];
    const ours = stackResponse(toStack(1.4, layers), 350, { angleDeg: 40.877867455277254, pol: 'p' });
    const ref = reference(1.4, layers, 350, 40.877867455277254, 'p');
    expect(ours.T).toBeCloseTo(ref.T, 13);
    expect(ours.A).toBeGreaterThan(3e-11);
  });

  it('the incremental growing-layer curve agrees with mathjs at each thickness (thick backside added incoherently)', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 0, max: 250, noNaN: true }), ({ ns, layers, wl, angleDeg, pol }, d) => {
        const below = layers.slice(0, -1);
        const top = layers[layers.length - 1];
        const ref = reference(ns, [...below, { ...top, d }], wl, angleDeg, pol);
        // bare back face (Fresnel), added in intensity (Macleod ch. 2); lossless stacks only, where
        // the coated face reflects the same from both sides
        const bare = reference(ns, [], wl, angleDeg, pol).R;
        const spec = {
          ambient: fromNK(1), substrate: fromNK(ns), below: toStack(ns, below).layers, growing: fromNK(top.n, top.k),
          wavelengthNm: wl, mode: 'T' as const, angleDeg, pol,
        };
        expect(growingLayerSignal(spec, [d])[0]).toBeCloseTo(ref.T, 10);
        expect(growingLayerSignal({ ...spec, mode: 'R' }, [d])[0]).toBeCloseTo(ref.R, 10);
        if (top.k === 0 && below.every((l) => l.k === 0)) {
          const tBack = growingLayerSignal({ ...spec, backside: true }, [d])[0];
          expect(tBack).toBeCloseTo((ref.T * (1 - bare)) / (1 - ref.R * bare), 10);
        }
      }),
      { numRuns: 150, seed: 7 },
    );
  });
});
