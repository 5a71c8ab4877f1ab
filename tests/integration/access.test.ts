import { afterAll, describe, expect, it } from 'vitest';
import { closeDb } from '@/db/client';
import { currentUser } from '@/app/_lib/auth';
import type { CookieJar } from '../helpers/cookieJar';
import { useJar } from '../helpers/cookieJar';
import { accessTable, principals, type Expect, type Principal } from './access/table';
import { discoverRoutes } from '../helpers/appRoutes';
import { anonymous, interruptOf, signInDemo } from './helpers';

afterAll(async () => {
  await closeDb();
});

const jars = new Map<Principal, CookieJar>();

/** Acts as the principal: a signed-in demo user (signed in again when an earlier cell signed out), or nobody. */
async function become(who: Principal): Promise<void> {
  if (who === 'anonymous') {
    anonymous();
    return;
  }
  const jar = jars.get(who);
  if (jar) {
    useJar(jar);
    if ((await currentUser())?.role === who) return;
  }
  jars.set(who, await signInDemo(who));
}

/** What happened, in the table's words. */
async function outcomeOf(call: () => Promise<unknown>): Promise<Expect | string> {
  let returned: unknown;
  const interrupt = await interruptOf(async () => {
    returned = await call();
  });
  if (interrupt !== 'returned') {
    if (interrupt.kind === 'redirect') return interrupt.location === '/sign-in' ? 'sign-in' : interrupt.location === '/' ? 'home' : 'yes';
    return interrupt.status === 403 ? 'forbidden' : interrupt.status === 401 ? 'sign-in' : `http ${interrupt.status}`;
  }
  if (returned instanceof Response) {
    if (returned.status === 401) return 'sign-in';
    if (returned.status === 403) return 'forbidden';
    if (returned.status >= 500) return `http ${returned.status}`;
    // The health check's own words; any other answer below 500 got past the access check.
    const body = (await returned.json().catch(() => null)) as { status?: unknown; database?: unknown } | null;
    if (body?.status === 'up') return body.database ? 'details' : 'up';
    return 'yes';
  }
  if (returned && typeof returned === 'object' && 'ok' in returned && returned.ok === false && 'code' in returned) {
    if (returned.code === 'unauthorized:session') return 'sign-in';
    if (returned.code === 'forbidden:role') return 'forbidden';
  }
  return 'yes';
}

describe('the access table', () => {
  it('has a row for every page, route handler and server action of app/, and none for what is gone', () => {
    const { keys, strayServerFiles } = discoverRoutes();
    const rows = accessTable.map((r) => r.key);
    expect(keys.filter((k) => !rows.includes(k)), 'routes without a row in tests/integration/access/table.ts').toEqual([]);
    expect(rows.filter((k) => !keys.includes(k)), 'rows for routes that no longer exist').toEqual([]);
    expect(new Set(rows).size, 'one row per route').toBe(rows.length);
    expect(strayServerFiles, "'use server' files other than actions.ts (their actions would escape the table)").toEqual([]);
  });

  for (const row of accessTable) {
    describe(row.key, () => {
      for (const who of principals) {
        it(`${who}: ${row.expect[who]}`, async () => {
          await become(who);
          expect(await outcomeOf(() => row.call(who))).toBe(row.expect[who]);
        });
      }
    });
  }
});
