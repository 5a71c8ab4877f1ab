import { describe, expect, it } from 'vitest';
import { cutGrade, runCutFlag } from '../cutGrade';

describe('cut-error grades', () => {
  it('grade against the layer limit, else the shop default of 2 % QWOT', () => {
    expect(cutGrade(1.3)).toBe('within');
    expect(cutGrade(-1.5)).toBe('near'); // from 70 % of the limit
    expect(cutGrade(2.01)).toBe('outside');
    expect(cutGrade(2.5, 3)).toBe('near');
    expect(cutGrade(2.01, 3)).toBe('within');
    expect(cutGrade(Number.NaN)).toBe('outside');
  });

  it('flag a run by its worst layer, each layer against its own limit', () => {
    const layers = [
      { layer: 1, cutErrorQwotPct: 2.5 },
      { layer: 2, cutErrorQwotPct: -1.6 },
      { layer: 3, cutErrorQwotPct: 0.2 },
    ];
    expect(runCutFlag(layers)).toEqual({ grade: 'outside', layer: 1, cutErrorQwotPct: 2.5, limitQwotPct: 2 });
    // layer 1 has a wide limit of its own: the near layer 2 is now the worst
    expect(runCutFlag(layers, new Map([[1, 5]]))).toEqual({ grade: 'near', layer: 2, cutErrorQwotPct: -1.6, limitQwotPct: 2 });
    expect(runCutFlag([])).toBeNull();
  });
});
