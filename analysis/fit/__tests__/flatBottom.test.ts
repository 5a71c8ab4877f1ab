import { describe, expect, it } from 'vitest';
import { flatBottom } from '../calibrateChip';

// The dark moment of a chip change read at its flat bottom (calibrateChip's darkLevels): the
// readings below are the chamber simulator's (tests/chamber), the real-chamber mirror with a 4–6 s
// dark moment logged once a second, seed 23, chip 2 (true offset 0.0030), and at 10 Hz, seed 28.
describe('flatBottom: a dip\'s bottom without its sloping sides', () => {
  it('a 1 Hz dip of two dark readings between two sides (an even count: its median is halfway up a side)', () => {
    const y = [0.3082, 0.1036, 0.0032, 0.0035, 0.3135, 0.9316];
    const l = flatBottom(y, 1, 5, 0.00119);
    expect([l.start, l.end]).toEqual([2, 4]);
    expect(l.mean).toBeCloseTo(0.00335, 6);
  });

  it('a 10 Hz bottom with one sample of its side', () => {
    const l = flatBottom([0.104, 0.003, 0.0031, 0.0029], 0, 4, 0.0006);
    expect([l.start, l.end]).toEqual([1, 4]);
    expect(l.mean).toBeCloseTo(0.003, 6);
  });

  it('a single dark reading between its sides', () => {
    const l = flatBottom([0.2, 0.0031, 0.25], 0, 3, 0.0006);
    expect([l.start, l.end, l.mean]).toEqual([1, 2, 0.0031]);
  });

  it('keeps a flat bottom whole, its noise within a few σ', () => {
    const y = [0.0030, 0.0042, 0.0021, 0.0035, 0.0027];
    const l = flatBottom(y, 0, 5, 0.0006);
    expect([l.start, l.end]).toEqual([0, 5]);
  });
});
