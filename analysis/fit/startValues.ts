import { fromNK, growingLayerSignalFor, type LayerAt } from '../optics';
import { type MonitorOptics } from './layerModel';

export interface StartGridInput {
  optics: MonitorOptics;
  below: readonly LayerAt[];
  extinction: number;
  tauS: ArrayLike<number>;
  y: ArrayLike<number>;
  offsetSignal: number;
  /** The index to start from (the material's nominal, or a held value). */
  index: number;
  /** Search the index too (±0.08 around `index`). */
  searchIndex: boolean;
  /** A held gain; otherwise the gain is solved for at each grid point. */
  gain?: number;
  /** Rate implied by the design thickness over the layer's duration, nm/s. */
  rateGuessNmPerS: number;
}

export interface StartGridResult {
  index: number;
  rateNmPerS: number;
  gain: number;
  ssr: number;
}

/**
 * A coarse search over rate (±35 % of the guess, 1 % steps), then index (±0.08), then rate
 * (0.125 % steps), with the gain solved in
 * closed form for each point (linear least squares), so the nonlinear fit starts on the right
 * fringe order even after an overshoot or a slow rate.
 */
export function startValues(input: StartGridInput): StartGridResult {
  const { optics, below, extinction, tauS, y, offsetSignal } = input;
  const n = tauS.length;
  const d = new Float64Array(n), m = new Float64Array(n);
  let best: StartGridResult = { index: input.index, rateNmPerS: input.rateGuessNmPerS, gain: 1, ssr: Infinity };
  // the model's set-up once per index (the rate scans keep it)
  const signalAt = new Map<number, (d: Float64Array, out: Float64Array) => Float64Array>();
  const tryPoint = (index: number, rate: number) => {
    let signal = signalAt.get(index);
    if (!signal) signalAt.set(index, (signal = growingLayerSignalFor({ ...optics, below, growing: fromNK(index, extinction), pol: 's' })));
    for (let i = 0; i < n; i++) d[i] = rate * tauS[i];
    signal(d, m);
    let sym = 0, smm = 0;
    for (let i = 0; i < n; i++) {
      sym += (y[i] - offsetSignal) * m[i];
      smm += m[i] * m[i];
    }
    const gain = input.gain ?? sym / smm;
    let ssr = 0;
    for (let i = 0; i < n; i++) {
      const r = y[i] - offsetSignal - gain * m[i];
      ssr += r * r;
    }
    if (ssr < best.ssr) best = { index, rateNmPerS: rate, gain, ssr };
  };
  // Rate at the nominal index (1 % steps), then the index at that rate, then the rate finer.
  for (let step = -35; step <= 35; step++) tryPoint(input.index, input.rateGuessNmPerS * (1 + step / 100));
  if (input.searchIndex) for (const dn of [-0.08, -0.06, -0.04, -0.02, 0.02, 0.04, 0.06, 0.08]) tryPoint(input.index + dn, best.rateNmPerS);
  const coarse = best.rateNmPerS;
  for (let step = -8; step <= 8; step++) if (step !== 0) tryPoint(best.index, coarse * (1 + step / 800));
  return best;
}
