import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { currentUser } from '@/app/_lib/auth';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { signOut } from '@/app/(app)/actions';
import { changePassword } from '@/app/(app)/account/actions';
import { inviteUser } from '@/app/(app)/admin/users/actions';
import { setPasswordWithToken } from '@/app/(auth)/set-password/actions';
import { useJar } from '../helpers/cookieJar';
import { anonymous, demo, form, interruptOf, lastMailId, linkIn, signInAs, signInDemo, uniqueEmail, waitForMail } from './helpers';

afterAll(async () => {
  await closeDb();
});

/** A fresh active user (invited by the admin, password set through the link). */
async function freshUser(password = 'fresh-password-42') {
  await signInDemo('admin');
  const email = uniqueEmail('fresh');
  const before = await lastMailId();
  const invited = await inviteUser(null, form({ email, name: 'Fresh Person', role: 'operator' }));
  expect(invited.ok).toBe(true);
  const mail = await waitForMail(email, /invited/i, before);
  const token = linkIn(mail.textBody).searchParams.get('token') ?? '';
  anonymous();
  expect(await interruptOf(() => setPasswordWithToken(null, form({ token, password, confirm: password })))).toEqual({
    kind: 'redirect',
    location: '/sign-in?notice=password-set',
  });
  return { email, password };
}

describe('sign-in', () => {
  it('signs each demo role in and knows who they are', async () => {
    for (const role of ['operator', 'engineer', 'supervisor', 'admin'] as const) {
      await signInDemo(role);
      const me = await currentUser();
      expect(me?.role).toBe(role);
      expect(me?.email).toBe(demo(role).email);
    }
  });

  it('accepts the e-mail in any letter case', async () => {
    const u = demo('engineer');
    await signInAs(u.email.toUpperCase(), u.password);
  });

  it('names missing fields at the field', async () => {
    anonymous();
    const r = await signIn(null, form({ email: '', password: '' }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.fieldErrors?.email).toEqual(['Enter an e-mail address.']);
    expect(r.fieldErrors?.password).toEqual(['Enter your password.']);
  });

  it('rejects a malformed e-mail address', async () => {
    anonymous();
    const r = await signIn(null, form({ email: 'not-an-address', password: 'x' }));
    expect(r.ok || r.fieldErrors?.email).toEqual(['That is not an e-mail address.']);
  });

  it('says the password is wrong and counts down, then pauses sign-in with a clear message', async () => {
    const { email, password } = await freshUser();
    anonymous();
    const messages: string[] = [];
    for (let i = 0; i < 5; i++) {
      const r = await signIn(null, form({ email, password: 'wrong-password-1' }));
      expect(r.ok).toBe(false);
      if (!r.ok) messages.push(r.fieldErrors?.password?.[0] ?? r.message);
    }
    expect(messages[0]).toBe('E-mail or password is wrong. 4 tries left before a 15-minute pause.');
    expect(messages[3]).toBe('E-mail or password is wrong. 1 try left before a 15-minute pause.');
    expect(messages[4]).toBe('E-mail or password is wrong. Sign-in for this address is now paused for 15 minutes; you can also reset your password.');
    // Even the right password waits now.
    const locked = await signIn(null, form({ email, password }));
    expect(locked.ok).toBe(false);
    if (!locked.ok) {
      expect(locked.code).toBe('rate_limited:sign_in');
      expect(locked.message).toMatch(/Wait 15 minutes and try again, or reset your password\./);
    }
    expect(await currentUser()).toBeNull();
  });

  it('gives an unknown e-mail the same answer as a wrong password', async () => {
    anonymous();
    const r = await signIn(null, form({ email: uniqueEmail('nobody'), password: 'whatever-123' }));
    expect(r.ok || r.fieldErrors?.password).toEqual(['E-mail or password is wrong. 4 tries left before a 15-minute pause.']);
  });
});

describe('sign-out and sessions', () => {
  it('signs out: the session cookie no longer identifies anyone', async () => {
    const jar = await signInDemo('operator');
    expect(await currentUser()).not.toBeNull();
    expect(await interruptOf(() => signOut())).toEqual({ kind: 'redirect', location: '/sign-in?notice=signed-out' });
    useJar(jar);
    expect(await currentUser()).toBeNull();
  });

  it('changing the password ends the other sessions, keeps this one, and retires the old password', async () => {
    const { email, password } = await freshUser();
    const other = await signInAs(email, password);
    const here = await signInAs(email, password);
    const r = await changePassword(null, form({ current: password, password: 'brand-new-pass-7', confirm: 'brand-new-pass-7' }));
    expect(r).toEqual({ ok: true, data: undefined });
    expect((await currentUser())?.email).toBe(email);
    useJar(other);
    expect(await currentUser()).toBeNull();
    useJar(here);
    anonymous();
    const old = await signIn(null, form({ email, password }));
    expect(old.ok).toBe(false);
    await signInAs(email, 'brand-new-pass-7');
  });

  it('refuses a wrong current password and weak or mismatched new ones, at the field', async () => {
    const { email, password } = await freshUser();
    await signInAs(email, password);
    const wrong = await changePassword(null, form({ current: 'not-it-at-all-1', password: 'another-pass-9', confirm: 'another-pass-9' }));
    expect(wrong.ok || wrong.fieldErrors?.current).toEqual(['That is not your current password. 4 tries left before a 15-minute pause.']);
    const weak = await changePassword(null, form({ current: password, password: 'short', confirm: 'short' }));
    expect(weak.ok || weak.fieldErrors?.password?.[0]).toBe('Use at least 10 characters.');
    const letters = await changePassword(null, form({ current: password, password: 'onlyletterspassword', confirm: 'onlyletterspassword' }));
    expect(letters.ok || letters.fieldErrors?.password).toEqual(['Add at least one digit or symbol.']);
    const differ = await changePassword(null, form({ current: password, password: 'another-pass-9', confirm: 'another-pass-8' }));
    expect(differ.ok || differ.fieldErrors?.confirm).toEqual(['The two passwords differ.']);
    // Nothing changed: the old password still signs in.
    await signInAs(email, password);
  });
});
