import { describe, expect, it } from 'vitest';
import { cutPlan, designSpectrum, parseDesign } from '..';
import { indexAt } from '../../materials';

// The example design of shared/FORMATS.md, verbatim.
const example = JSON.parse(`{
  "format": "fringelog.design/1",
  "name": "4-layer visible AR",
  "referenceWavelengthNm": 550,
  "ambient": { "model": "constant", "n": 1.0 },
  "substrate": { "model": "constant", "n": 1.52 },
  "substrateBackside": true,
  "materials": {
    "H": { "model": "constant", "n": 2.10, "k": 0 },
    "L": { "model": "sellmeier", "B": [0.6961663, 0.4079426, 0.8974794], "C": [0.0684043, 0.1162414, 9.896161] }
  },
  "layers": [
    { "material": "H", "thicknessNm": 14.2, "monitor": { "wavelengthNm": 550, "mode": "T", "chip": 1, "cut": "level" } },
    { "material": "L", "qwot": 1.0,         "monitor": { "wavelengthNm": 550, "mode": "T", "chip": 1, "cut": "turning-point" } }
  ]
}`);

describe('the shared/FORMATS.md example design', () => {
  const d = parseDesign(example, 'FORMATS.md');
  it('parses, with L = 550/(4·n(550)) from its own Sellmeier model', () => {
    expect(d.layers[1].thicknessNm).toBeCloseTo(550 / (4 * indexAt(d.materials.L, 550).re), 12);
    expect(d.layers[1].thicknessNm).toBeCloseTo(94.18, 2);
  });
  it('plans: layer 1 starts on the bare two-face chip at 91.832 % (Macleod ch. 2) and passes no turning point', () => {
    const [l1, l2] = cutPlan(d);
    expect(l1).toMatchObject({ layer: 1, wavelengthNm: 550, mode: 'T', chip: 1, turningPoints: 0 });
    expect(l1.startSignal).toBeCloseTo(0.918318, 6);
    expect(l2.startSignal).toBe(l1.cutSignal);
    // on a 14.2 nm H layer (not a quarter-wave) silica does not turn exactly at its own quarter-wave
    expect(l2.warnings.map((w) => w.code)).toContain('cut-not-at-turning-point');
  });
  it('has a spectrum with R + T = 1 (lossless)', () => {
    const s = designSpectrum(d);
    expect(s.wavelengthNm).toHaveLength(401);
    s.R.forEach((r, i) => expect(r + s.T[i]).toBeCloseTo(1, 12));
  });
});
