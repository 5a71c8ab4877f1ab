// The browser tests' shared kit: the test registry, assertions, screenshots and sign-in.
// Each area's tests live in specs/*.ts and register themselves with test(); run.ts runs them all.
import fs from 'node:fs';
import path from 'node:path';
import { type BrowserContext, type Page } from 'playwright-core';
import { demoUsers } from '../../db/seed/demoData';
import { SignInPage } from './pages';

export const baseUrl = process.env.APP_URL ?? 'http://localhost:3100';
const shots = path.resolve(import.meta.dirname, '..', 'screenshots');
fs.mkdirSync(shots, { recursive: true });

export function assert(condition: unknown, message: string): asserts condition {
  if (!condition) throw new Error(message);
}

export function assertEqual<T>(actual: T, expected: T, what: string): void {
  const a = JSON.stringify(actual);
  const e = JSON.stringify(expected);
  if (a !== e) throw new Error(`${what}: expected ${e}, got ${a}`);
}

/**
 * A screenshot to look at, not a check: it gets more time than the 10 s of an action, since a
 * full-page capture of a page of plots can take longer while the analysis worker fills both
 * cores (a fresh machine's first run timed out here once).
 */
export const SHOT_TIMEOUT_MS = 45_000;

export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true, timeout: SHOT_TIMEOUT_MS });
}

export async function signInAs(page: Page, role: string): Promise<void> {
  const u = demoUsers.find((d) => d.role === role);
  assert(u, `no demo ${role}`);
  const signIn = new SignInPage(page, baseUrl);
  await signIn.open();
  await signIn.signIn(u.email, u.password);
  await page.waitForURL(`${baseUrl}/`);
}

const cspViolations = new WeakMap<Page, string[]>();

/** Records every Content-Security-Policy violation Chromium reports on the page's console. */
export function watchCsp(page: Page): void {
  const seen: string[] = [];
  cspViolations.set(page, seen);
  page.on('console', (m) => {
    if (m.type() === 'error' && /Content Security Policy/i.test(m.text())) seen.push(m.text());
  });
}

/** The violations seen on the page so far, cleared. run.ts fails any test that leaves some behind. */
export function takeCspViolations(page: Page): string[] {
  const seen = cspViolations.get(page) ?? [];
  return seen.splice(0, seen.length);
}

/** The password the reset-password test gives the demo engineer (specs that run after it sign in with it). */
export const engineerPasswordAfterReset = 'idris-new-pass-77';

/** Signs the demo engineer in, with the demo password or, once the reset test has run, the one it set. */
export async function signInEngineer(page: Page): Promise<void> {
  const u = demoUsers.find((d) => d.role === 'engineer');
  assert(u, 'no demo engineer');
  const signIn = new SignInPage(page, baseUrl);
  for (const password of [u.password, engineerPasswordAfterReset]) {
    await signIn.open();
    await signIn.signIn(u.email, password);
    const outcome = await Promise.race([
      page.waitForURL(`${baseUrl}/`).then(() => 'in' as const, () => 'timeout' as const),
      signIn.fieldError('password').waitFor().then(() => 'wrong' as const, () => 'timeout' as const),
    ]);
    if (outcome === 'in') return;
  }
  throw new Error('the demo engineer could not sign in with either known password');
}

export type Test = { name: string; run(page: Page, context: BrowserContext): Promise<void> };
export const tests: Test[] = [];
export const test = (name: string, run: Test['run']) => tests.push({ name, run });
