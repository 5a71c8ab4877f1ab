import { describe, expect, it } from 'vitest';
import { assemblyMatrix, fromNK, gradedGrowingSignal, gradedSublayers, growingLayerSignal, stackResponse, type LayerAt } from '..';

const air = fromNK(1);

// The WKB characteristic matrix of a weakly inhomogeneous layer (R. Jacobsson, "Light reflection
// from films of continuously varying refractive index", Progress in Optics 5, 247–286 (1966); also
// Macleod, Thin-Film Optical Filters, chapter on inhomogeneous layers; both from memory):
//   M = [[√(na/nb)·cos δ, i·sin δ/√(na·nb)], [i·√(na·nb)·sin δ, √(nb/na)·cos δ]],  δ = (2π/λ)∫n dz.
// Orientation, derived here rather than remembered: the WKB fields are E ∝ n^(−1/2), H ∝ n^(1/2),
// so M (which carries the fields at the substrate-side face to the ambient-side face) has
// M11 = √(n_substrate-side / n_ambient-side): na is the index where the layer touches the
// substrate, nb where it faces the ambient. At δ = π, M = −diag(√(na/nb), √(nb/na)), so on a
// substrate ns the assembly's admittance is Y = ns·nb/na, and R = ((n0 − Y)/(n0 + Y))²: the
// half-wave point no longer returns to the bare substrate's reflectance (the monitoring signature
// of an inhomogeneous film). WKB leaves out terms second order in the gradient (the (n^(−1/2))''
// term of the wave equation), so Y is right to a relative (Δn/n)², and R to |dR/dY|·Y·(Δn/n)².
describe('graded layer as sublayers against the WKB closed form at the half-wave point', () => {
  const wl = 600, ns = 1.52;
  const reflectance = (y: number) => ((1 - y) / (1 + y)) ** 2;
  const tolerance = (y: number, dn: number, n: number) => ((4 * Math.abs(1 - y)) / (1 + y) ** 3) * y * (dn / n) ** 2;

  for (const [na, dn] of [[2.0, 0.01], [2.0, 0.04], [2.3, -0.03], [1.46, 0.02]] as const) {
    const nb = na + dn;
    // ∫n dz = λ/2 for the linear profile: d·(na + Δn/2) = λ/2
    const d = wl / 2 / (na + dn / 2);
    const layers = gradedSublayers(fromNK(na), dn, d);

    it(`na = ${na}, Δn = ${dn}: R = ((1 − ns·nb/na)/(1 + ns·nb/na))², not the bare substrate's`, () => {
      const y = (ns * nb) / na;
      const R = stackResponse({ ambient: air, substrate: fromNK(ns), layers }, wl).R;
      const tol = tolerance(y, dn, (na + nb) / 2);
      expect(Math.abs(R - reflectance(y))).toBeLessThan(tol);
      // the effect is first order in Δn, far beyond the tolerance (and of the sign the orientation says)
      const bare = reflectance(ns);
      expect(Math.abs(R - bare)).toBeGreaterThan(20 * tol);
      expect(Math.sign(R - bare)).toBe(Math.sign(reflectance(y) - bare));
    });

    it(`na = ${na}, Δn = ${dn}: the matrix is −diag(√(na/nb), √(nb/na)) to (Δn/n)²`, () => {
      const m = assemblyMatrix(layers, wl, 0, 's');
      const tol = (dn / na) ** 2;
      expect(Math.abs(m[0] + Math.sqrt(na / nb))).toBeLessThan(tol);
      expect(Math.abs(m[6] + Math.sqrt(nb / na))).toBeLessThan(tol);
      for (const k of [1, 2, 3, 4, 5, 7]) expect(Math.abs(m[k])).toBeLessThan(tol);
    });
  }

  it('matched substrate (ns = na): at the half-wave point the layer reflects as the bare top index, R = ((1 − nb)/(1 + nb))²', () => {
    const na = 1.9, dn = 0.05, nb = na + dn;
    const d = wl / 2 / (na + dn / 2);
    const R = stackResponse({ ambient: air, substrate: fromNK(na), layers: gradedSublayers(fromNK(na), dn, d) }, wl).R;
    expect(Math.abs(R - reflectance(nb))).toBeLessThan(tolerance(nb, dn, na));
  });
});

describe('gradedSublayers and gradedGrowingSignal', () => {
  const glass = fromNK(1.52);
  const below: LayerAt[] = [{ n: fromNK(2.35, 0.002), thicknessNm: 58.5 }, { n: fromNK(1.46), thicknessNm: 94.2 }];

  it('2-nm slabs agree with 0.05-nm slabs to 5e-7 in R and T for gradients up to 8e-4 per nm (the slab size GRADED_SLAB_NM)', () => {
    for (const dn of [0.05, -0.05]) {
      for (const d of [65, 131, 260]) {
        const coarse = stackResponse({ ambient: air, substrate: glass, layers: [...below, ...gradedSublayers(fromNK(2.3), dn, d)] }, 600, { backside: true });
        const fine = stackResponse({ ambient: air, substrate: glass, layers: [...below, ...gradedSublayers(fromNK(2.3), dn, d, 0.05)] }, 600, { backside: true });
        expect(Math.abs(coarse.R - fine.R)).toBeLessThan(5e-7);
        expect(Math.abs(coarse.T - fine.T)).toBeLessThan(5e-7);
      }
    }
  });

  it('the growing signal equals the full stack with the grown part as fine sublayers (T, R, backside, absorbing, oblique)', () => {
    const thickness = Float64Array.from({ length: 31 }, (_, i) => i * 4.3);
    const perNm = 0.03 / 130;
    for (const mode of ['T', 'R'] as const) {
      for (const backside of [false, true]) {
        for (const [angleDeg, growing] of [[0, fromNK(2.1)], [0, fromNK(2.1, 0.002)], [25, fromNK(2.1, 0.002)]] as const) {
          const spec = { ambient: air, substrate: glass, below, growing, wavelengthNm: 550, mode, backside, angleDeg };
          const curve = gradedGrowingSignal(spec, perNm, thickness);
          thickness.forEach((d, i) => {
            const grown = gradedSublayers(growing, perNm * d, d, 0.05);
            const full = stackResponse({ ambient: air, substrate: glass, layers: [...below, ...grown] }, 550, { backside, angleDeg });
            expect(Math.abs(curve[i] - (mode === 'T' ? full.T : full.R))).toBeLessThan(5e-7);
          });
        }
      }
    }
  });

  it('a LayerAt with indexChange (its n the mean) is its sublayers', () => {
    const graded: LayerAt = { n: fromNK(2.2, 0.001), thicknessNm: 70, indexChange: -0.02 };
    const a = stackResponse({ ambient: air, substrate: glass, layers: [...below, graded] }, 600, { backside: true });
    const b = stackResponse({ ambient: air, substrate: glass, layers: [...below, ...gradedSublayers(fromNK(2.21, 0.001), -0.02, 70)] }, 600, { backside: true });
    expect(a.T).toBeCloseTo(b.T, 12);
    expect(a.R).toBeCloseTo(b.R, 12);
    expect(Math.abs(a.T - stackResponse({ ambient: air, substrate: glass, layers: [...below, { n: fromNK(2.2, 0.001), thicknessNm: 70 }] }, 600, { backside: true }).T)).toBeGreaterThan(1e-5);
  });

  it('with no gradient it is the homogeneous growing layer, in any order of the points', () => {
    const thickness = Float64Array.from([40, 0, 12.5, 80.2, 33, 33, 150]);
    const spec = { ambient: air, substrate: glass, below, growing: fromNK(2.1, 0.001), wavelengthNm: 550, mode: 'T' as const, backside: true };
    const graded = gradedGrowingSignal(spec, 0, thickness);
    const plain = growingLayerSignal(spec, thickness);
    plain.forEach((v, i) => expect(graded[i]).toBeCloseTo(v, 12));
  });
});
