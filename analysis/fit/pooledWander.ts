import { rateWander, wanderKnots, type RateWander } from './rateWander';
import { WANDER_HYPERPARAMETERS, type WanderChoice } from './wanderChoice';

/** A wander scale shared by layers: a fraction of each layer's rate, and the correlation time. */
export interface SharedWander {
  fraction: number;
  correlationS: number;
}

/**
 * The wander scale the layers of one material share, from their wander choices' scores
 * (fit/wanderChoice.ts): each score is −2·log of a layer's restricted likelihood at a candidate
 * (σ_w as a fraction of the layer's rate, correlation time), its noise scale profiled per layer;
 * the layers' data are independent given the candidate, so the scores add, and their sum is the
 * material's −2·log restricted likelihood with the scale shared (the hyperparameter of a
 * hierarchical model estimated by its marginal likelihood, i.e. empirical Bayes; e.g.
 * A. Gelman et al., "Bayesian Data Analysis", 3rd ed. (2013), §5.1, from memory). A layer's own
 * choice keeps the plain law unless the wander beats it by AIC's margin; over a material's many
 * layers a wander each shows only weakly is told. Kept, as the choice, only past AIC's margin
 * (H. Akaike, IEEE Trans. Autom. Control 19, 716–723 (1974)); null otherwise or with fewer than
 * two layers, or when a layer lacks a candidate that others scored.
 */
export function sharedWander(choices: readonly WanderChoice['scores'][]): SharedWander | null {
  const scored = choices.filter((s) => s.length > 0);
  if (scored.length < 2) return null;
  const key = (s: { fraction: number; correlationS: number }) => (s.fraction === 0 ? '0' : `${s.fraction}@${s.correlationS}`);
  const sums = new Map<string, { fraction: number; correlationS: number; score: number; layers: number }>();
  for (const scores of scored) {
    for (const s of scores) {
      const t = sums.get(key(s)) ?? { fraction: s.fraction, correlationS: s.correlationS, score: 0, layers: 0 };
      t.score += s.score;
      t.layers++;
      sums.set(key(s), t);
    }
  }
  const complete = [...sums.values()].filter((t) => t.layers === scored.length);
  const plain = complete.find((t) => t.fraction === 0);
  if (!plain) return null;
  let best = plain;
  for (const t of complete) if (t.score < best.score) best = t;
  if (!(best.fraction > 0) || !(best.score < plain.score - 2 * WANDER_HYPERPARAMETERS)) return null;
  return { fraction: best.fraction, correlationS: best.correlationS };
}

/**
 * One layer's wander at the shared scale, as its own choice would build it: σ_w the fraction of
 * its rate times its profiled noise scale there, knots one correlation time apart over
 * `durationS`; null when the layer did not score that candidate.
 */
export function wanderAtShared(shared: SharedWander, scores: WanderChoice['scores'], rateNmPerS: number, durationS: number, pointSigma: number): RateWander | null {
  const s = scores.find((c) => c.fraction === shared.fraction && c.correlationS === shared.correlationS);
  if (!s || !(s.scale2 > 0)) return null;
  return rateWander({
    knotsS: wanderKnots(durationS, shared.correlationS),
    sigmaNmPerS: shared.fraction * Math.abs(rateNmPerS) * Math.sqrt(s.scale2),
    correlationS: shared.correlationS, pointSigma,
  });
}

/** What one layer's wander choice left for the shared scale. */
export interface WanderEvidence<V = never> {
  material: string;
  scores: WanderChoice['scores'];
  rateNmPerS: number;
  durationS: number;
  pointSigma: number;
  /** The layer's own choice kept a wander (its cost is carried already). */
  own: boolean;
  /** What a wander the fit does not follow costs the layer's figures (fit/wanderSigma.ts). */
  cost?: (w: RateWander) => V | null;
}

/** Each layer's wander at its material's shared scale (sharedWander), where its own choice kept none; null for the others. */
export function sharedWanders(layers: readonly WanderEvidence<unknown>[]): (RateWander | null)[] {
  const shared = new Map<string, SharedWander | null>();
  for (const m of new Set(layers.map((l) => l.material))) shared.set(m, sharedWander(layers.filter((l) => l.material === m).map((l) => l.scores)));
  return layers.map((l) => {
    const s = shared.get(l.material);
    return l.own || !s ? null : wanderAtShared(s, l.scores, l.rateNmPerS, l.durationS, l.pointSigma);
  });
}

/** Each layer's cost of its material's shared wander, where its own choice kept none; null for the others. */
export function sharedWanderCosts<V>(layers: readonly WanderEvidence<V>[]): (V | null)[] {
  return sharedWanders(layers).map((w, j) => (w && layers[j].cost ? layers[j].cost(w) : null));
}
