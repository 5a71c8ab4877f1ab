import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth';
import { sharedWander, sharedWanderCosts, wanderAtShared } from '../pooledWander';
import { chooseRateWander, type WanderChoice } from '../wanderChoice';
import { plainFit, wanderingLayer } from './wanderLayers';


/** −2·log L per candidate: the plain law at `plain`, the wander of 1 % at `wandered`. */
const scores = (plain: number, wandered: number, scale2 = 1): WanderChoice['scores'] => [
  { fraction: 0, correlationS: 20, score: plain, scale2: 1 },
  { fraction: 0.01, correlationS: 20, score: wandered, scale2 },
];

/** A wandering layer (wanderLayers.ts: OU wander of `fraction`, 15 s, lock-in noise): its plain fit and its wander choice. */
function choiceOn(fraction: number, seed: number): WanderChoice {
  const { tauS, y, data } = wanderingLayer(fraction, createRng(seed));
  const plain = plainFit(data);
  return chooseRateWander({ below: [], layer: data, estimate: plain.layers[0], offsetSignal: 0, gainPriorSigma: 0, allTauS: tauS, allY: y });
}

describe('sharedWander', () => {
  // Independent layers: their −2·log likelihoods add; the shared scale is kept past AIC's margin
  // of 2 for its one hyperparameter (H. Akaike, IEEE Trans. Autom. Control 19, 716–723 (1974)).
  it('adds the layers\' scores and keeps the wander past AIC\'s margin on the sum', () => {
    // each layer alone 1.5 better with the wander (below the margin), together 3
    expect(sharedWander([scores(0, -1.5), scores(10, 8.5)])).toEqual({ fraction: 0.01, correlationS: 20 });
    // together 1.9: not past 2
    expect(sharedWander([scores(0, -1), scores(10, 9.1)])).toBeNull();
    // one layer says nothing of a shared scale; no scores, nothing
    expect(sharedWander([scores(0, -10)])).toBeNull();
    expect(sharedWander([[], []])).toBeNull();
    // a candidate one layer did not score is not compared
    expect(sharedWander([scores(0, -5), [{ fraction: 0, correlationS: 20, score: 3, scale2: 1 }]])).toBeNull();
  });

  it('builds each layer\'s wander from its own rate and noise scale', () => {
    const w = wanderAtShared({ fraction: 0.01, correlationS: 20 }, scores(0, -3, 1.21), 0.5, 200, 0.002)!;
    expect(w.sigmaNmPerS).toBeCloseTo(0.01 * 0.5 * 1.1, 12);
    expect(Array.from(w.knotsS)).toEqual(Array.from({ length: 11 }, (_, i) => 20 * i));
    expect(wanderAtShared({ fraction: 0.02, correlationS: 20 }, scores(0, -3), 0.5, 200, 0.002)).toBeNull();
  });

  it('costs only the layers of a material whose own choice kept none', () => {
    const ev = (material: string, own: boolean, s: WanderChoice['scores']) => ({
      material, scores: s, rateNmPerS: 0.4, durationS: 100, pointSigma: 1, own, cost: (w: { sigmaNmPerS: number }) => w.sigmaNmPerS,
    });
    const out = sharedWanderCosts([ev('H', true, scores(0, -4)), ev('H', false, scores(0, -1)), ev('L', false, scores(0, -1)), ev('L', false, scores(0, 1))]);
    expect(out[0]).toBeNull();
    expect(out[1]).toBeCloseTo(0.004, 12);
    expect(out.slice(2)).toEqual([null, null]);
  });

  // Synthesised layers: a 1 % wander most single layers do not show past the margin, which eight
  // layers together do; eight steady layers under the same noise show none.
  it('tells a 1 % wander from eight layers that mostly do not show it alone, and none in steady ones', () => {
    const wandering = [21, 22, 23, 24, 25, 26, 27, 28].map((seed) => choiceOn(0.01, seed));
    const steady = [31, 32, 33, 34, 35, 36, 37, 38].map((seed) => choiceOn(0, seed));
    const alone = wandering.filter((c) => c.wander).length;
    console.log(`1 % wander: ${alone} of 8 layers chose it alone; shared ${JSON.stringify(sharedWander(wandering.map((c) => c.scores)))}`);
    expect(alone).toBeLessThanOrEqual(4);
    expect(sharedWander(wandering.map((c) => c.scores))?.fraction).toBeGreaterThan(0);
    expect(sharedWander(steady.map((c) => c.scores))).toBeNull();
  });
});
