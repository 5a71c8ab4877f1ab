import { describe, expect, it } from 'vitest';
import { adoptIndex } from '../adoptIndex';
import { indexAt } from '../indexAt';

describe('adoptIndex', () => {
  it('moves a Cauchy model to the fitted index at the monitor wavelength and keeps its dispersion', () => {
    const before = { model: 'cauchy', A: 1.45, B: 0.0036, C: 0, k: 0 } as const;
    const after = adoptIndex(before, 550, 1.47);
    expect(indexAt(after, 550).re).toBeCloseTo(1.47, 12);
    // n(450) − n(650) is unchanged: only A moves.
    expect(indexAt(after, 450).re - indexAt(after, 650).re).toBeCloseTo(indexAt(before, 450).re - indexAt(before, 650).re, 12);
  });

  it('sets a constant, shifts a table, and refuses a Sellmeier model', () => {
    expect(adoptIndex({ model: 'constant', n: 2.1, k: 0 }, 600, 2.05)).toEqual({ model: 'constant', n: 2.05, k: 0 });
    const table = adoptIndex({ model: 'table', points: [[400, 1.5, 0], [800, 1.4, 0]] }, 600, 1.5);
    expect(table).toEqual({ model: 'table', points: [[400, 1.55, 0], [800, 1.45, 0]] });
    expect(() => adoptIndex({ model: 'sellmeier', B: [1], C: [0.1] }, 600, 1.5)).toThrow('a Sellmeier model has no additive term');
    expect(() => adoptIndex({ model: 'table', points: [[400, 1.5, 0], [800, 1.4, 0]] }, 900, 1.5)).toThrow('outside the material');
  });
});
