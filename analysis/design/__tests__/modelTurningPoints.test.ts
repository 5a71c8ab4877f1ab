import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { modelTurningPoints } from '..';
import { fromNK } from '../../optics';
import { growingCurve } from '@/tests/chamber/chipStacks';
import { stackMatrices } from '@/tests/chamber/thinFilm';

describe('modelTurningPoints (property test against a dense brute-force scan of independent optics)', () => {
  it('finds every extremum of random absorbing stacks, in order, with the right kind', () => {
    const layer = fc.record({ n: fc.double({ min: 1.3, max: 2.6, noNaN: true }), k: fc.double({ min: 0, max: 0.05, noNaN: true }), d: fc.double({ min: 5, max: 200, noNaN: true }) });
    fc.assert(
      fc.property(fc.array(layer, { maxLength: 6 }), layer, fc.constantFrom('R' as const, 'T' as const), fc.boolean(), fc.double({ min: 50, max: 400, noNaN: true }), (below, grow, mode, backside, toNm) => {
        const spec = {
          ambient: fromNK(1), substrate: fromNK(1.52), below: below.map((l) => ({ n: fromNK(l.n, l.k), thicknessNm: l.d })),
          growing: fromNK(grow.n, grow.k), wavelengthNm: 600, mode, backside,
        };
        const found = modelTurningPoints(spec, 0, toNm);
        const n = 200_001;
        const grid = Float64Array.from({ length: n }, (_, i) => (toNm * i) / (n - 1));
        // the scan uses the chamber simulator's optics (tests/chamber), which share no code with modelTurningPoints
        const media = { ambient: 1, substrate: 1.52, backside };
        const stack = stackMatrices(below.map((l) => ({ n: l.n, k: l.k, thicknessNm: l.d })), 600);
        const y = growingCurve(stack, media, mode, grow.n, grow.k, 600, grid);
        const brute: { d: number; kind: string }[] = [];
        for (let i = 1; i < n - 1; i++) {
          if (y[i] > y[i - 1] && y[i] >= y[i + 1]) brute.push({ d: grid[i], kind: 'max' });
          else if (y[i] < y[i - 1] && y[i] <= y[i + 1]) brute.push({ d: grid[i], kind: 'min' });
        }
        const step = toNm / (n - 1);
        // extrema within a few grid steps of either end are ambiguous for the brute force; compare the rest
        const inner = (d: number) => d > 3 * step && d < toNm - 3 * step;
        const a = found.filter((p) => inner(p.thicknessNm));
        const b = brute.filter((p) => inner(p.d));
        expect(a.map((p) => p.kind)).toEqual(b.map((p) => p.kind));
        a.forEach((p, i) => expect(Math.abs(p.thicknessNm - b[i].d)).toBeLessThanOrEqual(step));
      }),
      { numRuns: 40, seed: 42 },
    );
  });

  it('returns nothing for an empty range and for a flat curve', () => {
    const spec = { ambient: fromNK(1), substrate: fromNK(1.52), below: [], growing: fromNK(1.52), wavelengthNm: 600, mode: 'R' as const };
    expect(modelTurningPoints(spec, 0, 500)).toEqual([]);
    expect(modelTurningPoints({ ...spec, growing: fromNK(2) }, 10, 10)).toEqual([]);
  });
});
