import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { tokenIssuedSince } from '@/db/queries/tokens';
import { listCaughtMail } from '@/db/queries/mail';
import { findUserIdByEmail, listUsers } from '@/db/queries/users';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { requestPasswordReset } from '@/app/(auth)/reset-password/actions';
import { setPasswordWithToken } from '@/app/(auth)/set-password/actions';
import SetPasswordPage from '@/app/(auth)/set-password/page';
import { changePassword } from '@/app/(app)/account/actions';
import { changeRole, inviteUser, resendInvite, setActive } from '@/app/(app)/admin/users/actions';
import { pendingAfterTasks, runAfterTasks } from '../helpers/after';
import { anonymous, demo, form, freshUser, interruptOf, lastMailId, linkIn, signInAs, signInDemo, textOf, uniqueEmail, waitForMail } from './helpers';

afterAll(async () => {
  await closeDb();
});

describe('passwords longer than bcrypt reads (72 bytes)', () => {
  const ascii73 = 'ab-1234567'.repeat(7) + 'xyz';
  const accented = 'é-ñ1ü'.repeat(11); // 55 characters, 88 bytes in UTF-8

  it('are refused at the field when chosen, counting bytes, not characters', async () => {
    expect(Buffer.byteLength(ascii73)).toBe(73);
    expect(Buffer.byteLength(accented)).toBe(88);
    const { email, password } = await freshUser();
    await signInAs(email, password);
    for (const tooLong of [ascii73, accented]) {
      const r = await changePassword(null, form({ current: password, password: tooLong, confirm: tooLong }));
      expect(r.ok || r.fieldErrors?.password).toEqual([
        'Use at most 72 bytes: 72 plain letters, digits or symbols; accented letters and other scripts take 2 to 4 bytes each.',
      ]);
    }
  });

  it('of exactly 72 bytes work, and a longer one sharing those 72 bytes does not sign in', async () => {
    const exact = 'cd-7654321'.repeat(7) + 'xy';
    expect(Buffer.byteLength(exact)).toBe(72);
    const { email } = await freshUser(exact);
    anonymous();
    const longer = await signIn(null, form({ email, password: `${exact}-and-more` }));
    expect(longer.ok || longer.fieldErrors?.password?.[0]).toMatch(/^E-mail or password is wrong\./);
    await signInAs(email, exact);
  });
});

describe('a password-reset request', () => {
  it('answers before any work on the address: the token and the mail come after the answer', async () => {
    const { email, userId } = await freshUser();
    const since = new Date(Date.now() - 1000);
    const before = await lastMailId();
    expect(await requestPasswordReset(null, form({ email }))).toEqual({ ok: true, data: { email } });
    expect(pendingAfterTasks()).toBe(1);
    expect(await tokenIssuedSince(userId, 'reset', since)).toBe(false);
    await runAfterTasks();
    expect(await tokenIssuedSince(userId, 'reset', since)).toBe(true);
    expect(linkIn((await waitForMail(email, /^Reset your Fringelog password$/, before)).textBody).pathname).toBe('/set-password');
  });

  it('does the same for an unknown address, and sends nothing', async () => {
    anonymous();
    const email = uniqueEmail('nobody-here');
    const before = await lastMailId();
    expect(await requestPasswordReset(null, form({ email }))).toEqual({ ok: true, data: { email } });
    expect(pendingAfterTasks()).toBe(1);
    await runAfterTasks();
    await new Promise((r) => setTimeout(r, 300));
    // nothing to that address (the queue's worker may mail a tolerance alert meanwhile)
    expect((await listCaughtMail(50)).filter((m) => m.id > before && m.envelopeTo.includes(email))).toEqual([]);
  });
});

describe('invitation names', () => {
  const refused = [
    ['a newline and a link', 'Eve Example\nhttps://phish.example/login'],
    ['a carriage return', 'Eve\rExample'],
    ['a tab', 'Eve\tExample'],
    ['a NUL byte', 'Eve\u0000Example'],
    ['a right-to-left override', 'Eve \u202eelpmaxE'],
    ['a zero-width space', 'Eve\u200bExample'],
    ['a line separator', 'Eve\u2028Example'],
    ['a URL on one line', 'Eve https://phish.example'],
  ] as const;

  for (const [what, name] of refused) {
    it(`refuse ${what}, at the field, and nobody is invited`, async () => {
      await signInDemo('admin');
      const email = uniqueEmail('badname');
      const r = await inviteUser(null, form({ email, name, role: 'operator' }));
      expect(r.ok || r.fieldErrors?.name).toEqual(['Use one line of letters, digits, spaces and . , ’ \' - ( ) only.']);
      expect(await findUserIdByEmail(email)).toBeUndefined();
    });
  }

  it('accept names in many scripts, with apostrophes and hyphens', async () => {
    await signInDemo('admin');
    for (const name of ['Zoë O’Brien-Ågren', 'Nguyễn Thị Hạnh', '山田 太郎', "D'Arcy (Night shift)"]) {
      const r = await inviteUser(null, form({ email: uniqueEmail('goodname'), name, role: 'operator' }));
      expect(r, name).toMatchObject({ ok: true });
    }
  });
});

describe('malformed input to actions is refused with a 4xx result, never thrown', () => {
  const tooBig = [2147483648, '99999999999999999999', -1, 0, 1.5];

  it('user ids outside PostgreSQL’s integer range', async () => {
    await signInDemo('admin');
    for (const userId of tooBig) {
      for (const r of [
        await changeRole(null, form({ userId, role: 'engineer' })),
        await setActive(null, form({ userId, active: 'false' })),
        await resendInvite(null, form({ userId })),
      ]) {
        expect(r, String(userId)).toMatchObject({ ok: false, code: 'bad_request:input' });
      }
    }
  });

  it('arguments that are not form data', async () => {
    const notForms: unknown[] = ['email=a@b.example', { email: demo('admin').email }, null, 42, ['x']];
    await signInDemo('admin');
    const count = (await listUsers()).length;
    for (const arg of notForms) {
      const bad = arg as FormData;
      const results = [
        await signIn(null, bad),
        await requestPasswordReset(null, bad),
        await setPasswordWithToken(null, bad),
        await changePassword(null, bad),
        await inviteUser(null, bad),
        await resendInvite(null, bad),
        await changeRole(null, bad),
        await setActive(null, bad),
      ];
      for (const r of results) expect(r, JSON.stringify(arg)).toMatchObject({ ok: false, code: 'bad_request:input', message: 'This request did not come from the form.' });
    }
    expect((await listUsers()).length).toBe(count);
  });

  it('a repeated token on the set-password page reads as a bad link', async () => {
    anonymous();
    const page = await interruptOf(async () => textOf(await SetPasswordPage({ searchParams: Promise.resolve({ token: ['a', 'b'] }) })));
    expect(page).toBe('returned');
    expect(textOf(await SetPasswordPage({ searchParams: Promise.resolve({ token: ['a', 'b'] }) }))).toContain('This link is not valid.');
  });
});
