import { fitLayers, type FitLayerData, type MonitorOptics } from '..';
import { fromNK, growingLayerSignal } from '../../optics';
import { createRng } from '../../synth';
import { binMeans } from '../subsample';
import { type WanderChoiceRequest } from '../wanderChoiceRequest';

const optics: MonitorOptics = { ambient: fromNK(1), substrate: fromNK(1.52), backside: false, wavelengthNm: 600, mode: 'T' };
const DT = 0.1;

/** The random source the layers draw from (synth's seeded generator). */
type Rng = ReturnType<typeof createRng>;

/**
 * One quarter-wave-ish layer (n = 2.3, 0.25 nm/s, 250 s at 10 Hz, or every dtS) whose rate wanders by
 * `fraction` as an OU process with a 15 s correlation time (integrated here by the rectangle rule,
 * not by fit/rateWander's knots), under white + AR(1) noise of a lock-in (1 s): its samples, its
 * fit data on 400 bin means, and the true end thickness.
 */
export function wanderingLayer(fraction: number, rng: Rng, dtS = DT) {
  const n = Math.round(250 / dtS), rate = 0.25;
  const tauS = Float64Array.from({ length: n }, (_, i) => i * dtS);
  const d = new Float64Array(n);
  const rhoW = Math.exp(-dtS / 15);
  let w = fraction * rng.normal();
  for (let i = 1; i < n; i++) {
    d[i] = d[i - 1] + rate * (1 + w) * dtS;
    w = rhoW * w + fraction * Math.sqrt(1 - rhoW * rhoW) * rng.normal();
  }
  const m = growingLayerSignal({ ...optics, below: [], growing: fromNK(2.3), pol: 's' }, d);
  const rhoN = Math.exp(-dtS / 1);
  let x = 0.0006 * rng.normal();
  const y = m.map((v) => {
    x = rhoN * x + 0.0006 * Math.sqrt(1 - rhoN * rhoN) * rng.normal();
    return v + x + 0.0003 * rng.normal();
  });
  const bins = binMeans(tauS, Int32Array.from({ length: n }, (_, i) => i), y, 400);
  const data: FitLayerData = {
    optics, nominalAt: () => fromNK(2.3), tauS: bins.tauS, y: bins.y, durationS: tauS[n - 1], extinction: 0,
    heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
  };
  return { tauS, y, data, endNm: d[n - 1] };
}

/** The plain law's fit of a wandering layer, from a start near the truth. */
export function plainFit(data: FitLayerData) {
  return fitLayers({ fixedBelow: [], layers: [data], offsetSignal: 0, start: [{ index: 2.29, rateNmPerS: 0.251, rateDriftNmPerS2: 0, gain: 1 }] });
}

/**
 * Wander-choice requests for a run of such layers, one per `fraction`, from one random stream:
 * each with its plain fit's solution, as analyzeRun asks for them.
 */
export function wanderRequests(fractions: number[], seed: number): WanderChoiceRequest[] {
  const rng = createRng(seed);
  return fractions.map((fraction) => {
    const { tauS, y, data } = wanderingLayer(fraction, rng);
    const plain = plainFit(data);
    const { nominalAt: _n, ...sent } = data;
    return {
      below: [], layer: sent, material: { model: 'constant', n: 2.3 }, estimate: plain.layers[0], offsetSignal: 0, gainPriorSigma: 0, allTauS: tauS, allY: y,
    };
  });
}
