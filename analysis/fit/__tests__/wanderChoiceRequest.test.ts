import { describe, expect, it } from 'vitest';
import { indexAt } from '../../materials';
import { newVariogramPool } from '../../stats';
import { chooseRateWander } from '../wanderChoice';
import { wanderChooser, wanderChoiceRequest } from '../wanderChoiceRequest';
import { wanderRequests } from './wanderLayers';

describe('wander choices as plain data (another thread may make them)', () => {
  it('makes each choice as chooseRateWander does, on one pool taking the layers in the order asked', () => {
    const requests = wanderRequests([0, 0.03, 0, 0.03], 4);
    const pool = newVariogramPool();
    const here = requests.map(({ material, layer, ...r }) => chooseRateWander({ ...r, layer: { ...layer, nominalAt: (w) => indexAt(material, w) }, noisePool: pool }));
    const choose = wanderChooser();
    const there = requests.map((r) => choose(structuredClone(r)));
    expect(there).toEqual(here);
    // the pool is read: the last layer alone on a new pool reads its noise otherwise
    expect(wanderChooser()(requests[3]).sampleSigma).not.toBe(there[3].sampleSigma);
  });

  it('sends the layer without its nominal index function, and the material to rebuild it', () => {
    const [r] = wanderRequests([0], 1);
    const { material, ...rest } = r;
    const sent = wanderChoiceRequest({ ...rest, layer: { ...r.layer, nominalAt: () => { throw new Error('not sent'); } } }, material);
    expect(sent).toEqual(r);
    expect(() => structuredClone(sent)).not.toThrow();
  });
});
