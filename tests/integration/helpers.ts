import { expect } from 'vitest';
import { listCaughtMail } from '@/db/queries/mail';
import { demoUsers } from '@/db/seed/demoData';
import type { Role } from '@/db/schema';
import { signIn } from '@/app/(auth)/sign-in/actions';
import { setPasswordWithToken } from '@/app/(auth)/set-password/actions';
import { inviteUser } from '@/app/(app)/admin/users/actions';
import { CookieJar, useJar } from '../helpers/cookieJar';

export function form(fields: Record<string, string | number>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.set(k, String(v));
  return fd;
}

type Interrupt = { kind: 'redirect'; location: string } | { kind: 'http'; status: number };

/** What a Next.js interrupt (redirect(), forbidden(), notFound()) thrown by `run` means. */
export async function interruptOf(run: () => Promise<unknown>): Promise<Interrupt | 'returned'> {
  try {
    await run();
    return 'returned';
  } catch (err) {
    const digest = (err as { digest?: unknown }).digest;
    if (typeof digest !== 'string') throw err;
    if (digest.startsWith('NEXT_REDIRECT;')) return { kind: 'redirect', location: digest.split(';')[2] };
    if (digest.startsWith('NEXT_HTTP_ERROR_FALLBACK;')) return { kind: 'http', status: Number(digest.split(';')[1]) };
    throw err;
  }
}

export function demo(role: Role): { name: string; email: string; role: Role; password: string } {
  const u = demoUsers.find((d) => d.role === role);
  if (!u) throw new Error(`no demo user for ${role}`);
  return u;
}

/** Signs in with a fresh cookie jar (a new browser) and leaves that jar current. */
export async function signInAs(email: string, password: string): Promise<CookieJar> {
  const jar = useJar(new CookieJar());
  const outcome = await interruptOf(() => signIn(null, form({ email, password })));
  expect(outcome, `sign-in of ${email}`).toEqual({ kind: 'redirect', location: '/' });
  return jar;
}

export function signInDemo(role: Role): Promise<CookieJar> {
  const u = demo(role);
  return signInAs(u.email, u.password);
}

export function anonymous(): CookieJar {
  return useJar(new CookieJar());
}

/** Waits (bounded) for the sink to have stored a message to `to` whose subject matches. */
export async function waitForMail(to: string, subject: RegExp, afterId = 0, timeoutMs = 5000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const found = (await listCaughtMail(50)).find((m) => m.id > afterId && m.envelopeTo.includes(to) && subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}

export async function lastMailId(): Promise<number> {
  return (await listCaughtMail(1))[0]?.id ?? 0;
}

export function linkIn(text: string): URL {
  const m = /https?:\/\/\S+/.exec(text);
  if (!m) throw new Error(`no link in mail:\n${text}`);
  return new URL(m[0]);
}

let counter = 0;
export function uniqueEmail(prefix: string): string {
  counter += 1;
  return `${prefix}-${Date.now().toString(36)}-${counter}@larkspur.example`;
}

/** The text a server component tree renders, collected without a DOM. */
export function textOf(node: unknown): string {
  if (node === null || node === undefined || typeof node === 'boolean') return '';
  if (typeof node === 'string' || typeof node === 'number') return String(node);
  if (Array.isArray(node)) return node.map(textOf).join('');
  const el = node as { props?: Record<string, unknown> };
  if (!el.props) return '';
  return [textOf(el.props.children), ...Object.entries(el.props).filter(([k]) => ['email', 'title'].includes(k)).map(([, v]) => textOf(v))].join(' ');
}

/** A fresh active user (invited by the demo admin, password set through the link); leaves an anonymous jar current. */
export async function freshUser(password = 'fresh-password-42', role: Role = 'operator'): Promise<{ email: string; password: string; userId: number }> {
  await signInDemo('admin');
  const email = uniqueEmail('fresh');
  const before = await lastMailId();
  const invited = await inviteUser(null, form({ email, name: 'Fresh Person', role }));
  if (!invited.ok) throw new Error(`invite failed: ${invited.message}`);
  const mail = await waitForMail(email, /invited/i, before);
  const token = linkIn(mail.textBody).searchParams.get('token') ?? '';
  anonymous();
  const outcome = await interruptOf(() => setPasswordWithToken(null, form({ token, password, confirm: password })));
  expect(outcome, `password for ${email}`).toEqual({ kind: 'redirect', location: '/sign-in?notice=password-set' });
  return { email, password, userId: invited.data.userId };
}
