import { abs, add, complex, cos, divide, type Complex as MComplex, type Matrix, matrix, multiply, sin, subtract } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { dispersion } from '../design';
import { chamberRng } from '../rng';
import { response, stackMatrices, type FilmLayer } from '../thinFilm';

const at = (layers: FilmLayer[], wl: number, ambient: number, substrate: number, backside: boolean) => {
  const m = stackMatrices(layers, wl);
  return response(m.forward, m.reverse, { ambient, substrate, backside });
};

/** The same physics with mathjs complex matrices (Macleod, Thin-Film Optical Filters, ch. 2). */
function mathjsRT(layers: FilmLayer[], wl: number, n0: number, ns: number): { R: number; T: number } {
  const i = complex(0, 1);
  let m = matrix([[complex(1, 0), complex(0, 0)], [complex(0, 0), complex(1, 0)]]) as Matrix;
  // ambient side first: M = M_top ⋯ M_1
  for (const l of [...layers].reverse()) {
    const N = complex(l.n, -l.k);
    const delta = multiply(N, (2 * Math.PI * l.thicknessNm) / wl) as MComplex;
    const lm = matrix([
      [cos(delta), divide(multiply(i, sin(delta)), N) as MComplex],
      [multiply(multiply(i, N), sin(delta)) as MComplex, cos(delta)],
    ]);
    m = multiply(m, lm) as Matrix;
  }
  const bc = multiply(m, matrix([[complex(1, 0)], [complex(ns, 0)]])) as Matrix;
  const B = bc.get([0, 0]) as MComplex, C = bc.get([1, 0]) as MComplex;
  const den = add(multiply(B, n0), C) as MComplex;
  const r = divide(subtract(multiply(B, n0), C), den) as MComplex;
  return { R: (abs(r) as unknown as number) ** 2, T: (4 * n0 * ns) / (abs(den) as unknown as number) ** 2 };
}

describe('chamber simulator optics', () => {
  it('a bare surface gives the Fresnel reflectance ((n0 − ns)/(n0 + ns))² (Macleod, Thin-Film Optical Filters, ch. 2)', () => {
    const r = at([], 550, 1, 1.52, false);
    expect(r.R).toBeCloseTo(((1 - 1.52) / (1 + 1.52)) ** 2, 12); // 0.042580
    expect(r.R + r.T).toBeCloseTo(1, 12);
  });

  it('a thick bare slab, incoherent: R = 2R₁/(1 + R₁), T = 2n/(n² + 1) (Macleod, ch. 2, thick substrate)', () => {
    const r = at([], 550, 1, 1.52, true);
    const r1 = ((1 - 1.52) / (1 + 1.52)) ** 2;
    expect(r.R).toBeCloseTo((2 * r1) / (1 + r1), 12);
    expect(r.T).toBeCloseTo((2 * 1.52) / (1.52 ** 2 + 1), 12); // 0.918318
  });

  it('a quarter-wave MgF2 layer on glass: R = ((n0·ns − n1²)/(n0·ns + n1²))² = 0.01260 (Macleod, ch. 3, single-layer AR)', () => {
    const n1 = 1.38, ns = 1.52;
    const r = at([{ n: n1, k: 0, thicknessNm: 550 / (4 * n1) }], 550, 1, ns, false);
    expect(r.R).toBeCloseTo(((ns - n1 * n1) / (ns + n1 * n1)) ** 2, 12);
    expect(r.R).toBeCloseTo(0.0126, 4);
  });

  it('a half-wave layer is absentee at its wavelength (Macleod, ch. 2)', () => {
    const r = at([{ n: 2.3, k: 0, thicknessNm: 550 / (2 * 2.3) }], 550, 1, 1.52, false);
    expect(r.R).toBeCloseTo(((1 - 1.52) / (1 + 1.52)) ** 2, 12);
  });

  it('a quarter-wave stack (HL)^p H: R = ((1 − Y)/(1 + Y))², Y = (nH/nL)^(2p)·nH²/ns (Macleod, ch. 6)', () => {
    const nH = 2.35, nL = 1.46, ns = 1.52, wl = 600, p = 4;
    const layers: FilmLayer[] = [];
    for (let j = 0; j < 2 * p + 1; j++) {
      const n = j % 2 ? nL : nH;
      layers.push({ n, k: 0, thicknessNm: wl / (4 * n) });
    }
    const Y = (nH / nL) ** (2 * p) * (nH * nH) / ns;
    expect(at(layers, wl, 1, ns, false).R).toBeCloseTo(((1 - Y) / (1 + Y)) ** 2, 10);
  });

  it('agrees with mathjs complex matrices on random absorbing stacks; R + T = 1 without absorption', () => {
    const rng = chamberRng(5);
    for (let trial = 0; trial < 40; trial++) {
      const count = 1 + Math.floor(rng.next() * 12);
      const absorbing = trial % 2 === 0;
      const layers = Array.from({ length: count }, () => ({
        n: rng.between(1.35, 2.5), k: absorbing ? rng.between(0, 0.05) : 0, thicknessNm: rng.between(5, 300),
      }));
      const wl = rng.between(400, 900);
      const ours = at(layers, wl, 1, 1.5, false);
      const ref = mathjsRT(layers, wl, 1, 1.5);
      expect(ours.R).toBeCloseTo(ref.R, 11);
      expect(ours.T).toBeCloseTo(ref.T, 11);
      if (absorbing) expect(ours.R + ours.T).toBeLessThan(1);
      else expect(ours.R + ours.T).toBeCloseTo(1, 11);
    }
  });

  it('the incoherent backside conserves energy without absorption (R + T = 1)', () => {
    const layers = [{ n: 2.1, k: 0, thicknessNm: 71 }, { n: 1.46, k: 0, thicknessNm: 97 }, { n: 2.1, k: 0, thicknessNm: 33 }];
    const r = at(layers, 633, 1, 1.52, true);
    expect(r.R + r.T).toBeCloseTo(1, 12);
  });

  it('evaluates the FORMATS dispersion models: fused silica n_d = 1.4585 at 587.6 nm (Malitson, JOSA 55, 1205 (1965))', () => {
    const silica = { model: 'sellmeier' as const, B: [0.6961663, 0.4079426, 0.8974794], C: [0.0684043, 0.1162414, 9.896161] };
    expect(dispersion(silica, 587.56).n).toBeCloseTo(1.4585, 4);
    expect(dispersion({ model: 'cauchy', A: 1.45, B: 0.0036, C: 0 }, 600).n).toBeCloseTo(1.45 + 0.0036 / 0.36, 12);
    const table = dispersion({ model: 'table', points: [[400, 2.0, 0.01], [600, 1.9, 0]] }, 450);
    expect(table.n).toBeCloseTo(1.975, 12);
    expect(table.k).toBeCloseTo(0.0075, 12);
    expect(() => dispersion({ model: 'table', points: [[400, 2.0, 0], [600, 1.9, 0]] }, 700)).toThrow(/outside the table/);
  });
});
