// `npm test`: the same bootstrap as `npm start` against the test database (recreated each run),
// then lint, type-check, unit + integration tests (vitest) and browser tests (Chromium).
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import {
  appDb,
  assertPortFree,
  bin,
  databaseUrl,
  dataDir,
  ensureChromium,
  ensureDatabases,
  ensureNodeModules,
  ensurePostgresInstalled,
  log,
  root,
  run,
  runInherit,
  startPostgres,
  testDb,
  waitForHttp,
} from './bootstrap.mjs';

const appPort = Number(process.env.TEST_APP_PORT ?? 3100);
const sinkPort = Number(process.env.TEST_MAIL_SINK_PORT ?? 2526);
const children = [];
let pg;

function cleanup() {
  for (const c of children) if (c.exitCode === null) c.kill('SIGTERM');
  pg?.stop();
}
process.on('SIGINT', () => {
  cleanup();
  process.exit(130);
});

ensureNodeModules();
await assertPortFree(appPort, 'the test web app');
await assertPortFree(sinkPort, 'the test mail sink');
pg = await startPostgres(ensurePostgresInstalled());
const password = ensureDatabases(pg, [appDb, testDb], { recreate: [testDb] });

const env = {
  ...process.env,
  NODE_ENV: 'production',
  NEXT_TELEMETRY_DISABLED: '1',
  DATABASE_URL: databaseUrl(password, testDb),
  SESSION_SECRET: randomBytes(36).toString('base64url'),
  SMTP_URL: `smtp://127.0.0.1:${sinkPort}`,
  APP_URL: `http://localhost:${appPort}`,
  MAIL_SINK_PORT: String(sinkPort),
  FRINGELOG_DIST_DIR: '.next-test',
};
const prep = run(bin('tsx'), ['--conditions=react-server', 'db/local/prepare.ts'], { env, allowFail: true });
process.stdout.write(prep.stdout.split('\n').filter((l) => l && !l.startsWith('SIGN-IN ')).join('\n') + '\n');
if (prep.status !== 0) {
  process.stderr.write(prep.stderr);
  cleanup();
  process.exit(1);
}

const sink = spawn(bin('tsx'), ['--conditions=react-server', 'db/local/mailSink.ts'], { cwd: root, env, stdio: 'inherit' });
children.push(sink);
// The analysis worker for the tests that need queued analyses to finish (integration and browser).
const worker = spawn(bin('tsx'), ['--conditions=react-server', 'db/local/worker.ts'], { cwd: root, env, stdio: 'inherit' });
children.push(worker);

// `npm test -- lint types vitest browser` runs only the named parts (all when none is named);
// any other word is a vitest file filter, and alone runs only vitest on those files
// (`npm test -- tests/integration/worker.test.ts`).
const PARTS = ['lint', 'types', 'vitest', 'browser'];
const args = process.argv.slice(2);
const only = args.filter((a) => PARTS.includes(a));
const filters = args.filter((a) => !PARTS.includes(a));
if (filters.length && only.length === 0) only.push('vitest');
const wanted = (part) => only.length === 0 || only.includes(part);
const failures = [];
async function step(name, cmd, args, opts = {}) {
  log(`── ${name}`);
  const t0 = Date.now();
  const code = await runInherit(cmd, args, { env: { ...env, NODE_ENV: 'test' }, ...opts });
  log(`── ${name}: ${code === 0 ? 'ok' : `FAILED (exit ${code})`} in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  if (code !== 0) failures.push(name);
  return code;
}

if (wanted('lint')) await step('eslint', bin('eslint'), ['.']);
if (wanted('types')) await step('tsc --noEmit', bin('tsc'), ['--noEmit', '-p', '.']);
const vitestJson = path.join(dataDir, 'vitest-results.json');
fs.rmSync(vitestJson, { force: true });
if (wanted('vitest')) await step('vitest (unit + integration)', bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${vitestJson}`, ...filters]);

// Browser tests: a production build of its own, served on the test port against the test DB.
let browser = { passed: 0, failed: 0 };
if (wanted('browser')) ensureChromium();
if (wanted('browser') && (await step('next build (test)', bin('next'), ['build'], { env })) === 0) {
  browser = { passed: 0, failed: 1 };
  const server = spawn(bin('next'), ['start', '-p', String(appPort), '-H', '127.0.0.1'], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] });
  children.push(server);
  if (await waitForHttp(`http://127.0.0.1:${appPort}/sign-in`, 30000)) {
    const resultFile = path.join(dataDir, 'browser-results.json');
    fs.rmSync(resultFile, { force: true });
    await step('browser (Chromium)', bin('tsx'), ['tests/browser/run.ts'], { env: { ...env, BROWSER_RESULTS: resultFile } });
    if (fs.existsSync(resultFile)) browser = JSON.parse(fs.readFileSync(resultFile, 'utf8'));
  } else {
    log('the test web app did not answer within 30 s');
    failures.push('browser (server did not start)');
  }
}
cleanup();

let unit = { passed: 0, failed: 0 };
if (fs.existsSync(vitestJson)) {
  const r = JSON.parse(fs.readFileSync(vitestJson, 'utf8'));
  // A file that fails to load has no assertions of its own: count it as one failure.
  const broken = r.testResults.filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  unit = { passed: r.numPassedTests, failed: r.numFailedTests + broken };
}
const passed = unit.passed + browser.passed;
// A failed step with no failed test to show for it (lint, types, a crash) still counts as one.
const uncounted = failures.filter(
  (f) => !(f.startsWith('vitest') && unit.failed > 0) && !(f.startsWith('browser') && browser.failed > 0),
).length;
const failed = unit.failed + browser.failed + uncounted;
console.log('');
console.log(`vitest: ${unit.passed} passed, ${unit.failed} failed · browser: ${browser.passed} passed, ${browser.failed} failed`);
if (failures.length) console.log(`failed steps: ${failures.join(', ')}`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failures.length || failed ? 1 : 0);
