import { describe, expect, it } from 'vitest';
import { fixed, formatBytes, signed } from '../format';

describe('run-page number formatting', () => {
  it('uses a true minus sign and drops the sign of a value that rounds to zero', () => {
    expect(fixed(-1.234, 2)).toBe('−1.23');
    expect(fixed(-0.00004, 4)).toBe('0.0000');
    expect(signed(0.00004, 4)).toBe('0.0000');
    expect(signed(3.684, 2)).toBe('+3.68');
    expect(signed(-0.2, 2)).toBe('−0.20');
  });

  it('shows an en dash for a missing or non-finite value', () => {
    expect(fixed(null, 2)).toBe('–');
    expect(fixed(Number.NaN, 2)).toBe('–');
    expect(signed(Number.POSITIVE_INFINITY, 2)).toBe('–');
  });

  it('gives file sizes in B, kB and MB', () => {
    expect(formatBytes(512)).toBe('512 B');
    expect(formatBytes(30242)).toBe('29.5 kB');
    expect(formatBytes(3 * 1024 * 1024)).toBe('3.0 MB');
  });
});
