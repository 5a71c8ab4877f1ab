import { describe, expect, it } from 'vitest';
import { indexAt } from '../../materials';
import { newVariogramPool } from '../../stats';
import { chooseRateWander, finishRateWander } from '../wanderChoice';
import { wanderChoiceRequest, wanderPrepBuffers, wanderPrepFromRequest } from '../wanderChoiceRequest';
import { wanderRequests } from './wanderLayers';

describe('wander choices in two parts (the pool-free one may be made on another thread)', () => {
  it('gives chooseRateWander\'s choices, the prepared parts (sent as plain data, in any order) finished in layer order on one pool', () => {
    const requests = wanderRequests([0, 0.03, 0, 0.03], 4);
    const pool = newVariogramPool();
    const whole = requests.map(({ material, layer, ...r }) => chooseRateWander({ ...r, layer: { ...layer, nominalAt: (w) => indexAt(material, w) }, noisePool: pool }));
    // prepared last first, each from a copy as another thread receives it
    const preps = requests.map((_, j) => j).reverse().map((j) => ({ j, prep: wanderPrepFromRequest(structuredClone(requests[j])) }));
    preps.sort((a, b) => a.j - b.j);
    const split = newVariogramPool();
    expect(preps.map(({ prep }) => finishRateWander(structuredClone(prep), split))).toEqual(whole);
    // the pool is read: the last layer alone on a new pool reads its noise otherwise
    expect(finishRateWander(wanderPrepFromRequest(requests[3]), newVariogramPool()).sampleSigma).not.toBe(whole[3].sampleSigma);
    expect(whole.some((c) => c.wander !== null)).toBe(true);
  });

  it('sends the layer without its nominal index function, and hands over arrays of the prep\'s own', () => {
    const [r] = wanderRequests([0], 1);
    const { material, ...rest } = r;
    const sent = wanderChoiceRequest({ ...rest, layer: { ...r.layer, nominalAt: () => { throw new Error('not sent'); } } }, material);
    expect(sent).toEqual(r);
    expect(() => structuredClone(sent)).not.toThrow();
    const prep = wanderPrepFromRequest(sent);
    const buffers = wanderPrepBuffers(prep);
    expect(new Set(buffers).size).toBe(buffers.length);
    expect(buffers[0].byteLength).toBe(prep.residuals.length * 8);
    const moved = structuredClone(prep, { transfer: buffers });
    expect(prep.residuals.length).toBe(0);
    expect(moved.candidates[0].jac.length).toBe(moved.candidates[0].np * moved.N);
  });
});
