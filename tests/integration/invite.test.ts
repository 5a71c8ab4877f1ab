import { afterAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { closeDb, db } from '@/db/client';
import { listAudit } from '@/db/queries/audit';
import { listUsers } from '@/db/queries/users';
import { currentUser } from '@/app/_lib/auth';
import { inviteUser, resendInvite, setActive } from '@/app/(app)/admin/users/actions';
import { requestPasswordReset } from '@/app/(auth)/reset-password/actions';
import { setPasswordWithToken } from '@/app/(auth)/set-password/actions';
import SetPasswordPage from '@/app/(auth)/set-password/page';
import { runAfterTasks } from '../helpers/after';
import { useJar } from '../helpers/cookieJar';
import { anonymous, demo, form, interruptOf, lastMailId, linkIn, signInAs, signInDemo, textOf, uniqueEmail, waitForMail } from './helpers';
import { listCaughtMail } from '@/db/queries/mail';

afterAll(async () => {
  await closeDb();
});

async function setPasswordPageText(token: string): Promise<string> {
  return textOf(await SetPasswordPage({ searchParams: Promise.resolve({ token }) }));
}

describe('invite by e-mail', () => {
  it('delivers an invitation through SMTP whose link sets the password once; the new user signs in', async () => {
    await signInDemo('admin');
    const email = uniqueEmail('invitee');
    const before = await lastMailId();
    const r = await inviteUser(null, form({ email, name: 'Odile Marchetti', role: 'engineer' }));
    expect(r.ok).toBe(true);

    const mail = await waitForMail(email, /^You are invited to Fringelog$/, before);
    expect(mail.envelopeTo).toEqual([email]);
    expect(mail.textBody).toContain('Hello Odile Marchetti');
    const link = linkIn(mail.textBody);
    expect(link.origin).toBe(process.env.APP_URL);
    expect(link.pathname).toBe('/set-password');
    const token = link.searchParams.get('token') ?? '';

    anonymous();
    expect(await setPasswordPageText(token)).toContain(`For ${email}`);
    const done = await interruptOf(() => setPasswordWithToken(null, form({ token, password: 'odile-first-pass-1', confirm: 'odile-first-pass-1' })));
    expect(done).toEqual({ kind: 'redirect', location: '/sign-in?notice=password-set' });

    await signInAs(email, 'odile-first-pass-1');
    expect((await currentUser())?.role).toBe('engineer');

    // Single use: the same link now fails, with a clear message, on the page and in the action.
    anonymous();
    expect(await setPasswordPageText(token)).toContain('This link has already been used. Ask for a new one.');
    const again = await setPasswordWithToken(null, form({ token, password: 'odile-other-pass-2', confirm: 'odile-other-pass-2' }));
    expect(again.ok ? '' : again.message).toBe('This link has already been used. Ask for a new one.');
    await signInAs(email, 'odile-first-pass-1');

    const audit = await listAudit(20);
    expect(audit.some((e) => e.action === 'user.invited' && e.actorEmail === demo('admin').email && e.detail.email === email)).toBe(true);
    expect(audit.some((e) => e.action === 'user.invite_accepted' && e.detail && e.targetType === 'user')).toBe(true);
  });

  it('refuses an expired link', async () => {
    await signInDemo('admin');
    const email = uniqueEmail('late');
    const before = await lastMailId();
    expect((await inviteUser(null, form({ email, name: 'Late Comer', role: 'operator' }))).ok).toBe(true);
    const token = linkIn((await waitForMail(email, /invited/, before)).textBody).searchParams.get('token') ?? '';
    await db().execute(sql`update one_time_tokens set expires_at = now() - interval '1 minute' where user_id = (select id from users where email = ${email})`);
    anonymous();
    expect(await setPasswordPageText(token)).toContain('This link has expired. Ask for a new one.');
    const r = await setPasswordWithToken(null, form({ token, password: 'late-pass-123', confirm: 'late-pass-123' }));
    expect(r.ok ? '' : r.message).toBe('This link has expired. Ask for a new one.');
  });

  it('voids the earlier link when a new one is sent', async () => {
    await signInDemo('admin');
    const email = uniqueEmail('resend');
    let before = await lastMailId();
    const invited = await inviteUser(null, form({ email, name: 'Twice Asked', role: 'operator' }));
    if (!invited.ok) throw new Error(invited.message);
    const first = linkIn((await waitForMail(email, /invited/, before)).textBody).searchParams.get('token') ?? '';
    before = await lastMailId();
    expect(await resendInvite(null, form({ userId: invited.data.userId }))).toEqual({ ok: true, data: undefined });
    const second = linkIn((await waitForMail(email, /invited/, before)).textBody).searchParams.get('token') ?? '';
    expect(second).not.toBe(first);
    anonymous();
    expect(await setPasswordPageText(first)).toContain('already been used');
    expect(await setPasswordPageText(second)).toContain(`For ${email}`);
  });

  it('names a duplicate e-mail, a missing name and a bad role at the field, and writes nothing', async () => {
    await signInDemo('admin');
    const count = (await listUsers()).length;
    const dup = await inviteUser(null, form({ email: demo('operator').email.toUpperCase(), name: 'Copy Cat', role: 'operator' }));
    expect(dup.ok || dup.fieldErrors?.email).toEqual(['A user with this e-mail address already exists.']);
    const missing = await inviteUser(null, form({ email: uniqueEmail('x'), name: '', role: 'wizard' }));
    expect(missing.ok || missing.fieldErrors?.name).toEqual(['Enter the person’s name.']);
    expect(missing.ok || missing.fieldErrors?.role).toEqual(['Choose a role.']);
    expect((await listUsers()).length).toBe(count);
  });

  it('voids the link of an invitation whose account was deactivated', async () => {
    await signInDemo('admin');
    const email = uniqueEmail('withdrawn');
    const before = await lastMailId();
    const invited = await inviteUser(null, form({ email, name: 'Withdrawn Offer', role: 'operator' }));
    if (!invited.ok) throw new Error(invited.message);
    const token = linkIn((await waitForMail(email, /invited/, before)).textBody).searchParams.get('token') ?? '';
    expect(await setActive(null, form({ userId: invited.data.userId, active: 'false' }))).toEqual({ ok: true, data: undefined });
    anonymous();
    const r = await setPasswordWithToken(null, form({ token, password: 'withdrawn-pass-1', confirm: 'withdrawn-pass-1' }));
    expect(r.ok ? '' : r.message).toBe('This account is deactivated. Ask an administrator.');
    expect(await setPasswordPageText(token)).toContain('This account is deactivated. Ask an administrator.');
  });

  it('refuses a weak password on the set-password link and keeps the link usable', async () => {
    await signInDemo('admin');
    const email = uniqueEmail('weak');
    const before = await lastMailId();
    expect((await inviteUser(null, form({ email, name: 'Weak Choice', role: 'operator' }))).ok).toBe(true);
    const token = linkIn((await waitForMail(email, /invited/, before)).textBody).searchParams.get('token') ?? '';
    anonymous();
    const weak = await setPasswordWithToken(null, form({ token, password: 'aaaaaaaaaa1', confirm: 'aaaaaaaaaa1' }));
    expect(weak.ok || weak.fieldErrors?.password).toEqual(['Use more varied characters.']);
    expect(await setPasswordPageText(token)).toContain(`For ${email}`);
  });
});

describe('password reset by e-mail', () => {
  it('mails a reset link that sets a new password and ends the old sessions', async () => {
    const { email } = demo('supervisor');
    const oldSession = await signInDemo('supervisor');
    anonymous();
    const before = await lastMailId();
    expect(await requestPasswordReset(null, form({ email }))).toEqual({ ok: true, data: { email } });
    await runAfterTasks();
    const mail = await waitForMail(email, /^Reset your Fringelog password$/, before);
    const token = linkIn(mail.textBody).searchParams.get('token') ?? '';
    expect(await setPasswordPageText(token)).toContain(`For ${email}`);
    const newPassword = 'wren-reset-pass-5';
    expect(await interruptOf(() => setPasswordWithToken(null, form({ token, password: newPassword, confirm: newPassword })))).toEqual({
      kind: 'redirect',
      location: '/sign-in?notice=password-set',
    });
    useJar(oldSession);
    expect(await currentUser()).toBeNull();
    await signInAs(email, newPassword);
    // A second request within a minute is answered the same way but sends nothing.
    anonymous();
    const quiet = await lastMailId();
    expect(await requestPasswordReset(null, form({ email }))).toEqual({ ok: true, data: { email } });
    await runAfterTasks();
    await new Promise((r) => setTimeout(r, 300));
    expect(await lastMailId()).toBe(quiet);
    // A minute later (backdated here) it sends again: put the demo password back that way.
    await db().execute(sql`update one_time_tokens set created_at = created_at - interval '2 minutes' where user_id = (select id from users where email = ${email})`);
    const before2 = await lastMailId();
    await requestPasswordReset(null, form({ email }));
    await runAfterTasks();
    const token2 = linkIn((await waitForMail(email, /Reset/, before2)).textBody).searchParams.get('token') ?? '';
    await interruptOf(() => setPasswordWithToken(null, form({ token: token2, password: demo('supervisor').password, confirm: demo('supervisor').password })));
    await signInDemo('supervisor');
  });

  it('answers an unknown address the same way and sends nothing', async () => {
    anonymous();
    const email = uniqueEmail('stranger');
    const before = await lastMailId();
    expect(await requestPasswordReset(null, form({ email }))).toEqual({ ok: true, data: { email } });
    await runAfterTasks();
    await new Promise((r) => setTimeout(r, 300));
    // nothing to that address (the queue's worker may mail a tolerance alert meanwhile)
    expect((await listCaughtMail(50)).filter((m) => m.id > before && m.envelopeTo.includes(email))).toEqual([]);
  });
});
