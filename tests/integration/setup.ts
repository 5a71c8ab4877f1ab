import { afterEach, vi } from 'vitest';
import { runAfterTasks } from '../helpers/after';
import { currentJar } from '../helpers/cookieJar';

// Integration tests run against the real test database and mail sink that `npm test` starts.
if (!process.env.DATABASE_URL?.endsWith('/fringelog_test') || !process.env.SMTP_URL) {
  throw new Error('Integration tests need the test database and mail sink: run them with `npm test` (it sets DATABASE_URL and SMTP_URL).');
}
process.env.APP_URL ??= 'http://localhost:3100';
// What next.config.mjs's experimental.authInterrupts sets at build time, so forbidden() works here.
process.env.__NEXT_EXPERIMENTAL_AUTH_INTERRUPTS = 'true';

vi.mock('next/headers', () => ({
  cookies: async () => currentJar(),
  // Next sets X-Forwarded-For from the socket when the request has none.
  headers: async () => new Headers({ 'x-forwarded-for': currentJar().address }),
}));
vi.mock('next/cache', () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));
vi.mock('next/server', async (importOriginal) => {
  const { deferAfter } = await import('../helpers/after');
  return { ...(await importOriginal<typeof import('next/server')>()), after: deferAfter };
});

// Nothing scheduled after an answer leaks into the next test.
afterEach(async () => {
  await runAfterTasks();
});
