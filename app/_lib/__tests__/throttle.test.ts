import { describe, expect, it } from 'vitest';
import { lockMessage } from '../throttle';

describe('lockMessage', () => {
  it('rounds the wait up to whole minutes, at least one', () => {
    expect(lockMessage(14 * 60 * 1000 + 1)).toBe('Too many failed sign-ins for this e-mail address. Wait 15 minutes and try again, or reset your password.');
    expect(lockMessage(500)).toBe('Too many failed sign-ins for this e-mail address. Wait 1 minute and try again, or reset your password.');
    expect(lockMessage(-5)).toMatch(/Wait 1 minute /);
  });
});
