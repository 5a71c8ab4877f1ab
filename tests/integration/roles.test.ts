import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { findUserById, listUsers } from '@/db/queries/users';
import { listAudit } from '@/db/queries/audit';
import { roles, type Role } from '@/db/schema';
import { currentUser } from '@/app/_lib/auth';
import { capabilities } from '@/app/_lib/capabilities';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { changeRole, inviteUser, resendInvite, setActive } from '@/app/(app)/admin/users/actions';
import { changePassword } from '@/app/(app)/account/actions';
import AppLayout from '@/app/(app)/layout';
import HomePage from '@/app/(app)/(home)/page';
import AccountPage from '@/app/(app)/account/page';
import UsersPage from '@/app/(app)/admin/users/page';
import MailPage from '@/app/(app)/admin/mail/page';
import AuditPage from '@/app/(app)/audit/page';
import { GET as health } from '@/app/api/health/route';
import { useJar } from '../helpers/cookieJar';
import { anonymous, demo, form, interruptOf, signInAs, signInDemo, textOf, uniqueEmail } from './helpers';
import { signOut } from '@/app/(app)/actions';

afterAll(async () => {
  await closeDb();
});

const pages: { path: string; render: () => Promise<unknown>; allowed: (r: Role) => boolean }[] = [
  { path: '/ (layout)', render: () => AppLayout({ children: null }), allowed: () => true },
  { path: '/', render: () => HomePage(), allowed: () => true },
  { path: '/account', render: () => AccountPage(), allowed: (r) => capabilities[r].changeOwnPassword },
  { path: '/admin/users', render: () => UsersPage(), allowed: (r) => capabilities[r].manageUsers },
  { path: '/admin/mail', render: () => MailPage(), allowed: (r) => capabilities[r].viewMailSink },
  { path: '/audit', render: () => AuditPage(), allowed: (r) => capabilities[r].viewAuditLog },
];

describe('the capability map', () => {
  it('gives user management and the mail sink to admins only, the audit log to supervisors and admins', () => {
    expect(roles.filter((r) => capabilities[r].manageUsers)).toEqual(['admin']);
    expect(roles.filter((r) => capabilities[r].viewMailSink)).toEqual(['admin']);
    expect(roles.filter((r) => capabilities[r].viewAuditLog)).toEqual(['supervisor', 'admin']);
    expect(roles.filter((r) => capabilities[r].changeOwnPassword)).toEqual(roles);
    expect(roles.filter((r) => capabilities[r].viewSystemHealth)).toEqual(['admin']);
  });
});

describe('pages, for each role', () => {
  for (const page of pages) {
    it(`${page.path}: signed-out visitors go to sign-in`, async () => {
      anonymous();
      expect(await interruptOf(page.render)).toEqual({ kind: 'redirect', location: '/sign-in' });
    });
    for (const role of roles) {
      it(`${page.path} as ${role}: ${page.allowed(role) ? 'shown' : '403'}`, async () => {
        await signInDemo(role);
        expect(await interruptOf(page.render)).toEqual(page.allowed(role) ? 'returned' : { kind: 'http', status: 403 });
      });
    }
  }
});

describe('own-account actions, for each role', () => {
  for (const role of roles) {
    it(`${role} may change their own password (and back) and sign out`, async () => {
      const u = demo(role);
      await signInDemo(role);
      const temporary = `${role}-temporary-9`;
      expect(await changePassword(null, form({ current: u.password, password: temporary, confirm: temporary }))).toEqual({ ok: true, data: undefined });
      expect(await changePassword(null, form({ current: temporary, password: u.password, confirm: u.password }))).toEqual({ ok: true, data: undefined });
      expect((await currentUser())?.email).toBe(u.email);
      expect(await interruptOf(() => signOut())).toEqual({ kind: 'redirect', location: '/sign-in?notice=signed-out' });
      expect(await currentUser()).toBeNull();
    });
  }
});

describe('GET /api/health', () => {
  it('says only "up" to visitors and non-admins', async () => {
    for (const who of ['anonymous', 'supervisor'] as const) {
      if (who === 'anonymous') anonymous();
      else await signInDemo(who);
      const res = await health();
      expect(res.status).toBe(200);
      expect(await res.json()).toEqual({ status: 'up' });
    }
  });

  it('gives a signed-in admin the database as reachable and migrated', async () => {
    await signInDemo('admin');
    const res = await health();
    expect(res.status).toBe(200);
    const body = (await res.json()) as { status: string; database: { ok: boolean; migrations: number; serverVersion: string } };
    expect(body.status).toBe('up');
    expect(body.database.ok).toBe(true);
    expect(body.database.migrations).toBeGreaterThanOrEqual(3);
    expect(body.database.serverVersion).toMatch(/^\d+/);
  });
});

describe('user-management actions, for each role', () => {
  const nonAdmins = roles.filter((r) => !capabilities[r].manageUsers);

  for (const role of nonAdmins) {
    it(`${role} may not invite, resend, change roles or deactivate, and nothing changes`, async () => {
      const target = (await listUsers()).find((u) => u.email === demo('engineer').email);
      if (!target) throw new Error('engineer missing');
      await signInDemo(role);
      const count = (await listUsers()).length;
      const results = [
        await inviteUser(null, form({ email: uniqueEmail('nope'), name: 'Not Allowed', role: 'admin' })),
        await resendInvite(null, form({ userId: target.id })),
        await changeRole(null, form({ userId: target.id, role: 'admin' })),
        await setActive(null, form({ userId: target.id, active: 'false' })),
      ];
      for (const r of results) expect(r).toMatchObject({ ok: false, code: 'forbidden:role', message: 'Your role does not allow this.' });
      expect((await listUsers()).length).toBe(count);
      expect(await findUserById(target.id)).toMatchObject({ role: 'engineer', status: 'active' });
    });
  }

  it('signed-out callers get "sign in again" from every action', async () => {
    anonymous();
    const results = [
      await inviteUser(null, form({ email: uniqueEmail('anon'), name: 'Anon Ymous', role: 'admin' })),
      await changeRole(null, form({ userId: 1, role: 'admin' })),
      await setActive(null, form({ userId: 1, active: 'false' })),
      await resendInvite(null, form({ userId: 1 })),
      await changePassword(null, form({ current: 'x', password: 'some-pass-123', confirm: 'some-pass-123' })),
    ];
    for (const r of results) expect(r).toMatchObject({ ok: false, code: 'unauthorized:session' });
  });

  it('admin changes a role (audited) and the change shows in the capability of the user', async () => {
    await signInDemo('admin');
    const op = (await listUsers()).find((u) => u.email === demo('operator').email);
    if (!op) throw new Error('operator missing');
    expect(await changeRole(null, form({ userId: op.id, role: 'supervisor' }))).toEqual({ ok: true, data: undefined });
    await signInDemo('operator');
    expect(await interruptOf(() => AuditPage())).toBe('returned');
    await signInDemo('admin');
    expect(await changeRole(null, form({ userId: op.id, role: 'operator' }))).toEqual({ ok: true, data: undefined });
    const audit = await listAudit(10);
    expect(audit.filter((e) => e.action === 'user.role_changed' && e.targetId === String(op.id)).map((e) => e.detail)).toEqual([
      { email: op.email, from: 'supervisor', to: 'operator' },
      { email: op.email, from: 'operator', to: 'supervisor' },
    ]);
    const page = textOf(await AuditPage());
    expect(page).toContain(`${demo('admin').name} changed the role of ${op.name}`);
    expect(page).toContain('Chamber operator → Supervisor');
    expect(page).toContain('Supervisor → Chamber operator');
  });

  it('deactivation ends the user’s session and blocks sign-in with a clear message; reactivation restores it', async () => {
    const eng = demo('engineer');
    const engJar = await signInDemo('engineer');
    await signInDemo('admin');
    const target = (await listUsers()).find((u) => u.email === eng.email);
    if (!target) throw new Error('engineer missing');
    expect(await setActive(null, form({ userId: target.id, active: 'false' }))).toEqual({ ok: true, data: undefined });
    useJar(engJar);
    expect(await currentUser()).toBeNull();
    anonymous();
    const r = await signIn(null, form({ email: eng.email, password: eng.password }));
    expect(r.ok || r.fieldErrors?.email).toEqual(['This account is deactivated. Ask an administrator to reactivate it.']);
    await signInDemo('admin');
    expect(await setActive(null, form({ userId: target.id, active: 'true' }))).toEqual({ ok: true, data: undefined });
    await signInAs(eng.email, eng.password);
  });

  it('keeps at least one active admin and refuses self-deactivation', async () => {
    await signInDemo('admin');
    const admin = (await listUsers()).find((u) => u.email === demo('admin').email);
    if (!admin) throw new Error('admin missing');
    expect(await setActive(null, form({ userId: admin.id, active: 'false' }))).toMatchObject({ ok: false, message: 'You cannot deactivate yourself.' });
    const activeAdmins = (await listUsers()).filter((u) => u.role === 'admin' && u.status === 'active');
    if (activeAdmins.length === 1) {
      expect(await changeRole(null, form({ userId: admin.id, role: 'operator' }))).toMatchObject({ ok: false, code: 'conflict:last_admin' });
      expect((await findUserById(admin.id))?.role).toBe('admin');
    }
  });

  it('rejects a malformed user id or role before touching anything', async () => {
    await signInDemo('admin');
    expect(await changeRole(null, form({ userId: 'abc', role: 'admin' }))).toMatchObject({ ok: false, code: 'bad_request:input' });
    expect(await changeRole(null, form({ userId: 999999, role: 'admin' }))).toMatchObject({ ok: false, code: 'not_found:user' });
  });
});
