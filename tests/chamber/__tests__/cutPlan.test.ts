import { describe, expect, it } from 'vitest';
import { turningPointThickness } from '../cutPlan';
import { identity } from '../chipStacks';

const media = { ambient: 1, substrate: 1.52, backside: false };
const bare = { forward: identity(), reverse: identity() };

describe("the simulator's turning-point cut", () => {
  // A non-absorbing layer on a bare substrate has its monitor extrema at every quarter-wave of
  // optical thickness, n·d = m·λ/4 (Macleod, Thin-Film Optical Filters, ch. 2: the quarter- and
  // half-wave layers); a half-wave layer returns the signal to the bare substrate's.
  it('finds a half-wave layer\'s own turning point, also when it falls exactly on the search grid', () => {
    const n = 1.38, lambda = 550;
    const halfWave = lambda / (2 * n);
    // the grid spans 1.6× the design thickness in 3000 steps, so the design thickness is a grid point
    const at = turningPointThickness({ below: bare, media, mode: 'T', n, k: 0, wavelengthNm: lambda }, halfWave);
    expect(at).toBeCloseTo(halfWave, 6);
  });

  it('finds the quarter-wave turning point from a design 3 % off it', () => {
    const n = 2.3, lambda = 600;
    const quarterWave = lambda / (4 * n);
    const at = turningPointThickness({ below: bare, media, mode: 'R', n, k: 0, wavelengthNm: lambda }, 1.03 * quarterWave);
    expect(Math.abs(at - quarterWave) / quarterWave).toBeLessThan(1e-4);
  });
});
