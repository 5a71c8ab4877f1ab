// Upload and queue figures for `npm run bench`: a production build served against a database of
// its own (fringelog_bench, recreated), one analysis worker, a chamber token. Prints the time
// from the start of a 10 MB upload to both analyses done, the upload throughput, and the web
// server's peak memory (VmHWM and sampled VmRSS of its process tree) during a 100 MB upload.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseDesign } from '../../analysis/design';
import { synthesizeRun, traceCsvChunks } from '../../analysis/synth';
import * as boot from '../../db/local/bootstrap.mjs';
import { benchDesignDocument } from './benchDesign';

const MB = 1e6;
const port = Number(process.env.BENCH_APP_PORT ?? 3200);
const base = `http://127.0.0.1:${port}`;
const token = `flk_bench${randomBytes(24).toString('base64url')}`;
const auth = { authorization: `Bearer ${token}` };

/** The server's process and its children (next start may run the app in a child). */
function tree(pid: number): number[] {
  const out = [pid];
  for (let i = 0; i < out.length; i++) {
    for (const task of fs.readdirSync(`/proc/${out[i]}/task`)) {
      const kids = fs.readFileSync(`/proc/${out[i]}/task/${task}/children`, 'utf8').trim();
      if (kids) out.push(...kids.split(/\s+/).map(Number));
    }
  }
  return out;
}
function statusKb(pid: number, key: 'VmRSS' | 'VmHWM'): number {
  const m = new RegExp(`^${key}:\\s+(\\d+) kB`, 'm').exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) : 0;
}
const treeKb = (pid: number, key: 'VmRSS' | 'VmHWM') => Math.max(...tree(pid).map((p) => statusKb(p, key)));

async function post(body: FormData): Promise<{ status: number; json: { run?: { id: string }; analyses?: { id: string }[]; error?: { message: string } } }> {
  const res = await fetch(`${base}/api/runs`, { method: 'POST', body, headers: auth });
  return { status: res.status, json: (await res.json()) as never };
}

async function waitDone(ids: string[], timeoutMs: number): Promise<string[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const states = await Promise.all(ids.map(async (id) => ((await (await fetch(`${base}/api/analyses/${id}`, { headers: auth })).json()) as { state: string }).state));
    if (states.every((s) => s === 'done' || s === 'failed')) return states;
    if (Date.now() > deadline) throw new Error(`analyses still ${states.join(', ')} after ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A trace of about `bytes` that passes every check (time increasing, layers 1–8); not meant to fit well. */
async function writeLargeTrace(file: string, bytes: number): Promise<number> {
  const out = fs.createWriteStream(file);
  out.write('# chamber: Bay 1 e-beam\n# run: BENCH-100\ntime_s,signal,layer,chip\n');
  let written = 0;
  let i = 0;
  const perLayer = Math.ceil(bytes / 26 / 8);
  while (written < bytes) {
    let chunk = '';
    for (let k = 0; k < 20000; k++, i++) chunk += `${(i * 0.01).toFixed(2)},${(0.5 + 0.3 * Math.sin(i / 500)).toFixed(6)},${Math.min(8, 1 + Math.floor(i / perLayer))},1\n`;
    written += chunk.length;
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
  return fs.statSync(file).size;
}

export async function run(): Promise<void> {
  const children: ChildProcess[] = [];
  const pg = await boot.startPostgres(boot.ensurePostgresInstalled());
  try {
    const password = boot.ensureDatabases(pg, ['fringelog_bench'], { recreate: ['fringelog_bench'] });
    const env: NodeJS.ProcessEnv = {
      ...process.env,
      NODE_ENV: 'production',
      NEXT_TELEMETRY_DISABLED: '1',
      DATABASE_URL: boot.databaseUrl(password, 'fringelog_bench'),
      SESSION_SECRET: randomBytes(36).toString('base64url'),
      SMTP_URL: 'smtp://127.0.0.1:9',
      APP_URL: base,
      FRINGELOG_DIST_DIR: '.next-bench',
      FRINGELOG_DEMO_TOKEN: token,
    };
    const sh = (cmd: string, args: string[]) => {
      const r = spawnSync(cmd, args, { cwd: boot.root, env, stdio: ['ignore', 'ignore', 'inherit'] });
      if (r.status !== 0) throw new Error(`${path.basename(cmd)} ${args.join(' ')} failed`);
    };
    sh(boot.bin('tsx'), ['--conditions=react-server', 'tests/bench/uploadSetup.ts']);
    if (!(process.env.BENCH_REUSE_BUILD && fs.existsSync(path.join(boot.root, '.next-bench', 'BUILD_ID')))) sh(boot.bin('next'), ['build']);
    const server = spawn(boot.bin('next'), ['start', '-p', String(port), '-H', '127.0.0.1'], { cwd: boot.root, env, stdio: 'ignore' });
    children.push(server);
    const worker = spawn(boot.bin('tsx'), ['--conditions=react-server', 'db/local/worker.ts'], { cwd: boot.root, env, stdio: 'ignore' });
    children.push(worker);
    if (!(await boot.waitForHttp(`${base}/sign-in`, 60000))) throw new Error('the bench server did not answer within 60 s');

    // 10 MB: a synthetic 8-layer run with known truth, analysed in both modes by the worker.
    const design = parseDesign(benchDesignDocument);
    const probe = synthesizeRun(design, { seed: 8, sampleIntervalS: 0.1 });
    const probeBytes = [...traceCsvChunks(probe)].reduce((a, c) => a + c.length, 0);
    const synth = synthesizeRun(design, { seed: 8, sampleIntervalS: (0.1 * probeBytes) / (10 * MB) });
    const csv = ['# chamber: Bay 1 e-beam\n# run: BENCH-10\n', ...traceCsvChunks(synth)].join('');
    const ten = new FormData();
    ten.set('design', benchDesignDocument.name);
    ten.set('trace', new Blob([csv], { type: 'text/csv' }), 'bench-10mb.csv');
    const t0 = performance.now();
    const stored = await post(ten);
    const t1 = performance.now();
    if (stored.status !== 201) throw new Error(`10 MB upload answered ${stored.status}: ${stored.json.error?.message}`);
    const states = await waitDone(stored.json.analyses!.map((a) => a.id), 600_000);
    const t2 = performance.now();
    console.log(`upload: 10 MB trace (${(csv.length / MB).toFixed(1)} MB, ${synth.timeS.length.toLocaleString('en')} samples, 8 layers), chamber token, 1 worker`);
    console.log(`  upload answered 201 (streamed, checked, stored)   ${(t1 - t0).toFixed(0)} ms   ${(csv.length / MB / ((t1 - t0) / 1000)).toFixed(1)} MB/s`);
    console.log(`  upload start to both analyses ${states.join(' and ')}       ${(t2 - t0).toFixed(0)} ms`);

    // 100 MB: the worker is stopped first, so the figures are the web server's alone.
    worker.kill('SIGTERM');
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'fringelog-bench-')), 'bench-100mb.csv');
    const size = await writeLargeTrace(file, 100 * MB);
    const big = new FormData();
    big.set('design', benchDesignDocument.name);
    big.set('trace', await fs.openAsBlob(file, { type: 'text/csv' }), 'bench-100mb.csv');
    const rssBefore = treeKb(server.pid!, 'VmRSS');
    const hwmBefore = treeKb(server.pid!, 'VmHWM');
    let rssPeak = rssBefore;
    const sampler = setInterval(() => (rssPeak = Math.max(rssPeak, treeKb(server.pid!, 'VmRSS'))), 25);
    const t3 = performance.now();
    const bigStored = await post(big);
    const t4 = performance.now();
    clearInterval(sampler);
    fs.rmSync(path.dirname(file), { recursive: true, force: true });
    if (bigStored.status !== 201) throw new Error(`100 MB upload answered ${bigStored.status}: ${bigStored.json.error?.message}`);
    const hwmAfter = treeKb(server.pid!, 'VmHWM');
    console.log(`upload: 100 MB trace (${(size / MB).toFixed(1)} MB), the web server's memory (its process tree, /proc)`);
    console.log(`  upload answered 201                                ${(t4 - t3).toFixed(0)} ms   ${(size / MB / ((t4 - t3) / 1000)).toFixed(1)} MB/s`);
    console.log(`  RSS before ${(rssBefore / 1024).toFixed(0)} MB, sampled peak during ${(rssPeak / 1024).toFixed(0)} MB; VmHWM before ${(hwmBefore / 1024).toFixed(0)} MB, after ${(hwmAfter / 1024).toFixed(0)} MB`);
  } finally {
    for (const c of children) if (c.exitCode === null) c.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 500));
    pg.stop();
  }
}

if (process.argv[1]?.endsWith('upload.ts')) await run();
