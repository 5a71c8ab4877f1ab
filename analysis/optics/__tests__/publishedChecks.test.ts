import { describe, expect, it } from 'vitest';
import { assemblyMatrix, fromNK, layerMatrix, multiply, stackResponse, tilt, type LayerAt, type StackAt } from '..';

const air = fromNK(1);
const qw = (n: number, wl: number): LayerAt => ({ n: fromNK(n), thicknessNm: wl / (4 * n) });

describe('quarter-wave reflector (HL)^p H (Macleod, Thin-Film Optical Filters, ch. 6, quarter-wave stacks)', () => {
  const nH = 2.35, nL = 1.38, ns = 1.52, wl = 550;
  const stackOf = (p: number): StackAt => {
    const layers: LayerAt[] = [];
    for (let i = 0; i < p; i++) layers.push(qw(nH, wl), qw(nL, wl));
    layers.push(qw(nH, wl));
    return { ambient: air, substrate: fromNK(ns), layers };
  };
  for (const p of [3, 5, 7]) {
    it(`p = ${p}: R = ((1 − (nH/nL)^(2p)·nH²/ns)/(1 + (nH/nL)^(2p)·nH²/ns))²`, () => {
      const y = (nH / nL) ** (2 * p) * (nH * nH) / ns;
      const expected = ((1 - y) / (1 + y)) ** 2;
      expect(stackResponse(stackOf(p), wl).R).toBeCloseTo(expected, 12);
    });
  }

  it('stop-band half-width Δg = (2/π)·arcsin((nH − nL)/(nH + nL)) in g = λ0/λ: the period matrix |½ tr M| = 1 at the edges', () => {
    const dg = (2 / Math.PI) * Math.asin((nH - nL) / (nH + nL));
    // ½ trace of one HL period at g = λ0/λ (normal incidence)
    const halfTrace = (g: number) => {
      const lam = wl / g;
      const h = layerMatrix(new Float64Array(8), fromNK(nH), fromNK(nH), wl / (4 * nH), lam);
      const l = layerMatrix(new Float64Array(8), fromNK(nL), fromNK(nL), wl / (4 * nL), lam);
      const m = multiply(new Float64Array(8), h, l);
      return (m[0] + m[6]) / 2;
    };
    const bisect = (a: number, b: number) => {
      for (let i = 0; i < 200; i++) {
        const c = (a + b) / 2;
        if ((halfTrace(a) + 1) * (halfTrace(c) + 1) <= 0) b = c;
        else a = c;
      }
      return (a + b) / 2;
    };
    expect(bisect(0.5, 1)).toBeCloseTo(1 - dg, 9);
    expect(bisect(1, 1.5)).toBeCloseTo(1 + dg, 9);
  });

  it('the half-reflectance edges of the computed spectrum close in on g = 1 ± Δg as the stack grows (to 0.5 % of Δg at p = 80)', () => {
    const dg = (2 / Math.PI) * Math.asin((nH - nL) / (nH + nL));
    const edge = (p: number, dir: 1 | -1) => {
      const s = stackOf(p);
      const R = (g: number) => stackResponse(s, wl / g).R - 0.5;
      // walk out from well inside the band (R > 0.999 at 0.9 Δg, next test) to the first drop
      // below 50 %, in steps finer than the narrow first side-lobe dip of long stacks; bisect that step
      const step = dir * 1e-4 * dg;
      let a = 1 + 0.9 * dir * dg;
      while (R(a + step) > 0) a += step;
      let b = a + step;
      for (let i = 0; i < 40; i++) {
        const c = (a + b) / 2;
        if (R(c) > 0) a = c;
        else b = c;
      }
      return Math.abs((a + b) / 2 - 1) / dg;
    };
    const excess = [15, 25, 40, 80].map((p) => edge(p, 1) - 1);
    for (let i = 1; i < excess.length; i++) expect(excess[i]).toBeLessThan(excess[i - 1]);
    expect(Math.abs(edge(80, 1) - 1)).toBeLessThan(0.005);
    expect(Math.abs(edge(80, -1) - 1)).toBeLessThan(0.005);
  });

  it('the computed reflectance of a 25-period stack is high inside g = 1 ± Δg and falls outside', () => {
    const dg = (2 / Math.PI) * Math.asin((nH - nL) / (nH + nL));
    const s = stackOf(25);
    for (const f of [-0.9, -0.5, 0, 0.5, 0.9]) expect(stackResponse(s, wl / (1 + f * dg)).R).toBeGreaterThan(0.999);
    for (const f of [-1.15, 1.15]) expect(stackResponse(s, wl / (1 + f * dg)).R).toBeLessThan(0.9);
  });
});

describe('half-wave layers are absent at their wavelength (Macleod, ch. 2)', () => {
  it('for any index, on any stack, in R, T and phase', () => {
    const below: LayerAt[] = [{ n: fromNK(2.1, 0.01), thicknessNm: 71 }, { n: fromNK(1.46), thicknessNm: 23 }];
    const base: StackAt = { ambient: air, substrate: fromNK(1.52), layers: below };
    const without = stackResponse(base, 633, { pol: 's' });
    for (const n of [1.38, 1.9, 2.6]) {
      const withHw = stackResponse({ ...base, layers: [...below, { n: fromNK(n), thicknessNm: 633 / (2 * n) }] }, 633, { pol: 's' });
      expect(withHw.R).toBeCloseTo(without.R, 12);
      expect(withHw.T).toBeCloseTo(without.T, 12);
      expect(Math.cos(withHw.phaseRad - without.phaseRad)).toBeCloseTo(1, 12);
    }
  });

  it('also at oblique incidence when the layer is a half-wave of n·cosθ', () => {
    const n0sin = Math.sin((40 * Math.PI) / 180);
    const n = fromNK(1.7);
    const nCos = tilt(n, n0sin, 's').nCos.re;
    const base: StackAt = { ambient: air, substrate: fromNK(1.52), layers: [{ n: fromNK(2.3), thicknessNm: 60 }] };
    for (const pol of ['s', 'p'] as const) {
      const a = stackResponse(base, 600, { angleDeg: 40, pol });
      const b = stackResponse({ ...base, layers: [...base.layers, { n, thicknessNm: 600 / (2 * nCos) }] }, 600, { angleDeg: 40, pol });
      expect(b.R).toBeCloseTo(a.R, 12);
    }
  });
});

describe('Fresnel equations (Born & Wolf, Principles of Optics §1.5.2; Hecht, Optics §4.6)', () => {
  it('glass 1.52 at 45°: Rs = 9.673 %, Rp = 0.936 % (4 significant figures as published), and the exact formulas to 1e-12', () => {
    const t0 = Math.PI / 4, t1 = Math.asin(Math.sin(t0) / 1.52);
    const rs = ((Math.cos(t0) - 1.52 * Math.cos(t1)) / (Math.cos(t0) + 1.52 * Math.cos(t1))) ** 2;
    const rp = ((1.52 * Math.cos(t0) - Math.cos(t1)) / (1.52 * Math.cos(t0) + Math.cos(t1))) ** 2;
    const s = stackResponse({ ambient: air, substrate: fromNK(1.52), layers: [] }, 500, { angleDeg: 45, pol: 's' });
    const p = stackResponse({ ambient: air, substrate: fromNK(1.52), layers: [] }, 500, { angleDeg: 45, pol: 'p' });
    expect(s.R).toBeCloseTo(rs, 12);
    expect(p.R).toBeCloseTo(rp, 12);
    expect(s.R * 100).toBeCloseTo(9.673, 3);
    expect(p.R * 100).toBeCloseTo(0.936, 3);
    expect(stackResponse({ ambient: air, substrate: fromNK(1.52), layers: [] }, 500, { angleDeg: 45 }).R).toBeCloseTo((rs + rp) / 2, 12);
  });

  it('Rp rises again on both sides of Brewster arctan(1.52) = 56.66°', () => {
    const b = (Math.atan(1.52) * 180) / Math.PI;
    const r = (a: number) => stackResponse({ ambient: air, substrate: fromNK(1.52), layers: [] }, 500, { angleDeg: a, pol: 'p' }).R;
    expect(b).toBeCloseTo(56.66, 2);
    expect(r(b)).toBeLessThan(1e-15);
    expect(r(b - 1)).toBeGreaterThan(1e-5);
    expect(r(b + 1)).toBeGreaterThan(1e-5);
  });

  it('a quarter-wave at normal incidence: the assembly matrix is [[0, i/n], [i n, 0]] (Macleod eq. 2.106 with δ = π/2)', () => {
    const m = assemblyMatrix([qw(1.38, 550)], 550, 0, 's');
    expect(Array.from(m).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([0, 0, 0, 1 / 1.38, 0, 1.38, 0, 0].map((v) => Math.round(v * 1e12) / 1e12));
  });
});

describe('normal incidence', () => {
  it('s, p and their mean coincide, phase included, for an absorbing stack', () => {
    const stack: StackAt = { ambient: air, substrate: fromNK(1.52), layers: [{ n: fromNK(2.2, 0.1), thicknessNm: 40 }, { n: fromNK(1.45), thicknessNm: 90 }] };
    const s = stackResponse(stack, 520, { pol: 's' });
    const p = stackResponse(stack, 520, { pol: 'p' });
    const m = stackResponse(stack, 520);
    expect(p.R).toBeCloseTo(s.R, 14);
    expect(p.T).toBeCloseTo(s.T, 14);
    expect(p.phaseRad).toBeCloseTo(s.phaseRad, 14);
    expect(m).toEqual(s);
  });

  it('at oblique incidence the mean is the average of s and p', () => {
    const stack: StackAt = { ambient: air, substrate: fromNK(1.52), layers: [{ n: fromNK(2.2, 0.1), thicknessNm: 40 }] };
    const s = stackResponse(stack, 520, { pol: 's', angleDeg: 30 });
    const p = stackResponse(stack, 520, { pol: 'p', angleDeg: 30 });
    const m = stackResponse(stack, 520, { angleDeg: 30 });
    expect(m.R).toBeCloseTo((s.R + p.R) / 2, 14);
    expect(s.R).not.toBeCloseTo(p.R, 3);
    expect(m.phaseRad).toBeNaN();
  });
});
