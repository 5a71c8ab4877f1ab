import { describe, expect, it } from 'vitest';
import { indexAt, materialLibrary, materialModelSchema, validRangeNm, type MaterialModel } from '..';

describe('indexAt: published dispersion fits', () => {
  it('fused silica n(587.6 nm) = 1.458462 (Malitson, J. Opt. Soc. Am. 55, 1205 (1965), Table/Sellmeier fit)', () => {
    const n = indexAt(materialLibrary['fused-silica'].model, 587.6);
    expect(n.re).toBeCloseTo(1.458462, 6);
    expect(n.im).toBe(-0);
  });

  it('MgF2 ordinary ray n_o(550 nm) ≈ 1.3785 (Dodge, Appl. Opt. 23, 1980 (1984); 4 digits as quoted)', () => {
    expect(indexAt(materialLibrary.MgF2.model, 550).re).toBeCloseTo(1.3785, 4);
  });

  it('N-BK7 n_d(587.56 nm) = 1.5168 (SCHOTT data sheet, from memory)', () => {
    expect(indexAt(materialLibrary['N-BK7'].model, 587.56).re).toBeCloseTo(1.5168, 4);
  });

  it('fused silica is normally dispersive across its range (n falls with wavelength)', () => {
    const m = materialLibrary['fused-silica'].model;
    let prev = Infinity;
    for (let nm = 210; nm <= 3710; nm += 50) {
      const n = indexAt(m, nm).re;
      expect(n).toBeLessThan(prev);
      prev = n;
    }
  });
});

describe('indexAt: the four models of shared/FORMATS.md', () => {
  it('constant gives N = n − ik', () => {
    expect(indexAt({ model: 'constant', n: 2.1, k: 0.003 }, 500)).toEqual({ re: 2.1, im: -0.003 });
  });

  it('cauchy is n = A + B/λ² + C/λ⁴ with λ in µm', () => {
    const n = indexAt({ model: 'cauchy', A: 1.45, B: 0.0036, C: 0.0001, k: 0.001 }, 500);
    expect(n.re).toBeCloseTo(1.45 + 0.0036 / 0.25 + 0.0001 / 0.0625, 14);
    expect(n.im).toBe(-0.001);
  });

  it('sellmeier with one term reproduces n² = 1 + Bλ²/(λ² − C²)', () => {
    const n = indexAt({ model: 'sellmeier', B: [1.2], C: [0.1] }, 600);
    expect(n.re).toBeCloseTo(Math.sqrt(1 + (1.2 * 0.36) / (0.36 - 0.01)), 14);
  });

  it('table interpolates n and k linearly and hits its nodes exactly', () => {
    const m: MaterialModel = { model: 'table', points: [[400, 2.0, 0.02], [500, 1.9, 0.0], [700, 1.8, 0.0]] };
    expect(indexAt(m, 450)).toEqual({ re: 1.95, im: -0.01 });
    expect(indexAt(m, 500).re).toBe(1.9);
    expect(indexAt(m, 700).re).toBe(1.8);
    expect(indexAt(m, 600).re).toBeCloseTo(1.85, 14);
  });
});

describe('indexAt: ranges and errors', () => {
  it('throws RangeError outside a valid range, naming the wavelength and range', () => {
    expect(() => indexAt(materialLibrary['fused-silica'].model, 200)).toThrow(
      new RangeError("wavelength 200 nm is outside the material's valid range 210–3710 nm"),
    );
    expect(() => indexAt({ model: 'table', points: [[400, 2, 0], [500, 1.9, 0]] }, 550)).toThrow(
      /550 nm is outside the material's valid range 400–500 nm/,
    );
  });

  it('rejects non-positive and non-finite wavelengths', () => {
    expect(() => indexAt({ model: 'constant', n: 1.5 }, 0)).toThrow(RangeError);
    expect(() => indexAt({ model: 'constant', n: 1.5 }, Number.NaN)).toThrow(/finite number > 0/);
  });

  it('throws at a Sellmeier resonance (n² ≤ 0) rather than return NaN', () => {
    expect(() => indexAt({ model: 'sellmeier', B: [1], C: [0.5] }, 499)).toThrow(/n² = .* at 499 nm/);
  });

  it('validRangeNm intersects a table with the declared range', () => {
    expect(validRangeNm({ model: 'table', points: [[300, 2, 0], [900, 2, 0]], validFromNm: 350 })).toEqual({ fromNm: 350, toNm: 900 });
  });
});

describe('materialModelSchema', () => {
  it('accepts every built-in material, each with a source, and evaluates it inside its range', () => {
    for (const [key, mat] of Object.entries(materialLibrary)) {
      expect(mat.name).toBe(key);
      expect(mat.source.length).toBeGreaterThan(10);
      expect(materialModelSchema.safeParse(mat.model).success).toBe(true);
      const { fromNm, toNm } = validRangeNm(mat.model);
      const mid = Number.isFinite(toNm) ? (Math.max(fromNm, 1) + toNm) / 2 : 550;
      expect(indexAt(mat.model, mid).re).toBeGreaterThanOrEqual(1);
    }
  });

  it('typical film values are labelled as such, not as published fits', () => {
    for (const key of ['SiO2', 'TiO2', 'Ta2O5', 'Nb2O5', 'HfO2', 'Al2O3', 'ZrO2']) {
      expect(materialLibrary[key].kind).toBe('typical-film');
    }
    expect(materialLibrary['fused-silica'].kind).toBe('published-fit');
    expect(materialLibrary.MgF2.kind).toBe('published-fit');
  });

  it('rejects bad models with the offending key in the issue path', () => {
    const cases: [unknown, (string | number)[]][] = [
      [{ model: 'constant', n: -1 }, ['n']],
      [{ model: 'constant', n: 1.5, kk: 0 }, []],
      [{ model: 'sellmeier', B: [1, 2], C: [0.1] }, ['C']],
      [{ model: 'table', points: [[500, 2, 0], [400, 2, 0]] }, ['points', 1, 0]],
      [{ model: 'cauchy', A: 1.5, B: 0.01, validFromNm: 800, validToNm: 400 }, ['validToNm']],
      [{ model: 'drude', n: 1 }, ['model']],
    ];
    for (const [input, path] of cases) {
      const r = materialModelSchema.safeParse(input);
      expect(r.success).toBe(false);
      expect(r.error!.issues[0].path).toEqual(path);
    }
  });
});
