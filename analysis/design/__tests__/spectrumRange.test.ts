import { describe, expect, it } from 'vitest';
import { parseDesign } from '../parseDesign';
import { spectrumRange } from '../spectrumRange';

const design = (L: unknown) => parseDesign({
  format: 'fringelog.design/1', name: 'two layers', referenceWavelengthNm: 550, substrate: { model: 'constant', n: 1.52 }, substrateBackside: false,
  materials: { H: { model: 'constant', n: 2.1 }, L },
  layers: [
    { material: 'H', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
    { material: 'L', qwot: 1, monitor: { wavelengthNm: 550, mode: 'T', chip: 1, cut: 'turning-point' } },
  ],
});
const range = { fromNm: 400, toNm: 800, stepNm: 1 };

describe('the wavelengths a spectrum can be shown over', () => {
  it('is the whole range where every material has an index there', () => {
    expect(spectrumRange(design({ model: 'constant', n: 1.46 }), range)).toEqual(range);
  });

  it('is a table\'s own range, and says which material bounds it', () => {
    const r = spectrumRange(design({ model: 'table', points: [[500, 1.462, 0], [600, 1.458, 0], [700, 1.455, 0]] }), range);
    expect(r).toEqual({ fromNm: 500, toNm: 700, stepNm: 1, limitedBy: 'material "L": wavelength 400 nm is outside the material\'s valid range 500–700 nm' });
  });

  it('stops short of a Sellmeier resonance, the resonance itself included', () => {
    // n² = 1 + B·λ²/(λ² − C²) with B = 1, C = 0.52 µm is ≤ 0 for C/√2 ≤ λ < C (367.7–520 nm) and
    // infinite at λ = C.
    const r = spectrumRange(design({ model: 'sellmeier', B: [1], C: [0.52] }), range);
    expect(r?.fromNm).toBe(521);
    expect(r?.toNm).toBe(800);
    expect(r?.limitedBy).toBe('material "L": Sellmeier model gives n² = -0.4493 at 400 nm (too close to a resonance)');
  });

  it('is null where no wavelength has them all', () => {
    const table = design({ model: 'table', points: [[500, 1.462, 0], [700, 1.455, 0]] });
    expect(spectrumRange(table, { fromNm: 300, toNm: 450, stepNm: 1 })).toBeNull();
  });
});
