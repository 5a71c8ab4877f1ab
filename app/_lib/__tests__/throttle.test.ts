import { describe, expect, it } from 'vitest';
import { clientLockMessage, lockMessage, wrongGuessMessage } from '../throttle';

describe('lockMessage', () => {
  it('rounds the wait up to whole minutes, at least one', () => {
    expect(lockMessage(14 * 60 * 1000 + 1)).toBe('Too many failed sign-ins for this e-mail address. Wait 15 minutes and try again, or reset your password.');
    expect(lockMessage(500)).toBe('Too many failed sign-ins for this e-mail address. Wait 1 minute and try again, or reset your password.');
    expect(lockMessage(-5)).toMatch(/Wait 1 minute /);
  });

  it('never states a wait longer than the 15-minute window', () => {
    expect(lockMessage(15 * 60 * 1000 + 40)).toMatch(/Wait 15 minutes /);
    expect(clientLockMessage(16 * 60 * 1000)).toBe('Too many failed sign-ins from your network address. Wait 15 minutes and try again.');
  });
});

describe('wrongGuessMessage', () => {
  it('counts down, then says the pause has begun', () => {
    expect(wrongGuessMessage('E-mail or password is wrong.', 2)).toBe('E-mail or password is wrong. 2 tries left before a 15-minute pause.');
    expect(wrongGuessMessage('E-mail or password is wrong.', 1)).toBe('E-mail or password is wrong. 1 try left before a 15-minute pause.');
    expect(wrongGuessMessage('That is not your current password.', 0)).toBe(
      'That is not your current password. Sign-in for this address is now paused for 15 minutes; you can also reset your password.',
    );
  });
});
