// Browser tests: Debian's Chromium, driven by playwright-core, against the production build
// that `npm test` serves on the test port. Runs every file of specs/ in name order; prints
// 'N passed, N failed'. Any Content-Security-Policy violation on a test's page fails that test.
// `tsx tests/browser/run.ts NAME…` runs only the spec files whose names contain one of the words.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { shot, takeCspViolations, tests, watchCsp } from './harness';

const specs = path.join(import.meta.dirname, 'specs');
const only = process.argv.slice(2);
for (const file of fs.readdirSync(specs).filter((f) => f.endsWith('.ts') && (only.length === 0 || only.some((w) => f.includes(w)))).sort()) {
  await import(path.join(specs, file));
}

const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fringelog-chromium-'));
const context = await chromium.launchPersistentContext(userDataDir, {
  executablePath: '/usr/bin/chromium',
  headless: true,
  viewport: { width: 1280, height: 800 },
  args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
});
context.setDefaultTimeout(10000);
let passed = 0;
let failed = 0;
// BROWSER_GREP=words runs only the tests whose names contain them (while working on one area).
const grep = process.env.BROWSER_GREP;
for (const t of tests.filter((x) => !grep || x.name.includes(grep))) {
  await context.clearCookies();
  const page = await context.newPage();
  watchCsp(page);
  const t0 = Date.now();
  try {
    await t.run(page, context);
    const violations = takeCspViolations(page);
    if (violations.length) throw new Error(`Content-Security-Policy violations:\n${violations.join('\n')}`);
    passed += 1;
    console.log(`  ✓ ${t.name} (${Date.now() - t0} ms)`);
  } catch (err) {
    failed += 1;
    console.log(`  ✗ ${t.name}\n    ${err instanceof Error ? err.message.split('\n').join('\n    ') : String(err)}`);
    await shot(page, `FAILED-${t.name.replace(/[^a-z0-9]+/gi, '-').slice(0, 60)}`).catch(() => undefined);
  } finally {
    await page.close();
  }
}
await context.close();
fs.rmSync(userDataDir, { recursive: true, force: true });
if (process.env.BROWSER_RESULTS) fs.writeFileSync(process.env.BROWSER_RESULTS, JSON.stringify({ passed, failed }));
console.log(`browser: ${passed} passed, ${failed} failed`);
process.exit(failed ? 1 : 0);
