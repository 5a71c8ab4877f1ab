import { describe, expect, it } from 'vitest';
import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { wanderKnots, wanderThickness, type RateWander } from '../rateWander';
import { wanderErrorVariances } from '../wanderSigma';
import { createRng } from '../../synth';
import { fromNK, growingLayerSignal } from '../../optics';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 550, mode: 'T' };
const rate = 0.3, durationS = 260;
// 2 % of the rate, 20 s correlation: the wander the plain law cannot follow
const wander: RateWander = { knotsS: wanderKnots(durationS, 20), sigmaNmPerS: 0.02 * rate, correlationS: 20, pointSigma: 1 };

describe('a wander the plain law does not follow, as variance of the figures (fit/wanderSigma.ts)', () => {
  // Monte Carlo against the linear propagation: layers grown with wanders drawn from the prior
  // (v unit normal), each fitted with d = r·τ + a·τ²/2; the scatter of the end thickness's error
  // must match the fit's own σ² plus the propagated wander variance, and not the fit's σ² alone.
  // The prediction is the variance of a linear function of a random vector, J·G·Jᵀ (C. R. Rao, "Linear
  // Statistical Inference and its Applications", Wiley (1973), §1b.2, from memory), with the knots'
  // Ornstein–Uhlenbeck prior (G. E. Uhlenbeck, L. S. Ornstein, Phys. Rev. 36, 823 (1930)).
  it('the end thickness\'s error variance over 60 draws matches σ² + Σ_k e_k²', () => {
    const rng = createRng(7);
    const tauS = Float64Array.from({ length: 521 }, (_, i) => i * 0.5);
    let errors2 = 0, predicted = 0, own = 0;
    const draws = 60;
    for (let s = 0; s < draws; s++) {
      const v = Float64Array.from(wander.knotsS, () => rng.normal());
      const d = tauS.map((t) => rate * t + wanderThickness(wander, v, t));
      const y = growingLayerSignal({ ...optics, below: [], growing: fromNK(2.1) }, d).map((m) => 0.9 * m + 1e-4 * rng.normal());
      const layer: FitLayerData = { optics, nominalAt: () => fromNK(2.1), tauS, y, durationS, extinction: 0, heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0 };
      const fit = fitLayers({ fixedBelow: [], layers: [layer], start: [{ index: 2.1, rateNmPerS: rate, rateDriftNmPerS2: 0, gain: 0.9 }], offsetSignal: 0 });
      const e = fit.layers[0];
      errors2 += (e.thicknessNm - d[d.length - 1]) ** 2;
      own += e.thicknessSigmaNm ** 2;
      predicted += e.thicknessSigmaNm ** 2 + wanderErrorVariances([], [layer], fit, 0, [wander], null)![0].thicknessNm2;
    }
    console.log(`end thickness error: RMS ${Math.sqrt(errors2 / draws).toFixed(3)} nm, predicted ${Math.sqrt(predicted / draws).toFixed(3)}, fit's own σ ${Math.sqrt(own / draws).toFixed(3)}`);
    // Measured: RMS 0.244 nm against 0.275 predicted (σ alone 0.154: its residual scaling takes up
    // part of the misfit, not the wander's share at the end). The sample variance of 60 draws is
    // within ±18 % (1σ) of its expectation.
    expect(errors2 / predicted).toBeGreaterThan(0.5);
    expect(errors2 / predicted).toBeLessThan(2);
    expect(errors2 / own).toBeGreaterThan(2);
  });
});
