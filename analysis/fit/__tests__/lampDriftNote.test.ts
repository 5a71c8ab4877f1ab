import { describe, expect, it } from 'vitest';
import { LAMP_SHARE_NAMED, lampDriftNote, type LampDriftShare } from '../lampDriftNote';

const layer = (n: number, sigmaD: number, shiftD: number, sigmaN: number, shiftN: number, indexHeld = false): LampDriftShare => ({
  layer: n, thicknessSigmaNm: sigmaD, indexSigma: sigmaN, indexHeld, shift: { index: shiftN, thicknessNm: shiftD, opticalNm: 0 },
});

describe('the note on a held lamp drift that makes up most of a layer\'s σ', () => {
  it('names each figure whose σ² the drift\'s shift squared is more than half of, with its share', () => {
    // layer 3: (0.9/1)² = 81 % of thickness, (0.001/0.002)² = 25 % of index; layer 4: 100 % (capped) and 64 %
    const note = lampDriftNote([layer(1, 1, 0.1, 0.01, 0.001), layer(3, 1, 0.9, 0.002, 0.001), layer(4, 1, 1.2, 0.01, 0.008)], 0, 0.01)!;
    expect(note).toMatch(/^lamp drift assumed: /);
    expect(note).toContain('held at 0.00 %/h with an assumed stability of ±1.00 %/h');
    expect(note).toContain('layer 3 (thickness 81 %), layer 4 (thickness ≥ 99 %, index 64 %)');
    expect(note).not.toContain('layer 1');
    expect(note).toContain('"Lamp stability, %/h"');
  });

  it('names six layers at most and counts the rest', () => {
    const note = lampDriftNote(Array.from({ length: 9 }, (_, i) => layer(i + 1, 1, 0.8, 0.01, 0)), 0, 0.01)!;
    expect(note).toContain('layer 6 (thickness 64 %), 3 more layers;');
    expect(note).not.toContain('layer 7');
  });

  it('says nothing where no figure passes the threshold, and leaves out a held index', () => {
    const just = Math.sqrt(LAMP_SHARE_NAMED) * 0.999;
    expect(lampDriftNote([layer(2, 1, just, 0.01, 0.01 * just)], 0, 0.01)).toBeNull();
    expect(lampDriftNote([layer(1, 1, 0.1, 0.01, 0.0099, true)], 0, 0.01)).toBeNull();
    expect(lampDriftNote([], 0, 0.01)).toBeNull();
    // a σ of 0 or a shift that is not a number names nothing
    expect(lampDriftNote([layer(1, 0, 0.1, 0.01, NaN)], 0, 0.01)).toBeNull();
  });
});
