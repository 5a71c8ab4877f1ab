import { describe, expect, it } from 'vitest';
import { cutWarning } from '../cutWarning';

describe('cutWarning', () => {
  it('says nothing within the threshold, and names the miss plainly where it is beyond 2σ', () => {
    expect(cutWarning(1.9, 0.5, 2, 520)).toBeNull();
    expect(cutWarning(-2, 0.5, 2, 520)).toBeNull();
    expect(cutWarning(6.1, 0.4, 2, 550)).toBe('cut thick (overshoot) by 6.1 % of a quarter-wave at 550 nm');
    expect(cutWarning(-2.5, 1.2, 2, 520)).toBe('cut thin (undershoot) by 2.5 % of a quarter-wave at 520 nm');
  });

  it('gives the σ and says the miss is not established where the error is within 2σ of zero', () => {
    const w = cutWarning(-2.3, 2.7, 2, 520)!;
    expect(w.startsWith('cut thin (undershoot) by 2.3 % of a quarter-wave at 520 nm')).toBe(true);
    expect(w).toContain('± 2.7 %');
    expect(w).toContain('do not establish');
    // exactly 2σ still counts as within
    expect(cutWarning(3, 1.5, 2, 520)).toContain('do not establish');
  });

  it('without a usable σ, the plain warning', () => {
    expect(cutWarning(3, NaN, 2, 520)).toBe('cut thick (overshoot) by 3.0 % of a quarter-wave at 520 nm');
    expect(cutWarning(3, 0, 2, 520)).toBe('cut thick (overshoot) by 3.0 % of a quarter-wave at 520 nm');
  });
});
