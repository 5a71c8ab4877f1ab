import { describe, expect, it } from 'vitest';
import { type FitLayerData } from '../layerModel';
import { turningPointEndSigma } from '../turningPointEnd';

const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: false, wavelengthNm: 600, mode: 'T' as const };
const qw = (n: number) => 600 / (4 * n);
const at = (n: number, thicknessNm = qw(n)) => ({ n: { re: n, im: 0 }, thicknessNm });

function layer(index: number): FitLayerData {
  return {
    optics, nominalAt: () => ({ re: index, im: 0 }), tauS: new Float64Array([0, 200]), y: new Float64Array(2), durationS: 200, extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
}

/**
 * The turning point of a layer on a bare substrate lies at a quarter-wave, n·d = λ/4 (H. A.
 * Macleod, Thin-Film Optical Filters, ch. 2; from memory), so d_TP = λ/(4n): ∂d/∂n = −λ/(4n²)
 * and n·d does not move. On a quarter-wave of nₐ over Y₀ a layer of n_b turns earlier by
 * c = nₐ²(nₐ²/Y₀² − 1)/(nₐ⁴/Y₀² − n_b²) nm per nm more of the layer below (the same admittance
 * argument to first order, derived in turningPointExcess.test.ts).
 */
const compensation = (na: number, nb: number, y0: number) => (na ** 2 * (na ** 2 / y0 ** 2 - 1)) / (na ** 4 / y0 ** 2 - nb ** 2);

describe("σ of a thickness placed on the layer's turning point", () => {
  it('on a bare chip: the index alone, σ_d = λ·σ_n/(4n²), n·d fixed at λ/4', () => {
    const sigma = turningPointEndSigma(layer(1.38), 1.38, 0.003, [], [], qw(1.38))!;
    expect(sigma.thicknessNm / ((600 * 0.003) / (4 * 1.38 ** 2))).toBeCloseTo(1, 2);
    expect(sigma.opticalThicknessNm).toBeLessThan(0.02);
  });

  it("on a quarter-wave below: that layer's thickness σ times the compensation, the inputs added in quadrature", () => {
    const c = compensation(2.3, 1.46, 1.52);
    const below = turningPointEndSigma(layer(1.46), 1.46, 0, [at(2.3)], [{ thicknessNm: 0.5, index: 0 }], qw(1.46))!;
    expect(below.thicknessNm / (c * 0.5)).toBeCloseTo(1, 1);
    const own = turningPointEndSigma(layer(1.46), 1.46, 0.004, [at(2.3)], [{ thicknessNm: 0, index: 0 }], qw(1.46))!;
    const both = turningPointEndSigma(layer(1.46), 1.46, 0.004, [at(2.3)], [{ thicknessNm: 0.5, index: 0 }], qw(1.46))!;
    expect(both.thicknessNm).toBeCloseTo(Math.hypot(own.thicknessNm, below.thicknessNm), 6);
  });

  it('is null where the layer does not turn near the end', () => {
    expect(turningPointEndSigma(layer(1.46), 1.46, 0.003, [at(2.3)], [{ thicknessNm: 0.5, index: 0.01 }], qw(1.46) / 2)).toBeNull();
  });
});
