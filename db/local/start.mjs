// `npm start`: installs what is missing, starts PostgreSQL, migrates and seeds, starts the local
// mail sink, builds and serves Fringelog on http://localhost:3000. Ctrl-C stops all of it.
import { spawn } from 'node:child_process';
import {
  appDb,
  assertPortFree,
  bin,
  databaseUrl,
  ensureDatabases,
  ensureNodeModules,
  ensurePostgresInstalled,
  log,
  root,
  run,
  runInherit,
  sessionSecret,
  startPostgres,
  testDb,
  waitForHttp,
} from './bootstrap.mjs';

const t0 = Date.now();
const appPort = Number(process.env.PORT ?? 3000);
const sinkPort = Number(process.env.MAIL_SINK_PORT ?? 2525);
const children = [];
let pg;
let stopping = false;

function stopAll(code) {
  if (stopping) return;
  stopping = true;
  log('stopping…');
  for (const c of children) if (c.exitCode === null) c.kill('SIGTERM');
  pg?.stop();
  process.exit(code);
}
process.on('SIGINT', () => stopAll(0));
process.on('SIGTERM', () => stopAll(0));

ensureNodeModules();
await assertPortFree(appPort, 'the web app');
const externalSmtp = process.env.SMTP_URL;
if (!externalSmtp) await assertPortFree(sinkPort, 'the local mail sink');

const pgBin = ensurePostgresInstalled();
pg = await startPostgres(pgBin);
const password = ensureDatabases(pg, [appDb, testDb]);

const env = {
  ...process.env,
  NODE_ENV: 'production',
  NEXT_TELEMETRY_DISABLED: '1',
  DATABASE_URL: process.env.DATABASE_URL ?? databaseUrl(password, appDb),
  SESSION_SECRET: sessionSecret(),
  SMTP_URL: externalSmtp ?? `smtp://127.0.0.1:${sinkPort}`,
  APP_URL: process.env.APP_URL ?? `http://localhost:${appPort}`,
  MAIL_SINK_PORT: String(sinkPort),
};

const prep = run(bin('tsx'), ['--conditions=react-server', 'db/local/prepare.ts'], { env, allowFail: true });
const signIns = prep.stdout.split('\n').filter((l) => l.startsWith('SIGN-IN '));
process.stdout.write(prep.stdout.split('\n').filter((l) => l && !l.startsWith('SIGN-IN ')).join('\n') + '\n');
if (prep.status !== 0) {
  process.stderr.write(prep.stderr);
  stopAll(1);
}

if (!externalSmtp) {
  const sink = spawn(bin('tsx'), ['--conditions=react-server', 'db/local/mailSink.ts'], { cwd: root, env, stdio: 'inherit' });
  children.push(sink);
  sink.on('exit', (code) => {
    if (!stopping) {
      console.error(`[fringelog] ERROR: mail sink exited (${code})`);
      stopAll(1);
    }
  });
}

// One analysis worker beside the web server; `npm run worker` (here or on another machine) adds more.
const worker = spawn(bin('tsx'), ['--conditions=react-server', 'db/local/worker.ts'], { cwd: root, env, stdio: 'inherit' });
children.push(worker);
worker.on('exit', (code) => {
  if (!stopping) {
    console.error(`[fringelog] ERROR: the analysis worker exited (${code})`);
    stopAll(1);
  }
});

log('next build');
if ((await runInherit(bin('next'), ['build'], { env })) !== 0) {
  console.error('[fringelog] ERROR: next build failed (see above)');
  stopAll(1);
}

const server = spawn(bin('next'), ['start', '-p', String(appPort), '-H', '127.0.0.1'], { cwd: root, env, stdio: ['ignore', 'inherit', 'inherit'] });
children.push(server);
server.on('exit', (code) => {
  if (!stopping) {
    console.error(`[fringelog] ERROR: next start exited (${code})`);
    stopAll(1);
  }
});

if (!(await waitForHttp(`http://127.0.0.1:${appPort}/sign-in`, 60000))) {
  console.error('[fringelog] ERROR: the web app did not answer within 60 s');
  stopAll(1);
}
if (!signIns.length) {
  console.error('[fringelog] ERROR: the seed step printed no demo sign-ins');
  stopAll(1);
}
const seconds = ((Date.now() - t0) / 1000).toFixed(1);
console.log(`
  Fringelog is running: ${env.APP_URL}   (ready in ${seconds} s; Ctrl-C stops everything)

  Demo sign-ins (Larkspur Optical Works):
${signIns.map((l) => `    ${l.slice('SIGN-IN '.length)}`).join('\n')}
${externalSmtp ? '' : `\n  Mail goes to the local sink (127.0.0.1:${sinkPort}); admins read it on the Mail page.\n`}`);
