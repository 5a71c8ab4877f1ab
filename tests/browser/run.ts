// Browser tests: Debian's Chromium, driven by playwright-core, against the production build
// that `npm test` serves on the test port. Runs every file of specs/ in name order; prints
// 'N passed, N failed'.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { shot, tests } from './harness';

const specs = path.join(import.meta.dirname, 'specs');
for (const file of fs.readdirSync(specs).filter((f) => f.endsWith('.ts')).sort()) await import(path.join(specs, file));

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
const only = process.env.BROWSER_GREP;
for (const t of tests.filter((x) => !only || x.name.includes(only))) {
  await context.clearCookies();
  const page = await context.newPage();
  const t0 = Date.now();
  try {
    await t.run(page, context);
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
