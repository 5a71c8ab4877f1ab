import { describe, expect, it } from 'vitest';
import { gradeAgainst, layerTolerance, parseDesign, SHOP_DEFAULT_TOLERANCE } from '..';

const base = {
  format: 'fringelog.design/1',
  referenceWavelengthNm: 550,
  substrate: { model: 'constant', n: 1.52 },
  materials: { L: { model: 'constant', n: 1.38 } },
};
const monitor = { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' };

describe('layer tolerances', () => {
  it('takes the layer, then the design, then the shop default', () => {
    const d = parseDesign({
      ...base,
      tolerance: { thicknessPct: 1.5 },
      layers: [
        { material: 'L', qwot: 1, monitor, tolerance: { cutErrorQwotPct: 0.8 } },
        { material: 'L', qwot: 1, monitor },
      ],
    });
    expect(d.layers[0].tolerance).toEqual({ thicknessPct: 1.5, indexAbs: SHOP_DEFAULT_TOLERANCE.indexAbs, cutErrorQwotPct: 0.8 });
    expect(d.layers[1].tolerance).toEqual({ ...SHOP_DEFAULT_TOLERANCE, thicknessPct: 1.5 });
    expect(layerTolerance()).toEqual(SHOP_DEFAULT_TOLERANCE);
  });

  it('names the key of a bad limit', () => {
    expect(() => parseDesign({ ...base, layers: [{ material: 'L', qwot: 1, monitor, tolerance: { indexAbs: -1 } }] })).toThrow(/layers\[0\]\.tolerance\.indexAbs/);
    expect(() => parseDesign({ ...base, layers: [{ material: 'L', qwot: 1, monitor, tolerance: { cutError: 1 } }] })).toThrow(/layers\[0\]\.tolerance/);
  });

  it('grades within, near (from 70 % of the limit) and outside, either sign', () => {
    expect(gradeAgainst(0.5, 2)).toBe('within');
    expect(gradeAgainst(-1.4, 2)).toBe('near');
    expect(gradeAgainst(2, 2)).toBe('near');
    expect(gradeAgainst(-2.01, 2)).toBe('outside');
    expect(gradeAgainst(Number.NaN, 2)).toBe('outside');
  });
});
