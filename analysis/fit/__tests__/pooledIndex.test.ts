import { describe, expect, it } from 'vitest';
import { type LayerEstimate } from '../fitLayers';
import { poolIndices, type PooledIndexLayer } from '../pooledIndex';

function layer(material: string, timeS: number, index: number, indexSigma: number, eligible = true): PooledIndexLayer {
  const thicknessNm = 150 / index;
  const estimate: LayerEstimate = {
    index, indexSigma, rateNmPerS: 0.25, rateSigma: 0.001, rateDriftNmPerS2: 1e-5, rateDriftSigma: 1e-6, gain: 1, gainSigma: 0,
    thicknessNm, thicknessSigmaNm: 0.3, opticalThicknessNm: index * thicknessNm, opticalThicknessSigmaNm: 0.4, noiseCorrelation: 1,
  };
  return { material, timeS, nominalIndex: 2.3, estimate, eligible };
}

describe('poolIndices', () => {
  it('leaves a material with fewer than five eligible layers, and every ineligible layer, as it was', () => {
    const layers = [
      ...[0, 1, 2, 3].map((k) => layer('L', k * 500, 1.46 + 0.001 * k, 0.002)),
      ...[0, 1, 2, 3, 4, 5].map((k) => layer('H', k * 500 + 250, 2.3 + 0.003 * ((k * 5) % 3 - 1), 0.004)),
      layer('H', 3200, 2.33, 0.004, false),
    ];
    const out = poolIndices(layers);
    layers.forEach((l, j) => {
      if (l.material === 'L' || !l.eligible) expect(out[j]).toBe(l.estimate);
      else expect(out[j]).not.toBe(l.estimate);
    });
  });

  it('keeps each moved layer\'s optical thickness, its rates and thickness scaled by n̂/n*, σ_d/d kept', () => {
    const layers = [0, 1, 2, 3, 4, 5, 6].map((k) => layer('H', k * 600, 2.3 - 0.002 * k + (k % 2 ? 0.004 : -0.004), 0.003));
    const out = poolIndices(layers);
    out.forEach((e, j) => {
      const before = layers[j].estimate;
      const k = before.index / e.index;
      expect(e.index * e.thicknessNm).toBeCloseTo(before.opticalThicknessNm, 10);
      expect(e.opticalThicknessNm).toBe(before.opticalThicknessNm);
      expect(e.rateNmPerS).toBeCloseTo(before.rateNmPerS * k, 14);
      expect(e.rateDriftNmPerS2).toBeCloseTo(before.rateDriftNmPerS2 * k, 18);
      expect(e.thicknessSigmaNm / e.thicknessNm).toBeCloseTo(before.thicknessSigmaNm / before.thicknessNm, 14);
      // alternating ±0.004 about a line, read with σ 0.003: each pulled towards the line
      expect(Math.abs(e.index - (2.3 - 0.002 * j))).toBeLessThan(0.004);
    });
  });

  it('says in the run\'s notes which material was pooled, its trend and spread bound; nothing for a material left alone', () => {
    const layers = [
      ...[0, 1, 2].map((k) => layer('L', k * 500, 1.46, 0.002)),
      ...[0, 1, 2, 3, 4, 5].map((k) => layer('H', k * 600, 2.3 + 0.002 * (k % 2 ? 1 : -1), 0.003)),
    ];
    const notes: string[] = [];
    poolIndices(layers, notes);
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/^H: the indices of its 6 turning-point layers read together \(option pooledIndex\): [+−]0\.00\d\d from nominal at mid-run, drifting [+−]\d\.\d{4} ± \d\.\d{4} per hour, layer-to-layer spread at most \d\.\d{4} \(95 %\)/);
  });
});
