import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { gradientText, LayerTable, type LayerView } from '../LayerTable';

const layer = (over: Partial<LayerView>): LayerView => ({
  layer: 3, material: 'H', materialName: 'TiO2', chip: 1, wavelengthNm: 600, monitorMode: 'T', cut: 'turning-point',
  designThicknessNm: 129.6, thicknessNm: 129.7, thicknessSigmaNm: 0.1, thicknessDeltaPct: 0.08, index: 2.3144, indexSigma: 0.0004,
  indexDeviation: 0.0002, indexHeld: false, rateNmPerS: 0.25, rateSigmaNmPerS: 0.001, rateDriftNmPerS2: 0, rateDriftSigmaNmPerS2: 0,
  cutErrorQwotPct: 0.1, cutErrorSigmaQwotPct: 0.1, cutLimitQwotPct: 2, cutGrade: 'within', startTimeS: 10, cutTimeS: 530,
  idealCutTimeS: 530, cutDeltaS: 0, triggerLevel: null, residualRms: 0.0004, residualToNoise: 1.1, otherModeThicknessNm: null,
  modesDisagree: false, warnings: [], ...over,
});

describe('the layer table', () => {
  it('shows a graded layer’s index change with its σ, and a trial kept uniform as such', () => {
    const html = renderToStaticMarkup(createElement(LayerTable, {
      layers: [
        layer({ layer: 3, indexGradient: { deltaN: 0.019, sigma: 0.0014, kept: true } }),
        layer({ layer: 4, material: 'L', indexGradient: { deltaN: -0.0011, sigma: 0.0025, kept: false } }),
        layer({ layer: 5, material: 'L' }),
      ],
    }));
    expect(html).toContain('graded Δn +0.0190 ± 0.0014');
    expect(html).toContain('uniform (trial Δn −0.0011 ± 0.0025)');
    // table and phone cards each show the two trials; the layer without one shows none
    expect(html.split('Δn ')).toHaveLength(5);
  });

  it('leaves the σ out when the analysis gave none', () => {
    expect(gradientText({ deltaN: 0.005, sigma: null, kept: true })).toBe('graded Δn +0.0050');
  });
});
