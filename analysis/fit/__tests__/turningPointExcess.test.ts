import { describe, expect, it } from 'vitest';
import { type LayerEstimate } from '../fitLayers';
import { type FitLayerData } from '../layerModel';
import { excessErrorMeanSquare, excessErrorVariance, excessMeanShiftNm, SHUTTER_CLOSE_S, TURNING_POINT_OVERSHOOT_PCT, turningPointCompensation, turningPointExcess } from '../turningPointExcess';

const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: false, wavelengthNm: 600, mode: 'T' as const };
const qw = (n: number) => 600 / (4 * n);
const at = (n: number, thicknessNm = qw(n)) => ({ n: { re: n, im: 0 }, thicknessNm });

function layer(index: number, durationS: number): FitLayerData {
  return {
    optics, nominalAt: () => ({ re: index, im: 0 }), tauS: new Float64Array([0, durationS]), y: new Float64Array(2), durationS, extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
}

const estimate = (index: number, rateNmPerS: number) => ({ index, rateNmPerS, rateDriftNmPerS2: 0, gain: 1 }) as LayerEstimate;

/**
 * A quarter-wave layer of index nₐ on a real admittance Y₀ ends at Y₁ = nₐ²/Y₀, and a layer of
 * index n_b on that turns where the admittance is real again (lossless film: H. A. Macleod,
 * Thin-Film Optical Filters, ch. 2, the admittance of a quarter-wave layer; from memory). To first
 * order, d more of the layer below moves Y₁ by −i·nₐ(Y₁/Y₀ − 1)·φ (φ = 2πnₐd/λ); the layer
 * above, whose phase moves the end by −i·n_b(n_b²/Y₁² − 1) per radian and carries an input step
 * iη to −iη·n_b²/Y₁², turns earlier by nₐ²(nₐ²/Y₀² − 1)/(nₐ⁴/Y₀² − n_b²) nm per nm (derived
 * here from the characteristic matrix; not from a source).
 */
const compensation = (na: number, nb: number, y0: number) => (na ** 2 * (na ** 2 / y0 ** 2 - 1)) / (na ** 4 / y0 ** 2 - nb ** 2);

/** A seeded uniform on [0, 1) (Park–Miller minimal standard generator). */
function uniforms(seed: number): () => number {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

describe("the excess past a turning point that a trace without a layer column does not show", () => {
  it("moves the next layer's turning point back as the characteristic matrix says (first order)", () => {
    // L (1.46) on a quarter-wave of H (2.3) on glass: 0.684 nm per nm
    const onGlass = turningPointCompensation(layer(1.46, 200), 1.46, [at(2.3)], qw(1.46));
    expect(onGlass).toBeCloseTo(compensation(2.3, 1.46, 1.52), 2);
    // deeper, on (HL)²H: Y₀ under the top H is n_L⁴·1.52/n_H⁴, and the compensation near 1 nm per nm
    const y0 = (1.46 ** 4 * 1.52) / 2.3 ** 4;
    const deep = turningPointCompensation(layer(1.46, 200), 1.46, [at(2.3), at(1.46), at(2.3), at(1.46), at(2.3)], qw(1.46));
    expect(deep).toBeCloseTo(compensation(2.3, 1.46, y0), 2);
    // H on L on glass: 0.05; H on L on (HL)²H, Y₀ under that L n_H⁶/(n_L⁴·1.52): near (n_L/n_H)² = 0.40
    const hOnL = turningPointCompensation(layer(2.3, 200), 2.3, [at(1.46)], qw(2.3));
    expect(hOnL).toBeCloseTo(compensation(1.46, 2.3, 1.52), 2);
    const y0L = 2.3 ** 6 / (1.46 ** 4 * 1.52);
    const hDeep = turningPointCompensation(layer(2.3, 200), 2.3, [at(2.3), at(1.46), at(2.3), at(1.46), at(2.3), at(1.46)], qw(2.3));
    expect(hDeep).toBeCloseTo(compensation(1.46, 2.3, y0L), 2);
  });

  it('has no compensation on a bare chip, nor where the layer does not turn near its end', () => {
    expect(turningPointCompensation(layer(1.46, 200), 1.46, [], qw(1.46))).toBeNull();
    expect(turningPointCompensation(layer(1.46, 200), 1.46, [at(2.3)], qw(1.46) / 2)).toBeNull();
  });

  it("takes the overshoot on 1 % of the layer and the growth on half the shutter's closing at the final rate, as two uniforms", () => {
    // 0.25 nm/s for 260 s: 65 nm
    const x = turningPointExcess(layer(2.3, 260), estimate(2.3, 0.25));
    expect(x.overshootMaxNm).toBeCloseTo((TURNING_POINT_OVERSHOOT_PCT / 100) * 65, 10);
    expect(x.growthMaxNm).toBeCloseTo((0.25 * SHUTTER_CLOSE_S) / 2, 10);
    // moments against a sum of two seeded uniform draws
    const u = uniforms(7);
    let m1 = 0, m2 = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      const v = x.overshootMaxNm * u() + x.growthMaxNm * u();
      m1 += v / n;
      m2 += (v * v) / n;
    }
    expect(x.meanNm).toBeCloseTo(m1, 2);
    expect(x.meanSquareNm2 / m2).toBeCloseTo(1, 2);
  });

  it("leaves the layer the mean square of c·u − v, u the excess below, v its own", () => {
    const own = turningPointExcess(layer(1.46, 206), estimate(1.46, 0.5));
    const below = turningPointExcess(layer(2.3, 260), estimate(2.3, 0.25));
    const u = uniforms(11);
    const c = 0.9;
    let m2 = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      const e = c * (below.overshootMaxNm * u() + below.growthMaxNm * u()) - (own.overshootMaxNm * u() + own.growthMaxNm * u());
      m2 += (e * e) / n;
    }
    expect(excessErrorMeanSquare(own, below, c) / m2).toBeCloseTo(1, 2);
    // on a bare chip, or below a layer whose end the data read: its own excess alone
    expect(excessErrorMeanSquare(own, null, null)).toBe(own.meanSquareNm2);
  });

  it('moves the estimate by E[v] − c·E[u] and leaves the variance of c·u − v about it', () => {
    const own = turningPointExcess(layer(1.46, 206), estimate(1.46, 0.5));
    const below = turningPointExcess(layer(2.3, 260), estimate(2.3, 0.25));
    const u = uniforms(13);
    const c = 0.9;
    let m1 = 0, m2 = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      // the truth past the turning point the fit finds: v − c·u
      const e = own.overshootMaxNm * u() + own.growthMaxNm * u() - c * (below.overshootMaxNm * u() + below.growthMaxNm * u());
      m1 += e / n;
      m2 += (e * e) / n;
    }
    expect(excessMeanShiftNm(own, below, c)).toBeCloseTo(m1, 2);
    expect(excessErrorVariance(own, below, c) / (m2 - m1 * m1)).toBeCloseTo(1, 2);
    // a uniform on [0, a] has variance a²/12: on a bare chip, the two uniforms' variances summed
    expect(excessMeanShiftNm(own, null, null)).toBe(own.meanNm);
    expect(excessErrorVariance(own, null, null)).toBeCloseTo((own.overshootMaxNm ** 2 + own.growthMaxNm ** 2) / 12, 12);
  });
});
