import { baseUrl, assert, assertEqual, engineerPasswordAfterReset, shot, signInAs, test } from '../harness';
import { demoUsers } from '../../../db/seed/demoData';
import { Shell, SignInPage } from '../pages';

const expectedNav: Record<string, string[]> = {
  operator: ['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Account'],
  engineer: ['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Account'],
  supervisor: ['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Audit log', 'Account'],
  admin: ['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Audit log', 'Users', 'Mail', 'Chamber tokens', 'Account'],
};

test('a signed-out visitor is sent to sign-in with a 307', async () => {
  const res = await fetch(`${baseUrl}/`, { redirect: 'manual' });
  assertEqual(res.status, 307, 'status of /');
  assertEqual(new URL(res.headers.get('location') ?? '', baseUrl).pathname, '/sign-in', 'redirect target');
});

test('the sign-in page shows the brand and a wrong password at the field', async (page) => {
  const signIn = new SignInPage(page, baseUrl);
  await signIn.open();
  await shot(page, 'sign-in');
  await signIn.signIn(demoUsers[0].email, 'not-the-password-1');
  await signIn.fieldError('password').waitFor();
  assert(/E-mail or password is wrong\. \d tries? left/.test((await signIn.fieldError('password').textContent()) ?? ''), 'wrong-password message');
  assertEqual(await page.getByLabel('E-mail').inputValue(), demoUsers[0].email, 'e-mail kept after a failed sign-in');
  await shot(page, 'sign-in-wrong-password');
});

for (const role of ['operator', 'engineer', 'supervisor', 'admin']) {
  test(`${role}: signs in, sees the ${role}'s navigation, signs out`, async (page, context) => {
    await signInAs(page, role);
    const shell = new Shell(page);
    assertEqual(await shell.navLabels(), expectedNav[role], `${role} navigation`);
    assertEqual(await shell.userName(), demoUsers.find((d) => d.role === role)?.name, 'name in the header');
    await page.getByText('Bay 2 IAD').waitFor();
    const cookie = (await context.cookies(baseUrl)).find((c) => c.name === 'fringelog_session');
    assert(cookie, 'session cookie set');
    assertEqual([cookie.httpOnly, cookie.sameSite, cookie.path], [true, 'Lax', '/'], 'session cookie httpOnly, SameSite, path');
    await shot(page, `home-${role}`);
    await shell.signOut();
    await page.getByText('You are signed out.').waitFor();
    const res = await page.goto(`${baseUrl}/account`);
    assertEqual(new URL(page.url()).pathname, '/sign-in', `after sign-out /account leads to sign-in (status ${res?.status()})`);
  });
}

const pageAccess: Record<string, string[]> = {
  operator: ['/', '/runs', '/account'],
  engineer: ['/', '/runs', '/account'],
  supervisor: ['/', '/runs', '/account', '/audit'],
  admin: ['/', '/runs', '/account', '/audit', '/admin/users', '/admin/mail'],
};
const allPages = ['/', '/runs', '/account', '/audit', '/admin/users', '/admin/mail'];

test('over HTTP, each role gets 200 on its pages and 403 on the others', async (page, context) => {
  for (const role of Object.keys(pageAccess)) {
    await context.clearCookies();
    await signInAs(page, role);
    for (const p of allPages) {
      const res = await page.request.get(`${baseUrl}${p}`, { maxRedirects: 0 });
      assertEqual(res.status(), pageAccess[role].includes(p) ? 200 : 403, `${role} GET ${p}`);
    }
  }
});

test('operator gets the 403 page on admin pages', async (page) => {
  await signInAs(page, 'operator');
  for (const p of ['/admin/users', '/admin/mail', '/audit']) {
    const res = await page.goto(`${baseUrl}${p}`);
    assertEqual(res?.status(), 403, `status of ${p}`);
    await page.getByText('Not for your role').waitFor();
  }
  await shot(page, 'forbidden-operator');
});

test('admin pages render: users, audit log, account', async (page) => {
  await signInAs(page, 'admin');
  const shell = new Shell(page);
  await shell.go('Users');
  await page.getByRole('heading', { name: 'Users' }).waitFor();
  await shot(page, 'admin-users');
  await shell.go('Audit log');
  await page.getByRole('heading', { name: 'Audit log' }).waitFor();
  await shot(page, 'audit-log');
  await shell.go('Account');
  await page.getByRole('heading', { name: 'Account' }).waitFor();
  await shot(page, 'account');
});

test('admin invites someone; the link from the Mail page sets a password; they sign in', async (page, context) => {
  await signInAs(page, 'admin');
  const shell = new Shell(page);
  await shell.go('Users');
  const email = `linnea-${Date.now().toString(36)}@larkspur.example`;
  await page.getByLabel('Name').fill('Linnea Ardent');
  await page.getByLabel('E-mail').fill(email);
  await page.locator('#field-role').selectOption('supervisor');
  await page.getByRole('button', { name: 'Send invitation' }).click();
  await page.getByText('Invitation sent.').waitFor();
  await page.locator(`tr[data-user-email="${email}"]`).getByText('invited').waitFor();
  await shell.go('Mail');
  const message = page.locator('article', { hasText: email }).first();
  await message.waitFor();
  await shot(page, 'admin-mail');
  const link = await message.locator('a').first().getAttribute('href');
  assert(link && link.startsWith(`${baseUrl}/set-password?token=`), `invite link ${link}`);
  await shell.signOut();
  await context.clearCookies();
  await page.goto(link);
  await page.getByText(`For ${email}`).waitFor();
  await page.getByLabel('New password', { exact: true }).fill('short');
  await page.getByLabel('Repeat the new password').fill('short');
  await page.getByRole('button', { name: 'Save password' }).click();
  await page.getByText('Use at least 10 characters.').waitFor();
  await shot(page, 'set-password-weak');
  await page.getByLabel('New password', { exact: true }).fill('linnea-pass-2026');
  await page.getByLabel('Repeat the new password').fill('linnea-pass-2026');
  await page.getByRole('button', { name: 'Save password' }).click();
  await page.waitForURL(/\/sign-in\?notice=password-set/);
  const signIn = new SignInPage(page, baseUrl);
  await signIn.signIn(email, 'linnea-pass-2026');
  await page.waitForURL(`${baseUrl}/`);
  assertEqual(await new Shell(page).navLabels(), expectedNav.supervisor, 'navigation of the invited supervisor');
});

test('forgot password: the reset link from the mail sets a new password, and the old one stops working', async (page, context) => {
  const engineer = demoUsers.find((d) => d.role === 'engineer');
  assert(engineer, 'no demo engineer');
  const signIn = new SignInPage(page, baseUrl);
  await signIn.open();
  await page.getByRole('link', { name: 'Forgot your password?' }).click();
  // Every page renders per request now (CSP nonce): wait for the new page before typing.
  await page.getByRole('heading', { name: 'Reset your password' }).waitFor();
  await page.getByLabel('E-mail').fill(engineer.email);
  await page.getByRole('button', { name: 'Send reset link' }).click();
  await page.getByText('a link to choose a new password is on its way').waitFor();
  await shot(page, 'reset-requested');

  await signInAs(page, 'admin');
  await new Shell(page).go('Mail');
  const message = page.locator('article', { hasText: engineer.email }).filter({ hasText: 'Reset your Fringelog password' }).first();
  const link = await message.locator('a').first().getAttribute('href');
  assert(link && link.startsWith(`${baseUrl}/set-password?token=`), `reset link ${link}`);
  await new Shell(page).signOut();
  await context.clearCookies();

  const fresh = engineerPasswordAfterReset;
  await page.goto(link);
  await page.getByRole('heading', { name: 'Choose a new password' }).waitFor();
  await page.getByLabel('New password', { exact: true }).fill(fresh);
  await page.getByLabel('Repeat the new password').fill(fresh);
  await page.getByRole('button', { name: 'Save password' }).click();
  await page.waitForURL(/\/sign-in\?notice=password-set/);
  await signIn.signIn(engineer.email, engineer.password);
  await signIn.fieldError('password').waitFor();
  await signIn.signIn(engineer.email, fresh);
  await page.waitForURL(`${baseUrl}/`);
  // The link was single-use.
  await page.goto(link);
  await page.getByText('This link has already been used.').waitFor();
});

