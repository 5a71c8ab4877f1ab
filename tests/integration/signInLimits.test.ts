import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { currentUser } from '@/app/_lib/auth';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { signOut } from '@/app/(app)/actions';
import { changePassword } from '@/app/(app)/account/actions';
import { CookieJar, useJar } from '../helpers/cookieJar';
import { anonymous, freshUser, form, interruptOf, signInAs, uniqueEmail } from './helpers';

afterAll(async () => {
  await closeDb();
});

const WRONG = /^E-mail or password is wrong\./;

function messageOf(r: Awaited<ReturnType<typeof signIn>>): string {
  return r.ok ? 'ok' : (r.fieldErrors?.password?.[0] ?? r.message);
}

describe('the sign-in lock-out, checked and recorded in one step', () => {
  it('lets at most five of fifteen simultaneous wrong passwords be checked, and never asks to wait more than 15 minutes', async () => {
    const { email, password } = await freshUser();
    anonymous();
    const replies = await Promise.all(Array.from({ length: 15 }, () => signIn(null, form({ email, password: 'wrong-password-1' }))));
    const messages = replies.map(messageOf);
    expect(messages.filter((m) => WRONG.test(m))).toHaveLength(5);
    const refused = messages.filter((m) => !WRONG.test(m));
    expect(refused).toHaveLength(10);
    for (const m of refused) expect(m).toMatch(/^Too many failed sign-ins for this e-mail address\. Wait (15|14) minutes/);
    // The right password waits too.
    expect(messageOf(await signIn(null, form({ email, password })))).toMatch(/^Too many failed sign-ins/);
  });

  it('counts wrong current passwords on the account page, and then pauses sign-in too', async () => {
    const { email, password } = await freshUser();
    await signInAs(email, password);
    const answers: string[] = [];
    for (let i = 0; i < 6; i++) {
      const r = await changePassword(null, form({ current: `not-my-password-${i}`, password: 'next-password-4', confirm: 'next-password-4' }));
      answers.push(r.ok ? 'ok' : (r.fieldErrors?.current?.[0] ?? r.message));
    }
    expect(answers[0]).toBe('That is not your current password. 4 tries left before a 15-minute pause.');
    expect(answers[4]).toMatch(/^That is not your current password\. Sign-in for this address is now paused for 15 minutes/);
    expect(answers[5]).toMatch(/^Too many failed sign-ins for this e-mail address\. Wait 15 minutes/);
    // Even the right current password waits now, and so does sign-in elsewhere.
    const right = await changePassword(null, form({ current: password, password: 'next-password-4', confirm: 'next-password-4' }));
    expect(right).toMatchObject({ ok: false, code: 'rate_limited:sign_in' });
    anonymous();
    expect(messageOf(await signIn(null, form({ email, password })))).toMatch(/^Too many failed sign-ins for this e-mail address/);
  });

  it('limits failed sign-ins per client address across e-mail addresses', async () => {
    const spraying = useJar(new CookieJar('203.0.113.77'));
    for (let i = 0; i < 20; i++) {
      expect(messageOf(await signIn(null, form({ email: uniqueEmail('spray'), password: 'guess-1234' })))).toMatch(WRONG);
    }
    const blocked = await signIn(null, form({ email: uniqueEmail('spray'), password: 'guess-1234' }));
    expect(blocked).toMatchObject({ ok: false, code: 'rate_limited:sign_in' });
    expect(messageOf(blocked)).toMatch(/^Too many failed sign-ins from your network address\. Wait 15 minutes/);
    // Another address is not affected.
    useJar(new CookieJar('203.0.113.78'));
    expect(messageOf(await signIn(null, form({ email: uniqueEmail('other'), password: 'guess-1234' })))).toMatch(WRONG);
    expect(spraying.address).toBe('203.0.113.77');
  });

  it('takes the address the nearest hop added: the last entry of X-Forwarded-For', async () => {
    useJar(new CookieJar('198.51.100.9, 203.0.113.90'));
    for (let i = 0; i < 20; i++) await signIn(null, form({ email: uniqueEmail('hop'), password: 'guess-1234' }));
    useJar(new CookieJar('203.0.113.90'));
    expect(messageOf(await signIn(null, form({ email: uniqueEmail('hop'), password: 'guess-1234' })))).toMatch(/from your network address/);
  });
});

describe('signing out ends the session on the server', () => {
  it('a copy of the cookie taken before signing out opens nothing afterwards', async () => {
    const { email, password } = await freshUser();
    const jar = await signInAs(email, password);
    const copy = jar.clone();
    expect(await interruptOf(() => signOut())).toEqual({ kind: 'redirect', location: '/sign-in?notice=signed-out' });
    useJar(copy);
    expect(await currentUser()).toBeNull();
    // Signing in again works.
    await signInAs(email, password);
    expect((await currentUser())?.email).toBe(email);
  });

  it('signing out with a cookie that has already ended leaves the current sessions alone', async () => {
    const { email, password } = await freshUser();
    const old = await signInAs(email, password);
    const stale = old.clone();
    await interruptOf(() => signOut());
    const fresh = await signInAs(email, password);
    useJar(stale);
    await interruptOf(() => signOut());
    useJar(fresh);
    expect((await currentUser())?.email).toBe(email);
  });
});
